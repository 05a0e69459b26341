// RODAS4: stiffly accurate, L-stable Rosenbrock method of order 4 with embedded order 3, 6 stages.
// E. Hairer & G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996,
// sec. IV.7 (method RODAS; coefficients as distributed with the authors' code RODAS), in the transformed
// form (7.25)-(7.26) with u_i = sum_j gamma_ij k_j:
//   (1/(h gamma) I - J) u_i = f(t + alpha_i h, y + sum_{j<i} a_ij u_j) + sum_{j<i} c_ij u_j / h
//                             + gamma_i h df/dt,
//   y1 = y + sum m_i u_i, error estimate u_6.
// df/dt is taken by a forward difference (one f evaluation per step, counted) since problems do
// not declare whether they are autonomous.
import { makeJacobianSource, usefulBand } from '../../core/jacobian.js';
import { RealIterationMatrix } from './iteration-matrix.js';
import { scaledRmsNorm } from '../../core/vector.js';
import type { Counts, Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { EPS, solveAdaptive, propose, type Stepper, type Tolerances } from './common.js';
import type { WorkLease } from '../work-lease.js';

/** Coefficients of RODAS4 (Hairer & Wanner 1996, sec. IV.7), transformed form. */
export const RODAS4 = {
  gamma: 0.25,
  alpha: [0, 0.386, 0.21, 0.63, 1, 1],
  gammaSum: [0.25, -0.1043, 0.1035, -0.0362, 0, 0],
  /** a_ij, j < i, row by row. */
  a: [
    [],
    [1.544],
    [0.9466785280815826, 0.2557011698983284],
    [3.314825187068521, 2.896124015972201, 0.9986419139977817],
    [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895],
    [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1],
  ] as number[][],
  /** c_ij, j < i, row by row. */
  c: [
    [],
    [-5.6688],
    [-2.430093356833875, -0.2063599157091915],
    [-0.1073529058151375, -9.594562251023355, -20.47028614809616],
    [7.496443313967647, -10.24680431464352, -33.99990352819905, 11.7089089320616],
    [8.083246795921522, -7.981132988064893, -31.52159432874371, 16.31930543123136, -6.058818238834054],
  ] as number[][],
  m: [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1, 1],
  /** Error estimate is u_6. */
  e: [0, 0, 0, 0, 0, 1],
};

const STAGES = 6;
const SAFE = 0.9;
/** h_new / h stays within [1/FAC_DOWN, FAC_UP]. */
const FAC_DOWN = 5;
const FAC_UP = 6;

function createStepper(problem: Problem, tol: Tolerances, counts: Counts, lease: WorkLease) {
  const n = problem.dimension;
  const proposal = lease.float64(1);
  // Scalars carried across steps live in fields, not closure variables: V8 boxes every double
  // written to a closure variable, which would allocate on each step.
  const st = { tLast: NaN };
  const f = problem.f;
  const { rtol, atol } = tol;
  const y = lease.copyOf(problem.y0);
  const f0 = lease.float64(n);
  const ft = lease.float64(n);
  const u: Float64Array[] = [];
  for (let s = 0; s < STAGES; s++) u.push(lease.float64(n));
  const ytmp = lease.float64(n), ftmp = lease.float64(n), ynew = lease.float64(n);
  const jacSrc = makeJacobianSource(f, problem.jacobian, n, counts, (length) => lease.float64(length), usefulBand(problem.jacobianBand, n));
  const M = new RealIterationMatrix(jacSrc, n, lease);
  const { gamma, alpha, gammaSum, a, c, m } = RODAS4;
  let f0Valid = false;
  let jacValid = false;
  let reject = false;

  f(problem.t0, y, f0);
  counts.nfev++;
  f0Valid = true;

  function attempt(t: number, h: number): boolean {
    if (!f0Valid) {
      f(t, y, f0);
      counts.nfev++;
      f0Valid = true;
    }
    if (!jacValid || t !== st.tLast) {
      jacSrc.evaluate(t, y, f0);
      // df/dt by a forward difference in t.
      const dt = Math.sqrt(EPS) * Math.max(1e-5, Math.abs(t));
      const tp = t + dt;
      f(tp, y, ftmp);
      counts.nfev++;
      const inv = 1 / (tp - t);
      for (let i = 0; i < n; i++) ft[i] = (ftmp[i]! - f0[i]!) * inv;
      jacValid = true;
      st.tLast = t;
    }
    const fac = 1 / (h * gamma);
    counts.nlu++;
    if (!M.factor(fac, 1)) {
      reject = true;
      return propose(proposal, false, 0.5 * h);
    }
    for (let s = 0; s < STAGES; s++) {
      const us = u[s]!;
      const as = a[s]!;
      const cs = c[s]!;
      if (s === 0) {
        for (let i = 0; i < n; i++) us[i] = f0[i]!;
      } else {
        for (let i = 0; i < n; i++) {
          let v = y[i]!;
          for (let j = 0; j < s; j++) v += as[j]! * u[j]![i]!;
          ytmp[i] = v;
        }
        f(t + alpha[s]! * h, ytmp, us);
        counts.nfev++;
      }
      const gh = gammaSum[s]! * h;
      for (let i = 0; i < n; i++) {
        let v = us[i]! + gh * ft[i]!;
        for (let j = 0; j < s; j++) v += (cs[j]! / h) * u[j]![i]!;
        us[i] = v;
      }
      M.solve(us);
    }
    for (let i = 0; i < n; i++) {
      let v = y[i]!;
      for (let j = 0; j < STAGES; j++) v += m[j]! * u[j]![i]!;
      ynew[i] = v;
    }
    const err = scaledRmsNorm(u[STAGES - 1]!, y, ynew, rtol, atol, n);
    const quot = Number.isFinite(err) ? Math.max(1 / FAC_UP, Math.min(FAC_DOWN, err ** 0.25 / SAFE)) : FAC_DOWN;
    let hnew = h / quot;
    if (!(err <= 1)) {
      reject = true;
      return propose(proposal, false, hnew);
    }
    if (reject) hnew = Math.min(hnew, h);
    reject = false;
    y.set(ynew);
    f0Valid = false;
    jacValid = false;
    return propose(proposal, true, hnew);
  }

  return { y, f0, proposal, attempt } satisfies Stepper & { f0: Float64Array };
}

export const rodas4: Method = {
  id: 'hairer-wanner-rodas4',
  name: 'RODAS4 (Hairer-Wanner)',
  family: 'implicit',
  order: 4,
  embeddedOrder: 3,
  source: 'E. Hairer, G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, sec. IV.7 (RODAS)',
  adaptive: true,
  stiff: true,
  notes:
    'L-stable, stiffly accurate Rosenbrock 4(3), one Jacobian and one LU per attempt; ' +
    'df/dt by forward difference (1 f evaluation per step, counted in nfev).',
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    return solveAdaptive(problem, setting, options, 'hairer-wanner-rodas4', 4, createStepper);
  },
};
