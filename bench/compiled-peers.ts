// Compiled peers side by side with stepgauge at matched achieved error: Boost.Odeint (Fehlberg
// 7(8) and Dormand-Prince 5 controlled, Bulirsch-Stoer, Rosenbrock 4) and SUNDIALS CVODE (BDF,
// dense and band direct solvers), built here from bench/compiled/peers.cpp with g++ -O2 against
// the Debian packages (libboost-dev, libsundials-dev), with NDEBUG (uBLAS's debug checks, on
// by default, made Rosenbrock 4 many times slower and abort at loose tolerances). Not part of npm test; a missing compiler
// or package skips its peers with a note.
//
// Matching: for every peer and every stepgauge method the loosest rtol whose final error meets
// the target is found exactly as `stepgauge choose` finds it (loosestRtol of src/sweep/choose.ts:
// the decade grid 1e-2..1e-15, then 8 bisections of log10 rtol; atol = rtol times the problem's
// atolScale), with the error in the problem's own scale against its own reference. stepgauge's
// chosen setting is then timed as `stepgauge run` records it (the run swept alone, timed in its
// own process); a peer's by the compiled program itself (median CPU time of repeated solves,
// creating the integrator's objects included, as a user's program would; the wall-clock median
// is in the row's note).
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ControllerKind, Method, Problem } from '../src/core/types.js';
import { absoluteTolerance } from '../src/core/tolerance.js';
import { errorMeter } from '../src/measure/error-norm.js';
import { DEFAULT_TIMING } from '../src/measure/timing.js';
import { findMethod } from '../src/methods/registry.js';
import { chooseMethod, loosestRtol } from '../src/sweep/choose.js';
import { findProblem } from '../problems/index.js';
import type { MatchedRow } from './peers.js';

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, here.endsWith(join('dist', 'bench')) ? '../..' : '..');
const source = join(root, 'bench', 'compiled', 'peers.cpp');
const cli = join(root, 'bin', 'stepgauge.js');
/** Timing budget of each timed setting, ms (the compiled program and `stepgauge run --time-budget` alike). */
const BUDGET_MS = 1000;

interface Peer {
  problem: string;
  method: string;
  library: 'boost' | 'cvode';
}

export const COMPILED_PEERS: readonly Peer[] = [
  { problem: 'kepler-eccentric', method: 'boost-rkf78', library: 'boost' },
  { problem: 'kepler-eccentric', method: 'boost-bulirsch-stoer', library: 'boost' },
  { problem: 'kepler-eccentric', method: 'boost-dopri5', library: 'boost' },
  { problem: 'robertson', method: 'boost-rosenbrock4', library: 'boost' },
  { problem: 'robertson', method: 'cvode-dense', library: 'cvode' },
  { problem: 'brusselator-1d', method: 'cvode-band', library: 'cvode' },
];

/**
 * The targets of the issue: problem, final error, stepgauge methods matched there. A `controller`
 * entry adds rows run with that step-size controller; the targets' fastest rows leave them out.
 */
export const COMPILED_TARGETS: readonly { problem: string; target: number; methods: readonly string[]; controller?: ControllerKind }[] = [
  { problem: 'kepler-eccentric', target: 1e-8, methods: ['dormand-el-mikkawy-prince-rkn1210', 'dormand-el-mikkawy-prince-rkn86', 'verner-87', 'verner-98', 'verner-76', 'dormand-prince-853', 'verner-65', 'dormand-prince-54', 'tsitouras-54'] },
  { problem: 'kepler-eccentric', target: 1e-10, methods: ['dormand-el-mikkawy-prince-rkn1210', 'dormand-el-mikkawy-prince-rkn86', 'verner-87', 'verner-98', 'verner-76', 'dormand-prince-853', 'verner-65'] },
  { problem: 'robertson', target: 1e-7, methods: ['hairer-wanner-rodas4', 'hairer-wanner-ros4-l-stable', 'radau-iia-5', 'bdf-variable', 'trapezoidal-bdf2'] },
  { problem: 'brusselator-1d', target: 1e-6, methods: ['hairer-wanner-rodas4', 'radau-iia-5', 'bdf-variable'] },
  // Boost's dopri5 keeps its step while 0.5 <= err <= 1; the deadband controller is that rule.
  { problem: 'kepler-eccentric', target: 1e-8, methods: ['dormand-prince-54'], controller: 'deadband' },
];

export interface CompiledPeerRow extends MatchedRow {
  problem: string;
  side: 'stepgauge' | 'boost' | 'cvode';
  /** The step-size controller of a stepgauge row run with one other than the default. */
  controller?: ControllerKind;
  /** Each round's time, ms, when the bench ran more than one round. */
  roundsMs?: number[];
}

interface Build {
  binary: string | null;
  cvode: boolean;
  notes: string[];
}

function has(cmd: string, args: string[]): boolean {
  return spawnSync(cmd, args, { stdio: 'ignore' }).status === 0;
}

/** Compiles peers.cpp (cached by its hash), with CVODE when its headers are installed. */
export function buildPeers(): Build {
  const notes: string[] = [];
  if (!has('g++', ['--version'])) return { binary: null, cvode: false, notes: ['g++ not found: compiled peers skipped'] };
  if (!existsSync('/usr/include/boost/numeric/odeint.hpp')) return { binary: null, cvode: false, notes: ['Boost.Odeint headers not found (Debian libboost-dev): compiled peers skipped'] };
  const cvode = existsSync('/usr/include/cvode/cvode.h');
  if (!cvode) notes.push('SUNDIALS CVODE headers not found (Debian libsundials-dev): CVODE peers skipped');
  const text = readFileSync(source, 'utf8');
  const dir = join(tmpdir(), 'stepgauge-compiled-peers');
  mkdirSync(dir, { recursive: true });
  const binary = join(dir, `peers-${createHash('sha256').update(text).update(String(cvode)).digest('hex').slice(0, 16)}`);
  if (!existsSync(binary)) {
    const libs = cvode ? ['-DWITH_CVODE', '-lsundials_cvode', '-lsundials_nvecserial', '-lsundials_sunmatrixdense', '-lsundials_sunmatrixband', '-lsundials_sunlinsoldense', '-lsundials_sunlinsolband'] : [];
    // Libraries after the source, where the linker needs them.
    const args = ['-O2', '-DNDEBUG', '-std=c++17', ...libs.filter((l) => l.startsWith('-D')), source, '-o', binary, ...libs.filter((l) => l.startsWith('-l'))];
    const r = spawnSync('g++', args, { encoding: 'utf8' });
    if (r.status !== 0) return { binary: null, cvode, notes: [...notes, `g++ failed: ${r.stderr.split('\n').slice(0, 3).join(' ')}`] };
  }
  return { binary, cvode, notes };
}

interface PeerSolve {
  nfev: number;
  /** Median wall time of one solve. */
  medianMs: number;
  /** Median CPU time of one solve (the solving thread's clock). */
  cpuMedianMs: number;
  y: number[];
}

function peerSolve(binary: string, peer: Peer, rtol: number, atol: number, budgetMs: number): PeerSolve {
  const out = execFileSync(binary, [peer.problem, peer.method, String(rtol), String(atol), String(budgetMs)], { encoding: 'utf8', maxBuffer: 64 << 20 });
  return JSON.parse(out) as PeerSolve;
}

/** The problem's reference state at tEnd. */
function referenceAtEnd(p: Problem): Float64Array {
  const out = new Float64Array(p.dimension);
  if (p.reference.exact) p.reference.exact(p.tEnd, out);
  else out.set(p.reference.points!.find((q) => q.t === p.tEnd)!.y);
  return out;
}

/** A matched row and how to time it once (ms, and the nfev of that solve). */
interface Timed {
  row: CompiledPeerRow;
  /** wallMs: a peer's wall-clock median, when its time is CPU time. */
  time: () => { ms: number | null; nfev: number | null; wallMs?: number };
}

function peerRow(binary: string, peer: Peer, p: Problem, target: number): Timed | CompiledPeerRow {
  const meter = errorMeter(p);
  const ref = referenceAtEnd(p);
  const errorAt = (rtol: number) => {
    try {
      const s = peerSolve(binary, peer, rtol, atolFor(p, rtol), 0);
      return { s, e: meter.error(p.tEnd, Float64Array.from(s.y), ref) };
    } catch {
      return { s: null, e: NaN }; // the solver gave up at this setting: the target is not met there
    }
  };
  const found = loosestRtol(errorAt, (r) => r.e <= target);
  const base = { problem: p.id, target, side: peer.library, method: peer.method };
  if (!found) return { ...base, met: false, rtol: null, achieved: null, nfev: null, medianMs: null, nsPerEval: null, note: 'target not reached down to rtol 1e-15' };
  const row: CompiledPeerRow = { ...base, met: true, rtol: found.rtol, achieved: found.result.e, nfev: found.result.s?.nfev ?? null, medianMs: null, nsPerEval: null };
  return {
    row,
    time: () => {
      const timed = peerSolve(binary, peer, found.rtol, atolFor(p, found.rtol), BUDGET_MS);
      // The solve's CPU time: a solve of a few ms waits for a core inside its wall time on a loaded
      // machine (bench/README.md), which the stepgauge rows (runs well under a ms) mostly escape.
      return { ms: timed.cpuMedianMs, nfev: timed.nfev, wallMs: timed.medianMs };
    },
  };
}

function atolFor(p: Problem, rtol: number): number {
  const a = absoluteTolerance(p, rtol);
  if (typeof a === 'number') return a;
  // The compiled program takes one atol: every catalogue problem here scales all states alike.
  return a[0]!;
}

/** The time `stepgauge run` records for this one run, swept alone (ms), and its nfev. */
function timedAsRun(problem: string, method: string, rtol: number, controller?: ControllerKind): { ms: number | null; nfev: number | null } {
  const dir = mkdtempSync(join(tmpdir(), 'stepgauge-compiled-peers-'));
  const controlled = controller ? ['--controller', controller] : [];
  try {
    execFileSync(process.execPath, [cli, 'run', '-p', problem, '-m', method, '-t', String(rtol), ...controlled, '--time-budget', String(BUDGET_MS / 1000), '--max-steps', '10000000', '--no-report', '-q', '-o', join(dir, 'out')], {
      stdio: ['ignore', 'ignore', 'inherit'],
    });
    const run = (JSON.parse(readFileSync(join(dir, 'out', 'results.json'), 'utf8')) as { runs: { time: { medianSeconds: number | null } | null; counts: { nfev: number } }[] }).runs[0];
    const s = run?.time?.medianSeconds;
    return { ms: typeof s === 'number' ? s * 1000 : null, nfev: run?.counts.nfev ?? null };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function stepgaugeRows(p: Problem, target: number, ids: readonly string[], controller?: ControllerKind): Promise<(Timed | CompiledPeerRow)[]> {
  const methods = ids.map((id) => findMethod(id)).filter((m): m is Method => m !== undefined);
  const choice = await chooseMethod(p, methods, { target, measure: 'final', cost: 'nfev', maxSteps: 10_000_000, timing: DEFAULT_TIMING, ...(controller ? { controller } : {}) });
  return choice.candidates.map((c) => {
    const base = { problem: p.id, target, side: 'stepgauge' as const, method: c.method, ...(controller ? { controller } : {}) };
    const setting = c.run?.setting;
    if (!c.met || !setting || !('rtol' in setting)) {
      return { ...base, met: false, rtol: null, achieved: c.achieved, nfev: null, medianMs: null, nsPerEval: null, note: c.note ?? 'target not reached' };
    }
    const row: CompiledPeerRow = { ...base, met: true, rtol: setting.rtol, achieved: c.achieved, nfev: c.run?.counts.nfev ?? null, medianMs: null, nsPerEval: null };
    return { row, time: () => timedAsRun(p.id, c.method, setting.rtol, controller) };
  });
}

/**
 * Timing rounds (STEPGAUGE_BENCH_ROUNDS, default 1): every matched row is timed once per round,
 * the rows one after another, and a row's time is the median of its rounds. On a shared machine
 * the speed drifts over minutes; interleaving puts every row in the same minutes.
 */
const ROUNDS = Math.max(1, Math.floor(Number(process.env.STEPGAUGE_BENCH_ROUNDS ?? 1)) || 1);
/** Only these problems (STEPGAUGE_BENCH_PEER_PROBLEMS, comma-separated ids); all by default. */
const ONLY = process.env.STEPGAUGE_BENCH_PEER_PROBLEMS?.split(',').map((x) => x.trim()).filter(Boolean);

function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

export async function runCompiledPeersBench(rounds = ROUNDS): Promise<{ rows: CompiledPeerRow[]; notes: string[] }> {
  const build = buildPeers();
  const entries: (Timed | CompiledPeerRow)[] = [];
  for (const { problem, target, methods, controller } of COMPILED_TARGETS) {
    if (ONLY && !ONLY.includes(problem)) continue;
    const p = findProblem(problem);
    if (!p) continue;
    entries.push(...(await stepgaugeRows(p, target, methods, controller)));
    if (controller) continue; // the peers were matched with the default controller's entry
    for (const peer of COMPILED_PEERS.filter((x) => x.problem === problem)) {
      if (!build.binary || (peer.library === 'cvode' && !build.cvode)) continue;
      entries.push(peerRow(build.binary, peer, p, target));
    }
  }
  const timed = entries.filter((e): e is Timed => 'time' in e);
  const times = timed.map(() => [] as number[]);
  const walls = timed.map(() => [] as number[]);
  for (let round = 0; round < rounds; round++) {
    timed.forEach((e, k) => {
      const t = e.time();
      if (t.ms !== null) times[k]!.push(t.ms);
      if (t.wallMs !== undefined) walls[k]!.push(t.wallMs);
      if (t.nfev !== null) e.row.nfev = t.nfev;
    });
  }
  timed.forEach((e, k) => {
    const ms = times[k]!;
    if (ms.length === 0) return;
    e.row.medianMs = median(ms);
    e.row.nsPerEval = e.row.nfev ? (e.row.medianMs * 1e6) / e.row.nfev : null;
    if (rounds > 1) e.row.roundsMs = ms;
    if (walls[k]!.length > 0) e.row.note = `CPU time; wall-clock median ${median(walls[k]!).toPrecision(3)} ms`;
  });
  return { rows: entries.map((e) => ('time' in e ? e.row : e)), notes: build.notes };
}

/**
 * Ratios of the targets from the rows (null where a side is missing). With rounds, each
 * round's ratio is taken between that round's fastest rows (rows of one round ran within a minute
 * of each other) and the target's figure is the median of the rounds' ratios; `roundRatios` lists
 * them. Without rounds, the ratio of the rows' medians.
 */
export function compiledTargets(rows: readonly CompiledPeerRow[]): Record<string, unknown>[] {
  const matching = (problem: string, target: number, side: string, method?: string, controller?: ControllerKind) =>
    rows.filter((r) => r.problem === problem && r.target === target && r.side === side && r.met && r.medianMs !== null && (!method || r.method === method) && r.controller === controller);
  const fastest = (candidates: CompiledPeerRow[]) => [...candidates].sort((a, b) => a.medianMs! - b.medianMs!)[0];
  const rounds = Math.min(...rows.filter((r) => r.medianMs !== null).map((r) => r.roundsMs?.length ?? 0));
  /** Per round: the fastest time (per evaluation with `perEval`) among the candidates. */
  const roundBest = (candidates: CompiledPeerRow[], k: number, perEval: boolean) =>
    Math.min(...candidates.map((r) => r.roundsMs![k]! / (perEval ? r.nfev! : 1)));
  const out: Record<string, unknown>[] = [];
  const add = (target: string, a: CompiledPeerRow[], b: CompiledPeerRow[], limit: number, perEval = false) => {
    let measured: number | null = null;
    let roundRatios: number[] | undefined;
    if (a.length > 0 && b.length > 0) {
      if (rounds > 1 && Number.isFinite(rounds)) {
        roundRatios = Array.from({ length: rounds }, (_, k) => roundBest(a, k, perEval) / roundBest(b, k, perEval));
        measured = median(roundRatios);
      } else {
        const x = fastest(a)!;
        const y = fastest(b)!;
        measured = perEval ? x.nsPerEval! / y.nsPerEval! : x.medianMs! / y.medianMs!;
      }
    }
    out.push({
      target,
      stepgauge: fastest(a)?.method ?? null,
      peer: fastest(b)?.method ?? null,
      measured,
      limit,
      met: measured !== null && measured <= limit,
      ...(roundRatios ? { roundRatios } : {}),
    });
  };
  for (const t of [1e-8, 1e-10]) add(`kepler-eccentric ${t}: fastest stepgauge / fastest Boost`, matching('kepler-eccentric', t, 'stepgauge'), matching('kepler-eccentric', t, 'boost'), 1);
  add('robertson 1e-7: fastest stepgauge / Boost Rosenbrock 4', matching('robertson', 1e-7, 'stepgauge'), matching('robertson', 1e-7, 'boost', 'boost-rosenbrock4'), 1);
  add('robertson 1e-7: fastest stepgauge / CVODE dense', matching('robertson', 1e-7, 'stepgauge'), matching('robertson', 1e-7, 'cvode', 'cvode-dense'), 0.5);
  add('brusselator-1d 1e-6: fastest stepgauge implicit / CVODE band', matching('brusselator-1d', 1e-6, 'stepgauge'), matching('brusselator-1d', 1e-6, 'cvode', 'cvode-band'), 1.5);
  add(
    'kepler-eccentric 1e-8: dormand-prince-54 / Boost dopri5, time per evaluation',
    matching('kepler-eccentric', 1e-8, 'stepgauge', 'dormand-prince-54'),
    matching('kepler-eccentric', 1e-8, 'boost', 'boost-dopri5'),
    1.3,
    true,
  );
  // Not one of the targets: the same ratio with stepgauge under Boost's own step rule.
  add(
    'kepler-eccentric 1e-8: dormand-prince-54 --controller deadband / Boost dopri5 (the same band), time per evaluation',
    matching('kepler-eccentric', 1e-8, 'stepgauge', 'dormand-prince-54', 'deadband'),
    matching('kepler-eccentric', 1e-8, 'boost', 'boost-dopri5'),
    1.3,
    true,
  );
  return out;
}

// By hand: node dist/bench/compiled-peers.js
if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const { rows, notes } = await runCompiledPeersBench();
  for (const n of notes) console.log(`note: ${n}`);
  for (const r of rows) console.log(JSON.stringify(r));
  for (const t of compiledTargets(rows)) console.log(JSON.stringify(t));
}
