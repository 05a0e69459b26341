// One run = one (problem, method, setting): a measured solve (errors, drift, exact counts) and,
// separately, timed repeat solves without observers so measurement never pollutes the clock.
import type { Method, Problem, Setting, SolveOptions, SolveResult } from '../core/types.js';
import { isAdaptiveSetting, zeroCounts } from '../core/types.js';
import type { RunResult, RunSetting } from '../results/contract.js';
import { messageOf } from '../core/errors.js';
import { errorMeter } from './error-norm.js';
import { referenceLookup } from './reference.js';
import { watchRun } from './observer.js';
import { roundTripError } from './round-trip.js';
import { solveOptions, type RunOptions } from './run-options.js';
import { eventRecords } from './events.js';
import { orbitErrorInto } from './orbit-error.js';
import type { OrbitErrorParts } from '../results/contract.js';

export type { RunOptions } from './run-options.js';
export { solveOptions } from './run-options.js';

export function runSetting(problem: Problem, setting: Setting, result?: SolveResult): RunSetting {
  if (isAdaptiveSetting(setting)) {
    return { rtol: setting.rtol, atol: typeof setting.atol === 'number' ? setting.atol : [...setting.atol] };
  }
  return { steps: setting.steps, h: result?.h ?? (problem.tEnd - problem.t0) / setting.steps };
}

/** Smallest error the reference can resolve at tEnd, from its trusted digits (0 when exact). */
function referenceResolution(problem: Problem, refFinal: Float64Array): number {
  const digits = problem.reference.digits;
  if (problem.reference.kind === 'exact' || digits === undefined) return 0;
  const rel = 10 ** -digits;
  if (problem.errorScale.kind === 'relative') return rel;
  let big = 0;
  for (const v of refFinal) big = Math.max(big, Math.abs(v));
  return rel * big;
}

/** Integrates once with observers and returns the run record (time left null). */
export function measureRun(problem: Problem, method: Method, setting: Setting, options: RunOptions): RunResult {
  const watch = watchRun(problem);
  let result: SolveResult;
  try {
    result = method.solve(problem, setting, solveOptions(problem, options, watch.observer));
  } catch (e) {
    return failedRun(problem, method, setting, `${method.id} threw: ${messageOf(e)}`);
  }
  const run: RunResult = {
    problem: problem.id,
    method: method.id,
    setting: runSetting(problem, setting, result),
    status: result.status,
    error: { final: null, max: null },
    drift: watch.drift(),
    counts: { ...result.counts },
    time: { medianSeconds: null, samples: 0 },
    tFinal: result.tFinal,
    yFinal: Array.from(result.yFinal),
  };
  if (result.message) run.message = result.message;
  const effective = effectiveTolerance(method, setting);
  if (effective) run.effectiveTolerance = effective;
  const trace = watch.trace();
  if (trace) run.trace = trace;
  const found = watch.eventsFound();
  if (found) run.events = eventRecords(problem, found);
  if (result.status !== 'ok') return run;
  try {
    run.roundTrip = roundTripError(problem, method, setting, result.yFinal, options);
  } catch (e) {
    run.roundTrip = null;
  }

  const ref = new Float64Array(problem.dimension);
  if (referenceLookup(problem).at(problem.tEnd, ref)) {
    const final = errorMeter(problem)(problem.tEnd, result.yFinal, ref);
    const along = watch.maxError();
    run.error = { final, max: along === null ? final : Math.max(along, final) };
    const resolution = referenceResolution(problem, ref);
    if (resolution > 0 && final < resolution) run.errorBelowReference = true;
    if (problem.orbit) run.orbitError = orbitRecord(problem.orbit.unit, result.yFinal, ref, problem, watch.orbitAlong());
  } else if (problem.reference.unavailable) {
    run.status = 'error';
    run.message = appendMessage(run.message, `${problem.reference.unavailable}; error not measured`);
  } else {
    run.message = appendMessage(run.message, 'no reference at the end of the span; error not measured');
  }
  return run;
}

function parts(b: Float64Array): OrbitErrorParts {
  return { position: b[0]!, radial: b[1]!, inTrack: b[2]!, crossTrack: b[3]! };
}

/** Final signed parts; the along-the-run maxima include the end. */
function orbitRecord(unit: string, y: Float64Array, ref: Float64Array, problem: Problem, along: ReturnType<RunWatchLike['orbitAlong']>): NonNullable<RunResult['orbitError']> {
  const b = new Float64Array(4);
  orbitErrorInto(y, ref, problem.orbit!, b);
  const final = parts(b);
  const max = { ...(along?.max ?? { position: 0, radial: 0, inTrack: 0, crossTrack: 0 }) };
  max.position = Math.max(max.position, Math.abs(final.position));
  max.radial = Math.max(max.radial, Math.abs(final.radial));
  max.inTrack = Math.max(max.inTrack, Math.abs(final.inTrack));
  max.crossTrack = Math.max(max.crossTrack, Math.abs(final.crossTrack));
  return { unit, final, max, ...(along?.trace ? { trace: along.trace } : {}) };
}

type RunWatchLike = ReturnType<typeof watchRun>;


/** The tolerance after the method's internal map, when it has one (see Method.effectiveRtol). */
export function effectiveTolerance(method: Pick<Method, 'effectiveRtol'>, setting: Setting): { rtol: number; atol: number | number[] } | undefined {
  if (!method.effectiveRtol || !isAdaptiveSetting(setting)) return undefined;
  const rtol = method.effectiveRtol(setting.rtol);
  if (rtol === setting.rtol) return undefined;
  const ratio = rtol / setting.rtol;
  return { rtol, atol: typeof setting.atol === 'number' ? setting.atol * ratio : setting.atol.map((a) => a * ratio) };
}

export function failedRun(problem: Problem, method: Method | { id: string }, setting: Setting, message: string): RunResult {
  return {
    problem: problem.id,
    method: method.id,
    setting: runSetting(problem, setting),
    status: 'error',
    message,
    error: { final: null, max: null },
    drift: {},
    counts: zeroCounts(),
    time: { medianSeconds: null, samples: 0 },
    tFinal: problem.t0,
    yFinal: [...problem.y0],
  };
}

export function appendMessage(a: string | undefined, b: string): string {
  return a ? `${a}; ${b}` : b;
}
