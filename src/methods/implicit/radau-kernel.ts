// Straight-line code for radau-iia-5's step on a small dense system, generated per state size:
// the Newton starting values, each simplified Newton iteration (three stage evaluations, the
// transformed right-hand sides, the real and complex back substitutions with the factors left by
// the iteration matrices, the increment norm) and the embedded error estimate, every component
// in a local and the method's constants as literals. On a 3-state problem the loops' control and
// bounds checks cost more than their arithmetic (bench/README.md).
// Every expression is radau-iia-5.ts's loop form (and luSolve / complexLuSolve of lu-small.ts) in
// the same order, so both give the same bits; a test compares them run for run.
import type { Rhs } from '../../core/types.js';
import { numberLiteral } from '../source-literal.js';
import { RADAU5_C, RADAU5_TRANSFORM } from './radau-iia-5-tableau.js';
import { complexSolveLines, range, realSolveLines, type LuNames } from './lu-solve-source.js';

/** Largest state size whose iteration is written out (the written-out LU's limit). */
export const RADAU_UNROLL_MAX_N = 8;

/** Slots of the kernels' io buffer. */
export const RIO_T = 0;
export const RIO_H = 1;
/** gamma / h, alpha / h, beta / h: the shifts of the real and complex iteration matrices. */
export const RIO_FAC1 = 2;
export const RIO_ALPHN = 3;
export const RIO_BETAN = 4;
/** Out: the scaled RMS norm of the Newton increment. */
export const RIO_DYNO = 5;
/** In: the tolerances' rtol; out: the error estimate's scaled RMS norm (unfloored). */
export const RIO_RTOL = 6;
export const RIO_ERR = 7;
/** In: h / h_old, the previous collocation polynomial's argument scale for the starting values. */
export const RIO_RATIO = 8;
export const RIO_LENGTH = 9;

/**
 * One Newton iteration: f at the three stages y + z_j, the increments of the transformed
 * variables into g1 (real system) and g2 + i g3 (complex system), their norm in io[RIO_DYNO].
 * Makes the three evaluations and nothing else; the caller counts them.
 */
export type RadauIteration = (
  f: Rhs,
  io: Float64Array,
  y: Float64Array,
  z1: Float64Array, z2: Float64Array, z3: Float64Array,
  w1: Float64Array, w2: Float64Array, w3: Float64Array,
  g1: Float64Array, g2: Float64Array, g3: Float64Array,
  ytmp: Float64Array,
  scal: Float64Array,
  a: Float64Array, piv: Int32Array,
  ar: Float64Array, ai: Float64Array, pivc: Int32Array,
) => void;

/** w_j += g_j, then z = T w: the iterate's update after an iteration that goes on. */
export type RadauUpdate = (
  z1: Float64Array, z2: Float64Array, z3: Float64Array,
  w1: Float64Array, w2: Float64Array, w3: Float64Array,
  g1: Float64Array, g2: Float64Array, g3: Float64Array,
) => void;

/**
 * The embedded estimate's first form: ftmp = sum d_j z_j / h, g1 = (gamma/h I - J)^{-1} (f0 +
 * ftmp), yEnd = y + z3, and g1's scaled RMS norm against y and yEnd into io[RIO_ERR].
 */
export type RadauEstimate = (
  io: Float64Array,
  y: Float64Array, f0: Float64Array,
  z1: Float64Array, z2: Float64Array, z3: Float64Array,
  g1: Float64Array, ftmp: Float64Array, yEnd: Float64Array,
  atol: Float64Array,
  a: Float64Array, piv: Int32Array,
) => void;

/** Newton starting values z_j from the previous step's collocation polynomial, w = T^{-1} z. */
export type RadauStart = (
  io: Float64Array,
  cont1: Float64Array, cont2: Float64Array, cont3: Float64Array,
  z1: Float64Array, z2: Float64Array, z3: Float64Array,
  w1: Float64Array, w2: Float64Array, w3: Float64Array,
) => void;

export interface RadauKernels {
  readonly iterate: RadauIteration;
  readonly update: RadauUpdate;
  readonly estimate: RadauEstimate;
  readonly start: RadauStart;
}

const lit = (v: number): string => numberLiteral(v, 'Radau IIA coefficient');
const TI = RADAU5_TRANSFORM.tinv.map(lit);
const T = RADAU5_TRANSFORM.t.map(lit);
const D = RADAU5_TRANSFORM.d.map(lit);
const C1 = lit(RADAU5_C[0]!);
const C2 = lit(RADAU5_C[1]!);

/** The real iteration matrix's factors and pivots, read where they lie (a, piv). */
const realFactors = (n: number): LuNames => ({ pivot: (k) => `piv[${k}]`, factor: (i, j) => `a[${i * n + j}]` });

export function radauIterationSource(n: number): string {
  const lines = [
    `const t = io[${RIO_T}]; const h = io[${RIO_H}]; const fac1 = io[${RIO_FAC1}]; const alphn = io[${RIO_ALPHN}]; const betan = io[${RIO_BETAN}];`,
    'let tmp = 0, sr = 0, si = 0, lr = 0, li = 0, xr = 0, xi = 0, dr = 0, di = 0, den = 0;',
  ];
  const stageTimes = [`t + ${C1} * h`, `t + ${C2} * h`, 't + h'];
  for (let j = 1; j <= 3; j++) {
    for (let i = 0; i < n; i++) lines.push(`ytmp[${i}] = y[${i}] + z${j}[${i}];`);
    lines.push(`f(${stageTimes[j - 1]}, ytmp, g${j});`);
  }
  for (let i = 0; i < n; i++) {
    lines.push(`const a1_${i} = g1[${i}], a2_${i} = g2[${i}], a3_${i} = g3[${i}];`);
    lines.push(`const x1_${i} = ${TI[0]} * a1_${i} + ${TI[1]} * a2_${i} + ${TI[2]} * a3_${i};`);
    lines.push(`const x2_${i} = ${TI[3]} * a1_${i} + ${TI[4]} * a2_${i} + ${TI[5]} * a3_${i};`);
    lines.push(`const x3_${i} = ${TI[6]} * a1_${i} + ${TI[7]} * a2_${i} + ${TI[8]} * a3_${i};`);
    lines.push(`let b${i} = x1_${i} - fac1 * w1[${i}];`);
    lines.push(`let r${i} = x2_${i} - alphn * w2[${i}] + betan * w3[${i}];`);
    lines.push(`let s${i} = x3_${i} - betan * w2[${i}] - alphn * w3[${i}];`);
  }
  lines.push(
    ...realSolveLines(n, realFactors(n)),
    ...complexSolveLines(n, (k) => `pivc[${k}]`, (i, j) => `ar[${i * n + j}]`, (i, j) => `ai[${i * n + j}]`),
  );
  lines.push('let sum = 0;');
  for (let i = 0; i < n; i++) {
    lines.push(`g1[${i}] = b${i}; g2[${i}] = r${i}; g3[${i}] = s${i};`);
    lines.push(`{ const q = 1 / scal[${i}]; const u = b${i} * q, v = r${i} * q, w = s${i} * q; sum += u * u + v * v + w * w; }`);
  }
  lines.push(`io[${RIO_DYNO}] = Math.sqrt(sum / ${3 * n});`);
  return [
    '"use strict";',
    `return function radauIteration_n${n}(f, io, y, z1, z2, z3, w1, w2, w3, g1, g2, g3, ytmp, scal, a, piv, ar, ai, pivc) {`,
    ...lines.map((l) => '  ' + l),
    '};',
  ].join('\n');
}

export function radauUpdateSource(n: number): string {
  const lines: string[] = [];
  for (let i = 0; i < n; i++) {
    lines.push(`{ const a1 = (w1[${i}] = w1[${i}] + g1[${i}]); const a2 = (w2[${i}] = w2[${i}] + g2[${i}]); const a3 = (w3[${i}] = w3[${i}] + g3[${i}]);`);
    lines.push(`  z1[${i}] = ${T[0]} * a1 + ${T[1]} * a2 + ${T[2]} * a3; z2[${i}] = ${T[3]} * a1 + ${T[4]} * a2 + ${T[5]} * a3; z3[${i}] = ${T[6]} * a1 + ${T[7]} * a2 + ${T[8]} * a3; }`);
  }
  return ['"use strict";', `return function radauUpdate_n${n}(z1, z2, z3, w1, w2, w3, g1, g2, g3) {`, ...lines.map((l) => '  ' + l), '};'].join('\n');
}

export function radauEstimateSource(n: number): string {
  const lines = [
    `const h = io[${RIO_H}]; const rtol = io[${RIO_RTOL}]; const dz1 = ${D[0]} / h, dz2 = ${D[1]} / h, dz3 = ${D[2]} / h;`,
    'let tmp = 0;',
  ];
  for (let i = 0; i < n; i++) {
    lines.push(`const c${i} = dz1 * z1[${i}] + dz2 * z2[${i}] + dz3 * z3[${i}]; ftmp[${i}] = c${i};`);
    lines.push(`let b${i} = f0[${i}] + c${i}; const e${i} = y[${i}] + z3[${i}]; yEnd[${i}] = e${i};`);
  }
  lines.push(...realSolveLines(n, realFactors(n)), 'let sum = 0;');
  for (let i = 0; i < n; i++) {
    lines.push(`g1[${i}] = b${i};`);
    lines.push(`{ const ya = Math.abs(y[${i}]); const yb = Math.abs(e${i}); const sc = atol[${i}] + rtol * (ya > yb ? ya : yb); const r = b${i} / sc; sum += r * r; }`);
  }
  lines.push(`io[${RIO_ERR}] = Math.sqrt(sum / ${n});`);
  return ['"use strict";', `return function radauEstimate_n${n}(io, y, f0, z1, z2, z3, g1, ftmp, yEnd, atol, a, piv) {`, ...lines.map((l) => '  ' + l), '};'].join('\n');
}

export function radauStartSource(n: number): string {
  const lines = [`const r = io[${RIO_RATIO}]; const s1 = 1 + ${C1} * r, s2 = 1 + ${C2} * r, s3 = 1 + r;`];
  for (let i = 0; i < n; i++) {
    const poly = (s: string) => `(${s} - 1) * (a1 + (${s} - ${C2}) * (a2 + (${s} - ${C1}) * a3))`;
    lines.push(`{ const a1 = cont1[${i}], a2 = cont2[${i}], a3 = cont3[${i}];`);
    lines.push(`  const v1 = ${poly('s1')}; const v2 = ${poly('s2')}; const v3 = ${poly('s3')};`);
    lines.push(`  z1[${i}] = v1; z2[${i}] = v2; z3[${i}] = v3;`);
    lines.push(`  w1[${i}] = ${TI[0]} * v1 + ${TI[1]} * v2 + ${TI[2]} * v3; w2[${i}] = ${TI[3]} * v1 + ${TI[4]} * v2 + ${TI[5]} * v3; w3[${i}] = ${TI[6]} * v1 + ${TI[7]} * v2 + ${TI[8]} * v3; }`);
  }
  return ['"use strict";', `return function radauStart_n${n}(io, cont1, cont2, cont3, z1, z2, z3, w1, w2, w3) {`, ...lines.map((l) => '  ' + l), '};'].join('\n');
}

const cache: (RadauKernels | undefined)[] = [];

/** The written-out iteration for n (1 <= n <= RADAU_UNROLL_MAX_N), built on first use. */
export function radauKernels(n: number): RadauKernels {
  if (!(Number.isInteger(n) && n >= 1 && n <= RADAU_UNROLL_MAX_N)) throw new RangeError(`written-out Radau IIA iterations exist for 1 <= n <= ${RADAU_UNROLL_MAX_N}, got ${n}`);
  // Built only from loop indices and the method's finite coefficients, never from input text.
  return (cache[n] ??= {
    iterate: new Function(radauIterationSource(n))() as RadauIteration,
    update: new Function(radauUpdateSource(n))() as RadauUpdate,
    estimate: new Function(radauEstimateSource(n))() as RadauEstimate,
    start: new Function(radauStartSource(n))() as RadauStart,
  });
}
