// Wall time of a solve: tinybench median over repeated solves within a time budget per run.
// Timed solves run without observers, so the clock sees only the integrator and the model.
import { Bench } from 'tinybench';
import type { Method, Problem, Setting, TimeBasis } from '../core/types.js';
import { solveOptions, type RunOptions } from './run-options.js';

import type { TimingOptions } from '../core/defaults.js';
import type { RunResult } from '../results/contract.js';
export type { TimingOptions } from '../core/defaults.js';

/** Timing is extended until the relative margin of error is below this (runs under a second). */
export const TARGET_RME_PERCENT = 5;

/** Whether a median this uncertain, of a run this short, is worth timing longer. */
export function needsMoreTime(rmePercent: number, medianMs: number): boolean {
  return rmePercent > TARGET_RME_PERCENT && medianMs < 1000;
}
const MAX_BUDGET_DOUBLINGS = 3;
/** Solves run before timing starts (fewer when the budget runs out first). */
const WARMUP_SOLVES = 20;
/** The first time a (method, problem) pair is timed in a process its code is cold: warm longer. */
const FIRST_WARMUP_CAP_SECONDS = 2;
const warmedPairs = new Set<string>();

export { DEFAULT_TIMING } from '../core/defaults.js';


export interface TimingResult {
  medianSeconds: number;
  /** Median absolute deviation of the samples, seconds. */
  spreadSeconds: number;
  samples: number;
  /** 95% relative margin of error of the median, percent. */
  rmePercent: number;
  /** Set for methods that time themselves (external programs). */
  basis?: TimeBasis;
}

/** The `time` record of a run from a timing (the results contract's shape). */
export function timeRecord(t: TimingResult): RunResult['time'] {
  return { medianSeconds: t.medianSeconds, samples: t.samples, spreadSeconds: t.spreadSeconds, rmePercent: t.rmePercent, ...(t.basis ? { basis: t.basis } : {}) };
}

export async function timeRun(
  problem: Problem,
  method: Method,
  setting: Setting,
  runOptions: RunOptions,
  timing: TimingOptions,
): Promise<TimingResult | null> {
  if (method.solveSeconds) {
    // A program times itself (or is timed by its process): one solve, its own figure.
    const own = method.solveSeconds(problem, setting, solveOptions(problem, runOptions));
    return own ? { medianSeconds: own.seconds, spreadSeconds: 0, samples: 1, rmePercent: Number.NaN, basis: own.basis } : null;
  }
  const solve = () => {
    method.solve(problem, setting, solveOptions(problem, runOptions));
  };
  // Warm-up until the JIT has settled: a fresh worker runs a method's code cold, and the
  // first solves of a millisecond run can take twenty times longer (seen with radau-iia-5 on
  // robertson). Bounded in time, so a long solve is warmed once.
  const key = `${method.id}|${problem.id}`;
  const firstTime = !warmedPairs.has(key);
  warmedPairs.add(key);
  const warmUntil = performance.now() + (firstTime ? FIRST_WARMUP_CAP_SECONDS : timing.budgetSeconds) * 1000;
  for (let k = 0; k < WARMUP_SOLVES && performance.now() < warmUntil; k++) solve();
  // Sample until the median's relative margin of error is under 5% (runs under a second), doubling
  // the budget a few times at most; a long solve is timed within its stated budget only.
  let budget = timing.budgetSeconds;
  let best: TimingResult | null = null;
  for (let round = 0; round <= MAX_BUDGET_DOUBLINGS; round++) {
    const bench = new Bench({ time: budget * 1000, iterations: timing.minSamples, warmup: false });
    bench.add('solve', solve);
    await bench.run();
    const r = bench.tasks[0]?.result;
    if (!r || r.state !== 'completed') return best;
    const rme = medianMarginPercent(r.latency.p50, r.latency.mad, r.latency.samplesCount);
    best = {
      medianSeconds: r.latency.p50 / 1000,
      spreadSeconds: r.latency.mad / 1000,
      samples: r.latency.samplesCount,
      rmePercent: rme,
    };
    if (!needsMoreTime(rme, r.latency.p50)) break;
    budget *= 2;
  }
  return best;
}

/**
 * 95% relative margin of error of the median, percent. The median's standard error is about
 * 1.2533 sigma / sqrt(n) for a normal sample (Kendall and Stuart, The Advanced Theory of
 * Statistics, vol. 1, asymptotic variance of the median), with sigma estimated robustly as
 * 1.4826 MAD, so GC pauses in a few samples do not inflate it as they inflate the mean's.
 */
export function medianMarginPercent(median: number, mad: number, n: number): number {
  if (!(median > 0) || n < 2) return Infinity;
  return (100 * 1.96 * 1.2533 * 1.4826 * mad) / (Math.sqrt(n) * median);
}

/**
 * A fixed arithmetic workload timed in the same process, so time gates can compare ratios
 * rather than raw seconds across machines of different speed.
 */
export async function calibrationSeconds(): Promise<number> {
  const n = 64;
  const a = new Float64Array(n * n);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n * n; i++) a[i] = Math.sin(i) * 0.01;
  x.fill(1);
  const bench = new Bench({ time: 200, iterations: 20, warmupIterations: 5 });
  bench.add('calibration', () => {
    for (let rep = 0; rep < 200; rep++) {
      for (let i = 0; i < n; i++) {
        let s = 0;
        for (let j = 0; j < n; j++) s += a[i * n + j]! * x[j]!;
        y[i] = s;
      }
      for (let i = 0; i < n; i++) x[i] = 0.5 * x[i]! + 0.5 * Math.tanh(y[i]!);
    }
  });
  await bench.run();
  const r = bench.tasks[0]?.result;
  return r && r.state === 'completed' ? r.latency.p50 / 1000 : NaN;
}
