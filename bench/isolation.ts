// Timing isolation: the time `stepgauge run` records for a run inside the whole catalogue sweep
// against the time it records for the same run in a sweep of that run alone. The sweep times each
// (problem, method) pair's runs in a fresh process (src/sweep/clocks.ts), so the two should agree
// within the machine's noise; the target is 10%. The lone sweeps run before and after the
// catalogue sweep and their mean is the reference, so a drift of the VM's speed during the
// catalogue sweep shows as a spread between them (`aloneSpread`).
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
  ['robertson', 'hairer-wanner-rodas4', 1e-7],
  ['robertson', 'radau-iia-5', 1e-7],
];

export interface IsolationRow {
  problem: string;
  method: string;
  rtol: number;
  /** Median ms recorded inside the catalogue sweep. */
  inSweepMs: number | null;
  /** Mean of the medians recorded by the lone sweeps before and after. */
  aloneMs: number | null;
  /** (before - after) / mean of the lone sweeps. */
  aloneSpread: number | null;
  /** inSweepMs / aloneMs. */
  ratio: number | null;
  withinTenPercent: boolean;
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

export function runIsolationBench(): IsolationRow[] {
  const before = alone();
  // The catalogue's default tolerances are 1e-3..1e-10; the compared settings are added to them.
  const tolerances = [...new Set(['1e-3', '1e-4', '1e-5', '1e-6', '1e-7', '1e-8', '1e-9', '1e-10', ...ISOLATION_RUNS.map(([, , r]) => String(r))])];
  const all = sweep([...sweepProblems(), '-t', tolerances.join(',')]);
  const after = alone();
  return ISOLATION_RUNS.map(([problem, method, rtol]) => {
    const key = `${problem}|${method}|${rtol}`;
    const a = before.get(key) ?? null;
    const b = after.get(key) ?? null;
    const aloneMs = a !== null && b !== null ? (a + b) / 2 : (a ?? b);
    const inSweepMs = msOf(all, problem, method, rtol);
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
    };
  });
}

// By hand: node dist/bench/isolation.js
if (process.argv[1] === fileURLToPath(import.meta.url)) {
  for (const row of runIsolationBench()) console.log(JSON.stringify(row));
}
