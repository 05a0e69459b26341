// The adaptive Rosenbrock engine: one stepper for every Rosenbrock method given as data, in the
// transformed form of Hairer & Wanner, Solving ODEs II, 2nd ed., sec. IV.7, (7.25)-(7.26), with
// u_i = sum_j gamma_ij k_j:
//   (1/(h gamma) I - J) u_i = f(t + alpha_i h, y + sum_{j<i} a_ij u_j) + sum_{j<i} c_ij u_j / h
//                             + gamma_i h df/dt,
//   y1 = y + sum m_i u_i, error estimate sum e_i u_i.
// df/dt is taken by a forward difference (one f evaluation per step, counted) since problems do
// not declare whether they are autonomous. A method is its coefficients (RosenbrockData); small
// dense systems run stage code generated per method and state size (rosenbrock-kernel.ts), the
// rest the loops below, which do the same operations in the same order.
import { makeJacobianSource } from '../../core/jacobian.js';
import { jacobianStructure } from '../../core/jacobian-structure.js';
import { RealIterationMatrix } from './iteration-matrix.js';
import { scaledRmsNorm } from '../../core/vector.js';
import type { Counts, Problem } from '../../core/types.js';
import { EPS, propose, type Stepper, type StepperFactory, type Tolerances } from './common.js';
import type { WorkLease } from '../work-lease.js';
import { errorTerms, unitEstimateStage, type RosenbrockData } from './rosenbrock-data.js';
import { IO_ERR, IO_FAC, IO_H, IO_RTOL, IO_T, rosenbrockKernel, ROSENBROCK_UNROLL_MAX_N } from './rosenbrock-kernel.js';

const SAFE = 0.9;
/** h_new / h stays within [1/FAC_DOWN, FAC_UP]. */
const FAC_DOWN = 5;
const FAC_UP = 6;

/**
 * The stepper factory of one method (its own function, so its work buffers have their own lease).
 * `writtenOut: false` keeps small systems on the loops too (for the test comparing the two).
 */
export function rosenbrockStepper(data: RosenbrockData, name: string, writtenOut = true): StepperFactory {
  const stages = data.alpha.length;
  const kernels = rosenbrockKernel(data, name);
  const unit = unitEstimateStage(data.e);
  const eTerms = errorTerms(data.e);
  const { gamma, alpha, gammaSum, a, c, m, e, reuse, errorExponent } = data;

  return function createStepper(problem: Problem, tol: Tolerances, counts: Counts, lease: WorkLease) {
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
    for (let s = 0; s < stages; s++) u.push(lease.float64(n));
    const ytmp = lease.float64(n), ftmp = lease.float64(n), ynew = lease.float64(n), est = lease.float64(n);
    const io = lease.float64(8);
    const jacSrc = makeJacobianSource(f, problem.jacobian, n, counts, (length) => lease.float64(length), jacobianStructure(problem, n));
    const M = new RealIterationMatrix(jacSrc, n, lease);
    const kernel = writtenOut && jacSrc.band === null && !jacSrc.sparse && n <= ROSENBROCK_UNROLL_MAX_N ? kernels(n) : null;
    const stageCalls = reuse.filter((r, s) => s > 0 && !r).length;
    let f0Valid = false;
    let jacValid = false;
    let reject = false;

    f(problem.t0, y, f0);
    counts.nfev++;
    f0Valid = true;

    /** The stages, y1 into ynew and the error norm into io[IO_ERR]; false when M is singular. */
    function loopedStages(t: number, h: number, fac: number): boolean {
      counts.nlu++;
      if (!M.factor(fac, 1)) return false;
      for (let s = 0; s < stages; s++) {
        const us = u[s]!;
        const as = a[s]!;
        const cs = c[s]!;
        if (s === 0) {
          for (let i = 0; i < n; i++) us[i] = f0[i]!;
        } else {
          if (!reuse[s]) {
            for (let i = 0; i < n; i++) {
              let v = y[i]!;
              for (let j = 0; j < s; j++) v += as[j]! * u[j]![i]!;
              ytmp[i] = v;
            }
            f(t + alpha[s]! * h, ytmp, ftmp);
            counts.nfev++;
          }
          for (let i = 0; i < n; i++) us[i] = ftmp[i]!;
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
        for (let j = 0; j < stages; j++) v += m[j]! * u[j]![i]!;
        ynew[i] = v;
      }
      const ev = unit >= 0 ? u[unit]! : est;
      if (unit < 0) {
        // Zero weights are left out, as in the generated stage code.
        for (let i = 0; i < n; i++) {
          let v = e[eTerms[0]!]! * u[eTerms[0]!]![i]!;
          for (let k = 1; k < eTerms.length; k++) v += e[eTerms[k]!]! * u[eTerms[k]!]![i]!;
          ev[i] = v;
        }
      }
      io[IO_ERR] = scaledRmsNorm(ev, y, ynew, rtol, atol, n);
      return true;
    }

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
      let factored: boolean;
      if (kernel !== null) {
        io[IO_T] = t;
        io[IO_H] = h;
        io[IO_RTOL] = rtol;
        io[IO_FAC] = fac;
        counts.nlu++;
        factored = kernel(f, io, y, f0, ft, jacSrc.jac, ytmp, ftmp, ynew, atol);
        if (factored) counts.nfev += stageCalls;
      } else {
        factored = loopedStages(t, h, fac);
      }
      if (!factored) {
        reject = true;
        return propose(proposal, false, 0.5 * h);
      }
      const err = io[IO_ERR]!;
      const quot = Number.isFinite(err) ? Math.max(1 / FAC_UP, Math.min(FAC_DOWN, err ** errorExponent / SAFE)) : FAC_DOWN;
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
  };
}

