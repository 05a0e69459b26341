// External programs (issue 25): what the program protocol costs.
//  - lines overhead: the round trip of a request to a kept process (protocol lines) answering
//    with a short trajectory (target: at most 2 ms per run), and, for a real trajectory, the time
//    beyond the solve time the program reports (its JSON writing, the pipe, the parse).
//  - Python lines vs once: 50 runs of the SciPy example (DOP853) in one kept process against one
//    process per run. Target: lines at least 5x faster. Skipped without python3 + SciPy.
// `node dist/bench/programs.js` alone, or from `npm run bench`.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Method, Problem, Setting } from '../src/core/types.js';
import { catalogue } from '../problems/index.js';
import { loadProgramFile } from '../src/methods/program/file.js';
import { programMethod } from '../src/methods/program/method.js';
import { stopKeptPrograms } from '../src/methods/program/bridge.js';

const here = dirname(fileURLToPath(import.meta.url));
const root = here.endsWith(join('dist', 'bench')) ? join(here, '..', '..') : join(here, '..');
const examples = join(root, 'examples', 'programs');

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

function problem(id: string): Problem {
  return catalogue.find((p) => p.id === id)!;
}

/** Seconds for `runs` solves, and the per-run overheads beyond the program's reported seconds. */
function timeSolves(method: Method, p: Problem, setting: Setting, runs: number): { total: number; overheadMs: number[] } {
  const overheadMs: number[] = [];
  const start = performance.now();
  for (let k = 0; k < runs; k++) {
    const t0 = performance.now();
    const r = method.solve(p, setting, { maxSteps: 1e6 });
    const wall = performance.now() - t0;
    if (r.status !== 'ok') throw new Error(`${method.id}: ${r.status} ${r.message ?? ''}`);
    const own = method.solveSeconds?.(p, setting, { maxSteps: 1e6 });
    if (own?.basis === 'reported') overheadMs.push(wall - own.seconds * 1000);
  }
  return { total: (performance.now() - start) / 1000, overheadMs };
}

export function runProgramsBench(): Record<string, unknown>[] {
  const rows: Record<string, unknown>[] = [];
  const setting = { rtol: 1e-6, atol: 1e-6 };
  // The protocol's own cost: a kept Node process answering with 11 states (the test suite's
  // well-behaved fixture program), so nearly all of the round trip is request, pipe and parse.
  const tmp0 = mkdtempSync(join(tmpdir(), 'sg-bench-programs-'));
  try {
    const file = join(tmp0, 'small.yaml');
    writeFileSync(file, `id: small-answer\nname: 11-state answer\nprogram: [node, ${join(root, 'test', 'fixtures', 'programs', 'faulty.mjs')}, --mode, ok, --lines]\nsettings: tolerance\nprotocol: lines\n`);
    const small = programMethod(loadProgramFile(file));
    const harmonic = problem('harmonic-oscillator');
    const ms: number[] = [];
    for (let k = 0; k < 320; k++) {
      const t0 = performance.now();
      const r = small.solve(harmonic, setting, { maxSteps: 1e6 });
      if (r.status !== 'ok') throw new Error(`small-answer: ${r.status} ${r.message ?? ''}`);
      if (k >= 20) ms.push(performance.now() - t0);
    }
    rows.push({ row: 'lines round trip, 11 reported states (protocol cost)', runs: 300, medianMs: median(ms), target: '<= 2 ms', met: median(ms) <= 2 });
  } finally {
    stopKeptPrograms();
    rmSync(tmp0, { recursive: true, force: true });
  }
  // A real trajectory: the Node example on kepler-eccentric (2564 reported steps at rtol 1e-6);
  // beyond its reported solve time this includes its own JSON writing and the pipe.
  const kepler = problem('kepler-eccentric');
  const node = programMethod(loadProgramFile(join(examples, 'node-bogacki-shampine-lines.yaml')));
  timeSolves(node, kepler, setting, 20); // start the process, warm both sides
  const n = timeSolves(node, kepler, setting, 200);
  const reported = node.solve(kepler, setting, { maxSteps: 1e6 }).reportedPoints ?? 0;
  rows.push({
    row: `lines, beyond the reported solve time (node example, kepler-eccentric, ${reported} states)`,
    runs: 200,
    medianMs: median(n.overheadMs),
    note: `${((median(n.overheadMs) * 1000) / Math.max(1, reported)).toFixed(2)} us per reported state`,
  });
  stopKeptPrograms();

  const scipy = spawnSync('python3', ['-c', 'import scipy.integrate'], { encoding: 'utf8' }).status === 0;
  if (!scipy) {
    rows.push({ row: 'python lines vs once, 50 runs', note: 'skipped: python3 with SciPy not available' });
    return rows;
  }
  const tmp = mkdtempSync(join(tmpdir(), 'sg-bench-programs-'));
  try {
    const onceFile = join(tmp, 'scipy-once.yaml');
    // The same script: it answers every line of its input, so with one request it is protocol once.
    writeFileSync(onceFile, `id: scipy-dop853-once\nname: SciPy DOP853, one process per run\nprogram: [python3, ${join(examples, 'python', 'propagate.py')}, --method, DOP853]\nsettings: tolerance\nprotocol: once\n`);
    const lines = programMethod(loadProgramFile(join(examples, 'scipy-dop853.yaml')));
    const once = programMethod(loadProgramFile(onceFile));
    const s = { rtol: 1e-6, atol: 1e-6 };
    lines.solve(kepler, s, { maxSteps: 1e6 }); // start the kept process
    const l = timeSolves(lines, kepler, s, 50).total;
    const o = timeSolves(once, kepler, s, 50).total;
    rows.push({ row: 'python (SciPy DOP853, kepler-eccentric, rtol 1e-6) 50 runs, lines', runs: 50, seconds: l });
    rows.push({ row: 'python (SciPy DOP853, kepler-eccentric, rtol 1e-6) 50 runs, once', runs: 50, seconds: o });
    rows.push({ row: 'python once / lines', ratio: o / l, target: '>= 5x', met: o / l >= 5 });
  } finally {
    stopKeptPrograms();
    rmSync(tmp, { recursive: true, force: true });
  }
  return rows;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  for (const r of runProgramsBench()) console.log(JSON.stringify(r));
}
