// Plumbing shared by the implicit integrators: the adaptive step driver
// (check times, step limit, deadline, underflow, observer) and the starting step heuristic.
// Each integrator supplies only its step attempt; the driver owns the bookkeeping so that every
// method honours SolveOptions the same way.
import { adaptiveTolerances } from '../../core/setting.js';
import { checkOptions, checkProblem } from '../rules.js';
import { startingStep } from '../starting-step.js';
import type { Counts, Problem, Setting, SolveOptions, SolveResult, Status } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { allFinite } from '../../core/vector.js';
import { budgetStop } from '../budget.js';
import { withLease, type WorkLease } from '../work-lease.js';
import { stopTimes } from '../stop-times.js';

const EPS = 2.220446049250313e-16;

export interface Tolerances {
  readonly rtol: number;
  readonly atol: Float64Array;
}

/**
 * x to a small non-negative integer power by repeated multiplication. The Newton convergence
 * tests raise the contraction rate to the iterations left; `**` calls the general power routine,
 * about 30 ns against 5 for the products, and it runs once per iteration.
 */
export function powInt(x: number, k: number): number {
  let p = 1;
  for (let q = 0; q < k; q++) p *= x;
  return p;
}

/**
 * Relative width of the band around a threshold inside which a power-free test defers to the
 * power itself (see dampedTimesWithin; trapezoidal-bdf2's acceptedFactor uses it too).
 */
export const DECIDE_BAND = 1e-12;
/** Range in which the power-free test's products are normal numbers. */
const POW_RANGE_LO = 1e-280;
const POW_RANGE_HI = 1e280;

/**
 * The first Newton iteration's stopping test with RADAU5's carried contraction estimate,
 * max(eta, eps)^0.8 * dy <= tol (Hairer & Wanner, Solving ODEs II, sec. IV.8), decided as the
 * floating-point expression `base ** 0.8 * dy <= tol` decides it, base = max(eta, eps). In exact
 * arithmetic the test is base^4 <= (tol/dy)^5, which takes products only; the general power
 * routine it avoids was a quarter of trapezoidal-bdf2's time. The products carry a relative
 * error of about 1e-15, so outside a band of DECIDE_BAND around equality both forms agree;
 * inside it, and where the powers would leave the normal range, the original expression decides.
 * Same decisions, bit for bit, so counts do not move. The damped value itself is needed only when
 * the first iteration converges: later iterations replace it, and a failed solve resets it.
 */
export function dampedTimesWithin(base: number, dy: number, tol: number): boolean {
  const r = tol / dy;
  const lhs = base * base * base * base;
  const rhs = r * r * r * r * r;
  if (rhs > POW_RANGE_LO && rhs < POW_RANGE_HI && lhs < POW_RANGE_HI) {
    if (lhs <= rhs * (1 - DECIDE_BAND)) return true;
    if (lhs >= rhs * (1 + DECIDE_BAND)) return false;
  }
  return base ** 0.8 * dy <= tol;
}

/**
 * How an attempt reports back: accepted or not as its return value, the step size proposed for
 * the next attempt (after acceptance, or for the retry) in `proposal[0]`. A buffer, not a
 * returned object, so the step loop allocates nothing.
 */
export function propose(proposal: Float64Array, accepted: boolean, hNext: number): boolean {
  proposal[0] = hNext;
  return accepted;
}

/**
 * A one-step or multistep integrator as the driver sees it: `attempt` tries to advance the state
 * held in `y` from t by h; on acceptance y holds the new state, otherwise y is unchanged.
 */
export interface Stepper {
  readonly y: Float64Array;
  /** proposal[0]: the step size the last attempt proposes (see `propose`). */
  readonly proposal: Float64Array;
  attempt(t: number, h: number): boolean;
}

/** Stop a stretch of h this close to a stop (relative), so no sliver step is left over. */
const LANDING_STRETCH = 1.01;

/** A closure over the loop's t would box every new t on the heap, so this one takes it as an argument. */
function finished(status: Status, t: number, y: Float64Array, counts: Counts, message?: string): SolveResult {
  const r: SolveResult = { status, tFinal: t, yFinal: Float64Array.from(y), counts };
  if (message !== undefined) r.message = message;
  return r;
}

/**
 * Run an adaptive stepper from problem.t0 to problem.tEnd with step h0. Honours maxSteps
 * (accepted + rejected attempts), observer, checkTimes (landing exactly, resuming with the step
 * proposed before the landing), deadline, step underflow and non-finite states.
 */
export function drive(problem: Problem, options: SolveOptions, stepper: Stepper, h0: number, counts: Counts, methodId: string): SolveResult {
  const n = problem.dimension;
  const y = stepper.y;
  const stops = stopTimes(options.checkTimes, problem.t0, problem.tEnd, methodId);
  const observer = options.observer;
  const deadline = options.deadline;
  const maxSteps = options.maxSteps;
  const maxStep = options.maxStep ?? Infinity;
  let t = problem.t0;
  let h = h0;
  let stopIdx = 0;
  const proposal = stepper.proposal;
  observer?.(t, y);
  while (stopIdx < stops.length) {
    const stop = stops[stopIdx]!;
    const budget = budgetStop(counts.accepted + counts.rejected, maxSteps, deadline, t);
    if (budget !== null) return finished(budget.status, t, y, counts, budget.message);
    if (!(h > 0) || !Number.isFinite(h)) return finished('step-underflow', t, y, counts, `step size became ${h} at t=${t}`);
    let hTry = h > maxStep ? maxStep : h;
    let landing = false;
    if (t + LANDING_STRETCH * hTry >= stop) {
      hTry = stop - t;
      landing = true;
    }
    const hMin = 16 * EPS * Math.max(Math.abs(t), 1e-300);
    if (hTry < hMin) return finished('step-underflow', t, y, counts, `step size ${hTry} below ${hMin} at t=${t}`);
    const accepted = stepper.attempt(t, hTry);
    const hNext = proposal[0]!;
    if (!accepted) {
      counts.rejected++;
      h = Math.min(hNext, hTry);
      continue;
    }
    counts.accepted++;
    if (landing) {
      t = stop;
      stopIdx++;
      // The landing step was cut short by the stop, not by accuracy: resume with the larger of
      // the step proposed before the cut and the one the controller proposes now.
      h = Math.max(hNext, h);
    } else {
      t = t + hTry;
      h = hNext;
    }
    if (!allFinite(y, n)) return finished('diverged', t, y, counts, `non-finite state at t=${t}`);
    observer?.(t, y);
  }
  return finished('ok', t, y, counts);
}

/** What an adaptive implicit method builds once per solve; `drive` steps it. */
export type StepperFactory = (problem: Problem, tol: Tolerances, counts: Counts, lease: WorkLease) => Stepper & { f0: Float64Array };

/**
 * The whole adaptive solve of a stepper-based method: validate, build the stepper, choose the
 * starting step for the method's order, drive it to tEnd. A method that controls a different
 * tolerance than the one requested (see radau-iia-5, trapezoidal-bdf2) passes its map; the
 * stepper and the starting step both see the mapped tolerances.
 */
export function solveAdaptive(
  problem: Problem,
  setting: Setting,
  options: SolveOptions,
  methodId: string,
  order: number,
  createStepper: StepperFactory,
  mapTolerances?: (requested: Tolerances) => Tolerances,
): SolveResult {
  checkProblem(problem, methodId);
  checkOptions(options, methodId);
  const requested = adaptiveTolerances(setting, problem.dimension, methodId, { rtolMayBeZero: false });
  const tol = mapTolerances ? mapTolerances(requested) : requested;
  const counts = zeroCounts();
  const n = problem.dimension;
  // The stepper's buffers come from a lease kept per method and state size (work-lease.ts).
  return withLease(createStepper, n, (lease) => {
    const stepper = createStepper(problem, tol, counts, lease);
    const h0 = options.initialStep ?? firstStep(problem, stepper.y, stepper.f0, order, tol, counts, lease.float64(n), lease.float64(n));
    return drive(problem, options, stepper, h0, counts, methodId);
  });
}

/** The shared starting step (methods/starting-step.ts), its probe evaluation counted. */
function firstStep(problem: Problem, y0: Float64Array, f0: Float64Array, order: number, tol: Tolerances, counts: Counts, yWork: Float64Array, fWork: Float64Array): number {
  counts.nfev++;
  return startingStep({
    f: problem.f,
    t0: problem.t0,
    y0,
    f0,
    order,
    rtol: tol.rtol,
    atol: tol.atol,
    span: problem.tEnd - problem.t0,
    n: problem.dimension,
    arithmetic: 'reciprocal',
    y1: yWork,
    f1: fWork,
  });
}

export { zeroCounts, EPS };
