// The results contract (format version 1): the only thing report, gate and merge read.
// Field meanings are fixed by the design document; new fields may be added, never repurposed.
import type { Counts, ReferenceKind, Status } from '../core/types.js';

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
}

export interface RunResult {
  problem: string;
  method: string;
  setting: RunSetting;
  status: Status;
  message?: string;
  error: { final: number | null; max: number | null };
  drift: Record<string, number>;
  counts: Counts;
  time: { medianSeconds: number | null; samples: number; spreadSeconds?: number | null; rmePercent?: number | null; calibrationRatio?: number | null };
  tFinal: number;
  yFinal: number[];
  /** True when the error is below what the reference can resolve (certified references). */
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
}

export interface ProblemRecord {
  id: string;
  title: string;
  sha256: string;
  stiff: boolean;
  reference: { kind: ReferenceKind; digits?: number; source?: string; certifiedBy?: { methods: string[]; rtol?: number } };
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

/** Stable key of one run: problem, method and setting. */
export function runKey(r: Pick<RunResult, 'problem' | 'method' | 'setting'>): string {
  const s = r.setting;
  const part = 'rtol' in s ? `rtol=${s.rtol},atol=${JSON.stringify(s.atol)}` : `steps=${s.steps}`;
  return `${r.problem}|${r.method}|${part}`;
}
