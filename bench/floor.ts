// Floor benchmark: what a solve costs beyond the user's function. For every explicit method, the
// problem's right-hand side is called in a bare loop exactly as many times as the solve calls it
// (the cost of f alone), and the full solve is timed the way timed runs are (check times on, no
// observer). Overhead per evaluation = (solve - bare loop) / nfev.
// Problems: kepler-eccentric (4 states, f costs a few ns, so the integrator dominates) and a
// 100-state dense linear system x' = Ax (f is a 100x100 mat-vec, so f dominates).
import { Bench } from 'tinybench';
import type { Method, Problem, Setting } from '../src/core/types.js';
import { solveOptions } from '../src/measure/run-one.js';
import { medianMarginPercent, needsMoreTime } from '../src/measure/timing.js';
import { explicitMethods } from '../src/methods/explicit/index.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';

/** Size of the dense linear test system. */
export const LINEAR_N = 100;
const LINEAR_SEED = 20240611;
const MAX_STEPS = 10_000_000;

/** Deterministic uniform [0, 1) numbers (32-bit xorshift), so the matrix is the same every run. */
function xorshift(seed: number): () => number {
  let s = seed >>> 0 || 1;
  return () => {
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return s / 4294967296;
  };
}

/**
 * x' = Ax with A = R / sqrt(n) - I, R uniform in [-1, 1]: the spectrum of R / sqrt(n) lies
 * (circular law) in a disc of radius about 1/sqrt(3), so every eigenvalue of A has real part
 * below about -0.4 (stable, not stiff). x(0) = (1, ..., 1), t in [0, 10].
 */
export function denseLinearProblem(n = LINEAR_N, seed = LINEAR_SEED): Problem {
  const rand = xorshift(seed);
  const a = new Float64Array(n * n);
  const scale = 1 / Math.sqrt(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) a[i * n + j] = (2 * rand() - 1) * scale - (i === j ? 1 : 0);
  }
  return {
    id: `dense-linear-${n}`,
    title: `Dense random stable linear system, ${n} states (benchmark only)`,
    source: 'bench/floor.ts: seeded matrix, no reference (timing only)',
    dimension: n,
    t0: 0,
    tEnd: 10,
    y0: new Array<number>(n).fill(1),
    f: (_t, y, dy) => {
      for (let i = 0; i < n; i++) {
        const row = i * n;
        let s = 0;
        for (let j = 0; j < n; j++) s += a[row + j]! * y[j]!;
        dy[i] = s;
      }
    },
    stiff: false,
    invariants: [],
    errorScale: { kind: 'absolute' },
    reference: { kind: 'certified', source: 'none: the floor benchmark times solves and never measures error' },
    checkTimes: [],
    definition: `dense-linear n=${n} seed=${seed}`,
  };
}

export interface FloorRow {
  problem: string;
  method: string;
  setting: string;
  nfev: number;
  solveMs: number;
  floorMs: number;
  /** Solve time per evaluation, ns. */
  nsPerEval: number;
  /** Bare f time per evaluation, ns. */
  floorNsPerEval: number;
  /** (solve - floor) / nfev, ns. */
  overheadNsPerEval: number;
  /** solve / floor. */
  ratio: number;
  /** The bare loop with solver-like arguments (see solverArgsLoop), ms. */
  floorSolverArgsMs: number;
  /** solve / floorSolverArgsMs. */
  ratioSolverArgs: number;
  samples: number;
  /** Median absolute deviation of the solve's samples (all rounds), ms. */
  solveMadMs: number;
  /** 95% relative margin of error of the solve's median, percent (all rounds' samples). */
  solveRmePercent: number;
  /** Timing budget the row used, ms (doubled while the margin was 5% or more). */
  budgetMs: number;
}

function settingFor(problem: Problem, m: Method, rtol: number, steps: number): Setting {
  if (!m.adaptive) return { steps };
  const s = problem.atolScale;
  return { rtol, atol: s === undefined ? rtol : typeof s === 'number' ? rtol * s : s.map((v) => rtol * v) };
}

function label(s: Setting): string {
  return 'rtol' in s ? `rtol=${s.rtol}` : `steps=${s.steps}`;
}

/** f called `count` times on a fixed state with varying t: the cost of the user's function alone. */
function bareLoop(problem: Problem, count: number): () => void {
  const f = problem.f;
  const y = Float64Array.from(problem.y0);
  const dy = new Float64Array(problem.dimension);
  const span = problem.tEnd - problem.t0;
  return () => {
    for (let i = 0; i < count; i++) f(problem.t0 + (span * i) / count, y, dy);
  };
}

/**
 * The same calls with the kinds of arguments a solver passes: two alternating state buffers and
 * the rows (subarray views) of one stage buffer as outputs. On the 100-state system V8 runs f
 * about 30% slower this way than on one fixed pair of buffers, so both floors are reported.
 */
function solverArgsLoop(problem: Problem, count: number): () => void {
  const f = problem.f;
  const n = problem.dimension;
  const rows = 7;
  const k = new Float64Array(rows * n);
  const out: Float64Array[] = [];
  for (let i = 0; i < rows; i++) out.push(k.subarray(i * n, (i + 1) * n));
  const ys = [Float64Array.from(problem.y0), Float64Array.from(problem.y0)];
  const span = problem.tEnd - problem.t0;
  return () => {
    for (let i = 0; i < count; i++) f(problem.t0 + (span * i) / count, ys[i & 1]!, out[i % rows]!);
  };
}

/** What one tinybench task gave: its median and its samples. */
export interface Timed {
  ms: number;
  /** The latency samples themselves, ms (for statistics pooled over rounds). */
  values: readonly number[];
}

/** Median wall time of fn, ms (tinybench, after warm-up), with the samples kept. */
export function medianMs(fn: () => void, timeMs: number): Timed {
  const bench = new Bench({ time: timeMs, iterations: 5, warmup: true, warmupIterations: 3, warmupTime: 20, retainSamples: true });
  bench.add('x', fn);
  bench.runSync();
  const r = bench.tasks[0]!.result;
  if (r.state !== 'completed') throw new Error(`benchmark task did not complete (${r.state})`);
  return { ms: r.latency.p50, values: [...(r.latency.samples ?? [])] };
}

/**
 * Spread and margin of the median of a set of timings, ms: the median absolute deviation, and
 * the 95% relative margin of error of the median in percent (the formula the sweep's own timing
 * uses, src/measure/timing.ts).
 */
export function sampleStats(values: readonly number[]): { medianMs: number; madMs: number; rmePercent: number } {
  const m = median([...values]);
  const mad = median(values.map((v) => Math.abs(v - m)));
  return { medianMs: m, madMs: mad, rmePercent: medianMarginPercent(m, mad, values.length) };
}

export function median(xs: number[]): number {
  const a = [...xs].sort((x, y) => x - y);
  const k = a.length >> 1;
  return a.length % 2 ? a[k]! : (a[k - 1]! + a[k]!) / 2;
}

/** Rounds of solve then floor, so a change in machine load hits both alike; medians over rounds. */
const ROUNDS = 5;

/** Times a floor or peers row's budget may double while its median is uncertain. */
const MAX_DOUBLINGS = 2;

/**
 * measure(budget), again with the budget doubled (at most `doublings` times) while its median
 * needs more time by the sweep's own rule (needsMoreTime: a margin over 5%, a run under a second).
 */
export function untilSure<T>(measure: (budgetMs: number) => T, stats: (t: T) => { rmePercent: number; medianMs: number }, budgetMs: number, doublings: number): { result: T; budgetMs: number } {
  let budget = budgetMs;
  let result = measure(budget);
  for (let k = 0; k < doublings; k++) {
    const s = stats(result);
    if (!needsMoreTime(s.rmePercent, s.medianMs)) break;
    budget *= 2;
    result = measure(budget);
  }
  return { result, budgetMs: budget };
}

function interleavedOnce(solve: () => void, floor: () => void, floorSolverArgs: () => void, timeMs: number) {
  const s: number[] = [];
  const f: number[] = [];
  const g: number[] = [];
  const pooled: number[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    const a = medianMs(solve, timeMs / ROUNDS);
    s.push(a.ms);
    pooled.push(...a.values);
    f.push(medianMs(floor, timeMs / ROUNDS).ms);
    g.push(medianMs(floorSolverArgs, timeMs / ROUNDS).ms);
  }
  // The reported times are medians over rounds; the spread and margin come from every solve
  // sample of every round, so they include the drift between rounds.
  const stats = sampleStats(pooled);
  return { solveMs: median(s), floorMs: median(f), floorSolverArgsMs: median(g), samples: pooled.length, solveMadMs: stats.madMs, solveRmePercent: stats.rmePercent };
}

/** The rounds, timed longer while the solve's median is uncertain (untilSure). */
function interleaved(solve: () => void, floor: () => void, floorSolverArgs: () => void, timeMs: number) {
  const { result, budgetMs } = untilSure(
    (budget) => interleavedOnce(solve, floor, floorSolverArgs, budget),
    (t) => ({ rmePercent: t.solveRmePercent, medianMs: t.solveMs }),
    timeMs,
    MAX_DOUBLINGS,
  );
  return { ...result, budgetMs };
}

export function floorRow(problem: Problem, m: Method, setting: Setting, timeMs: number): FloorRow {
  const opts = solveOptions(problem, { maxSteps: MAX_STEPS });
  const first = m.solve(problem, setting, opts);
  if (first.status !== 'ok') throw new Error(`${m.id} on ${problem.id}: ${first.status} ${first.message ?? ''}`);
  const nfev = first.counts.nfev;
  const t = interleaved(() => {
    m.solve(problem, setting, opts);
  }, bareLoop(problem, nfev), solverArgsLoop(problem, nfev), timeMs);
  return {
    problem: problem.id,
    method: m.id,
    setting: label(setting),
    nfev,
    solveMs: t.solveMs,
    floorMs: t.floorMs,
    nsPerEval: (t.solveMs * 1e6) / nfev,
    floorNsPerEval: (t.floorMs * 1e6) / nfev,
    overheadNsPerEval: ((t.solveMs - t.floorMs) * 1e6) / nfev,
    ratio: t.solveMs / t.floorMs,
    floorSolverArgsMs: t.floorSolverArgsMs,
    ratioSolverArgs: t.solveMs / t.floorSolverArgsMs,
    samples: t.samples,
    solveMadMs: t.solveMadMs,
    solveRmePercent: t.solveRmePercent,
    budgetMs: t.budgetMs,
  };
}

/** Times one (problem, method, setting): in this process, or in a fresh one (see index.ts). */
export type FloorTimer = (problem: Problem, m: Method, setting: Setting, timeMs: number) => FloorRow;

/** The problems this file builds or imports, by id (for timing in a child process). */
export function benchProblem(id: string): Problem {
  if (id === keplerEccentric.id) return keplerEccentric;
  const linear = denseLinearProblem();
  if (id === linear.id) return linear;
  throw new Error(`unknown bench problem ${id}`);
}

/** Every explicit method on both problems; rtol 1e-12 / 20,000 steps on Kepler, 1e-8 / 2,000 steps on the linear system. */
export function runFloorBench(timeMs = 1000, timer: FloorTimer = floorRow): FloorRow[] {
  const rows: FloorRow[] = [];
  const linear = denseLinearProblem();
  const cases: [Problem, number, number][] = [
    [keplerEccentric, 1e-12, 20_000],
    [linear, 1e-8, 2_000],
  ];
  for (const [p, rtol, steps] of cases) {
    for (const m of explicitMethods) {
      if (m.needsSeparable && !p.separable) continue;
      rows.push(timer(p, m, settingFor(p, m, rtol, steps), timeMs));
    }
  }
  return rows;
}
