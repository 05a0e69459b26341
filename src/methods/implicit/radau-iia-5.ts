// Radau IIA of order 5 (3 stages), adaptive.
// E. Hairer & G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996,
// sec. IV.8: simplified Newton on the stage system transformed by T into one real and one
// complex linear system (eq. (8.14)-(8.15)), starting values from the previous collocation
// polynomial (8.16), convergence-rate monitoring with theta and eta (8.10)-(8.13), embedded
// error estimate (8.19)-(8.20) with its second, filtered evaluation on first and rejected steps,
// and the predictive step-size controller of Gustafsson (8.25).
import { makeJacobianSource } from '../../core/jacobian.js';
import { jacobianStructure } from '../../core/jacobian-structure.js';
import { ComplexIterationMatrix, RealIterationMatrix } from './iteration-matrix.js';
import { scaledRmsNorm } from '../../core/vector.js';
import type { Counts, Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { EPS, powInt, propose, solveAdaptive, type Stepper, type StepperFactory, type Tolerances } from './common.js';
import type { WorkLease } from '../work-lease.js';
import { RADAU5_C, RADAU5_TRANSFORM } from './radau-iia-5-tableau.js';
import { RADAU_UNROLL_MAX_N, RIO_ALPHN, RIO_BETAN, RIO_DYNO, RIO_ERR, RIO_FAC1, RIO_H, RIO_LENGTH, RIO_RATIO, RIO_RTOL, RIO_T, radauKernels } from './radau-kernel.js';

/** Step-size safety factor and the bounds on h_new / h (1/FACL .. 1/FACR). */
const SAFE = 0.9;
const FACL = 5;
const FACR = 1 / 8;
/** Most Newton iterations per step. */
const NIT = 7;
/** Jacobian is kept when the Newton contraction theta stays below this. */
const THET = 0.001;
/** LU is kept (and h frozen) when h_new / h falls in [QUOT1, QUOT2] and the Jacobian is kept. */
const QUOT1 = 1;
const QUOT2 = 1.2;
/**
 * Newton stopping constant: iterate until eta * ||dW|| <= KAPPA in tolerance units, sec. IV.8
 * eq. (8.12), which suggests kappa between 1e-2 and 1e-1. The authors' code tightens it as rtol
 * falls; what that would cost and buy here is in bench/README.md and DEVELOPERS.md ("Open decisions").
 */
const KAPPA = 0.03;
/** Factor of the tolerance transformation rtol' = TOL_FACTOR * rtol^(2/3). */
const TOL_FACTOR = 0.1;
/** Step factor after a Newton failure. */
const NEWTON_FAIL_FACTOR = 0.5;

// Glossary. The names above and the step's state keep the spelling of the authors' Fortran code
// RADAU5, so the two can be read side by side:
//   FACL, FACR   bounds on quot = h / h_new (h_new stays within h / FACL .. h / FACR)
//   NIT          most Newton iterations per step
//   THET         keep the Jacobian when the Newton contraction rate theta stays below this
//   QUOT1, QUOT2 keep the LU decomposition (and h) when h_new / h falls in [QUOT1, QUOT2]
//   fnewt        Newton stopping tolerance, kappa of eq. (8.12)
//   faccon       eta of eq. (8.10), theta / (1 - theta), carried from step to step
//   dyno, dynold norm of the Newton increment now and at the previous iteration
//   thq, thqold  their ratio (the contraction estimate) now and before
//   hacc, erracc step size and error of the last accepted step (Gustafsson's predictor, (8.25))
//   facgus       Gustafsson's predictive step factor
//   quot         h / h_new proposed by the error estimate
//   hLU          the step size the current LU decomposition was made for
const C1 = RADAU5_C[0]!;
const C2 = RADAU5_C[1]!;
const { gamma: GAM, alpha: ALPH, beta: BETA, t: T, tinv: TI, d: D } = RADAU5_TRANSFORM;

/**
 * The authors' tolerance transformation (their code RADAU5, described with sec. IV.8): the
 * order-3 estimate controls an order-5 solution, so the requested rtol is mapped to
 * 0.1 rtol^(2/3) and atol keeps its ratio to rtol.
 */
export function radauRtol(rtol: number): number {
  return TOL_FACTOR * rtol ** (2 / 3);
}

function radauTolerances(tol: Tolerances): Tolerances {
  const rtol = radauRtol(tol.rtol);
  return { rtol, atol: tol.atol.map((a) => (a * rtol) / tol.rtol) };
}

function buildStepper(problem: Problem, tol: Tolerances, counts: Counts, lease: WorkLease, writtenOut: boolean) {
  const { rtol, atol } = tol;
  const n = problem.dimension;
  const proposal = lease.float64(1);
  // Scalars carried across steps live in fields, not closure variables: V8 boxes every double
  // written to a closure variable, which would allocate on each step.
  const st = { hLU: NaN, hOld: 0, faccon: 1, theta: THET, hacc: 0, erracc: 0, hFail: NaN, newt: 0, err: 0, quot: 1 };
  const f = problem.f;
  const y = lease.copyOf(problem.y0);
  const f0 = lease.float64(n);
  const z1 = lease.float64(n), z2 = lease.float64(n), z3 = lease.float64(n);
  const w1 = lease.float64(n), w2 = lease.float64(n), w3 = lease.float64(n);
  const g1 = lease.float64(n), g2 = lease.float64(n), g3 = lease.float64(n);
  const ytmp = lease.float64(n), ftmp = lease.float64(n);
  const cont1 = lease.float64(n), cont2 = lease.float64(n), cont3 = lease.float64(n);
  const scal = lease.float64(n);
  const yEnd = lease.float64(n);
  const jacSrc = makeJacobianSource(f, problem.jacobian, n, counts, (length) => lease.float64(length), jacobianStructure(problem, n));
  const e1 = new RealIterationMatrix(jacSrc, n, lease);
  const e2 = new ComplexIterationMatrix(jacSrc, n, lease);
  // A small dense system iterates in written-out code (radau-kernel.ts), bitwise the loops below.
  const kernels = writtenOut && n <= RADAU_UNROLL_MAX_N && e1.smallDense && e2.smallDense ? radauKernels(n) : null;
  const io = lease.float64(RIO_LENGTH);
  io[RIO_RTOL] = rtol;
  const fnewt = Math.max((10 * EPS) / rtol, KAPPA);
  const cfac = SAFE * (1 + 2 * NIT);

  let needJac = true;
  let jacCurrent = false;
  let first = true;
  let reject = false;
  let havePoly = false;

  f(problem.t0, y, f0);
  counts.nfev++;

  function factor(h: number): boolean {
    const fac1 = GAM / h;
    const alphn = ALPH / h;
    const betan = BETA / h;
    counts.nlu++;
    st.hLU = NaN;
    if (!e1.factor(fac1, 1)) return false;
    if (!e2.factor(alphn, betan)) return false;
    st.hLU = h;
    return true;
  }

  /** The step's error norm, scaled by y and the step's end y + z3 (yEnd, set by estimateError). */
  const errorNorm = (v: Float64Array): number => Math.max(scaledRmsNorm(v, y, yEnd, rtol, atol, n), 1e-10);

  // The attempt is split into its phases, each its own function: V8 compiles a function again
  // whenever it meets a branch or a right-hand side it had not seen when it first compiled it,
  // which each new problem brings, so only the phase that met something new is compiled again,
  // not one large function with the model inlined five times (bench/README.md). Computed doubles
  // pass between phases in `st`, not as arguments or return values: a double crossing a call
  // that V8 does not inline is boxed, an allocation per step.

  /** Newton starting values from the previous step's collocation polynomial, else zero. */
  function startValues(h: number): void {
    if (first || !havePoly) {
      z1.fill(0); z2.fill(0); z3.fill(0);
      w1.fill(0); w2.fill(0); w3.fill(0);
      return;
    }
    const r = h / st.hOld;
    if (kernels !== null) {
      io[RIO_RATIO] = r;
      kernels.start(io, cont1, cont2, cont3, z1, z2, z3, w1, w2, w3);
      return;
    }
    const s1 = 1 + C1 * r, s2 = 1 + C2 * r, s3 = 1 + r;
    for (let i = 0; i < n; i++) {
      const a1 = cont1[i]!, a2 = cont2[i]!, a3 = cont3[i]!;
      const v1 = (s1 - 1) * (a1 + (s1 - C2) * (a2 + (s1 - C1) * a3));
      const v2 = (s2 - 1) * (a1 + (s2 - C2) * (a2 + (s2 - C1) * a3));
      const v3 = (s3 - 1) * (a1 + (s3 - C2) * (a2 + (s3 - C1) * a3));
      z1[i] = v1; z2[i] = v2; z3[i] = v3;
      w1[i] = TI[0]! * v1 + TI[1]! * v2 + TI[2]! * v3;
      w2[i] = TI[3]! * v1 + TI[4]! * v2 + TI[5]! * v3;
      w3[i] = TI[6]! * v1 + TI[7]! * v2 + TI[8]! * v3;
    }
  }

  /**
   * One iteration's stage evaluations, transformed right-hand sides (T^{-1} F) - (Lambda/h) W and
   * solves, in place in g1..g3; the increment's scaled RMS norm into io[RIO_DYNO]. Its inputs
   * come in io too, like the written-out kernel's.
   */
  function iterateLooped(): void {
    const t = io[RIO_T]!, h = io[RIO_H]!, fac1 = io[RIO_FAC1]!, alphn = io[RIO_ALPHN]!, betan = io[RIO_BETAN]!;
    for (let i = 0; i < n; i++) ytmp[i] = y[i]! + z1[i]!;
    f(t + C1 * h, ytmp, g1);
    for (let i = 0; i < n; i++) ytmp[i] = y[i]! + z2[i]!;
    f(t + C2 * h, ytmp, g2);
    for (let i = 0; i < n; i++) ytmp[i] = y[i]! + z3[i]!;
    f(t + h, ytmp, g3);
    counts.nfev += 3;
    for (let i = 0; i < n; i++) {
      const a1 = g1[i]!, a2 = g2[i]!, a3 = g3[i]!;
      const x1 = TI[0]! * a1 + TI[1]! * a2 + TI[2]! * a3;
      const x2 = TI[3]! * a1 + TI[4]! * a2 + TI[5]! * a3;
      const x3 = TI[6]! * a1 + TI[7]! * a2 + TI[8]! * a3;
      g1[i] = x1 - fac1 * w1[i]!;
      g2[i] = x2 - alphn * w2[i]! + betan * w3[i]!;
      g3[i] = x3 - betan * w2[i]! - alphn * w3[i]!;
    }
    e1.solve(g1);
    e2.solve(g2, g3);
    let s = 0;
    for (let i = 0; i < n; i++) {
      const q = 1 / scal[i]!;
      const a = g1[i]! * q, b = g2[i]! * q, c = g3[i]! * q;
      s += a * a + b * b + c * c;
    }
    io[RIO_DYNO] = Math.sqrt(s / (3 * n));
  }

  /** w += increments, z = T w. */
  function updateLooped(): void {
    for (let i = 0; i < n; i++) {
      const a1 = (w1[i] = w1[i]! + g1[i]!);
      const a2 = (w2[i] = w2[i]! + g2[i]!);
      const a3 = (w3[i] = w3[i]! + g3[i]!);
      z1[i] = T[0]! * a1 + T[1]! * a2 + T[2]! * a3;
      z2[i] = T[3]! * a1 + T[4]! * a2 + T[5]! * a3;
      z3[i] = T[6]! * a1 + T[7]! * a2 + T[8]! * a3;
    }
  }

  /**
   * Simplified Newton iteration on the transformed stage system. True when it converged, with
   * the iteration count in st.newt; else the step size to retry with in st.hFail.
   */
  function newtonSolve(t: number, h: number): boolean {
    const fac1 = GAM / h, alphn = ALPH / h, betan = BETA / h;
    st.faccon = Math.max(st.faccon, EPS) ** 0.8;
    st.theta = THET;
    let newt = 0;
    let dynold = 0;
    let thqold = 0;
    st.hFail = h * NEWTON_FAIL_FACTOR;
    io[RIO_T] = t;
    io[RIO_H] = h;
    io[RIO_FAC1] = fac1;
    io[RIO_ALPHN] = alphn;
    io[RIO_BETAN] = betan;
    while (true) {
      if (newt >= NIT) return false;
      if (kernels !== null) {
        kernels.iterate(f, io, y, z1, z2, z3, w1, w2, w3, g1, g2, g3, ytmp, scal, e1.m, e1.piv, e2.mr, e2.mi, e2.piv);
        counts.nfev += 3;
      } else {
        iterateLooped();
      }
      const dyno = io[RIO_DYNO]!;
      if (!Number.isFinite(dyno)) return false;
      if (newt >= 1) {
        const thq = dyno / dynold;
        st.theta = newt === 1 ? thq : Math.sqrt(thq * thqold);
        thqold = thq;
        if (st.theta < 0.99) {
          st.faccon = st.theta / (1 - st.theta);
          const dyth = (st.faccon * dyno * powInt(st.theta, NIT - 1 - newt)) / fnewt;
          if (dyth >= 1) {
            // Convergence predicted too slow: shrink h by the factor that would make it fit.
            const qnewt = Math.max(1e-4, Math.min(20, dyth));
            st.hFail = h * 0.8 * qnewt ** (-1 / (4 + NIT - 1 - newt));
            return false;
          }
        } else {
          return false;
        }
      }
      dynold = Math.max(dyno, EPS);
      if (kernels !== null) kernels.update(z1, z2, z3, w1, w2, w3, g1, g2, g3);
      else updateLooped();
      newt++;
      if (st.faccon * dyno <= fnewt) {
        st.newt = newt;
        return true;
      }
    }
  }

  /** Embedded error estimate into st.err: (gamma/h I - J)^{-1} (f0 + sum d_j z_j / h), filtered once more on first and rejected steps. */
  function estimateError(t: number, h: number): void {
    let err: number;
    if (kernels !== null) {
      io[RIO_H] = h;
      kernels.estimate(io, y, f0, z1, z2, z3, g1, ftmp, yEnd, atol, e1.m, e1.piv);
      err = Math.max(io[RIO_ERR]!, 1e-10);
    } else {
      const dz1 = D[0]! / h, dz2 = D[1]! / h, dz3 = D[2]! / h;
      for (let i = 0; i < n; i++) {
        const c = dz1 * z1[i]! + dz2 * z2[i]! + dz3 * z3[i]!;
        ftmp[i] = c; // kept for the filtered second estimate
        g1[i] = f0[i]! + c;
        yEnd[i] = y[i]! + z3[i]!;
      }
      e1.solve(g1);
      err = errorNorm(g1);
    }
    if (err >= 1 && (first || reject)) {
      for (let i = 0; i < n; i++) ytmp[i] = y[i]! + g1[i]!;
      f(t, ytmp, g2);
      counts.nfev++;
      for (let i = 0; i < n; i++) g2[i] = g2[i]! + ftmp[i]!;
      e1.solve(g2);
      err = errorNorm(g2);
    }
    st.err = err;
  }

  /** Takes the step (error st.err <= 1, h_new = h / st.quot proposed): new state, collocation polynomial, next h. */
  function accept(t: number, h: number): boolean {
    const err = st.err;
    let quot = st.quot;
    let hnew = h / quot;
    if (!first && st.hacc > 0) {
      let facgus = ((st.hacc / h) * (err * err / st.erracc) ** 0.25) / SAFE;
      facgus = Math.max(FACR, Math.min(FACL, facgus));
      quot = Math.max(quot, facgus);
      hnew = h / quot;
    }
    st.hacc = h;
    st.erracc = Math.max(1e-2, err);
    first = false;
    // Divided differences of the collocation polynomial on nodes 1, c2, c1, 0 (values z3, z2, z1, 0).
    for (let i = 0; i < n; i++) {
      const a = z1[i]!, b = z2[i]!, c = z3[i]!;
      const d1 = (b - c) / (C2 - 1);
      const ak = (a - b) / (C1 - C2);
      const acont3 = a / C1;
      const d2 = (ak - d1) / (C1 - 1);
      const ak2 = (ak - acont3) / C2; // [c2, c1, 0]
      const d3 = (ak2 - d2) / (0 - 1);
      cont1[i] = d1;
      cont2[i] = d2;
      cont3[i] = d3;
      y[i] = y[i]! + c;
    }
    havePoly = true;
    st.hOld = h;
    f(t + h, y, f0);
    counts.nfev++;
    if (reject) hnew = Math.min(hnew, h);
    reject = false;
    jacCurrent = false;
    const qt = hnew / h;
    if (st.theta <= THET && qt >= QUOT1 && qt <= QUOT2) {
      // Keep both the Jacobian and the factorization: h stays as it is.
      return propose(proposal, true, h);
    }
    if (st.theta > THET) needJac = true;
    return propose(proposal, true, hnew);
  }

  /** A rejected attempt: the Jacobian is refreshed unless it is current, and hNext is proposed. */
  function retryWith(hNext: number): boolean {
    reject = true;
    if (!jacCurrent) needJac = true;
    return propose(proposal, false, hNext);
  }

  function attempt(t: number, h: number): boolean {
    if (needJac) {
      jacSrc.evaluate(t, y, f0);
      needJac = false;
      jacCurrent = true;
      st.hLU = NaN;
    }
    if (h !== st.hLU && !factor(h)) {
      // Singular iteration matrix: a smaller h moves it away from singularity of J - (gamma/h) I.
      return retryWith(h * NEWTON_FAIL_FACTOR);
    }
    startValues(h);
    for (let i = 0; i < n; i++) scal[i] = atol[i]! + rtol * Math.abs(y[i]!);
    if (!newtonSolve(t, h)) return retryWith(st.hFail);
    estimateError(t, h);
    const err = st.err;
    const fac = Math.min(SAFE, cfac / (st.newt + 2 * NIT));
    const quot = Math.max(FACR, Math.min(FACL, err ** 0.25 / fac));
    if (!(err < 1)) return retryWith(first ? h * 0.1 : h / quot);
    st.quot = quot;
    return accept(t, h);
  }

  return { y, f0, proposal, attempt } satisfies Stepper & { f0: Float64Array };
}

/**
 * The stepper factory; `writtenOut` false keeps the loops on small dense systems too (the
 * reference the written-out iteration is tested against).
 */
export function radauStepper(writtenOut: boolean): StepperFactory {
  return (problem, tol, counts, lease) => buildStepper(problem, tol, counts, lease, writtenOut);
}

// The name `solve` below passes: its text is part of the method's sha256, which baselines compare.
const createStepper = radauStepper(true);

export const radauIIA5: Method = {
  id: 'radau-iia-5',
  name: 'Radau IIA 5 (Hairer-Wanner)',
  family: 'implicit',
  order: 5,
  embeddedOrder: 3,
  source: 'E. Hairer, G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, sec. IV.8',
  adaptive: true,
  stiff: true,
  notes:
    'Simplified Newton on the T-transformed stage system (one real, one complex LU per factorization, counted as 1 nlu). ' +
    "Newton failures count as rejected steps. Tolerances are transformed as in the authors' code: rtol' = 0.1 rtol^(2/3), atol' = atol rtol'/rtol.",
  effectiveRtol: radauRtol,
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    return solveAdaptive(problem, setting, options, 'radau-iia-5', 5, createStepper, radauTolerances);
  },
};
