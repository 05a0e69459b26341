// The results contract (format version 1): the only thing report, gate and merge read.
// Field meanings are fixed by the design document; new fields may be added, never repurposed.
import type { Counts, ReferenceKind, Status, TimeBasis } from '../core/types.js';

export const RESULTS_FORMAT = 'stepgauge-results';
export const RESULTS_VERSION = 1;

export type RunSetting = { rtol: number; atol: number | number[] } | { steps: number; h: number };

/** Invariant drift sampled along a run, kept small (at most a few hundred points) for plots. */
export interface DriftTrace {
  t: number[];
  drift: Record<string, number[]>;
}

/** Position error split in the reference orbit's frame, in the problem's position unit. */
export interface OrbitErrorParts {
  /** RSS (length of the position error). */
  position: number;
  radial: number;
  inTrack: number;
  crossTrack: number;
}

export interface OrbitErrorRecord {
  unit: string;
  /** Signed parts at the end of the span. */
  final: OrbitErrorParts | null;
  /** Largest magnitude of each part over the points compared along the run (the end included). */
  max: OrbitErrorParts | null;
  /** Signed parts sampled along the run (a few hundred points at most), for plots. */
  trace?: { t: number[]; radial: number[]; inTrack: number[]; crossTrack: number[] };
}

/** One event's crossings in a run against the reference's. */
export interface EventRecord {
  direction: 'rising' | 'falling' | 'both';
  /** Crossing times the run produced. */
  times: number[];
  /** Reference crossing times (null: the reference gives none, so nothing is compared). */
  reference: number[] | null;
  /** Per reference crossing: run time minus reference time, null where the run missed it. */
  timeErrors: (number | null)[] | null;
  /** Largest |time error| over the matched crossings (null when none matched or no reference). */
  maxTimeError: number | null;
  missed: number | null;
  extra: number | null;
  /**
   * How the run's crossing times were found (added later): the interpolant they were located on
   * (the method's own continuous extension, or stepgauge's Hermite of the accepted steps), or
   * "reported by the program" for an external program that reports its event times.
   */
  locatedBy?: string;
}

export interface RunResult {
  problem: string;
  method: string;
  setting: RunSetting;
  status: Status;
  message?: string;
  /**
   * final: at the end of the span; max: worst over the solver's own accepted steps where the
   * reference can be evaluated, and the end; outputs (added later): worst at the problem's output
   * times, from the values the run gives there (see outputInterpolant); dense (added later): worst
   * at the midpoint of every accepted step, from the method's own interpolant (see
   * denseInterpolant), for methods that offer one and references that have a value there.
   */
  error: { final: number | null; max: number | null; outputs?: number | null; dense?: number | null };
  /** The reference's resolution at each error figure's own point, in the figure's units. */
  resolution?: { final: number | null; max: number | null; outputs?: number | null; dense?: number | null };
  /**
   * Error figures within reach of the resolution (at most 10 times it): not confirmed by the
   * reference, so drawn as such, left out of fits and never meeting a `choose` target.
   */
  unresolved?: ErrorFigure[];
  /** own-steps: the solver chose every step; check-times: it landed on the output times (problem option). */
  landing?: 'own-steps' | 'check-times';
  /** Where the values at output times came from (the method's own interpolant, or which other). */
  outputInterpolant?: string;
  /** The interpolant error.dense measured (the method's own, named with its source). */
  denseInterpolant?: string;
  drift: Record<string, number>;
  counts: Counts;
  time: {
    medianSeconds: number | null;
    samples: number;
    spreadSeconds?: number | null;
    rmePercent?: number | null;
    calibrationRatio?: number | null;
    /** External programs: 'reported' (the program's own solve time) or 'wall-minus-start-up'. */
    basis?: TimeBasis;
  };
  tFinal: number;
  yFinal: number[];
  /** True when the final error is within reach of what the reference can resolve (see unresolved). */
  errorBelowReference?: boolean;
  /**
   * Tolerance the method actually controlled to, for methods that map the requested one
   * internally (Radau IIA as in the authors' code, TR-BDF2); absent when it is the requested one.
   */
  effectiveTolerance?: { rtol: number; atol: number | number[] };
  /** Reference-free indicator: error after integrating to the end and back (null: not measured). */
  roundTrip?: number | null;
  /** Position of this run in the sweep plan (keeps merged shards in plan order). */
  planIndex?: number;
  trace?: DriftTrace;
  /** Radial / in-track / cross-track split of the position error (problems that name an orbit). */
  orbitError?: OrbitErrorRecord;
  /** Event crossings located in the run, by event name (problems that declare events). */
  events?: Record<string, EventRecord>;
  /**
   * Right-hand-side evaluations stepgauge made to locate the run's events (its Hermite
   * interpolant), not part of `counts`; 0 when the method's own interpolant located them.
   */
  eventEvaluations?: number;
  /**
   * Right-hand-side evaluations the method's own interpolant made for its extra stages (Verner's
   * and DOP853's interpolants evaluate a few stages per step in which a value between steps is
   * asked for: at output times, events, error.dense), not part of `counts`, which are the steps'
   * work alone; present only for such interpolants.
   */
  denseEvaluations?: number;
  /** False when the method did not report its work (an external program): counts are not figures. */
  countsReported?: boolean;
  /** External programs: SHA-256 of the reported times and states (settings that change nothing). */
  outputSha256?: string;
  /** External programs: set when another setting gave exactly the same reported output. */
  settingIgnored?: boolean;
  /** Set when the error was measured against the method itself at a much tighter setting: what that was. */
  selfReference?: string;
}

export interface ProblemRecord {
  id: string;
  title: string;
  sha256: string;
  stiff: boolean;
  reference: {
    kind: ReferenceKind;
    digits?: number;
    source?: string;
    /** The methods a certified reference was computed from, their rtol, and each run (maxStep: the bounded one). */
    certifiedBy?: { methods: string[]; rtol?: number; runs?: { method: string; rtol: number; maxStep?: number }[] };
    /** Why there is no usable reference (errors are then null). */
    none?: string;
  };
  stiffnessRatio?: number | null;
  source?: string;
  dimension?: number;
  [extra: string]: unknown;
}

export interface Environment {
  node: string;
  platform: string;
  arch: string;
  cpu: string;
  cpuCount?: number;
  stepgauge: string;
  commit?: string;
  /** Seconds for the fixed calibration workload timed in the same process (for time gating). */
  calibrationSeconds?: number;
  [extra: string]: unknown;
}

export interface ResultsFile {
  format: typeof RESULTS_FORMAT;
  version: typeof RESULTS_VERSION;
  createdAt: string;
  environment: Environment;
  runs: RunResult[];
  problems: ProblemRecord[];
  /** Set when a sweep was interrupted before all planned runs finished. */
  interrupted?: boolean;
  /** Set for one shard of a sharded sweep: "K/N" and the plan's fingerprint. */
  shard?: { index: number; count: number; planSha256: string };
  [extra: string]: unknown;
}

export type ErrorFigure = 'final' | 'max' | 'outputs' | 'dense';

/**
 * True when the run marks this error figure as within reach of its reference's resolution:
 * listed in `unresolved`, or, for the final error, flagged `errorBelowReference` (the older flag).
 */
export function isUnresolved(run: Pick<RunResult, 'unresolved' | 'errorBelowReference'>, figure: ErrorFigure): boolean {
  return run.unresolved?.includes(figure) === true || (figure === 'final' && run.errorBelowReference === true);
}

/** The error figure of a run when it is a real, resolved measurement; null otherwise. */
export function resolvedError(run: Pick<RunResult, 'status' | 'error' | 'unresolved' | 'errorBelowReference'>, figure: ErrorFigure): number | null {
  if (run.status !== 'ok') return null;
  const e = run.error[figure];
  if (e === null || e === undefined) return null;
  if (isUnresolved(run, figure)) return null;
  return e;
}

/** Stable key of one run: problem, method and setting. */
export function runKey(r: Pick<RunResult, 'problem' | 'method' | 'setting'>): string {
  const s = r.setting;
  const part = 'rtol' in s ? `rtol=${s.rtol},atol=${JSON.stringify(s.atol)}` : `steps=${s.steps}`;
  return `${r.problem}|${r.method}|${part}`;
}
