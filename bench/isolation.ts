// Timing isolation: the time `stepgauge run` records for a run inside the whole catalogue sweep
// against the time it records for the same run in a sweep of that run alone. The sweep times each
// (problem, method) pair's runs in a fresh process (src/sweep/clocks.ts), so the two should agree
// within the machine's noise; the target is 10%. The lone sweeps run before and after the
// catalogue sweep (every round, see ROUNDS) and their median is the reference; a drift of the
// VM's speed during the catalogue sweep shows as a spread between the first and the last
// (`aloneSpread`).
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
/** bin/stepgauge.js from dist/bench or bench. */
const cli = join(here, here.endsWith(join('dist', 'bench')) ? '../..' : '..', 'bin', 'stepgauge.js');

/** Runs compared: cheap and costly, explicit and implicit (problem, method, rtol). */
export const ISOLATION_RUNS: readonly [string, string, number][] = [
  ['kepler-eccentric', 'dormand-prince-853', 1e-10],
  ['kepler-eccentric', 'dormand-prince-54', 1e-8],
  ['kepler-eccentric', 'verner-87', 1e-10],
  ['kepler-eccentric', 'dormand-el-mikkawy-prince-rkn1210', 1e-10],
  ['robertson', 'hairer-wanner-rodas4', 1e-7],
  ['robertson', 'radau-iia-5', 1e-7],
];

export interface IsolationRow {
  problem: string;
  method: string;
  rtol: number;
  /** Median ms recorded inside the catalogue sweep (median over the rounds). */
  inSweepMs: number | null;
  /** Median of the medians recorded by the lone sweeps (before and after, every round). */
  aloneMs: number | null;
  /** (first - last) / mean of the first and last lone sweeps. */
  aloneSpread: number | null;
  /** inSweepMs / aloneMs. */
  ratio: number | null;
  withinTenPercent: boolean;
  /** Every sweep's figure, ms, when the bench ran more than one round. */
  inSweepRoundsMs?: number[];
  aloneRoundsMs?: number[];
}

interface RunLine {
  problem: string;
  method: string;
  setting: { rtol?: number };
  time: { medianSeconds: number | null } | null;
}

function sweep(args: string[]): RunLine[] {
  const dir = mkdtempSync(join(tmpdir(), 'stepgauge-isolation-'));
  try {
    execFileSync(process.execPath, [cli, 'run', '--no-report', '-q', '-o', join(dir, 'out'), ...args], { stdio: ['ignore', 'ignore', 'inherit'] });
    return (JSON.parse(readFileSync(join(dir, 'out', 'results.json'), 'utf8')) as { runs: RunLine[] }).runs;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function msOf(runs: RunLine[], problem: string, method: string, rtol: number): number | null {
  const r = runs.find((x) => x.problem === problem && x.method === method && x.setting.rtol === rtol);
  const s = r?.time?.medianSeconds;
  return typeof s === 'number' ? s * 1000 : null;
}

function alone(): Map<string, number | null> {
  const out = new Map<string, number | null>();
  for (const [p, m, rtol] of ISOLATION_RUNS) out.set(`${p}|${m}|${rtol}`, msOf(sweep(['-p', p, '-m', m, '-t', String(rtol)]), p, m, rtol));
  return out;
}

/**
 * The problems of the big sweep: the whole catalogue, or the list in
 * STEPGAUGE_BENCH_ISOLATION_PROBLEMS (comma-separated ids, each compared run's problem among them)
 * for a shorter look on a busy machine: every method still runs in the sweep.
 */
function sweepProblems(): string[] {
  const list = process.env.STEPGAUGE_BENCH_ISOLATION_PROBLEMS;
  return list ? ['-p', list] : [];
}

/**
 * Rounds (STEPGAUGE_BENCH_ISOLATION_ROUNDS, default 1): the lone sweeps, then the big sweep, per
 * round, and the lone sweeps once more at the end; each side's figure is the median of its
 * sweeps. On a busy machine more rounds put both sides in the same minutes.
 */
const ROUNDS = Math.max(1, Math.floor(Number(process.env.STEPGAUGE_BENCH_ISOLATION_ROUNDS ?? 1)) || 1);

function median(xs: readonly number[]): number | null {
  if (xs.length === 0) return null;
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

export function runIsolationBench(rounds = ROUNDS): IsolationRow[] {
  // The catalogue's default tolerances are 1e-3..1e-10; the compared settings are added to them.
  const tolerances = [...new Set(['1e-3', '1e-4', '1e-5', '1e-6', '1e-7', '1e-8', '1e-9', '1e-10', ...ISOLATION_RUNS.map(([, , r]) => String(r))])];
  const lone: Map<string, number | null>[] = [];
  const sweeps: RunLine[][] = [];
  for (let round = 0; round < rounds; round++) {
    lone.push(alone());
    sweeps.push(sweep([...sweepProblems(), '-t', tolerances.join(',')]));
  }
  lone.push(alone());
  const values = (xs: (number | null)[]) => xs.filter((x): x is number => x !== null);
  return ISOLATION_RUNS.map(([problem, method, rtol]) => {
    const key = `${problem}|${method}|${rtol}`;
    const aloneAll = values(lone.map((m) => m.get(key) ?? null));
    const a = lone[0]!.get(key) ?? null;
    const b = lone[lone.length - 1]!.get(key) ?? null;
    const aloneMs = median(aloneAll);
    const inSweepAll = values(sweeps.map((all) => msOf(all, problem, method, rtol)));
    const inSweepMs = median(inSweepAll);
    const ratio = inSweepMs !== null && aloneMs !== null ? inSweepMs / aloneMs : null;
    return {
      problem,
      method,
      rtol,
      inSweepMs,
      aloneMs,
      aloneSpread: a !== null && b !== null ? (a - b) / ((a + b) / 2) : null,
      ratio,
      withinTenPercent: ratio !== null && Math.abs(ratio - 1) <= 0.1,
      ...(rounds > 1 ? { inSweepRoundsMs: inSweepAll, aloneRoundsMs: aloneAll } : {}),
    };
  });
}

// By hand: node dist/bench/isolation.js
if (process.argv[1] === fileURLToPath(import.meta.url)) {
  for (const row of runIsolationBench()) console.log(JSON.stringify(row));
}
