// Column groups for finite-difference Jacobians of a sparse pattern, as Curtis, Powell and Reid
// proposed ("On the estimation of sparse Jacobian matrices", J. Inst. Math. Appl. 13 (1974)
// 117-119): columns that share no row may be perturbed together, and one evaluation of f then
// gives all of them. One evaluation per group, so fewer groups make every difference Jacobian
// cheaper. First greedy in natural column order, as in that paper; when that misses the lower
// bound (the widest row's entry count, Coleman and More 1983) the colourings of
// src/core/column-colourings.ts are tried in a fixed order, and one is taken only when it needs
// strictly fewer groups than the best so far. Banded patterns reach the bound in natural order
// and keep exactly their groups; the 5-point grid gets its optimum, 5 (test/column-groups.test.ts).
import { ColumnNeighbours, columnDegrees, widestRow } from './column-graph.js';
import {
  type Colouring,
  type ColumnGraph,
  greedyColouring,
  incidenceDegreeOrder,
  saturationColouring,
  smallestLastOrder,
} from './column-colourings.js';
import type { SparsePattern } from './sparse-pattern.js';

export interface ColumnGroups {
  readonly count: number;
  /** Group g's columns are columns[start[g]] .. columns[start[g + 1] - 1], ascending. */
  readonly start: Int32Array;
  readonly columns: Int32Array;
}

/**
 * The colourings tried after the natural order, in this order; each gives null unless it needs
 * fewer than `limit`. Saturation first: it reaches the bound on the grids tried, so the others
 * are then not computed.
 */
const ALTERNATIVES: readonly ((g: ColumnGraph, limit: number) => Colouring | null)[] = [
  (g, limit) => saturationColouring(g, limit),
  (g, limit) => greedyColouring(g.walk, smallestLastOrder(g), limit),
  (g, limit) => greedyColouring(g.walk, incidenceDegreeOrder(g), limit),
];

export function columnGroups(p: SparsePattern): ColumnGroups {
  const walk = new ColumnNeighbours(p);
  const bound = widestRow(p);
  let best = greedyColouring(walk, null, Infinity)!;
  if (best.count > bound) {
    const graph: ColumnGraph = { n: p.n, walk, degree: columnDegrees(p, walk) };
    for (const colouring of ALTERNATIVES) {
      best = colouring(graph, best.count) ?? best;
      if (best.count === bound) break;
    }
  }
  return grouped(best);
}

/** The groups of a colouring, numbered by their smallest column (natural order's numbering already). */
function grouped({ colour, count }: Colouring): ColumnGroups {
  const n = colour.length;
  const number = new Int32Array(count).fill(-1);
  const start = new Int32Array(count + 1);
  let next = 0;
  for (let j = 0; j < n; j++) {
    const c = colour[j]!;
    if (number[c] === -1) number[c] = next++;
    start[number[c]! + 1]!++;
  }
  for (let g = 0; g < count; g++) start[g + 1]! += start[g]!;
  const fill = Int32Array.from(start);
  const columns = new Int32Array(n);
  for (let j = 0; j < n; j++) columns[fill[number[colour[j]!]!]!++] = j;
  return { count, start, columns };
}
