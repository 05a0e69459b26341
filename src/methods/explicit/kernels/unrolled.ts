// Straight-line step code generated from a tableau, so the pair stays pure data while its step
// runs without the short coefficient loops of the generic sweep. Every coefficient becomes a
// literal in the generated source, and every pair (and state size) gets its own function: V8
// keeps feedback per function, so the f call sites inside one kernel see only the problems that
// method runs on and stay monomorphic (and inlined) in the common one-problem case.
// For small systems the component loop is written out too (measured on the 4-state Kepler
// problem: about 15-20% off the kernel's time; loops of 4 cost more in loop control and bounds
// checks than in arithmetic). The per-component arithmetic is the same in both forms, so the
// two give bitwise equal results. Agreement with the generic engine (same counts, same state to
// rounding) is tested per kernel.
import { InputError } from '../../../core/errors.js';
import type { Rhs } from '../../../core/types.js';
import { numberLiteral } from '../../source-literal.js';
import { COMBINED_ERR3_WEIGHT } from '../control.js';
import { IO_ERR, IO_H, IO_NONFINITE, IO_RTOL, IO_T, IO_T_NEW, errorCoefficients, isFsal, workingWeights, type KernelFactory, type StageKernel, type TableauData } from '../tableau.js';

/** Largest state size whose component loop is written out; larger systems loop. */
export const UNROLL_MAX_N = 8;

/** Most right-hand-side calls in one generated function (see piecesSource). */
export const CALLS_PER_PIECE = 6;

/** A coefficient as source text that parses back to the same double. */
const lit = (v: number): string => numberLiteral(v, 'tableau coefficient');

/**
 * How component j and stage i's entry are spelled: a loop variable over the buffers, or, written
 * out for one state size, locals read once from the buffers (see localsOf).
 */
interface Indexing {
  /** Component index as text. */
  readonly j: string;
  /** Entry j of stage i. */
  stage(i: number): string;
  /** y_j at the start of the step, and y_new_j once it is computed. */
  readonly y: string;
  readonly yNew: string;
}

function loopIndexing(): Indexing {
  return { j: 'j', stage: (i) => (i === 0 ? 'K[j]' : `K[o${i} + j]`), y: 'y[j]', yNew: 'yNew[j]' };
}

/** Fixed indices into the buffers themselves (the fixed-step kernels). */
function bufferIndexing(j: number, n: number): Indexing {
  return { j: String(j), stage: (i) => `K[${i * n + j}]`, y: `y[${j}]`, yNew: `yNew[${j}]` };
}

function fixedIndexing(j: number): Indexing {
  return { j: String(j), stage: (i) => `k${i}_${j}`, y: `y_${j}`, yNew: `yn_${j}` };
}

/** sum_i w_i k_i over the nonzero weights, or null when all are zero. */
function combination(w: readonly number[], ix: Indexing): string | null {
  const terms: string[] = [];
  w.forEach((v, i) => {
    if (v !== 0) terms.push(`${lit(v)} * ${ix.stage(i)}`);
  });
  return terms.length > 0 ? terms.join(' + ') : null;
}

function stateUpdate(target: string, w: readonly number[], ix: Indexing): string {
  const sum = combination(w, ix);
  const value = sum === null ? ix.y : `${ix.y} + h * (${sum})`;
  // Written out, y_new also gets a local, which the error sums read.
  if (target === 'yNew' && ix.yNew !== 'yNew[j]') return `const ${ix.yNew} = ${value}; yNew[${ix.j}] = ${ix.yNew};`;
  return `${target}[${ix.j}] = ${value};`;
}

function stageTime(c: number): string {
  // c = 1 is the end of the step: use tNew so a step clipped onto a stop evaluates exactly there.
  return c === 1 ? 'tNew' : c === 0 ? 't' : `t + ${lit(c)} * h`;
}

function scale(ix: Indexing): string {
  return `const ya = Math.abs(${ix.y}); const yb = Math.abs(${ix.yNew}); const sk = atol[${ix.j}] + rtol * (ya > yb ? ya : yb);`;
}

/**
 * One component's contribution to the error sums, in its own block of consts: temporaries
 * declared once for the whole function (let, initialised to 0 before the stage calls) were kept
 * boxed by V8 and allocated heap numbers every step (measured: a scavenge every ~60,000 steps).
 */
function errorTerm(d: ReturnType<typeof workingWeights>, ix: Indexing, fsalStage: number | null): string {
  const e = combination(errorCoefficients(d.b, d.bHat!), ix);
  if (e === null) throw new InputError('an unrolled kernel needs nonzero error weights');
  // v - v is 0 for finite v and NaN otherwise: the finiteness check rides along with the norm.
  const bad = `bad += ${ix.yNew} - ${ix.yNew};` + (fsalStage === null ? '' : ` bad += ${ix.stage(fsalStage)} - ${ix.stage(fsalStage)};`);
  if (!d.bHat2) return `{ ${scale(ix)} const r = (h * (${e})) / sk; sum += r * r; ${bad} }`;
  const e2 = combination(errorCoefficients(d.b, d.bHat2), ix) ?? '0';
  return `{ ${scale(ix)} const a5 = (${e}) / sk; const a3 = (${e2}) / sk; s5 += a5 * a5; s3 += a3 * a3; ${bad} }`;
}

/** Final error norm from the sums, stored in io. */
function errorNorm(d: ReturnType<typeof workingWeights>): string[] {
  if (!d.bHat2) return [`io[${IO_ERR}] = Math.sqrt(sum / n);`];
  // The combined estimate of the generic engine, in the same order of operations.
  return [
    `let deno = s5 + ${lit(COMBINED_ERR3_WEIGHT)} * s3;`,
    'if (!(deno > 0)) deno = 1;',
    `io[${IO_ERR}] = Math.abs(h) * s5 * Math.sqrt(1 / (n * deno));`,
  ];
}

/**
 * The generated function's source. With `n` (at most UNROLL_MAX_N) the component loop is
 * written out for that state size; without it the kernel loops over any n.
 */
export function unrolledSource(d: TableauData, name: string, n?: number): string {
  if (!d.bHat) throw new InputError(`${name}: an unrolled kernel needs an embedded pair (bHat)`);
  if (n !== undefined && !(Number.isInteger(n) && n >= 1 && n <= UNROLL_MAX_N)) {
    throw new InputError(`${name}: written-out kernels exist for 1 <= n <= ${UNROLL_MAX_N}, got ${n}`);
  }
  const s = d.c.length;
  const fsal = isFsal(d);
  const last = s - 1;
  const lastFromA = fsal ? last - 1 : last;
  const each = (line: (ix: Indexing) => string): string[] => {
    if (n === undefined) return [`for (let j = 0; j < n; j++) ${line(loopIndexing())}`];
    const out: string[] = [];
    for (let j = 0; j < n; j++) out.push(line(fixedIndexing(j)));
    return out;
  };
  const head = [`const t = io[${IO_T}]; const tNew = io[${IO_T_NEW}]; const h = io[${IO_H}]; const rtol = io[${IO_RTOL}];`];
  if (n === undefined) for (let i = 1; i < s; i++) head.push(`const o${i} = ${i} * n;`);
  // One segment per stage evaluation (its state sum, the call, the increment), then the last.
  const segments: string[][] = [];
  const w = workingWeights(d);
  for (let i = 1; i <= lastFromA; i++) {
    const seg = each((ix) => stateUpdate('ys', w.a[i]!, ix));
    seg.push(`f(${stageTime(d.c[i]!)}, ys, kRow[${i}]);`);
    if (n === undefined) {
      if (d.increments) seg.push(...each((ix) => `${ix.stage(i)} -= ${ix.stage(0)};`));
    } else {
      // The stage just filled, read into locals (as an increment over stage 1, stored back).
      for (let j = 0; j < n; j++) {
        const at = `K[${i * n + j}]`;
        seg.push(d.increments ? `const k${i}_${j} = ${at} - k0_${j}; ${at} = k${i}_${j};` : `const k${i}_${j} = ${at};`);
      }
    }
    segments.push(seg);
  }
  const end = each((ix) => stateUpdate('yNew', w.b, ix));
  if (fsal) {
    end.push(`f(tNew, yNew, kRow[${last}]);`);
    if (n !== undefined) for (let j = 0; j < n; j++) end.push(`const k${last}_${j} = K[${last * n + j}];`);
  }
  end.push(w.bHat2 ? 'let s5 = 0; let s3 = 0; let bad = 0;' : 'let sum = 0; let bad = 0;');
  end.push(...each((ix) => errorTerm(w, ix, fsal ? last : null)));
  end.push(`io[${IO_NONFINITE}] = bad;`);
  end.push(...errorNorm(w));
  segments.push(end);
  const fn = `${name.replace(/[^A-Za-z0-9_]/g, '_')}${n === undefined ? '' : `_n${n}`}`;
  return piecesSource(`step_${fn}`, 'f, io, y, yNew, ys, K, kRow, atol, n', head, segments, n === undefined ? undefined : (body) => localsOf(body, n));
}

/**
 * The reads a written-out piece needs at its top: y_j and every stage local it uses but does not
 * fill itself (stage 1, or stages filled by an earlier piece); and its own stage reads that
 * nothing uses are dropped. Each typed-array read costs V8 a bounds check, and the sums read a
 * stage up to s times: one read per entry is what is left (the arithmetic is unchanged).
 */
function localsOf(body: readonly string[], n: number): string[] {
  const text = body.join('\n');
  const uses = (name: string) => (text.match(new RegExp(`\\b${name}\\b`, 'g')) ?? []).length;
  const declared = new Set<string>();
  const kept: string[] = [];
  for (const line of body) {
    const m = /^const (k(\d+)_\d+) = K\[\d+\];$/.exec(line);
    if (m && uses(m[1]!) === 1) continue;
    const d = /^const ((?:k\d+|yn)_\d+) = /.exec(line);
    if (d) declared.add(d[1]!);
    kept.push(line);
  }
  const top: string[] = [];
  for (let j = 0; j < n; j++) if (uses(`y_${j}`) > 0) top.push(`const y_${j} = y[${j}];`);
  const stages = new Set<number>();
  for (const m of text.matchAll(/\bk(\d+)_\d+\b/g)) stages.add(Number(m[1]));
  for (const i of [...stages].sort((a, b) => a - b)) {
    for (let j = 0; j < n; j++) {
      const name = `k${i}_${j}`;
      if (!declared.has(name) && uses(name) > 0) top.push(`const ${name} = K[${i * n + j}];`);
    }
  }
  return [...top, ...kept];
}

/**
 * The step as a few functions of at most CALLS_PER_PIECE evaluations each, called in turn by the
 * returned one. V8 inlines callees into an optimised function only within a bytecode budget per
 * function, so a kernel of 9 to 13 calls inlined the first few right-hand sides and made real
 * calls (each boxing its double t) for the rest (bench/README.md); each piece has a budget of its
 * own. Calls are spread evenly over the pieces; statements and their order are unchanged, so the
 * bits are too.
 */
export function piecesSource(
  name: string,
  params: string,
  head: readonly string[],
  segments: readonly string[][],
  locals: (body: readonly string[]) => string[] = (body) => [...body],
): string {
  const callsIn = (seg: readonly string[]) => seg.filter((l) => l.startsWith('f(')).length;
  const total = segments.reduce((sum, seg) => sum + callsIn(seg), 0);
  const perPiece = total === 0 ? 1 : Math.ceil(total / Math.ceil(total / CALLS_PER_PIECE));
  const pieces: string[][] = [[]];
  let calls = 0;
  for (const seg of segments) {
    const segCalls = callsIn(seg);
    if (calls > 0 && calls + segCalls > perPiece) {
      pieces.push([]);
      calls = 0;
    }
    pieces[pieces.length - 1]!.push(...seg);
    calls += segCalls;
  }
  const out = ['"use strict";'];
  pieces.forEach((body, k) => {
    out.push(`function ${name}_${k + 1}(${params}) {`, ...[...head, ...locals(body)].map((l) => '  ' + l), '}');
  });
  out.push(`return function ${name}(${params}) {`, ...pieces.map((_, k) => `  ${name}_${k + 1}(${params});`), '};');
  return out.join('\n');
}

function build(d: TableauData, name: string, n?: number): StageKernel {
  // The source is built only from the finite numeric literals of a tableau, never from input text.
  return new Function(unrolledSource(d, name, n))() as StageKernel;
}

/**
 * The unrolled step of one pair (costs s - 1 evaluations, the FSAL stage included when the pair
 * has one), written out per state size up to UNROLL_MAX_N. `name` labels it in profiles.
 */
export function unrolledKernel(d: TableauData, name: string): KernelFactory {
  const looped = build(d, name);
  const bySize: (StageKernel | undefined)[] = [];
  // Built on first use per state size, then reused by every solve of that size.
  return (n) => {
    if (n > UNROLL_MAX_N) return looped;
    return (bySize[n] ??= build(d, name, n));
  };
}

/**
 * One equal step of a fixed-step tableau, in place on y: k_1 = f(t, y), the stages, then
 * y += h * sum b_i k_i. The sums are written in the generic engine's order (nonzero terms, left
 * to right, the first added to 0 there), so both give bitwise equal states. t and h come in io.
 */
export type FixedStepKernel = (
  f: Rhs,
  io: Float64Array,
  y: Float64Array,
  yStage: Float64Array,
  K: Float64Array,
  kRow: readonly Float64Array[],
  n: number,
) => void;

export type FixedKernelFactory = (n: number) => FixedStepKernel;

/** Source of a fixed-step kernel; with `n` (at most UNROLL_MAX_N) the component loop is written out. */
export function fixedStepSource(d: TableauData, name: string, n?: number): string {
  if (n !== undefined && !(Number.isInteger(n) && n >= 1 && n <= UNROLL_MAX_N)) {
    throw new InputError(`${name}: written-out kernels exist for 1 <= n <= ${UNROLL_MAX_N}, got ${n}`);
  }
  const s = d.c.length;
  const each = (line: (ix: Indexing) => string): string[] => {
    if (n === undefined) return [`for (let j = 0; j < n; j++) ${line(loopIndexing())}`];
    const out: string[] = [];
    for (let j = 0; j < n; j++) out.push(line(bufferIndexing(j, n)));
    return out;
  };
  // An all-zero row is y + h * 0 in the generic engine; keep that arithmetic.
  const update = (target: string, w: readonly number[], ix: Indexing) =>
    `${target}[${ix.j}] = y[${ix.j}] + h * (${combination(w, ix) ?? '0'});`;
  const lines: string[] = [`const t = io[${IO_T}]; const h = io[${IO_H}];`];
  if (n === undefined) for (let i = 1; i < s; i++) lines.push(`const o${i} = ${i} * n;`);
  lines.push('f(t, y, kRow[0]);');
  for (let i = 1; i < s; i++) {
    lines.push(...each((ix) => update('ys', d.a[i]!, ix)));
    lines.push(`f(t + ${lit(d.c[i]!)} * h, ys, kRow[${i}]);`);
  }
  lines.push(...each((ix) => update('y', d.b, ix)));
  const fn = `${name.replace(/[^A-Za-z0-9_]/g, '_')}${n === undefined ? '' : `_n${n}`}`;
  return [
    '"use strict";',
    `return function fixed_${fn}(f, io, y, ys, K, kRow, n) {`,
    ...lines.map((l) => '  ' + l),
    '};',
  ].join('\n');
}

/** The unrolled equal step of a fixed-step tableau (s evaluations), per state size like unrolledKernel. */
export function fixedStepKernel(d: TableauData, name: string): FixedKernelFactory {
  const make = (n?: number) => new Function(fixedStepSource(d, name, n))() as FixedStepKernel;
  const looped = make();
  const bySize: (FixedStepKernel | undefined)[] = [];
  return (n) => (n > UNROLL_MAX_N ? looped : (bySize[n] ??= make(n)));
}
