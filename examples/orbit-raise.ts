// A problem module: a small spacecraft spirals outward from a circular orbit under a weak,
// constant thrust along its velocity. Nondimensional units: gravitational parameter 1, initial
// radius 1 (so the initial circular speed and angular rate are 1). State (x, y, vx, vy):
//   r = |(x, y)|, v = |(vx, vy)|,  x'' = -x / r^3 + a vx / v,  y'' = -y / r^3 + a vy / v.
// With thrust the orbital energy is not conserved, so there are no invariants and no closed form:
// the sweep certifies the reference. Equations: Newtonian two-body with a tangential acceleration
// (common practice, no source).
//
// Run it with:  stepgauge run --problem ./examples/orbit-raise.ts
import { defineProblem } from 'stepgauge';

/** Thrust acceleration as a fraction of the initial gravitational acceleration. */
const THRUST = 0.01;

export default defineProblem({
  id: 'orbit-raise',
  title: 'Low-thrust orbit raise from a circular orbit',
  source: 'Planar two-body problem with constant tangential thrust (common practice, no source); reference certified by the sweep',
  description: "x'' = -x/r^3 + a vx/|v|, y'' = -y/r^3 + a vy/|v|, a = 0.01, from the circular orbit r = 1, t in [0, 40]",
  stateNames: ['x', 'y', 'vx', 'vy'],
  y0: [1, 0, 0, 1],
  span: [0, 40],
  checkTimes: [10, 20, 30, 40],
  f(_t, s, ds) {
    const x = s[0]!;
    const y = s[1]!;
    const vx = s[2]!;
    const vy = s[3]!;
    const r2 = x * x + y * y;
    const inv3 = 1 / (r2 * Math.sqrt(r2));
    const push = THRUST / Math.sqrt(vx * vx + vy * vy);
    ds[0] = vx;
    ds[1] = vy;
    ds[2] = -x * inv3 + push * vx;
    ds[3] = -y * inv3 + push * vy;
  },
  errorScale: { kind: 'relative', floor: 1e-3 },
});
