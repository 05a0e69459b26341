// Straight-line attempt code for a Rosenbrock method on a small dense system, generated per
// method and state size: the iteration matrix, its LU factors (partial pivoting), every stage and
// its solve held in local variables, the coefficients as literals. On a 3-state problem the
// looped form spent its time in loop control and bounds checks over 1-5 terms and 3 components,
// not in arithmetic (bench/README.md). Every expression is the looped form's (rosenbrock.ts, and
// luFactor/luSolve in src/core/lu.ts) in the same order, so both give the same bits; a test
// compares them run for run.
import { InputError } from '../../core/errors.js';
import type { Rhs } from '../../core/types.js';
import { numberLiteral } from '../source-literal.js';
import { errorTerms, unitEstimateStage, type RosenbrockData } from './rosenbrock-data.js';
import { range, realSolveLines, type LuNames } from './lu-solve-source.js';

/** Largest state size whose attempt is written out; larger (or banded) systems loop. */
export const ROSENBROCK_UNROLL_MAX_N = 8;

/** Slots of the kernel's io buffer. */
export const IO_T = 0;
export const IO_H = 1;
export const IO_RTOL = 2;
/** 1 / (h gamma), the diagonal shift of the iteration matrix. */
export const IO_FAC = 3;
/** Out: the scaled RMS norm of the error estimate. */
export const IO_ERR = 4;

/**
 * One attempt's numerical core: false when the iteration matrix is singular (nothing else is
 * then written); else y1 in ynew and the error norm in io[IO_ERR]. Makes the stage evaluations
 * and nothing else; the caller counts them.
 */
export type RosenbrockKernel = (
  f: Rhs,
  io: Float64Array,
  y: Float64Array,
  f0: Float64Array,
  ft: Float64Array,
  jac: Float64Array,
  ytmp: Float64Array,
  fs: Float64Array,
  ynew: Float64Array,
  atol: Float64Array,
) => boolean;

/** A coefficient as source text that parses back to the same double. */
const lit = (v: number): string => numberLiteral(v, 'Rosenbrock coefficient');

/** LU factorisation of the locals m{i}_{j} in place, luFactor's steps; pivots into p{k}. */
function factorLines(n: number): string[] {
  const out: string[] = [];
  for (let k = 0; k < n; k++) {
    out.push(`let p${k} = ${k}; let mx${k} = Math.abs(m${k}_${k});`);
    for (let i = k + 1; i < n; i++) out.push(`{ const v = Math.abs(m${i}_${k}); if (v > mx${k}) { mx${k} = v; p${k} = ${i}; } }`);
    out.push(`if (!(mx${k} > 0)) return false;`);
    for (let i = k + 1; i < n; i++) {
      const swaps = range(n).map((j) => `tmp = m${k}_${j}; m${k}_${j} = m${i}_${j}; m${i}_${j} = tmp;`);
      out.push(`if (p${k} === ${i}) { ${swaps.join(' ')} }`);
    }
    if (k === n - 1) break;
    out.push(`const inv${k} = 1 / m${k}_${k};`);
    for (let i = k + 1; i < n; i++) {
      out.push(`m${i}_${k} = m${i}_${k} * inv${k};`);
      const upd = range(n).filter((j) => j > k).map((j) => `m${i}_${j} = m${i}_${j} - m${i}_${k} * m${k}_${j};`);
      out.push(`if (m${i}_${k} !== 0) { ${upd.join(' ')} }`);
    }
  }
  return out;
}

/** The factors as factorLines leaves them: locals m{i}_{j}, pivots p{k}. */
const LOCAL_FACTORS: LuNames = { pivot: (k) => `p${k}`, factor: (i, j) => `m${i}_${j}` };

/** The generated function's source for state size n. */
export function rosenbrockSource(d: RosenbrockData, name: string, n: number): string {
  if (!(Number.isInteger(n) && n >= 1 && n <= ROSENBROCK_UNROLL_MAX_N)) {
    throw new InputError(`${name}: written-out Rosenbrock attempts exist for 1 <= n <= ${ROSENBROCK_UNROLL_MAX_N}, got ${n}`);
  }
  const stages = d.alpha.length;
  const lines: string[] = [`const t = io[${IO_T}]; const h = io[${IO_H}]; const rtol = io[${IO_RTOL}]; const fac = io[${IO_FAC}];`, 'let tmp = 0;'];
  // M = fac I - J, as RealIterationMatrix.factor(fac, 1) forms it: -1 * J, then the diagonal shift.
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) lines.push(`let m${i}_${j} = -1 * jac[${i * n + j}]${i === j ? ' + fac' : ''};`);
  }
  lines.push(...factorLines(n));
  for (let s = 0; s < stages; s++) {
    const as = d.a[s]!;
    const cs = d.c[s]!;
    if (s > 0 && !d.reuse[s]) {
      for (let i = 0; i < n; i++) lines.push(`ytmp[${i}] = y[${i}]${range(s).map((j) => ` + ${lit(as[j]!)} * u${j}_${i}`).join('')};`);
      lines.push(`f(t + ${lit(d.alpha[s]!)} * h, ytmp, fs);`);
    }
    lines.push(`const gh${s} = ${lit(d.gammaSum[s]!)} * h;`);
    for (let j = 0; j < s; j++) lines.push(`const c${s}_${j} = ${lit(cs[j]!)} / h;`);
    const src = s === 0 ? 'f0' : 'fs';
    lines.push('{');
    for (let i = 0; i < n; i++) lines.push(`let b${i} = ${src}[${i}] + gh${s} * ft[${i}]${range(s).map((j) => ` + c${s}_${j} * u${j}_${i}`).join('')};`);
    lines.push(...realSolveLines(n, LOCAL_FACTORS));
    for (let i = 0; i < n; i++) lines.push(`u${s}_${i} = b${i};`);
    lines.push('}');
  }
  const unit = unitEstimateStage(d.e);
  const eTerms = errorTerms(d.e);
  lines.push('let sum = 0;');
  for (let i = 0; i < n; i++) {
    lines.push(`ynew[${i}] = y[${i}]${range(stages).map((j) => ` + ${lit(d.m[j]!)} * u${j}_${i}`).join('')};`);
    const ev = unit >= 0 ? `u${unit}_${i}` : eTerms.map((j) => `${lit(d.e[j]!)} * u${j}_${i}`).join(' + ');
    lines.push(`{ const ya = Math.abs(y[${i}]); const yb = Math.abs(ynew[${i}]); const sc = atol[${i}] + rtol * (ya > yb ? ya : yb); const r = (${ev}) / sc; sum += r * r; }`);
  }
  lines.push(`io[${IO_ERR}] = Math.sqrt(sum / ${n});`, 'return true;');
  // The stage values are declared up front: each is assigned inside its stage's block.
  const decl = range(stages).map((s) => range(n).map((i) => `u${s}_${i} = 0`).join(', '));
  const fn = `rosenbrock_${name.replace(/[^A-Za-z0-9_]/g, '_')}_n${n}`;
  return [
    '"use strict";',
    `return function ${fn}(f, io, y, f0, ft, jac, ytmp, fs, ynew, atol) {`,
    `  let ${decl.join(', ')};`,
    ...lines.map((l) => '  ' + l),
    '};',
  ].join('\n');
}

/** The written-out attempt of one method, built on first use per state size up to ROSENBROCK_UNROLL_MAX_N. */
export function rosenbrockKernel(d: RosenbrockData, name: string): (n: number) => RosenbrockKernel {
  const bySize: (RosenbrockKernel | undefined)[] = [];
  // The source is built only from the finite numeric literals of the method's data.
  return (n) => (bySize[n] ??= new Function(rosenbrockSource(d, name, n))() as RosenbrockKernel);
}
