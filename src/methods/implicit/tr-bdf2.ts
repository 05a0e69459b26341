// TR-BDF2: a trapezoidal stage to t + gamma h followed by a BDF2 stage to t + h, gamma = 2 - sqrt(2).
// R. E. Bank, W. M. Coughran, W. Fichtner, E. H. Grosse, D. J. Rose, R. K. Smith, Transient
// simulation of silicon devices and circuits, IEEE Trans. CAD 4 (1985) 436-451; written as a
// one-step ESDIRK with its embedded order-3 error estimate by M. E. Hosea & L. F. Shampine,
// Analysis and implementation of TR-BDF2, Appl. Numer. Math. 20 (1996) 21-37:
//   c = (0, gamma, 1), b = (w, w, d), bhat = ((1-w)/3, (3w+1)/3, d/3), d = gamma/2, w = sqrt(2)/4,
// both implicit stages share the iteration matrix I - d h J. The estimate h (bhat - b) f is
// filtered by (I - d h J)^{-1} so that it stays bounded for stiff components.
import { luFactor, luSolve } from '../../core/lu.js';
import { makeJacobianSource } from '../../core/jacobian.js';
import type { Counts, Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { EPS, solveAdaptive, type Attempt, type Stepper, type Tolerances } from './common.js';

const GAMMA = 2 - Math.SQRT2;
const DIAG = GAMMA / 2;
const W = Math.SQRT2 / 4;
/** Tableau as data (Hosea & Shampine 1996, sec. 2). */
export const TR_BDF2 = {
  c: [0, GAMMA, 1],
  a: [
    [0, 0, 0],
    [DIAG, DIAG, 0],
    [W, W, DIAG],
  ],
  b: [W, W, DIAG],
  bhat: [(1 - W) / 3, (3 * W + 1) / 3, DIAG / 3],
};
const E = TR_BDF2.bhat.map((v, i) => v - TR_BDF2.b[i]!);

const NEWTON_MAXITER = 5;
const KAPPA = 0.03;
const SAFE = 0.9;
const MIN_FACTOR = 0.2;
const MAX_FACTOR = 5;
const HOLD_RATIO = 1.2;

function createStepper(problem: Problem, tol: Tolerances, counts: Counts) {
  const n = problem.dimension;
  const f = problem.f;
  const { rtol, atol } = tol;
  const y = Float64Array.from(problem.y0);
  const f1 = new Float64Array(n), f2 = new Float64Array(n), f3 = new Float64Array(n);
  const z = new Float64Array(n), rhs = new Float64Array(n), delta = new Float64Array(n);
  const fz = new Float64Array(n), scal = new Float64Array(n), est = new Float64Array(n);
  const z3 = new Float64Array(n);
  const M = new Float64Array(n * n);
  const piv = new Int32Array(n);
  const jacSrc = makeJacobianSource(f, problem.jacobian, n, counts);
  const jac = jacSrc.jac;
  const newtonTol = Math.max((10 * EPS) / rtol, KAPPA);
  let hLU = NaN;
  let needJac = true;
  let jacCurrent = false;
  let eta = 1;
  let reject = false;

  f(problem.t0, y, f1);
  counts.nfev++;

  function norm(v: Float64Array): number {
    let s = 0;
    for (let i = 0; i < n; i++) {
      const r = v[i]! / scal[i]!;
      s += r * r;
    }
    return Math.sqrt(s / n);
  }

  /** Solve z = rhs + d h f(tz, z) from the start value in z; fOut gets f(tz, z) via the stage relation. */
  function newton(tz: number, h: number, fOut: Float64Array): boolean {
    eta = Math.max(eta, EPS) ** 0.8;
    let dyOld = 0;
    const dh = DIAG * h;
    for (let it = 0; it < NEWTON_MAXITER; it++) {
      f(tz, z, fz);
      counts.nfev++;
      for (let i = 0; i < n; i++) delta[i] = rhs[i]! + dh * fz[i]! - z[i]!;
      luSolve(M, n, piv, delta);
      const dy = norm(delta);
      if (!Number.isFinite(dy)) return false;
      if (it > 0) {
        const rate = dy / dyOld;
        if (rate >= 1 || (rate ** (NEWTON_MAXITER - it) / (1 - rate)) * dy > newtonTol) return false;
        eta = rate / (1 - rate);
      }
      for (let i = 0; i < n; i++) z[i] = z[i]! + delta[i]!;
      if (dy === 0 || eta * dy <= newtonTol) {
        // f at the converged stage from the stage equation, consistent with what was solved.
        const inv = 1 / dh;
        for (let i = 0; i < n; i++) fOut[i] = (z[i]! - rhs[i]!) * inv;
        return true;
      }
      dyOld = dy;
    }
    return false;
  }

  function attempt(t: number, h: number): Attempt {
    if (needJac) {
      jacSrc.evaluate(t, y, f1);
      needJac = false;
      jacCurrent = true;
      hLU = NaN;
    }
    if (h !== hLU) {
      const dh = DIAG * h;
      for (let q = 0; q < n * n; q++) M[q] = -dh * jac[q]!;
      for (let i = 0; i < n; i++) M[i * n + i] = M[i * n + i]! + 1;
      counts.nlu++;
      hLU = NaN;
      if (!luFactor(M, n, piv)) {
        if (!jacCurrent) needJac = true;
        return { accepted: false, hNext: 0.5 * h };
      }
      hLU = h;
    }
    for (let i = 0; i < n; i++) scal[i] = atol[i]! + rtol * Math.abs(y[i]!);
    // Trapezoidal stage.
    for (let i = 0; i < n; i++) {
      rhs[i] = y[i]! + DIAG * h * f1[i]!;
      z[i] = y[i]! + GAMMA * h * f1[i]!;
    }
    let ok = newton(t + GAMMA * h, h, f2);
    if (ok) {
      // BDF2 stage, started from an explicit combination of the known slopes.
      for (let i = 0; i < n; i++) {
        rhs[i] = y[i]! + W * h * (f1[i]! + f2[i]!);
        z[i] = rhs[i]! + DIAG * h * f2[i]!;
      }
      ok = newton(t + h, h, f3);
    }
    if (!ok) {
      eta = 1;
      reject = true;
      if (!jacCurrent) {
        needJac = true;
        return { accepted: false, hNext: h };
      }
      return { accepted: false, hNext: 0.5 * h };
    }
    z3.set(z);
    for (let i = 0; i < n; i++) est[i] = h * (E[0]! * f1[i]! + E[1]! * f2[i]! + E[2]! * f3[i]!);
    luSolve(M, n, piv, est);
    let s = 0;
    for (let i = 0; i < n; i++) {
      const sc = atol[i]! + rtol * Math.max(Math.abs(y[i]!), Math.abs(z3[i]!));
      const r = est[i]! / sc;
      s += r * r;
    }
    const err = Math.sqrt(s / n);
    if (!(err <= 1)) {
      reject = true;
      const factor = Number.isFinite(err) ? Math.max(MIN_FACTOR, SAFE * err ** (-1 / 3)) : MIN_FACTOR;
      return { accepted: false, hNext: h * factor };
    }
    let factor = Math.min(MAX_FACTOR, SAFE * Math.max(err, 1e-10) ** (-1 / 3));
    if (reject) factor = Math.min(factor, 1);
    reject = false;
    y.set(z3);
    f1.set(f3);
    jacCurrent = false;
    if (factor >= 1 && factor < HOLD_RATIO) factor = 1;
    return { accepted: true, hNext: h * factor };
  }

  return { y, f0: f1, attempt } satisfies Stepper & { f0: Float64Array };
}

export const trBdf2: Method = {
  id: 'trapezoidal-bdf2',
  name: 'TR-BDF2 (Bank et al.; Hosea-Shampine)',
  family: 'implicit',
  order: 2,
  embeddedOrder: 3,
  source:
    'R. E. Bank et al., IEEE Trans. CAD 4 (1985) 436-451; M. E. Hosea, L. F. Shampine, Appl. Numer. Math. 20 (1996) 21-37',
  adaptive: true,
  stiff: true,
  notes:
    'L-stable ESDIRK form, one LU shared by both stages; Jacobian kept until Newton fails. ' +
    'The slope at the new point is taken from the stage equation, so FSAL costs no evaluation.',
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    return solveAdaptive(problem, setting, options, 'trapezoidal-bdf2', 2, createStepper);
  },
};
