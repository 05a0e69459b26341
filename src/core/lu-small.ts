// The dense LU routines of lu.ts written out for one small n: every loop unrolled, every index a
// literal, generated once per size. On a 3-state problem the loops' control and bounds checks
// cost more than their arithmetic (bench/README.md). Each statement is lu.ts's, in lu.ts's order,
// so factors, pivots and solutions are bitwise the same (test/lu-small.test.ts).

/** Largest n with written-out routines. */
export const SMALL_LU_MAX_N = 8;

export interface SmallLu {
  factor(a: Float64Array, piv: Int32Array): boolean;
  solve(a: Float64Array, piv: Int32Array, b: Float64Array): void;
  complexFactor(ar: Float64Array, ai: Float64Array, piv: Int32Array): boolean;
  complexSolve(ar: Float64Array, ai: Float64Array, piv: Int32Array, br: Float64Array, bi: Float64Array): void;
}

const range = (from: number, to: number): number[] => Array.from({ length: Math.max(0, to - from) }, (_, i) => from + i);

/** Pivot search in column k by `size(i)`, pivot recorded, rows k and p swapped in each of `arrays`. */
function pivotLines(n: number, k: number, size: (i: number) => string, arrays: readonly string[]): string[] {
  const out = [`p = ${k}; mx = ${size(k)};`];
  for (const i of range(k + 1, n)) out.push(`v = ${size(i)}; if (v > mx) { mx = v; p = ${i}; }`);
  out.push(`piv[${k}] = p;`, 'if (!(mx > 0)) return false;');
  for (const i of range(k + 1, n)) {
    const swaps = arrays.flatMap((x) => range(0, n).map((j) => `t = ${x}[${k * n + j}]; ${x}[${k * n + j}] = ${x}[${i * n + j}]; ${x}[${i * n + j}] = t;`));
    out.push(`if (p === ${i}) { ${swaps.join(' ')} }`);
  }
  return out;
}

function factorSource(n: number): string {
  const out = ['let p = 0, mx = 0, v = 0, t = 0, inv = 0, m = 0;'];
  for (const k of range(0, n)) {
    out.push(...pivotLines(n, k, (i) => `Math.abs(a[${i * n + k}])`, ['a']));
    out.push(`inv = 1 / a[${k * n + k}];`);
    for (const i of range(k + 1, n)) {
      const upd = range(k + 1, n).map((j) => `a[${i * n + j}] = a[${i * n + j}] - m * a[${k * n + j}];`);
      out.push(`m = a[${i * n + k}] * inv; a[${i * n + k}] = m; if (m !== 0) { ${upd.join(' ')} }`);
    }
  }
  out.push('return true;');
  return out.join('\n');
}

function pivotApplyLines(n: number, arrays: readonly string[]): string[] {
  return range(0, n).map((k) => `p = piv[${k}]; if (p !== ${k}) { ${arrays.map((x) => `t = ${x}[${k}]; ${x}[${k}] = ${x}[p]; ${x}[p] = t;`).join(' ')} }`);
}

function solveSource(n: number): string {
  const out = ['let p = 0, t = 0;', ...pivotApplyLines(n, ['b'])];
  for (const i of range(1, n)) out.push(`b[${i}] = b[${i}]${range(0, i).map((j) => ` - a[${i * n + j}] * b[${j}]`).join('')};`);
  for (let i = n - 1; i >= 0; i--) out.push(`b[${i}] = (b[${i}]${range(i + 1, n).map((j) => ` - a[${i * n + j}] * b[${j}]`).join('')}) / a[${i * n + i}];`);
  return out.join('\n');
}

function complexFactorSource(n: number): string {
  const out = ['let p = 0, mx = 0, v = 0, t = 0, pr = 0, pi = 0, den = 0, ir = 0, ii = 0, xr = 0, xi = 0, mr = 0, mi = 0, ur = 0, ui = 0;'];
  for (const k of range(0, n)) {
    out.push(...pivotLines(n, k, (i) => `Math.abs(ar[${i * n + k}]) + Math.abs(ai[${i * n + k}])`, ['ar', 'ai']));
    const kk = k * n + k;
    out.push(`pr = ar[${kk}]; pi = ai[${kk}]; den = pr * pr + pi * pi; ir = pr / den; ii = -pi / den;`);
    for (const i of range(k + 1, n)) {
      const ik = i * n + k;
      const upd = range(k + 1, n).map(
        (j) => `ur = ar[${k * n + j}]; ui = ai[${k * n + j}]; ar[${i * n + j}] = ar[${i * n + j}] - (mr * ur - mi * ui); ai[${i * n + j}] = ai[${i * n + j}] - (mr * ui + mi * ur);`,
      );
      out.push(`xr = ar[${ik}]; xi = ai[${ik}]; mr = xr * ir - xi * ii; mi = xr * ii + xi * ir; ar[${ik}] = mr; ai[${ik}] = mi;`);
      if (upd.length > 0) out.push(`if (!(mr === 0 && mi === 0)) { ${upd.join(' ')} }`);
    }
  }
  out.push('return true;');
  return out.join('\n');
}

function complexSolveSource(n: number): string {
  const out = ['let p = 0, t = 0, sr = 0, si = 0, lr = 0, li = 0, xr = 0, xi = 0, dr = 0, di = 0, den = 0;', ...pivotApplyLines(n, ['br', 'bi'])];
  const term = (i: number, j: number) => `lr = ar[${i * n + j}]; li = ai[${i * n + j}]; xr = br[${j}]; xi = bi[${j}]; sr -= lr * xr - li * xi; si -= lr * xi + li * xr;`;
  for (const i of range(1, n)) out.push(`sr = br[${i}]; si = bi[${i}]; ${range(0, i).map((j) => term(i, j)).join(' ')} br[${i}] = sr; bi[${i}] = si;`);
  for (let i = n - 1; i >= 0; i--) {
    const ii = i * n + i;
    out.push(
      `sr = br[${i}]; si = bi[${i}]; ${range(i + 1, n).map((j) => term(i, j)).join(' ')} dr = ar[${ii}]; di = ai[${ii}]; den = dr * dr + di * di; br[${i}] = (sr * dr + si * di) / den; bi[${i}] = (si * dr - sr * di) / den;`,
    );
  }
  return out.join('\n');
}

const cache: (SmallLu | undefined)[] = [];

/** The written-out routines for n (1 <= n <= SMALL_LU_MAX_N), built on first use. */
export function smallLu(n: number): SmallLu {
  if (!(Number.isInteger(n) && n >= 1 && n <= SMALL_LU_MAX_N)) throw new RangeError(`written-out LU exists for 1 <= n <= ${SMALL_LU_MAX_N}, got ${n}`);
  // Built only from loop indices, never from input text.
  const make = (params: string, body: string, name: string) => new Function(`"use strict"; return function ${name}_n${n}(${params}) {\n${body}\n};`)();
  return (cache[n] ??= {
    factor: make('a, piv', factorSource(n), 'luFactor'),
    solve: make('a, piv, b', solveSource(n), 'luSolve'),
    complexFactor: make('ar, ai, piv', complexFactorSource(n), 'complexLuFactor'),
    complexSolve: make('ar, ai, piv, br, bi', complexSolveSource(n), 'complexLuSolve'),
  });
}
