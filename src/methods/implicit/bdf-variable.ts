// Variable-order (1..5), variable-step BDF in backward-difference form with quasi-constant steps.
// L. F. Shampine & M. W. Reichelt, The MATLAB ODE Suite, SIAM J. Sci. Comput. 18 (1997) 1-22,
// sec. 2 (the NDF/BDF family, here with kappa = 0, i.e. the classical BDF): predictor
// sum_j D_j, corrector gamma_k (y - y_pred) + sum_j gamma_j D_j = h f, local error
// ||y - y_pred|| / (k + 1), order chosen among k-1, k, k+1 after k+1 steps of constant size,
// simplified Newton with the Jacobian kept until Newton fails.
import { makeJacobianSource } from '../../core/jacobian.js';
import { jacobianStructure } from '../../core/jacobian-structure.js';
import { RealIterationMatrix } from './iteration-matrix.js';
import { inverseScales, weightedRms } from '../../core/vector.js';
import type { Counts, Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { rescaleDifferences } from './bdf-rescale.js';
import { EPS, dampedTimesWithin, powInt, solveAdaptive, propose, type Stepper, type Tolerances } from './common.js';
import type { WorkLease } from '../work-lease.js';

const MAX_ORDER = 5;
const NEWTON_MAXITER = 4;
/** Step ratio bounds after a rejection and after an acceptance. */
const MIN_FACTOR = 0.2;
const MAX_FACTOR = 10;
/** A proposed ratio in [1, HOLD_RATIO) keeps h, so the factorization is reused. */
const HOLD_RATIO = 1.2;
/** Newton stopping constant in tolerance units (cf. Hairer & Wanner II, sec. IV.8, eq. (8.12)). */
const KAPPA = 0.03;

/** gamma_k = sum_{m=1..k} 1/m. */
const GAMMA: number[] = [0];
for (let k = 1; k <= MAX_ORDER + 1; k++) GAMMA.push(GAMMA[k - 1]! + 1 / k);

function createStepper(problem: Problem, tol: Tolerances, counts: Counts, lease: WorkLease) {
  const n = problem.dimension;
  const proposal = lease.float64(1);
  // Scalars carried across steps live in fields, not closure variables: V8 boxes every double
  // written to a closure variable, which would allocate on each step.
  const st = { hCur: NaN, eta: 1, iters: 0, err: 0 };
  const f = problem.f;
  const { rtol, atol } = tol;
  const y = lease.copyOf(problem.y0);
  const f0 = lease.float64(n);
  const D = lease.float64((MAX_ORDER + 3) * n);
  const yPred = lease.float64(n), psi = lease.float64(n), dcor = lease.float64(n);
  const ycur = lease.float64(n), fcur = lease.float64(n), delta = lease.float64(n);
  const w = lease.float64(n), fy = lease.float64(n), row = lease.float64(n);
  const work = lease.float64(3 * (MAX_ORDER + 1) ** 2 + (MAX_ORDER + 1) * n);
  const jacSrc = makeJacobianSource(f, problem.jacobian, n, counts, (length) => lease.float64(length), jacobianStructure(problem, n));
  const M = new RealIterationMatrix(jacSrc, n, lease);
  const newtonTol = Math.max((10 * EPS) / rtol, KAPPA);

  let k = 1;
  let nEqual = 0;
  let luValid = false;
  let needJac = true;
  let jacCurrent = false;
  let started = false;

  f(problem.t0, y, f0);
  counts.nfev++;

  const norm = (v: Float64Array): number => weightedRms(v, w, n);
  /** The norm of difference D_j, through a copy: a subarray view would allocate on every order check. */
  const differenceNorm = (j: number): number => {
    const off = j * n;
    for (let i = 0; i < n; i++) row[i] = D[off + i]!;
    return weightedRms(row, w, n);
  };

  // The attempt is split into phases, each its own function: V8 compiles a function again
  // whenever it meets a branch or a right-hand side it had not seen when it first compiled it,
  // which each new problem brings, and then only the phase that met something new is compiled
  // again (see radau-iia-5.ts). Computed doubles pass between phases in `st`, not as arguments or
  // return values: a double crossing a call that V8 does not inline is boxed, an allocation.

  /** Step-size safety factor, smaller after a slow Newton iteration (st.iters iterations). */
  function newtonSafety(): number {
    return (0.9 * (2 * NEWTON_MAXITER + 1)) / (2 * NEWTON_MAXITER + st.iters);
  }

  /** Simplified Newton on d - c f(t+h, y_pred + d) + psi = 0: true when it converged, its iterations in st.iters. */
  function newtonSolve(t: number, h: number): boolean {
    const c = h / GAMMA[k]!;
    let dyOld = 0;
    let rate = 0;
    // Damped carried estimate, its power taken only when kept (see dampedTimesWithin).
    const etaBase = Math.max(st.eta, EPS);
    for (let it = 0; it < NEWTON_MAXITER; it++) {
      f(t + h, ycur, fcur);
      counts.nfev++;
      for (let i = 0; i < n; i++) delta[i] = c * fcur[i]! - psi[i]! - dcor[i]!;
      M.solve(delta);
      const dy = norm(delta);
      st.iters = it + 1;
      if (!Number.isFinite(dy)) return false;
      if (it > 0) {
        rate = dy / dyOld;
        if (rate >= 1 || (powInt(rate, NEWTON_MAXITER - it) / (1 - rate)) * dy > newtonTol) return false;
        st.eta = rate / (1 - rate);
      }
      for (let i = 0; i < n; i++) {
        ycur[i] = ycur[i]! + delta[i]!;
        dcor[i] = dcor[i]! + delta[i]!;
      }
      if (it === 0 ? dy === 0 || dampedTimesWithin(etaBase, dy, newtonTol) : st.eta * dy <= newtonTol) {
        if (it === 0) st.eta = etaBase ** 0.8;
        return true;
      }
      dyOld = dy;
    }
    return false;
  }

  /** Takes the step (error st.err <= 1): differences updated newest first, then order and step chosen. */
  function accept(h: number): boolean {
    const err = st.err;
    const safety = newtonSafety();
    const o1 = (k + 1) * n;
    const o2 = (k + 2) * n;
    for (let i = 0; i < n; i++) {
      D[o2 + i] = dcor[i]! - D[o1 + i]!;
      D[o1 + i] = dcor[i]!;
    }
    for (let j = k; j >= 0; j--) {
      const oj = j * n;
      for (let i = 0; i < n; i++) D[oj + i] = D[oj + i]! + D[oj + n + i]!;
    }
    for (let i = 0; i < n; i++) y[i] = D[i]!;
    jacCurrent = false;
    nEqual++;
    if (nEqual < k + 1) return propose(proposal, true, h);
    // Order and step selection among k-1, k, k+1.
    const errM = k > 1 ? differenceNorm(k) / k : Infinity;
    const errP = k < MAX_ORDER ? differenceNorm(k + 2) / (k + 2) : Infinity;
    const fM = k > 1 ? Math.max(errM, 1e-10) ** (-1 / k) : 0;
    const f0k = Math.max(err, 1e-10) ** (-1 / (k + 1));
    const fP = k < MAX_ORDER ? Math.max(errP, 1e-10) ** (-1 / (k + 2)) : 0;
    let newK = k;
    let best = f0k;
    if (fM > best) {
      best = fM;
      newK = k - 1;
    }
    if (fP > best) {
      best = fP;
      newK = k + 1;
    }
    const factor = Math.min(MAX_FACTOR, safety * best);
    if (newK === k && factor >= 1 && factor < HOLD_RATIO) return propose(proposal, true, h);
    if (newK !== k) {
      k = newK;
      luValid = false;
    }
    nEqual = 0;
    return propose(proposal, true, h * factor);
  }

  function attempt(t: number, h: number): boolean {
    if (!started) {
      for (let i = 0; i < n; i++) {
        D[i] = y[i]!;
        D[n + i] = h * f0[i]!;
      }
      st.hCur = h;
      started = true;
    } else if (h !== st.hCur) {
      rescaleDifferences(D, n, k, h / st.hCur, work);
      st.hCur = h;
      nEqual = 0;
      luValid = false;
    }
    if (needJac) {
      if (!jacSrc.analytic) {
        f(t, y, fy);
        counts.nfev++;
      }
      jacSrc.evaluate(t, y, fy);
      needJac = false;
      jacCurrent = true;
      luValid = false;
    }
    const c = h / GAMMA[k]!;
    if (!luValid) {
      counts.nlu++;
      if (!M.factor(1, c)) {
        if (!jacCurrent) needJac = true;
        return propose(proposal, false, 0.5 * h);
      }
      luValid = true;
    }
    // Predictor and the history term psi = sum_{j=1..k} gamma_j D_j / gamma_k.
    for (let i = 0; i < n; i++) {
      let p = 0;
      let s = 0;
      for (let j = 0; j <= k; j++) p += D[j * n + i]!;
      for (let j = 1; j <= k; j++) s += GAMMA[j]! * D[j * n + i]!;
      yPred[i] = p;
      psi[i] = s / GAMMA[k]!;
      ycur[i] = p;
      dcor[i] = 0;
      w[i] = 1 / (atol[i]! + rtol * Math.abs(p));
    }
    if (!newtonSolve(t, h)) {
      st.eta = 1;
      if (!jacCurrent) {
        needJac = true;
        return propose(proposal, false, h);
      }
      return propose(proposal, false, 0.5 * h);
    }
    inverseScales(y, ycur, rtol, atol, w, n);
    const err = norm(dcor) / (k + 1);
    st.err = err;
    if (!(err <= 1)) {
      const factor = Number.isFinite(err) ? Math.max(MIN_FACTOR, newtonSafety() * err ** (-1 / (k + 1))) : MIN_FACTOR;
      return propose(proposal, false, h * factor);
    }
    return accept(h);
  }

  return { y, f0, proposal, attempt } satisfies Stepper & { f0: Float64Array };
}

export const bdfVariable: Method = {
  id: 'bdf-variable',
  name: 'Variable-order BDF 1-5 (Shampine-Reichelt quasi-constant step)',
  family: 'implicit',
  order: 5,
  embeddedOrder: 5,
  source:
    'L. F. Shampine, M. W. Reichelt, The MATLAB ODE Suite, SIAM J. Sci. Comput. 18 (1997) 1-22, sec. 2 (BDF, kappa = 0)',
  adaptive: true,
  stiff: true,
  notes:
    'Orders 1 to 5 (order is the maximum). Error estimated from the corrector-predictor difference. ' +
    'Jacobian kept until Newton fails; LU redone when h or the order changes. Newton failures count as rejected steps.',
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    return solveAdaptive(problem, setting, options, 'bdf-variable', 1, createStepper);
  },
};
