// `npm run bench`: floor, peers, then (when their modules are present) the implicit-method and
// sweep benchmarks; prints every table and writes bench/results.json with the machine it ran on.
// The optional modules are loaded by path at run time so this file builds without them.
// Each timed row runs in a fresh child process (`--row`): methods sharing one process share V8's
// type feedback (engine call sites, inlined right-hand sides), which measured up to 1.7x slower
// per evaluation than a method timed alone; the suite-order numbers say more about the order than
// about the method. The searches (exact, deterministic counts) stay in this process.
import { existsSync, mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { execFileSync } from 'node:child_process';
import type { Method, Problem, Setting } from '../src/core/types.js';
import { findMethod } from '../src/methods/registry.js';
import { benchProblem, floorRow, runFloorBench, type FloorRow } from './floor.js';
import { runPeersBench, type PeerRow } from './peers.js';

const here = dirname(fileURLToPath(import.meta.url));
/** bench/ in the source tree, whether this runs from dist/bench or from bench. */
const benchDir = here.endsWith(join('dist', 'bench')) ? join(here, '..', '..', 'bench') : here;

type Row = Record<string, unknown>;

function fmt(v: unknown): string {
  if (typeof v === 'number') {
    if (Number.isInteger(v) && Math.abs(v) < 1e7) return String(v);
    return Number.isFinite(v) ? v.toPrecision(3) : String(v);
  }
  if (v === null || v === undefined) return '-';
  if (typeof v === 'object') return JSON.stringify(v);
  return String(v);
}

export function table(title: string, rows: readonly Row[], columns: readonly string[]): string {
  const cells = rows.map((r) => columns.map((c) => fmt(r[c])));
  const width = columns.map((c, i) => Math.max(c.length, ...cells.map((r) => r[i]!.length)));
  const line = (r: readonly string[]) => '| ' + r.map((v, i) => v.padEnd(width[i]!)).join(' | ') + ' |';
  return [
    `### ${title}`,
    '',
    line(columns),
    '|' + width.map((w) => '-'.repeat(w + 2)).join('|') + '|',
    ...cells.map(line),
    '',
  ].join('\n');
}

async function optional<T>(file: string, exportName: string): Promise<((...a: unknown[]) => T | Promise<T>) | null> {
  const path = join(here, file);
  if (!existsSync(path)) return null;
  const mod = (await import(pathToFileURL(path).href)) as Record<string, unknown>;
  const fn = mod[exportName];
  return typeof fn === 'function' ? (fn as (...a: unknown[]) => T | Promise<T>) : null;
}

function machine(loadStart: number[]) {
  const c = cpus();
  return {
    cpu: c[0]?.model ?? 'unknown',
    cores: c.length,
    node: process.version,
    platform: process.platform,
    arch: process.arch,
    date: new Date().toISOString(),
    loadAverageStart: loadStart,
    loadAverageEnd: loadavg(),
  };
}

interface RowRequest {
  problem: string;
  method: string;
  setting: Setting;
  timeMs: number;
}

/** floorRow in a fresh node process. */
function isolatedRow(problem: Problem, m: Method, setting: Setting, timeMs: number): FloorRow {
  const req: RowRequest = { problem: problem.id, method: m.id, setting, timeMs };
  const out = execFileSync(process.execPath, [fileURLToPath(import.meta.url), '--row', JSON.stringify(req)], {
    encoding: 'utf8',
    maxBuffer: 1 << 24,
  });
  return JSON.parse(out.trim().split('\n').at(-1)!) as FloorRow;
}

function childRow(arg: string): void {
  const req = JSON.parse(arg) as RowRequest;
  const m = findMethod(req.method);
  if (!m) throw new Error(`unknown method ${req.method}`);
  console.log(JSON.stringify(floorRow(benchProblem(req.problem), m, req.setting, req.timeMs)));
}

/** The performance targets, read off the rows. */
function targets(floor: readonly FloorRow[], peers: readonly PeerRow[]): Row[] {
  const rows: Row[] = [];
  const dp = floor.find((r) => r.problem === 'kepler-eccentric' && r.method === 'dormand-prince-54');
  if (dp) rows.push({ target: 'dormand-prince-54, kepler-eccentric, rtol 1e-12: ns per f', measured: dp.nsPerEval, limit: 25, met: dp.nsPerEval <= 25 });
  const at8 = peers.filter((r) => r.target === 1e-8 && r.medianMs !== null && r.method !== 'odex');
  const fastest = at8.sort((a, b) => a.medianMs! - b.medianMs!)[0];
  if (fastest) {
    rows.push({ target: `fastest at final error 1e-8 (${fastest.method}): ms`, measured: fastest.medianMs, limit: 0.5, met: fastest.medianMs! < 0.5 });
    rows.push({ target: `fastest at final error 1e-8 (${fastest.method}): speed-up vs odex`, measured: fastest.speedupVsOdex, limit: 3, met: (fastest.speedupVsOdex ?? 0) >= 3 });
  }
  const linear = floor.filter((r) => r.problem.startsWith('dense-linear'));
  const worst = [...linear].sort((a, b) => b.ratio - a.ratio)[0];
  if (worst) rows.push({ target: `dense-linear-100: solve / bare f loop, worst method (${worst.method})`, measured: worst.ratio, limit: 1.5, met: worst.ratio <= 1.5 });
  const dpLinear = linear.find((r) => r.method === 'dormand-prince-54');
  if (dpLinear) rows.push({ target: 'dense-linear-100: solve / bare f loop, dormand-prince-54', measured: dpLinear.ratio, limit: 1.5, met: dpLinear.ratio <= 1.5 });
  return rows;
}

async function main(): Promise<void> {
  const loadStart = loadavg();
  const out: Record<string, unknown> = {};
  const show = (s: string) => console.log(s);

  const floor = runFloorBench(1000, isolatedRow);
  out.floor = floor;
  show(
    table('floor: solve vs the bare right-hand-side loop (same number of calls)', floor as unknown as Row[], [
      'problem', 'method', 'setting', 'nfev', 'solveMs', 'floorMs', 'nsPerEval', 'floorNsPerEval', 'overheadNsPerEval', 'ratio',
      'floorSolverArgsMs', 'ratioSolverArgs', 'samples', 'solveRmePercent',
    ]),
  );

  const peers = await runPeersBench(1000, isolatedRow);
  out.peers = peers;
  show(
    table('peers: kepler-eccentric at matched achieved final error', peers as unknown as Row[], [
      'target', 'method', 'rtol', 'achieved', 'nfev', 'medianMs', 'nsPerEval', 'speedupVsOdex', 'samples', 'rmePercent', 'note',
    ]),
  );

  out.targets = targets(floor, peers);
  show(table('targets', out.targets as Row[], ['target', 'measured', 'limit', 'met']));

  const stiff = await optional<Row[]>('stiff.js', 'runStiffBench');
  if (stiff) {
    const rows = await stiff();
    out.stiff = rows;
    show(table('stiff: implicit methods on Robertson', rows, Object.keys(rows[0] ?? {})));
  }
  const programs = await optional<Row[]>('programs.js', 'runProgramsBench');
  if (programs) {
    const rows = await programs();
    out.programs = rows;
    show(table('programs: external-program protocol overhead', rows, ['row', 'runs', 'medianMs', 'seconds', 'ratio', 'target', 'met', 'note']));
  }
  const heap = await optional<Row[]>('heap.js', 'runHeapBench');
  if (heap) {
    const rows = await heap();
    out.heap = rows;
    show(table('heap: bytes allocated per step (slope between a short and a long solve)', rows, Object.keys(rows[0] ?? {})));
  }
  const sweep = await optional<Row[]>('sweep.js', 'runSweepBench');
  if (sweep) {
    const rows = await sweep();
    out.sweep = rows;
    show(table('sweep: catalogue at jobs 1 and 2, 10,000-run memory sweep', rows, Object.keys(rows[0] ?? {})));
    const speed = await optional<{ pairs: number[]; median: number }>('sweep.js', 'sweepSpeedups');
    if (speed) {
      const lib = await speed(rows, 'library');
      const cli = await speed(rows, 'cli');
      const defaults = await speed(rows, 'defaults');
      const two = rows.filter((r) => r.jobs === 2 && r.level !== 'defaults' && !String(r.name).startsWith('synthetic')).map((r) => Number(r.seconds));
      const synthetic = rows.find((r) => String(r.name).startsWith('synthetic'));
      const pairsText = (s: { pairs: number[] }) => s.pairs.map((x) => x.toFixed(2)).join(', ');
      const sweepTargets: Row[] = [
        { target: 'catalogue sweep, --jobs 2, no timing: slowest of the pairs, s', measured: Math.max(...two), limit: 20, met: Math.max(...two) < 20 },
        { target: `catalogue, stepgauge run: --jobs 1 / --jobs 2, median of ${cli.pairs.length} pairs (${pairsText(cli)})`, measured: cli.median, limit: 1.7, met: cli.median >= 1.7 },
        { target: `catalogue, runSweep: --jobs 1 / --jobs 2, median of ${lib.pairs.length} pairs (${pairsText(lib)})`, measured: lib.median, limit: 1.7, met: lib.median >= 1.7 },
      ];
      if (defaults.pairs.length > 0) {
        sweepTargets.push({
          target: `catalogue, stepgauge run with its defaults (runs timed, report): --jobs 1 / --jobs 2, median of ${defaults.pairs.length} (${pairsText(defaults)})`,
          measured: defaults.median,
          limit: 1.7,
          met: defaults.median >= 1.7,
        });
      }
      if (synthetic) {
        const mb = Number(synthetic.peakTreeRssMB);
        sweepTargets.push({ target: '10,000-run sweep: peak resident memory, sweep process and workers, MB', measured: mb, limit: 300, met: mb < 300 });
      }
      (out.targets as Row[]).push(...sweepTargets);
      show(table('sweep targets', sweepTargets, ['target', 'measured', 'limit', 'met']));
    }
  }

  const dispersion = await optional<Row[]>('dispersion.js', 'runDispersionBench');
  if (dispersion) {
    const rows = await dispersion();
    out.dispersion = rows;
    show(table('dispersion: 100,000 runs whole and in 8 shards, then merged', rows, Object.keys(rows[0] ?? {})));
    const whole = rows[0]!;
    const merge = rows.at(-1)!;
    const targets: Row[] = [
      { target: `${whole.runs}-run dispersion sweep: peak resident memory, process tree, MB`, measured: whole.peakTreeRssMB, limit: 500, met: Number(whole.peakTreeRssMB) < 500 },
      { target: 'merge of 8 shards of 12,500 runs: wall seconds', measured: merge.seconds, limit: 60, met: Number(merge.seconds) < 60 },
    ];
    (out.targets as Row[]).push(...targets);
    show(table('dispersion targets', targets, ['target', 'measured', 'limit', 'met']));
  }
  const compiled = await optional<{ rows: Row[]; notes: string[] }>('compiled-peers.js', 'runCompiledPeersBench');
  if (compiled) {
    const { rows, notes } = await compiled();
    out.compiledPeers = { rows, notes };
    for (const n of notes) show(`note: ${n}`);
    show(table('compiled peers at matched final error (Boost.Odeint, SUNDIALS CVODE; stepgauge as `stepgauge run` records it)', rows, ['problem', 'target', 'side', 'method', 'met', 'rtol', 'achieved', 'nfev', 'medianMs', 'nsPerEval', 'note']));
    const targetsOf = await optional<Row[]>('compiled-peers.js', 'compiledTargets');
    if (targetsOf) {
      const t = await targetsOf(rows);
      (out.targets as Row[]).push(...t);
      show(table('compiled peer targets', t, ['target', 'stepgauge', 'peer', 'measured', 'limit', 'met']));
    }
  }
  const isolation = await optional<Row[]>('isolation.js', 'runIsolationBench');
  if (isolation) {
    const rows = await isolation();
    out.isolation = rows;
    show(table('isolation: a run timed inside the catalogue sweep against the same run swept alone (stepgauge run)', rows, Object.keys(rows[0] ?? {})));
    const ratios = rows.map((r) => Number(r.ratio)).filter(Number.isFinite);
    const worst = ratios.reduce((w, r) => (Math.abs(r - 1) > Math.abs(w - 1) ? r : w), 1);
    const target: Row = { target: 'time recorded inside the catalogue sweep / the same run swept alone, worst row', measured: worst, limit: '0.9-1.1', met: rows.every((r) => r.withinTenPercent) };
    (out.targets as Row[]).push(target);
    show(table('isolation target', [target], ['target', 'measured', 'limit', 'met']));
  }

  const env = machine(loadStart);
  show(`machine: ${env.cpu}, ${env.cores} cores, node ${env.node}, ${env.date}, load average ${env.loadAverageStart.map((v) => v.toFixed(2)).join(' ')} (start) / ${env.loadAverageEnd.map((v) => v.toFixed(2)).join(' ')} (end)`);
  const doc = { format: 'stepgauge-bench', version: 1, machine: env, ...out };
  mkdirSync(benchDir, { recursive: true });
  const target = join(benchDir, 'results.json');
  const tmp = `${target}.tmp-${process.pid}`;
  writeFileSync(tmp, JSON.stringify(doc, null, 2) + '\n');
  renameSync(tmp, target);
  console.log(`wrote ${target}`);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  if (process.argv[2] === '--row') childRow(process.argv[3]!);
  else main().catch((e: unknown) => {
    console.error(e);
    process.exitCode = 1;
  });
}
