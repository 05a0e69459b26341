// Source text of luSolve's and complexLuSolve's steps (src/core/lu.ts, written out as in
// src/core/lu-small.ts) on right-hand sides held in locals, for the generated implicit steps: the
// Rosenbrock attempt keeps its factors and pivots in locals, Radau IIA's iteration reads them from
// the iteration matrices. One statement order for all, so each stays bitwise the loops.

/** Where the factors and pivots are: expressions for pivot k and factor entry (i, j). */
export interface LuNames {
  pivot(k: number): string;
  factor(i: number, j: number): string;
}

/** 0 .. k - 1, for the generators' loops over indices. */
export const range = (k: number): number[] => Array.from({ length: k }, (_, i) => i);

/** Row interchanges of the pivots on the locals `${v}{k}` of each name in `locals`, alike. */
export function pivotLines(n: number, pivot: (k: number) => string, locals: readonly string[]): string[] {
  const out: string[] = [];
  for (let k = 0; k < n; k++) {
    for (let i = k + 1; i < n; i++) out.push(`if (${pivot(k)} === ${i}) { ${locals.map((v) => `tmp = ${v}${k}; ${v}${k} = ${v}${i}; ${v}${i} = tmp;`).join(' ')} }`);
  }
  return out;
}

/** b{i} := M^{-1} b{i} with real factors: interchanges, forward then back substitution. */
export function realSolveLines(n: number, names: LuNames): string[] {
  const out = pivotLines(n, names.pivot, ['b']);
  for (let i = 1; i < n; i++) out.push(`b${i} = b${i}${range(i).map((j) => ` - ${names.factor(i, j)} * b${j}`).join('')};`);
  for (let i = n - 1; i >= 0; i--) {
    const terms = range(n).filter((j) => j > i).map((j) => ` - ${names.factor(i, j)} * b${j}`).join('');
    out.push(`b${i} = ${terms === '' ? `b${i}` : `(b${i}${terms})`} / ${names.factor(i, i)};`);
  }
  return out;
}

/**
 * (r{i} + i s{i}) := M^{-1} (r{i} + i s{i}) with complex factors re(i, j) + i im(i, j):
 * interchanges, forward then back substitution. Uses the locals tmp, sr, si, lr, li, xr, xi, dr,
 * di and den, which the caller declares.
 */
export function complexSolveLines(n: number, pivot: (k: number) => string, re: (i: number, j: number) => string, im: (i: number, j: number) => string): string[] {
  const out = pivotLines(n, pivot, ['r', 's']);
  const term = (i: number, j: number): string =>
    `lr = ${re(i, j)}; li = ${im(i, j)}; xr = r${j}; xi = s${j}; sr -= lr * xr - li * xi; si -= lr * xi + li * xr;`;
  for (let i = 1; i < n; i++) out.push(`sr = r${i}; si = s${i}; ${range(i).map((j) => term(i, j)).join(' ')} r${i} = sr; s${i} = si;`);
  for (let i = n - 1; i >= 0; i--) {
    const terms = range(n).filter((j) => j > i).map((j) => term(i, j)).join(' ');
    out.push(`sr = r${i}; si = s${i}; ${terms} dr = ${re(i, i)}; di = ${im(i, i)}; den = dr * dr + di * di; r${i} = (sr * dr + si * di) / den; s${i} = (si * dr - sr * di) / den;`);
  }
  return out;
}
