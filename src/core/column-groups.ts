// Column groups for finite-difference Jacobians of a sparse pattern, as Curtis, Powell and Reid
// proposed ("On the estimation of sparse Jacobian matrices", J. Inst. Math. Appl. 13 (1974)
// 117-119): columns that share no row may be perturbed together, and one evaluation of f then
// gives all of them. Greedy in natural column order, as in that paper: each column joins the
// first group none of whose columns shares a row with it. One evaluation per group.
import type { SparsePattern } from './sparse-pattern.js';

export interface ColumnGroups {
  readonly count: number;
  /** Group g's columns are columns[start[g]] .. columns[start[g + 1] - 1], ascending. */
  readonly start: Int32Array;
  readonly columns: Int32Array;
}

export function columnGroups(p: SparsePattern): ColumnGroups {
  const n = p.n;
  const group = new Int32Array(n).fill(-1);
  // blocked[g] === j + 1: group g already holds a column sharing a row with column j.
  const blocked = new Int32Array(n);
  let count = 0;
  for (let j = 0; j < n; j++) {
    for (let q = p.colStart[j]!; q < p.colStart[j + 1]!; q++) {
      const i = p.row[q]!;
      for (let r = p.rowStart[i]!; r < p.rowStart[i + 1]!; r++) {
        const g = group[p.column[r]!]!;
        if (g >= 0) blocked[g] = j + 1;
      }
    }
    let g = 0;
    while (g < count && blocked[g] === j + 1) g++;
    group[j] = g;
    if (g === count) count++;
  }
  const start = new Int32Array(count + 1);
  for (let j = 0; j < n; j++) start[group[j]! + 1]!++;
  for (let g = 0; g < count; g++) start[g + 1]! += start[g]!;
  const next = Int32Array.from(start);
  const columns = new Int32Array(n);
  for (let j = 0; j < n; j++) columns[next[group[j]!]!++] = j;
  return { count, start, columns };
}
