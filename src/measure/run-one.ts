// One run = one (problem, method, setting): a measured solve (errors, drift, exact counts) and,
// separately, timed repeat solves without observers so measurement never pollutes the clock.
import type { Method, Problem, Setting, SolveOptions, SolveResult } from '../core/types.js';
import { isAdaptiveSetting, zeroCounts } from '../core/types.js';
import type { ErrorFigure, RunResult, RunSetting } from '../results/contract.js';
import { messageOf } from '../core/errors.js';
import { errorMeter } from './error-norm.js';
import { referenceLookup } from './reference.js';
import { watchRun, type Figure } from './observer.js';
import { NEAR_RESOLUTION } from './resolution.js';
import type { OutputInterpolant } from './output-times.js';
import { roundTripError } from './round-trip.js';
import { solveOptions, type RunOptions } from './run-options.js';
import { eventRecords } from './events.js';
import { HERMITE_EVENT_INTERPOLANT } from './event-watch.js';
import { orbitErrorInto } from './orbit-error.js';
import type { OrbitErrorParts } from '../results/contract.js';
import { nonFiniteComponent, unsoundSolveResult } from './result-check.js';

export type { RunOptions } from './run-options.js';
export { solveOptions } from './run-options.js';

export function runSetting(problem: Problem, setting: Setting, result?: SolveResult): RunSetting {
  if (isAdaptiveSetting(setting)) {
    return { rtol: setting.rtol, atol: typeof setting.atol === 'number' ? setting.atol : [...setting.atol] };
  }
  return { steps: setting.steps, h: result?.h ?? (problem.tEnd - problem.t0) / setting.steps };
}

/** A method that offers its own continuous extension (see methods/explicit/dense-dp54.ts). */
interface WithInterpolant {
  readonly dense: {
    solve(p: Problem, s: Setting, o: SolveOptions, onStep: (tOld: number, tNew: number, evaluate: (t: number, out: Float64Array) => void) => void): SolveResult & { readonly denseEvaluations?: number };
  };
  readonly notes?: string;
}

function ownInterpolant(method: Method): WithInterpolant | undefined {
  const d = (method as Partial<WithInterpolant>).dense;
  return d && typeof d.solve === 'function' ? (method as unknown as WithInterpolant) : undefined;
}

function interpolantText(kind: OutputInterpolant, method: Method): string {
  if (kind === 'landed') return 'landed: every output time was the end of a step';
  if (kind === 'method') return ownInterpolantText(method);
  return "cubic Hermite between accepted steps, built by stepgauge: the method publishes no interpolant here";
}

/** locatedBy of an event whose crossing times an external program reported itself. */
export const PROGRAM_REPORTED = 'reported by the program';

/** The method's own interpolant, named with its source (the method's notes say which it is). */
function ownInterpolantText(method: Method): string {
  return `${method.id}'s own continuous extension${method.notes ? ` (${method.notes})` : ''}`;
}

function isUnresolved(f: Figure | null): boolean {
  return f !== null && f.value === f.value && !(f.value > NEAR_RESOLUTION * f.resolution);
}

/** Integrates once with observers and returns the run record (time left null). */
export function measureRun(problem: Problem, method: Method, setting: Setting, options: RunOptions): RunResult {
  const landing = problem.landOnCheckTimes === true;
  const own = landing ? undefined : ownInterpolant(method);
  const watch = watchRun(problem, own !== undefined);
  let result: SolveResult & { readonly denseEvaluations?: number };
  try {
    const o = solveOptions(problem, options, watch.observer);
    result = own ? own.dense.solve(problem, setting, o, watch.denseStep) : method.solve(problem, setting, o);
  } catch (e) {
    return failedRun(problem, method, setting, `${method.id} threw: ${messageOf(e)}`);
  }
  let unsound: string | undefined;
  try {
    unsound = unsoundSolveResult(result, problem.dimension);
  } catch (e) {
    unsound = `a solve result that cannot be read (${messageOf(e)})`;
  }
  if (unsound) return failedRun(problem, method, setting, `${method.id} returned ${unsound}`);
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
    landing: landing ? 'check-times' : 'own-steps',
  };
  if (result.message) run.message = result.message;
  const effective = effectiveTolerance(method, setting);
  if (effective) run.effectiveTolerance = effective;
  if (result.countsReported === false) run.countsReported = false;
  // Read after the solve: every value the measurement asks for is asked for inside it.
  const extra = result.denseEvaluations;
  if (typeof extra === 'number' && Number.isSafeInteger(extra) && extra >= 0) run.denseEvaluations = extra;
  if (result.outputSha256 !== undefined) run.outputSha256 = result.outputSha256;
  const trace = watch.trace();
  if (trace) run.trace = trace;
  const found = watch.eventsFound();
  if (found) {
    const located = own ? ownInterpolantText(method) : HERMITE_EVENT_INTERPOLANT;
    const reported = result.eventTimes ?? {};
    const times = { ...found, ...reported };
    run.events = eventRecords(problem, times, (name) => (Object.hasOwn(reported, name) ? PROGRAM_REPORTED : located));
    run.eventEvaluations = watch.eventEvaluations();
  }
  const nonFinite = result.status === 'ok' ? nonFiniteComponent(result.yFinal) : undefined;
  if (nonFinite) {
    run.status = 'diverged';
    run.message = appendMessage(run.message, `${method.id} reported ok, but its final state is not finite (y${nonFinite} at t = ${result.tFinal})`);
  }
  if (run.status !== 'ok') return run;
  try {
    run.roundTrip = roundTripError(problem, method, setting, result.yFinal, options);
  } catch (e) {
    run.roundTrip = null;
  }

  const ref = new Float64Array(problem.dimension);
  const res = new Float64Array(problem.dimension);
  if (referenceLookup(problem).at(problem.tEnd, ref, res)) {
    const badReference = nonFiniteComponent(ref);
    if (badReference) {
      run.status = 'error';
      run.message = appendMessage(run.message, `the reference is not finite at t = ${problem.tEnd} (component ${badReference}); error not measured`);
      return run;
    }
    const meter = errorMeter(problem);
    const final: Figure = { value: meter.error(problem.tEnd, result.yFinal, ref, res), resolution: meter.resolution };
    const along = watch.along();
    const max = along === null || !(along.value >= final.value) ? final : along;
    if (!Number.isFinite(final.value) || (along !== null && !Number.isFinite(along.value))) {
      // The state and reference are finite at the end, so a non-finite error comes from along the
      // run (a reference or state that overflowed at a check time) or from their difference.
      run.status = 'error';
      run.message = appendMessage(run.message, `the measured error is not finite (final ${final.value}, along the run ${along?.value}); a state or the reference overflowed`);
      return run;
    }
    const outputs = watch.outputs();
    const kind = watch.outputInterpolant();
    const dense = watch.dense();
    run.error = { final: final.value, max: max.value, ...(outputs ? { outputs: outputs.value } : {}), ...(dense ? { dense: dense.value } : {}) };
    run.resolution = {
      final: final.resolution,
      max: max.resolution,
      ...(outputs ? { outputs: outputs.resolution } : {}),
      ...(dense ? { dense: dense.resolution } : {}),
    };
    if (kind) run.outputInterpolant = interpolantText(kind, method);
    if (dense) run.denseInterpolant = ownInterpolantText(method);
    const unresolved: ErrorFigure[] = [];
    if (isUnresolved(final)) unresolved.push('final');
    if (isUnresolved(max)) unresolved.push('max');
    if (isUnresolved(outputs)) unresolved.push('outputs');
    if (isUnresolved(dense)) unresolved.push('dense');
    if (unresolved.length > 0) run.unresolved = unresolved;
    if (unresolved.includes('final')) run.errorBelowReference = true;
    const reported = result.reportedPoints;
    if (reported !== undefined && watch.comparedPoints() < reported) {
      run.message = appendMessage(
        run.message,
        `error checked at ${watch.comparedPoints()} of ${reported} reported times (the reference has no value at the others)`,
      );
    }
    if (problem.orbit) run.orbitError = orbitRecord(problem.orbit.unit, result.yFinal, ref, problem, watch.orbitAlong());
  } else if (problem.reference.untrusted) {
    run.message = appendMessage(run.message, `${problem.reference.untrusted}; error not measured`);
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
