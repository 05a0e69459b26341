// A circular low Earth orbit passing through Earth's shadow, modelled as a cylinder of Earth's
// radius behind Earth (sun at infinity, fixed direction over the span). The event-timing reference:
// entry and exit times are analytic.
// Scenario of our own: radius R = 6378137 + 700e3 m, plane inclined 51.6 degrees about the x axis,
// sun direction s = cos(beta) e1 + sin(beta) n at beta = 60 degrees above the orbit plane
// (e1, e2 span the plane, n = e1 x e2). Span: three periods.
// Motion: exact circular two-body motion r = R (cos wt e1 + sin wt e2), w = sqrt(GM / R^3)
// (e.g. Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., ch. 2; chapter from memory).
// Shadow: r.s < 0 and |r - (r.s) s| < R_E (cylindrical shadow model, Vallado 4th ed., ch. 5; chapter from memory).
// On this orbit r.s = R cos(wt) cos(beta) and |r - (r.s)s|^2 = R^2 (1 - cos^2(wt) cos^2(beta)), so
// the satellite is in shadow where cos(wt) <= -sqrt(1 - (R_E/R)^2) / cos(beta): entry at
// wt = pi - alpha, exit at pi + alpha (mod 2 pi), alpha = acos(sqrt(1 - (R_E/R)^2) / cos(beta)).
// Event function g = R_E - (r.s < 0 ? |r - (r.s)s| : |r|): continuous (the two agree where r.s = 0),
// negative in sunlight, positive in shadow; entry is its rising crossing, exit its falling one.
// Error: absolute, metres and metres per second. Invariants: energy and angular-momentum magnitude.
import type { Problem, ProblemEvent } from '../src/core/types.js';
import { twoBodyAngularMomentum, twoBodyEnergy, twoBodyJacobian, twoBodyRhs } from './physics/two-body.js';
import { EARTH_GM, EARTH_RADIUS, inclinedPlane } from './physics/earth.js';
import { catalogueProblem } from './from-source.js';

const R = EARTH_RADIUS + 700e3;
const W = Math.sqrt(EARTH_GM / (R * R * R));
const PERIOD = (2 * Math.PI) / W;
const ORBITS = 3;
const INCLINATION = (51.6 * Math.PI) / 180;
const { e1: E1, e2: E2, normal: N } = inclinedPlane(INCLINATION);

/**
 * The problem with the sun `betaDeg` degrees above the orbit plane (60 in the catalogue; near 64.3
 * the eclipse lasts about a minute, which tests use for steps that jump over it).
 */
export function eclipseOrbit(betaDeg: number): Problem {
  const beta = (betaDeg * Math.PI) / 180;
  const sun = [0, 1, 2].map((k) => Math.cos(beta) * E1[k]! + Math.sin(beta) * N[k]!);
  const halfAngle = Math.acos(Math.sqrt(1 - (EARTH_RADIUS / R) ** 2) / Math.cos(beta));
  const shadow = (t: number, y: Float64Array) => shadowFunction(sun, y);
  const times = eclipseTimes(halfAngle);
  return build(betaDeg, shadow, times);
}

function shadowFunction(SUN: readonly number[], y: Float64Array): number {
  const x = y[0]!;
  const yy = y[1]!;
  const z = y[2]!;
  const along = x * SUN[0]! + yy * SUN[1]! + z * SUN[2]!;
  if (along >= 0) return EARTH_RADIUS - Math.sqrt(x * x + yy * yy + z * z);
  const px = x - along * SUN[0]!;
  const py = yy - along * SUN[1]!;
  const pz = z - along * SUN[2]!;
  return EARTH_RADIUS - Math.sqrt(px * px + py * py + pz * pz);
}

/** Analytic entry and exit times over the span, for an eclipse of half-angle alpha. */
export function eclipseTimes(alpha: number): { entry: number[]; exit: number[] } {
  const entry: number[] = [];
  const exit: number[] = [];
  for (let k = 0; k < ORBITS; k++) {
    entry.push((Math.PI - alpha + 2 * Math.PI * k) / W);
    exit.push((Math.PI + alpha + 2 * Math.PI * k) / W);
  }
  return { entry, exit };
}

function build(betaDeg: number, shadow: ProblemEvent['fn'], TIMES: { entry: number[]; exit: number[] }): Problem {
  const EVENTS: ProblemEvent[] = [
    { name: 'eclipse-entry', fn: shadow, direction: 'rising' },
    { name: 'eclipse-exit', fn: shadow, direction: 'falling' },
  ];
  const variant = betaDeg === 60 ? '' : `-beta-${betaDeg}`;
  return catalogueProblem(import.meta.url, {
    id: `eclipse-circular-orbit${variant.replace('.', '-')}`,
    title: 'Circular low Earth orbit through a cylindrical Earth shadow (eclipse events)',
    source: 'Exact circular two-body motion and cylindrical shadow geometry, Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., chs. 2 and 5; WGS 84 constants',
    dimension: 6,
    stateNames: ['x', 'y', 'z', 'vx', 'vy', 'vz'],
    t0: 0,
    tEnd: ORBITS * PERIOD,
    y0: [R * E1[0], R * E1[1], R * E1[2], R * W * E2[0], R * W * E2[1], R * W * E2[2]],
    f: twoBodyRhs(3, EARTH_GM),
    jacobian: twoBodyJacobian(3, EARTH_GM),
    stiff: false,
    invariants: [twoBodyEnergy(3, EARTH_GM), twoBodyAngularMomentum(3)],
    errorScale: { kind: 'absolute' },
    reference: {
      kind: 'exact',
      source: 'analytic circular motion; eclipse times from the cylindrical shadow geometry',
      exact(t, out) {
        const c = Math.cos(W * t);
        const s = Math.sin(W * t);
        for (let k = 0; k < 3; k++) {
          out[k] = R * (c * E1[k]! + s * E2[k]!);
          out[3 + k] = R * W * (-s * E1[k]! + c * E2[k]!);
        }
      },
      eventTimes: { 'eclipse-entry': TIMES.entry, 'eclipse-exit': TIMES.exit },
    },
    checkTimes: Array.from({ length: 4 * ORBITS - 1 }, (_, k) => ((k + 1) * PERIOD) / 4),
    // 33 steps per orbit doubling: rk4 from visibly wrong to its asymptotic range (common practice, no source).
    defaultSteps: [100, 200, 400, 800, 1600, 3200, 6400, 12800],
    separable: { positions: [0, 1, 2], velocities: [3, 4, 5], secondOrder: true },
    orbit: { position: [0, 1, 2], velocity: [3, 4, 5], unit: 'm' },
    events: EVENTS,
  }, { betaDeg });
}

export const eclipseCircularOrbit: Problem = eclipseOrbit(60);
