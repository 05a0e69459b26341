// The one engine for embedded explicit Runge-Kutta pairs: any compiled tableau with error weights.
// Error estimate in the scaled RMS norm (HNW I, sec. II.4), the propagated solution is whatever
// the tableau's b weights are (local extrapolation is a property of the data), FSAL reuse,
// standard or PI control, exact landing on check times and tEnd. The work buffers are kept between
// solves (../work-lease.ts); the step loop allocates nothing.
import type { Counts, Problem, Setting, SolveOptions, SolveResult, Status } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { allFinite } from '../../core/vector.js';
import {
  FAC_MAX,
  LANDING_STRETCH,
  NONFINITE_SHRINK,
  PI_ERR_FLOOR,
  UNDERFLOW_ULPS,
  piFactor,
  deadbandFactor,
  standardFactor,
} from './control.js';
import { startingStep } from '../starting-step.js';
import { finish } from '../finish.js';
import { genericStep } from './generic-step.js';
import { stopTimes } from '../stop-times.js';
import { budgetStop } from '../budget.js';
import { IO_ERR, IO_H, IO_NONFINITE, IO_RTOL, IO_SIZE, IO_T, IO_T_NEW, type StageKernel, type Tableau } from './tableau.js';
import { withLease, type WorkLease } from '../work-lease.js';
import { checkOptions, checkProblem } from '../rules.js';
import { adaptiveTolerances } from '../../core/setting.js';

export { COMBINED_ERR3_WEIGHT } from './control.js';

/** Keeps the underflow guard meaningful at t = 0. */
const TINY_T = 1e-300;

/**
 * Called after each accepted step, before the buffers move on: stage derivatives k (row-major,
 * stage i at k[i*n .. i*n+n)), the states at both ends. Read them, do not keep them.
 */
export type AcceptHook = (
  tOld: number,
  tNew: number,
  h: number,
  yOld: Float64Array,
  yNew: Float64Array,
  k: Float64Array,
  n: number,
) => void;

export function solveEmbedded(
  tab: Tableau,
  methodId: string,
  problem: Problem,
  setting: Setting,
  options: SolveOptions,
  onAccept?: AcceptHook,
): SolveResult {
  // One step function per solve: the method's generated kernel, or the generic sweep.
  const step = (n: number): StageKernel => (tab.kernel !== null ? tab.kernel(n) : genericStep(tab, n));
  return solveWithStep(tab, methodId, problem, setting, options, step, onAccept);
}

/**
 * What the adaptive loop needs to know of a pair: its stage count, FSAL, orders. The object also
 * keys the work buffers. The Runge-Kutta-Nystrom pairs bring their own step with such a shape.
 */
export type StepShape = Pick<Tableau, 'stages' | 'fsal' | 'order' | 'controlOrder'>;

/**
 * The adaptive loop around the step `makeStep` returns for this problem, made once the problem,
 * options and setting have passed their checks.
 */
export function solveWithStep(
  shape: StepShape,
  methodId: string,
  problem: Problem,
  setting: Setting,
  options: SolveOptions,
  makeStep: (n: number) => StageKernel,
  onAccept?: AcceptHook,
): SolveResult {
  checkProblem(problem, methodId);
  checkOptions(options, methodId);
  const n = problem.dimension;
  const { rtol, atol } = adaptiveTolerances(setting, n, methodId, { rtolMayBeZero: true });
  const stops = stopTimes(options.checkTimes, problem.t0, problem.tEnd, methodId);
  const step = makeStep(n);
  return withLease(shape, n, (lease) => stepAdaptively(lease, shape, problem, options, onAccept, step, rtol, atol, stops));
}

function stepAdaptively(
  lease: WorkLease,
  tab: StepShape,
  problem: Problem,
  options: SolveOptions,
  onAccept: AcceptHook | undefined,
  step: StageKernel,
  rtol: number,
  atol: Float64Array,
  stops: Float64Array,
): SolveResult {
  const n = problem.dimension;
  const t0 = problem.t0;
  const tEnd = problem.tEnd;
  const f = problem.f;
  const s = tab.stages;
  const fsal = tab.fsal;
  const last = s - 1;
  const kExp = tab.controlOrder + 1;
  const usePi = options.controller === 'pi';
  const useDeadband = options.controller === 'deadband';
  const observer = options.observer;
  const deadline = options.deadline;
  const maxSteps = options.maxSteps;
  const maxStep = options.maxStep ?? Infinity;
  const K = lease.float64(s * n);
  const kRow = lease.rows(K, s, n);
  let y = lease.copyOf(problem.y0);
  let yNew = lease.float64(n);
  const yStage = lease.float64(n);
  const io = lease.float64(IO_SIZE);
  io[IO_RTOL] = rtol;
  const counts: Counts = zeroCounts();

  let t = t0;
  f(t, y, kRow[0]!);
  counts.nfev++;
  if (!allFinite(y, n) || !allFinite(kRow[0]!, n)) {
    return finish('diverged', `y0 or f(t0, y0) is not finite at t=${t}`, t, y, counts);
  }
  let h: number;
  if (options.initialStep !== undefined) h = Math.min(options.initialStep, tEnd - t0);
  else {
    h = startingStep({ f, t0, y0: y, f0: kRow[0]!, order: tab.order, rtol, atol, span: tEnd - t0, n, arithmetic: 'divide', y1: yStage, f1: kRow[1 % s]! });
    counts.nfev++;
  }
  if (observer) observer(t, y);

  let stopIdx = 0;
  let stop = stops[0]!;
  let k0Fresh = true;
  let lastRejected = false;
  let lastNonFinite = false;
  let errPrev = 1;
  // Read t and h back through the typed buffer: their first values come from an object property
  // and a call, and V8 otherwise keeps them boxed, allocating a heap number per step.
  io[IO_T] = t;
  io[IO_H] = h;
  t = io[IO_T]!;
  h = io[IO_H]!;
  let status: Status = 'ok';
  let message: string | undefined;

  for (;;) {
    const attempts = counts.accepted + counts.rejected;
    const budget = budgetStop(attempts, maxSteps, deadline, t);
    if (budget !== null) {
      status = budget.status;
      message = budget.message;
      break;
    }
    const at = t < 0 ? -t : t;
    if (!(h >= UNDERFLOW_ULPS * Number.EPSILON * (at > TINY_T ? at : TINY_T))) {
      status = lastNonFinite ? 'diverged' : 'step-underflow';
      message = lastNonFinite
        ? `non-finite state or error persists down to step ${h} at t=${t}`
        : `step ${h} too small at t=${t}`;
      break;
    }
    let hs = h > maxStep ? maxStep : h;
    let clipped = false;
    if (t + hs * LANDING_STRETCH >= stop) {
      hs = stop - t;
      clipped = true;
    }
    const tNew = clipped ? stop : t + hs;

    if (!k0Fresh) {
      f(t, y, kRow[0]!);
      counts.nfev++;
      k0Fresh = true;
      if (!allFinite(kRow[0]!, n)) {
        status = 'diverged';
        message = `f(t, y) is not finite at t=${t}`;
        break;
      }
    }
    io[IO_T] = t;
    io[IO_T_NEW] = tNew;
    io[IO_H] = hs;
    step(f, io, y, yNew, yStage, K, kRow, atol, n);
    const err = io[IO_ERR]!;
    counts.nfev += last;

    // IO_NONFINITE is 0 exactly when y_new (and the FSAL stage) are finite.
    const finite = err === err && io[IO_NONFINITE] === 0;
    if (finite && err <= 1) {
      const facMax = lastRejected ? 1 : FAC_MAX;
      const fac = usePi ? piFactor(err, errPrev, kExp, facMax) : useDeadband ? deadbandFactor(err, kExp, facMax) : standardFactor(err, kExp, facMax);
      // Only the PI controller reads errPrev; keeping it out of standard runs also keeps V8 from
      // boxing err every step (the PI call is never taken there, so its arguments stay tagged).
      if (usePi) errPrev = Math.max(err, PI_ERR_FLOOR);
      let hNext = hs * fac;
      if (clipped) {
        // Landing shortened the step, not the error: resume with the step proposed before it.
        if (hNext >= hs && hNext < h) hNext = h;
        stopIdx++;
        if (stopIdx < stops.length) stop = stops[stopIdx]!;
      }
      if (onAccept) onAccept(t, tNew, hs, y, yNew, K, n);
      const swap = y;
      y = yNew;
      yNew = swap;
      t = tNew;
      if (fsal) {
        const off = last * n;
        for (let j = 0; j < n; j++) K[j] = K[off + j]!;
      }
      else k0Fresh = false;
      counts.accepted++;
      lastRejected = false;
      lastNonFinite = false;
      if (observer) observer(t, y);
      if (clipped && stopIdx >= stops.length) break;
      h = hNext;
    } else {
      counts.rejected++;
      lastRejected = true;
      if (finite) {
        h = hs * standardFactor(err, kExp, 1);
        lastNonFinite = false;
      } else {
        h = hs * NONFINITE_SHRINK;
        lastNonFinite = true;
      }
    }
  }
  return finish(status, message, t, y, counts);
}

