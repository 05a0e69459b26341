// Sweep benchmark: the whole catalogue without timing at --jobs 1 and --jobs 2 (wall time, peak
// resident memory), and a synthetic 10,000-run sweep for memory. Each measurement runs in a
// fresh child process so peak memory belongs to that sweep alone. The catalogue pair is measured
// PAIRS times, alternating, because a shared VM's speed drifts by tens of percent between minutes.
//
// Parallel sweeps run their runs in worker processes, whose memory a process's own maxRSS does
// not include; so resident memory is sampled from /proc for the sweep process and all its
// descendants together, and the peak of that sum is reported (`peakTreeRssMB`).
//
// The pair is measured at three levels: the library's runSweep alone (`library`), the command
// `stepgauge run --no-timing --no-report -q --jobs N` from the start of its process (`cli`), which
// adds starting Node, loading the CLI and writing results.json and results.csv to both sides, and
// the command with its defaults, `stepgauge run -q --jobs N` (`defaults`: every run timed within
// its 0.1 s budget, the report written), what a user who types `stepgauge run` waits for. Without
// timing most runs take a few milliseconds, so starting workers and V8 compiling the integrators
// in each of them weigh on --jobs 2; with timing the runs dominate. A defaults pair takes about
// three minutes, so there is one unless STEPGAUGE_BENCH_DEFAULT_PAIRS asks for more (0: none).
//
// CPU time is reported beside wall time (`cpuSeconds`: the sweep process and its workers, from
// /proc, so Linux only) with `coreUse` = CPU seconds / (wall seconds x cores): a parallel sweep at
// coreUse near 1 can only get faster by doing less work, and a sequential one above 1 / cores is
// being helped by V8's own background threads (optimising compiler, garbage collector).
import { spawn, type ChildProcess } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';
import { availableParallelism } from 'node:os';
// The median of the pairs: for an even count, the mean of the two middle values.
import { median } from './floor.js';

const here = dirname(fileURLToPath(import.meta.url));
const child = join(here, 'sweep-child.js');
/** Alternating pairs per level; STEPGAUGE_BENCH_PAIRS sets more for a closer median. */
const PAIRS = pairsFromEnv('STEPGAUGE_BENCH_PAIRS', 4, 1);
/** Pairs of the command with its defaults (about three minutes each). */
const DEFAULT_PAIRS = pairsFromEnv('STEPGAUGE_BENCH_DEFAULT_PAIRS', 1, 0);
const SAMPLE_MS = 50;

function pairsFromEnv(name: string, fallback: number, least: number): number {
  const text = process.env[name];
  if (text === undefined || text === '') return fallback;
  const n = Number(text);
  if (!Number.isInteger(n) || n < least) throw new Error(`${name} must be a whole number of at least ${least}, not '${text}'`);
  return n;
}

export interface SweepBenchRow {
  name: string;
  /** What was timed: the library's runSweep, or the whole `stepgauge run` process, lean or with its defaults. */
  level: 'library' | 'cli' | 'defaults';
  jobs: number;
  runs: number;
  seconds: number;
  /** The sweep process alone (its own maxRSS). */
  peakRssMB: number;
  /** Peak of the summed resident memory of the sweep process and its workers (sampled). */
  peakTreeRssMB: number;
  /** User + system CPU seconds of the sweep process and its workers during the sweep (null off Linux). */
  cpuSeconds: number | null;
  /** cpuSeconds / (seconds x available cores). */
  coreUse: number | null;
}

/** Resident kilobytes of pid and every descendant, from /proc (0 for processes already gone). */
function treeRssKB(root: number): number {
  const parent = new Map<number, number>();
  const rss = new Map<number, number>();
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const status = readFileSync(`/proc/${entry}/status`, 'utf8');
      const pp = /^PPid:\s+(\d+)/m.exec(status);
      const kb = /^VmRSS:\s+(\d+)/m.exec(status);
      parent.set(Number(entry), pp ? Number(pp[1]) : 0);
      rss.set(Number(entry), kb ? Number(kb[1]) : 0);
    } catch {
      // the process ended while the table was read
    }
  }
  let total = 0;
  for (const [pid, kb] of rss) {
    for (let p: number | undefined = pid; p !== undefined && p > 1; p = parent.get(p)) {
      if (p === root) {
        total += kb;
        break;
      }
    }
  }
  return total;
}

/** Samples the resident memory of `proc` and its descendants every `everyMs`; `stop` ends it and answers the peak in kB. */
export function watchTreeRss(proc: ChildProcess, everyMs: number): { stop: () => number } {
  let peakKB = 0;
  const timer = setInterval(() => {
    if (proc.pid !== undefined) peakKB = Math.max(peakKB, treeRssKB(proc.pid));
  }, everyMs);
  return {
    stop() {
      clearInterval(timer);
      return peakKB;
    },
  };
}

function measureSweep(name: string, args: { jobs: number; synthetic?: boolean; cli?: boolean; defaults?: boolean }): Promise<SweepBenchRow> {
  return new Promise((resolve, reject) => {
    const proc = spawn(process.execPath, [child, JSON.stringify(args)], { stdio: ['ignore', 'pipe', 'inherit'] });
    let out = '';
    proc.stdout.on('data', (d: Buffer) => (out += d.toString('utf8')));
    const rss = watchTreeRss(proc, SAMPLE_MS);
    proc.on('error', reject);
    proc.on('close', (code) => {
      const peakKB = rss.stop();
      if (code !== 0) return reject(new Error(`sweep child exited with ${code}`));
      const row = JSON.parse(out.trim().split('\n').at(-1)!) as Omit<SweepBenchRow, 'name' | 'level' | 'peakTreeRssMB' | 'coreUse'>;
      const coreUse = row.cpuSeconds === null ? null : Math.round((row.cpuSeconds / (row.seconds * availableParallelism())) * 100) / 100;
      const level = args.defaults ? 'defaults' : args.cli ? 'cli' : 'library';
      resolve({ name, level, ...row, peakTreeRssMB: Math.max(peakKB / 1024, row.peakRssMB), coreUse });
    });
  });
}

export async function runSweepBench(): Promise<SweepBenchRow[]> {
  const rows: SweepBenchRow[] = [];
  for (let k = 0; k < PAIRS; k++) {
    rows.push(await measureSweep(`catalogue, default settings, no timing (pair ${k + 1})`, { jobs: 1 }));
    rows.push(await measureSweep(`catalogue, default settings, no timing (pair ${k + 1})`, { jobs: 2 }));
    rows.push(await measureSweep(`catalogue via stepgauge run (pair ${k + 1})`, { jobs: 1, cli: true }));
    rows.push(await measureSweep(`catalogue via stepgauge run (pair ${k + 1})`, { jobs: 2, cli: true }));
  }
  for (let k = 0; k < DEFAULT_PAIRS; k++) {
    rows.push(await measureSweep(`catalogue via stepgauge run with its defaults (pair ${k + 1})`, { jobs: 1, cli: true, defaults: true }));
    rows.push(await measureSweep(`catalogue via stepgauge run with its defaults (pair ${k + 1})`, { jobs: 2, cli: true, defaults: true }));
  }
  rows.push(await measureSweep('synthetic 10,000 runs (oscillator, 10 methods x 1,000 tolerances)', { jobs: 2, synthetic: true }));
  return rows;
}

/** Per pair and median speed-up of jobs 2 over jobs 1 on the catalogue, at one level. */
export function sweepSpeedups(rows: readonly SweepBenchRow[], level: SweepBenchRow['level'] = 'library'): { pairs: number[]; median: number } {
  const pairs: number[] = [];
  const atLevel = rows.filter((r) => r.level === level && !r.name.startsWith('synthetic'));
  for (let i = 0; i + 1 < atLevel.length; i += 2) {
    const one = atLevel[i]!;
    const two = atLevel[i + 1]!;
    if (one.jobs === 1 && two.jobs === 2 && one.runs === two.runs) pairs.push(one.seconds / two.seconds);
  }
  return { pairs, median: pairs.length ? median(pairs) : NaN };
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const rows = await runSweepBench();
  console.table(rows);
  for (const level of ['library', 'cli', 'defaults'] as const) {
    const s = sweepSpeedups(rows, level);
    console.log(`speed-up jobs 2 / jobs 1 (${level}): ${s.pairs.map((x) => x.toFixed(2)).join(', ')} (median ${s.median.toFixed(2)}x)`);
  }
}
