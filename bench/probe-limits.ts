// Probes behind two missed targets, run by hand: `node dist/bench/probe-limits.js [kepler|buffers]`.
// They are not part of `npm run bench` and set no target; bench/README.md quotes what they show.
//
// kepler: dormand-prince-54 on kepler-eccentric at rtol = atol = 1e-12, the product's solve next
//   to a hand-written version of the same pair with the two-body right-hand side written into
//   the step in scalar locals (no arrays at all). The second cannot be offered to users: their f
//   takes (t, y, dy) arrays. It shows what V8 reaches on this machine when no state passes
//   through memory, so the gap to the 25 ns target can be read against it.
// buffers: the 100-state linear right-hand side of the floor benchmark called 2000 times with
//   the same two buffers held in the loop's own constants, then with the same buffers read from
//   an array. Under callgrind (instruction counts do not drift with the machine's load):
//     valgrind --tool=callgrind node --single-threaded dist/bench/probe-limits.js buffers-constant
//     valgrind --tool=callgrind node --single-threaded dist/bench/probe-limits.js buffers-variable
// The Kepler pair the same way: `kepler-product N` and `kepler-scalar N` make N solves of one
// kind; the difference between N = 100 and N = 300, divided by the evaluations, is instructions
// per evaluation with start-up and compilation taken out.
// `stiff-solves <method-id> <rtol> N` does the same for an implicit method on robertson (atol =
// rtol times the problem's atolScale, as the catalogue sets it).
import { fileURLToPath } from 'node:url';
import { dormandPrince54 } from '../src/methods/explicit/index.js';
import { DORMAND_PRINCE_54 as DP } from '../src/methods/explicit/tableaus/dormand-prince-54.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';
import { denseLinearProblem, median, medianMs } from './floor.js';
import { DEFAULT_MAX_STEPS } from '../src/core/defaults.js';
import { robertson } from '../problems/robertson.js';
import { implicitMethods } from '../src/methods/implicit/index.js';

const a = DP.a;
const [a21] = a[1]!;
const [a31, a32] = a[2]!;
const [a41, a42, a43] = a[3]!;
const [a51, a52, a53, a54] = a[4]!;
const [a61, a62, a63, a64, a65] = a[5]!;
const [b1, , b3, b4, b5, b6] = DP.b;
const e = DP.b.map((v, i) => v - DP.bHat![i]!);
const [e1, , e3, e4, e5, e6, e7] = e;

interface ScalarResult {
  nfev: number;
  x: number;
}

/**
 * The pair on the planar two-body problem (mu = 1), every stage in locals; standard control. The
 * problem is autonomous, so the stage times are never formed.
 */
function scalarKepler(rtol: number, atol: number, tEnd: number, y0: readonly number[], hStart: number): ScalarResult {
  let x0 = y0[0]!, x1 = y0[1]!, x2 = y0[2]!, x3 = y0[3]!;
  let t = 0;
  let h = hStart;
  let nfev = 1;
  let r2 = x0 * x0 + x1 * x1;
  let g = -1 / (r2 * Math.sqrt(r2));
  let k10 = x2, k11 = x3, k12 = g * x0, k13 = g * x1;
  let last = false;
  let rejected = false;
  for (;;) {
    if (t + h >= tEnd) {
      h = tEnd - t;
      last = true;
    }
    let s0 = x0 + h * (a21! * k10), s1 = x1 + h * (a21! * k11), s2 = x2 + h * (a21! * k12), s3 = x3 + h * (a21! * k13);
    r2 = s0 * s0 + s1 * s1; g = -1 / (r2 * Math.sqrt(r2));
    const k20 = s2, k21 = s3, k22 = g * s0, k23 = g * s1;
    s0 = x0 + h * (a31! * k10 + a32! * k20); s1 = x1 + h * (a31! * k11 + a32! * k21);
    s2 = x2 + h * (a31! * k12 + a32! * k22); s3 = x3 + h * (a31! * k13 + a32! * k23);
    r2 = s0 * s0 + s1 * s1; g = -1 / (r2 * Math.sqrt(r2));
    const k30 = s2, k31 = s3, k32 = g * s0, k33 = g * s1;
    s0 = x0 + h * (a41! * k10 + a42! * k20 + a43! * k30); s1 = x1 + h * (a41! * k11 + a42! * k21 + a43! * k31);
    s2 = x2 + h * (a41! * k12 + a42! * k22 + a43! * k32); s3 = x3 + h * (a41! * k13 + a42! * k23 + a43! * k33);
    r2 = s0 * s0 + s1 * s1; g = -1 / (r2 * Math.sqrt(r2));
    const k40 = s2, k41 = s3, k42 = g * s0, k43 = g * s1;
    s0 = x0 + h * (a51! * k10 + a52! * k20 + a53! * k30 + a54! * k40); s1 = x1 + h * (a51! * k11 + a52! * k21 + a53! * k31 + a54! * k41);
    s2 = x2 + h * (a51! * k12 + a52! * k22 + a53! * k32 + a54! * k42); s3 = x3 + h * (a51! * k13 + a52! * k23 + a53! * k33 + a54! * k43);
    r2 = s0 * s0 + s1 * s1; g = -1 / (r2 * Math.sqrt(r2));
    const k50 = s2, k51 = s3, k52 = g * s0, k53 = g * s1;
    s0 = x0 + h * (a61! * k10 + a62! * k20 + a63! * k30 + a64! * k40 + a65! * k50);
    s1 = x1 + h * (a61! * k11 + a62! * k21 + a63! * k31 + a64! * k41 + a65! * k51);
    s2 = x2 + h * (a61! * k12 + a62! * k22 + a63! * k32 + a64! * k42 + a65! * k52);
    s3 = x3 + h * (a61! * k13 + a62! * k23 + a63! * k33 + a64! * k43 + a65! * k53);
    r2 = s0 * s0 + s1 * s1; g = -1 / (r2 * Math.sqrt(r2));
    const k60 = s2, k61 = s3, k62 = g * s0, k63 = g * s1;
    const n0 = x0 + h * (b1! * k10 + b3! * k30 + b4! * k40 + b5! * k50 + b6! * k60);
    const n1 = x1 + h * (b1! * k11 + b3! * k31 + b4! * k41 + b5! * k51 + b6! * k61);
    const n2 = x2 + h * (b1! * k12 + b3! * k32 + b4! * k42 + b5! * k52 + b6! * k62);
    const n3 = x3 + h * (b1! * k13 + b3! * k33 + b4! * k43 + b5! * k53 + b6! * k63);
    r2 = n0 * n0 + n1 * n1; g = -1 / (r2 * Math.sqrt(r2));
    const k70 = n2, k71 = n3, k72 = g * n0, k73 = g * n1;
    nfev += 6;
    const w0 = atol + rtol * Math.max(Math.abs(x0), Math.abs(n0));
    const w1 = atol + rtol * Math.max(Math.abs(x1), Math.abs(n1));
    const w2 = atol + rtol * Math.max(Math.abs(x2), Math.abs(n2));
    const w3 = atol + rtol * Math.max(Math.abs(x3), Math.abs(n3));
    const q0 = (h * (e1! * k10 + e3! * k30 + e4! * k40 + e5! * k50 + e6! * k60 + e7! * k70)) / w0;
    const q1 = (h * (e1! * k11 + e3! * k31 + e4! * k41 + e5! * k51 + e6! * k61 + e7! * k71)) / w1;
    const q2 = (h * (e1! * k12 + e3! * k32 + e4! * k42 + e5! * k52 + e6! * k62 + e7! * k72)) / w2;
    const q3 = (h * (e1! * k13 + e3! * k33 + e4! * k43 + e5! * k53 + e6! * k63 + e7! * k73)) / w3;
    const err = Math.sqrt((q0 * q0 + q1 * q1 + q2 * q2 + q3 * q3) / 4);
    // The product's standard controller: safety 0.9, factor in [0.2, 10], no growth after a rejection.
    const raw = err > 0 ? 0.9 * Math.exp(Math.log(err) * -0.2) : 10;
    if (err <= 1) {
      t = last ? tEnd : t + h;
      x0 = n0; x1 = n1; x2 = n2; x3 = n3;
      k10 = k70; k11 = k71; k12 = k72; k13 = k73;
      if (last) break;
      h *= Math.min(rejected ? 1 : 10, Math.max(0.2, raw));
      rejected = false;
    } else {
      h *= Math.min(1, Math.max(0.2, raw));
      rejected = true;
      last = false;
    }
  }
  return { nfev, x: x0 };
}

/** Median ns per evaluation of one solve, timed the way the floor benchmark times (tinybench). */
function nsPerEval(solve: () => number, timeMs: number): number {
  const nfev = solve();
  return (medianMs(() => void solve(), timeMs).ms * 1e6) / nfev;
}

const KEPLER = { ...keplerEccentric, checkTimes: [] };
const product = () => dormandPrince54.solve(KEPLER, { rtol: 1e-12, atol: 1e-12 }, { checkTimes: [], maxSteps: 1e7 }).counts.nfev;
const scalar = () => scalarKepler(1e-12, 1e-12, KEPLER.tEnd, KEPLER.y0, 1e-3).nfev;

function kepler(): void {
  // Alternate, so a change in machine speed hits both alike.
  const rows: { product: number; scalar: number }[] = [];
  for (let k = 0; k < 5; k++) rows.push({ product: nsPerEval(product, 200), scalar: nsPerEval(scalar, 200) });
  const prod = median(rows.map((r) => r.product));
  const scal = median(rows.map((r) => r.scalar));
  console.log(JSON.stringify({ probe: 'kepler', productNsPerEval: prod, scalarLocalsNsPerEval: scal, nfevProduct: product(), nfevScalar: scalar() }));
}

function buffers(mode: 'constant' | 'variable'): void {
  const p = denseLinearProblem();
  const f = p.f;
  const y = Float64Array.from(p.y0);
  const dy = new Float64Array(p.dimension);
  const held = [y, dy];
  const pick = new Int32Array(2);
  const calls = 2000;
  const constant = () => {
    for (let i = 0; i < calls; i++) f(i, y, dy);
  };
  const variable = () => {
    for (let i = 0; i < calls; i++) f(i, held[pick[i & 1]!]!, held[1 + pick[i & 1]!]!);
  };
  const run = mode === 'constant' ? constant : variable;
  // Fixed repetitions, not a time budget, so the instruction counts under callgrind repeat.
  for (let w = 0; w < 20; w++) run();
  const times: number[] = [];
  for (let r = 0; r < 15; r++) {
    const t0 = performance.now();
    run();
    times.push(((performance.now() - t0) * 1e3) / calls);
  }
  console.log(JSON.stringify({ probe: `buffers-${mode}`, microsecondsPerCall: median(times) }));
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const which = process.argv[2] ?? 'kepler';
  if (which === 'kepler') kepler();
  else if (which === 'kepler-product' || which === 'kepler-scalar') {
    // A fixed number of solves of one kind, for instruction counts: 'solves' tells how many.
    const solves = Number(process.argv[3] ?? 100);
    const solve = which === 'kepler-product' ? product : scalar;
    let nfev = 0;
    for (let i = 0; i < solves; i++) nfev += solve();
    console.log(JSON.stringify({ probe: which, solves, nfev }));
  } else if (which === 'stiff-solves') {
    const method = implicitMethods.find((m) => m.id === process.argv[3]);
    if (!method) throw new Error(`probe-limits: no implicit method '${process.argv[3]}'`);
    const rtol = Number(process.argv[4]);
    const solves = Number(process.argv[5] ?? 100);
    const setting = { rtol, atol: rtol * (robertson.atolScale as number) };
    let counts = null;
    for (let i = 0; i < solves; i++) counts = method.solve(robertson, setting, { maxSteps: DEFAULT_MAX_STEPS }).counts;
    console.log(JSON.stringify({ probe: which, method: method.id, rtol, solves, counts }));
  } else if (which === 'buffers-constant') buffers('constant');
  else if (which === 'buffers-variable') buffers('variable');
  else {
    console.error(`probe-limits: unknown probe '${which}' (expected kepler, kepler-product, kepler-scalar, buffers-constant or buffers-variable)`);
    process.exitCode = 2;
  }
}
