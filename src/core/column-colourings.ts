// Colourings of the column intersection graph (src/core/column-graph.ts), each a candidate
// grouping for src/core/column-groups.ts. The sequential (greedy) colouring gives each column in
// turn the smallest colour none of its coloured neighbours has; its result depends on the order.
// Coleman and More (SIAM J. Numer. Anal. 20 (1983) 187-209) propose the smallest-last order
// (Matula and Beck) and the incidence-degree order for it; the saturation order of D. Brelaz
// ("New methods to color the vertices of a graph", Comm. ACM 22 (1979) 251-256) picks the next
// column by the colours it already sees, and is the one that finds the 5 groups of the 5-point
// grid. Every tie is broken by a fixed rule (src/core/column-heap.ts), so results are reproducible.
// Each costs a few passes over the neighbour lists, O(sum over rows of entries^2) with a log n
// factor for the heap, and O(n) memory besides the saturation order's bit per (column, colour).
import { ColumnHeap } from './column-heap.js';
import type { ColumnNeighbours } from './column-graph.js';

/** Column j is in group colour[j]; groups 0..count-1. */
export interface Colouring {
  readonly colour: Int32Array;
  readonly count: number;
}

/** What every colouring reads: the neighbour walker and each column's degree. */
export interface ColumnGraph {
  readonly n: number;
  readonly walk: ColumnNeighbours;
  readonly degree: Int32Array;
}

/**
 * The saturation order keeps one bit per column and colour below the limit; past this many 32-bit
 * words (16 MB) it is not tried. Only a pattern whose natural grouping needs hundreds of groups on
 * a very large system gets near it (a choice made here, no source).
 */
export const MAX_SATURATION_WORDS = 1 << 22;

/**
 * Greedy colouring in `order` (natural order when null), or null as soon as it would need
 * `limit` colours or more.
 */
export function greedyColouring(walk: ColumnNeighbours, order: Int32Array | null, limit: number): Colouring | null {
  const n = walk.list.length;
  const colour = new Int32Array(n).fill(-1);
  // blocked[c] === k + 1: colour c is taken by a neighbour of the k-th column in the order.
  const blocked = new Int32Array(n + 1);
  let count = 0;
  for (let k = 0; k < n; k++) {
    const j = order ? order[k]! : k;
    const degree = walk.of(j);
    for (let s = 0; s < degree; s++) {
      const c = colour[walk.list[s]!]!;
      if (c >= 0) blocked[c] = k + 1;
    }
    let c = 0;
    while (blocked[c] === k + 1) c++;
    if (c + 1 >= limit) return null;
    colour[j] = c;
    if (c === count) count++;
  }
  return { colour, count };
}

/**
 * Smallest-last order: repeatedly take out a column of smallest degree among the columns left;
 * the order is the reverse of the taking out.
 */
export function smallestLastOrder(g: ColumnGraph): Int32Array {
  // The key is minus the degree among the columns left, so the heap's first has the smallest;
  // taking a column out lowers its neighbours' degrees, which raises their keys.
  return heapOrder(g, Int32Array.from(g.degree, (d) => -d), new Int32Array(g.n), true);
}

/**
 * Incidence-degree order: next comes a column with the most neighbours already in the order,
 * ties to the larger degree (so the first column is one of largest degree).
 */
export function incidenceDegreeOrder(g: ColumnGraph): Int32Array {
  return heapOrder(g, new Int32Array(g.n), g.degree, false);
}

/**
 * Takes the heap's first column until none is left, raising the key of each neighbour still in
 * the heap by one; the columns in the order taken, or reversed.
 */
function heapOrder(g: ColumnGraph, key: Int32Array, tie: Int32Array, reversed: boolean): Int32Array {
  const { n, walk } = g;
  const heap = new ColumnHeap(key, tie);
  const order = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const j = heap.pop();
    order[reversed ? n - 1 - k : k] = j;
    const degree = walk.of(j);
    for (let s = 0; s < degree; s++) {
      const u = walk.list[s]!;
      if (heap.has(u)) {
        key[u]!++;
        heap.raised(u);
      }
    }
  }
  return order;
}

/**
 * Brelaz's saturation order, coloured as it goes: next comes a column whose neighbours show the
 * most distinct colours, ties to the larger degree; it takes the smallest colour they do not show.
 * Null when it would need `limit` colours or more, or when its bits would pass MAX_SATURATION_WORDS.
 */
export function saturationColouring(g: ColumnGraph, limit: number): Colouring | null {
  const { n, walk } = g;
  // Colours 0 .. limit - 2 are allowed; seen holds, per column, one bit for each that a neighbour has.
  const words = Math.ceil(Math.max(limit - 1, 1) / 32);
  if (n * words > MAX_SATURATION_WORDS) return null;
  const seen = new Int32Array(n * words);
  const key = new Int32Array(n);
  const heap = new ColumnHeap(key, g.degree);
  const colour = new Int32Array(n).fill(-1);
  let count = 0;
  for (let k = 0; k < n; k++) {
    const j = heap.pop();
    let c = 0;
    while (c < limit - 1 && (seen[j * words + (c >> 5)]! & (1 << (c & 31))) !== 0) c++;
    if (c + 1 >= limit) return null;
    colour[j] = c;
    if (c >= count) count = c + 1;
    const bit = 1 << (c & 31);
    const degree = walk.of(j);
    for (let s = 0; s < degree; s++) {
      const u = walk.list[s]!;
      const w = u * words + (c >> 5);
      if (heap.has(u) && (seen[w]! & bit) === 0) {
        seen[w] = seen[w]! | bit;
        key[u]!++;
        heap.raised(u);
      }
    }
  }
  return { colour, count };
}
