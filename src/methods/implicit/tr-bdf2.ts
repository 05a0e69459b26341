// TR-BDF2: a trapezoidal stage to t + gamma h followed by a BDF2 stage to t + h, gamma = 2 - sqrt(2).
// R. E. Bank, W. M. Coughran, W. Fichtner, E. H. Grosse, D. J. Rose, R. K. Smith, Transient
// simulation of silicon devices and circuits, IEEE Trans. CAD 4 (1985) 436-451; written as a
// one-step ESDIRK with its embedded order-3 error estimate by M. E. Hosea & L. F. Shampine,
// Analysis and implementation of TR-BDF2, Appl. Numer. Math. 20 (1996) 21-37:
//   c = (0, gamma, 1), b = (w, w, d), bhat = ((1-w)/3, (3w+1)/3, d/3), d = gamma/2, w = sqrt(2)/4,
// both implicit stages share the iteration matrix I - d h J. The estimate h (bhat - b) f is
// filtered by (I - d h J)^{-1} so that it stays bounded for stiff components. The order-3 result
// is not used to advance: its stability function grows without bound as z -> -inf (bhat_1 !=
// bhat_2 while the trapezoidal stage tends to -y), so local extrapolation would lose L-stability.
//
// Tolerance map. The controller keeps the local error of the order-2 result near tol' per step,
// so h ~ (tol'/C)^(1/3), and the global error, the sum of about T/h such errors, grows like
// tol'^(2/3). Measured on Robertson without the map: global error 0.63 rtol^(2/3) from rtol 1e-3
// to 1e-10; the filtered estimate over the true local error of each step (from a radau-iia-5
// solve at rtol 1e-14) has median 1.00, 10th-90th percentile 0.89-1.09 at rtol 1e-8; a 300 times
// tighter Newton test changes the global error by 5%. So neither the estimate nor the Newton
// iteration is the gap between rtol and the achieved error, the per-step control is. For a
// global error proportional to the requested tolerance, order p controlled per step needs
// tol' ~ tol^((p+1)/p) = tol^(3/2). The constant is not knowable in advance (it is an integral
// over the problem, here it makes the error about 6 rtol); it is chosen so that, like the map
// rtol' = 0.1 rtol^(2/3) of Hairer and Wanner's RADAU5 code (Solving ODEs II, sec. IV.8), the
// map leaves rtol = 1e-3 unchanged:
//   rtol' = min(rtol, 1e-3 (rtol / 1e-3)^(3/2)),  atol' = atol rtol'/rtol,
// floored at 10 eps / KAPPA (7.4e-14), where the Newton test max(10 eps/rtol', KAPPA) would start
// to exceed KAPPA, i.e. where the requested local error reaches rounding level. Nothing in it
// depends on the problem. The min keeps loose requests as they are, where the small-h argument
// behind the map does not hold. The cost: steps grow like rtol^(-1/2) instead of rtol^(-1/3), a
// factor (1e-3/rtol)^(1/6) more than without the map (6.8 at rtol 1e-8), which is what second
// order costs for a global error near the request; long spans at rtol <= 1e-9 need more than
// 100000 steps.
import { makeJacobianSource } from '../../core/jacobian.js';
import { jacobianStructure } from '../../core/jacobian-structure.js';
import { RealIterationMatrix } from './iteration-matrix.js';
import { rmsOverScales, scaledRmsNorm } from '../../core/vector.js';
import type { Counts, Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { DECIDE_BAND, EPS, dampedTimesWithin, powInt, propose, solveAdaptive, type Stepper, type Tolerances } from './common.js';
import type { WorkLease } from '../work-lease.js';

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
/** The error at which SAFE e^(-1/3) equals 1, HOLD_RATIO and MAX_FACTOR. */
const ERR_FACTOR_1 = SAFE ** 3;
const ERR_FACTOR_HOLD = (SAFE / HOLD_RATIO) ** 3;
const ERR_FACTOR_MAX = (SAFE / MAX_FACTOR) ** 3;
/** Tolerance left unchanged by the map (the fixed point of RADAU5's map, see the header). */
const TOL_ANCHOR = 1e-3;
/** Smallest mapped rtol: below it the Newton test 10 eps / rtol' would exceed KAPPA. */
const TOL_FLOOR = (10 * EPS) / KAPPA;

/** The header's tolerance map: rtol' = min(rtol, 1e-3 (rtol/1e-3)^(3/2)), floored; atol keeps its ratio. */
export function trBdf2Rtol(rtol: number): number {
  return Math.max(Math.min(rtol, TOL_ANCHOR * (rtol / TOL_ANCHOR) ** 1.5), Math.min(rtol, TOL_FLOOR));
}

export function trBdf2Tolerances(tol: Tolerances): Tolerances {
  const rtol = trBdf2Rtol(tol.rtol);
  const ratio = rtol / tol.rtol;
  return { rtol, atol: tol.atol.map((a) => a * ratio) };
}

/**
 * Step factor after an accepted step: min(MAX_FACTOR, SAFE e^(-1/3)) with e = max(err, 1e-10),
 * at most 1 after a rejection, and 1 when it falls in [1, HOLD_RATIO) so the factorization is
 * kept. Most steps end held (about four in five at tight tolerances) or at the cap, and which one
 * follows from comparing e with the thresholds the factor crosses, (SAFE/x)^3 for x = 1,
 * HOLD_RATIO, MAX_FACTOR; only the rest need the power. Near a threshold (band 1e-12, far wider
 * than the rounding of either side) the power decides, so the factor is bitwise the one the
 * direct formula gives.
 */
export function acceptedFactor(err: number, afterReject: boolean): number {
  const e = Math.max(err, 1e-10);
  if (e < ERR_FACTOR_1 * (1 - DECIDE_BAND) && (afterReject || e > ERR_FACTOR_HOLD * (1 + DECIDE_BAND))) return 1;
  if (!afterReject && e < ERR_FACTOR_MAX * (1 - DECIDE_BAND)) return MAX_FACTOR;
  let factor = Math.min(MAX_FACTOR, SAFE * e ** (-1 / 3));
  if (afterReject) factor = Math.min(factor, 1);
  if (factor >= 1 && factor < HOLD_RATIO) factor = 1;
  return factor;
}

function createStepper(problem: Problem, tol: Tolerances, counts: Counts, lease: WorkLease) {
  const n = problem.dimension;
  const proposal = lease.float64(1);
  // Scalars carried across steps live in fields, not closure variables: V8 boxes every double
  // written to a closure variable, which would allocate on each step.
  const st = { hLU: NaN, eta: 1 };
  const f = problem.f;
  const { rtol, atol } = tol;
  const y = lease.copyOf(problem.y0);
  const f1 = lease.float64(n), f2 = lease.float64(n), f3 = lease.float64(n);
  const z = lease.float64(n), rhs = lease.float64(n), delta = lease.float64(n);
  const fz = lease.float64(n), scal = lease.float64(n), est = lease.float64(n);
  const jacSrc = makeJacobianSource(f, problem.jacobian, n, counts, (length) => lease.float64(length), jacobianStructure(problem, n));
  const M = new RealIterationMatrix(jacSrc, n, lease);
  const newtonTol = Math.max((10 * EPS) / rtol, KAPPA);
  let needJac = true;
  let jacCurrent = false;
  let reject = false;

  f(problem.t0, y, f1);
  counts.nfev++;

  const norm = (v: Float64Array): number => rmsOverScales(v, scal, n);

  /** Solve z = rhs + d h f(tz, z) from the start value in z; fOut gets f(tz, z) via the stage relation. */
  function newton(tz: number, h: number, fOut: Float64Array): boolean {
    // The carried contraction estimate enters damped, max(eta, eps)^0.8 (RADAU5's rule), its
    // power taken only when kept (see dampedTimesWithin).
    const etaBase = Math.max(st.eta, EPS);
    let dyOld = 0;
    const dh = DIAG * h;
    for (let it = 0; it < NEWTON_MAXITER; it++) {
      f(tz, z, fz);
      counts.nfev++;
      for (let i = 0; i < n; i++) delta[i] = rhs[i]! + dh * fz[i]! - z[i]!;
      M.solve(delta);
      const dy = norm(delta);
      if (!Number.isFinite(dy)) return false;
      if (it > 0) {
        const rate = dy / dyOld;
        if (rate >= 1 || (powInt(rate, NEWTON_MAXITER - it) / (1 - rate)) * dy > newtonTol) return false;
        st.eta = rate / (1 - rate);
      }
      for (let i = 0; i < n; i++) z[i] = z[i]! + delta[i]!;
      if (it === 0 ? dy === 0 || dampedTimesWithin(etaBase, dy, newtonTol) : st.eta * dy <= newtonTol) {
        if (it === 0) st.eta = etaBase ** 0.8;
        // f at the converged stage from the stage equation, consistent with what was solved.
        const inv = 1 / dh;
        for (let i = 0; i < n; i++) fOut[i] = (z[i]! - rhs[i]!) * inv;
        return true;
      }
      dyOld = dy;
    }
    return false;
  }

  function attempt(t: number, h: number): boolean {
    if (needJac) {
      jacSrc.evaluate(t, y, f1);
      needJac = false;
      jacCurrent = true;
      st.hLU = NaN;
    }
    if (h !== st.hLU) {
      counts.nlu++;
      st.hLU = NaN;
      if (!M.factor(1, DIAG * h)) {
        if (!jacCurrent) needJac = true;
        return propose(proposal, false, 0.5 * h);
      }
      st.hLU = h;
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
      st.eta = 1;
      reject = true;
      if (!jacCurrent) {
        needJac = true;
        return propose(proposal, false, h);
      }
      return propose(proposal, false, 0.5 * h);
    }
    for (let i = 0; i < n; i++) est[i] = h * (E[0]! * f1[i]! + E[1]! * f2[i]! + E[2]! * f3[i]!);
    M.solve(est);
    const err = scaledRmsNorm(est, y, z, rtol, atol, n);
    if (!(err <= 1)) {
      reject = true;
      const factor = Number.isFinite(err) ? Math.max(MIN_FACTOR, SAFE * err ** (-1 / 3)) : MIN_FACTOR;
      return propose(proposal, false, h * factor);
    }
    const factor = acceptedFactor(err, reject);
    reject = false;
    // Plain loops: TypedArray.prototype.set costs a builtin call, about as much as the step's
    // arithmetic on a small system.
    for (let i = 0; i < n; i++) {
      y[i] = z[i]!;
      f1[i] = f3[i]!;
    }
    jacCurrent = false;
    return propose(proposal, true, h * factor);
  }

  return { y, f0: f1, proposal, attempt } satisfies Stepper & { f0: Float64Array };
}

export const trBdf2: Method = {
  id: 'trapezoidal-bdf2',
  name: 'TR-BDF2 (Bank et al.; Hosea-Shampine)',
  family: 'implicit',
  order: 2,
  embeddedOrder: 3,
  // The tolerance map (header) makes steps grow like rtol^(-1/2) rather than rtol^(-1/3).
  stepGrowth: 0.5,
  source:
    'R. E. Bank et al., IEEE Trans. CAD 4 (1985) 436-451; M. E. Hosea, L. F. Shampine, Appl. Numer. Math. 20 (1996) 21-37',
  adaptive: true,
  stiff: true,
  notes:
    'L-stable ESDIRK form, one LU shared by both stages; Jacobian kept until Newton fails. ' +
    'The slope at the new point is taken from the stage equation, so FSAL costs no evaluation. ' +
    "Tolerances are mapped so that the global error is proportional to rtol (order 2 under per-step control would give rtol^(2/3)): " +
    "rtol' = min(rtol, 1e-3 (rtol/1e-3)^(3/2)), floored at 10 eps/0.03, atol' = atol rtol'/rtol; " +
    'this costs (1e-3/rtol)^(1/6) times the steps of the unmapped control (6.8 at rtol 1e-8).',
  effectiveRtol: trBdf2Rtol,
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    return solveAdaptive(problem, setting, options, 'trapezoidal-bdf2', 2, createStepper, trBdf2Tolerances);
  },
};
