// The orbit problems of the catalogue checked against outside facts: shadow geometry, the J2
// nodal regression rate, the periodicity of Arenstorf's published orbit, and conservation laws
// along an integration by odex (Hairer's GBS extrapolation code, a registry library).
import { describe, expect, it } from 'vitest';
import odex from 'odex';
import { findProblem } from '../problems/index.js';
import type { Problem } from '../src/core/types.js';

function odexSolve(p: Problem, tEnd: number, tol: number): Float64Array {
  const solver = new odex.Solver(p.dimension);
  solver.relativeTolerance = solver.absoluteTolerance = tol;
  solver.maxSteps = 1e7;
  const dy = new Float64Array(p.dimension);
  const res = solver.solve((t: number, y: number[]) => (p.f(t, Float64Array.from(y), dy), Array.from(dy)), p.t0, [...p.y0], tEnd);
  expect(res.outcome).toBe(0);
  return Float64Array.from(res.y);
}

describe('eclipse-circular-orbit', () => {
  const p = findProblem('eclipse-circular-orbit')!;
  const R_E = 6378137; // WGS 84 equatorial radius
  const exact = (t: number) => {
    const out = new Float64Array(6);
    p.reference.exact!(t, out);
    return out;
  };
  // Shadow test written directly from the cylinder model (behind Earth, within R_E of the axis),
  // with the sun direction recovered from the problem's own description: 60 deg above the plane
  // whose normal is e1 x e2, e1 = (1,0,0), e2 = (0, cos 51.6, sin 51.6).
  const i = (51.6 * Math.PI) / 180;
  const b = (60 * Math.PI) / 180;
  const sun = [Math.cos(b), -Math.sin(b) * Math.sin(i), Math.sin(b) * Math.cos(i)];
  const inShadow = (t: number) => {
    const r = exact(t);
    const along = r[0]! * sun[0]! + r[1]! * sun[1]! + r[2]! * sun[2]!;
    const perp = Math.hypot(r[0]! - along * sun[0]!, r[1]! - along * sun[1]!, r[2]! - along * sun[2]!);
    return along < 0 && perp < R_E;
  };

  it('the analytic entry and exit times are where the cylinder test changes (bisection to 1e-9 s)', () => {
    const entry = p.reference.eventTimes!['eclipse-entry']!;
    const exit = p.reference.eventTimes!['eclipse-exit']!;
    expect(entry.length).toBe(3);
    for (const [times, into] of [[entry, true], [exit, false]] as const) {
      for (const t of times) {
        let lo = t - 60;
        let hi = t + 60;
        expect(inShadow(lo)).toBe(!into);
        expect(inShadow(hi)).toBe(into);
        while (hi - lo > 1e-9) {
          const mid = (lo + hi) / 2;
          if (inShadow(mid) === into) hi = mid;
          else lo = mid;
        }
        expect(Math.abs((lo + hi) / 2 - t)).toBeLessThan(1e-6);
      }
    }
    // The event function is zero there to round-off in metres.
    const g = p.events![0]!.fn;
    for (const t of [...entry, ...exit]) expect(Math.abs(g(t, exact(t)))).toBeLessThan(1e-6);
  });
});

describe('leo-j2', () => {
  const p = findProblem('leo-j2')!;
  it('energy and polar angular momentum are conserved along an odex run (rtol 1e-12)', () => {
    const y = odexSolve(p, p.tEnd, 1e-12);
    const y0 = Float64Array.from(p.y0);
    for (const inv of p.invariants) {
      const a = inv.fn(0, y0);
      expect(Math.abs(inv.fn(p.tEnd, y) - a) / Math.abs(a), inv.name).toBeLessThan(1e-9);
    }
  });

  it('the node regresses at the secular J2 rate -1.5 n J2 (R/p)^2 cos i (within 3% over a day)', () => {
    // Secular nodal rate: Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., ch. 9
    // (from memory; also Brouwer 1959). Short-period terms make the osculating node differ by a
    // fraction of a percent of a day's drift (measured: the bound here is loose on purpose).
    const gm = 3.986004418e14;
    const re = 6378137;
    const j2 = 0.0010826267;
    const a = re + 500e3;
    const e = 0.001;
    const inc = (51.6 * Math.PI) / 180;
    const n = Math.sqrt(gm / a ** 3);
    const rate = -1.5 * n * j2 * (re / (a * (1 - e * e))) ** 2 * Math.cos(inc);
    const node = (y: ArrayLike<number>) => {
      const hx = y[1]! * y[5]! - y[2]! * y[4]!;
      const hy = y[2]! * y[3]! - y[0]! * y[5]!;
      return Math.atan2(hx, -hy);
    };
    const y = odexSolve(p, p.tEnd, 1e-11);
    const drift = node(y) - node(p.y0);
    expect(node(p.y0)).toBeCloseTo((30 * Math.PI) / 180, 12);
    expect(Math.abs(drift / (rate * p.tEnd) - 1)).toBeLessThan(0.03);
  });
});

describe('arenstorf-orbit', () => {
  const p = findProblem('arenstorf-orbit')!;
  it('odex at rtol 1e-13 returns to the published initial state after the published period', () => {
    // HNW I sec. II.0: the orbit is periodic with T = 17.0652165601579625588917206249.
    const y = odexSolve(p, p.tEnd, 1e-13);
    const resolution = 2 * 10 ** -p.reference.digits!; // 8 digits of values up to 2
    for (let i = 0; i < 4; i++) expect(Math.abs(y[i]! - p.y0[i]!)).toBeLessThan(resolution);
    const c = p.invariants[0]!.fn;
    expect(Math.abs(c(p.tEnd, y) - c(0, Float64Array.from(p.y0)))).toBeLessThan(1e-10);
  });
});

describe('tethered-pair', () => {
  const p = findProblem('tethered-pair')!;
  it('energy and angular momentum are conserved along an odex run (rtol 1e-12), through the slack phases', () => {
    const y = odexSolve(p, p.tEnd, 1e-12);
    const y0 = Float64Array.from(p.y0);
    for (const inv of p.invariants) {
      const a = inv.fn(0, y0);
      expect(Math.abs(inv.fn(p.tEnd, y) - a) / Math.abs(a), inv.name).toBeLessThan(1e-11);
    }
  });

  it('the tether pushes never: the separation\'s acceleration is gravity\'s alone when slack', () => {
    const y = Float64Array.from(p.y0);
    const l = Math.hypot(y[3]!, y[4]!, y[5]!);
    for (let k = 3; k < 6; k++) y[k]! *= 499 / l; // 1 m shorter than the natural length
    const dy = new Float64Array(12);
    p.f(0, y, dy);
    // Differential gravity of two bodies 499 m apart in LEO: |g(r1) - g(r2)| <= 3 GM l / r^3 ~ 2e-3 m/s^2.
    expect(Math.hypot(dy[9]!, dy[10]!, dy[11]!)).toBeLessThan(3e-3);
    for (let k = 3; k < 6; k++) y[k]! *= 501 / 499; // 1 m longer: k * 1 m * (1/m1 + 1/m2) = 9 m/s^2 inward
    p.f(0, y, dy);
    expect(Math.hypot(dy[9]!, dy[10]!, dy[11]!)).toBeCloseTo(9, 2);
  });
});
