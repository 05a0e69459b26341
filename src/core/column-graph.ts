// The column intersection graph of a sparse pattern (Coleman and More, "Estimation of sparse
// Jacobian matrices and graph coloring problems", SIAM J. Numer. Anal. 20 (1983) 187-209): one
// vertex per column, an edge where two columns share a row. Column groups for grouped differences
// are exactly its colourings. The graph is never stored (a pattern with one long row would make
// it quadratic): neighbours are listed from the pattern's rows and columns when asked for.
import type { SparsePattern } from './sparse-pattern.js';

/** Lists the neighbours of one column at a time; the work arrays are the walker's, made once. */
export class ColumnNeighbours {
  /** The last list's neighbours are list[0] .. list[count - 1], each once, the column itself left out. */
  readonly list: Int32Array;
  private readonly seen: Int32Array;
  private stamp = 0;

  constructor(private readonly p: SparsePattern) {
    this.list = new Int32Array(p.n);
    this.seen = new Int32Array(p.n);
  }

  /** Fills `list` with column j's neighbours; returns how many. */
  of(j: number): number {
    const { colStart, row, rowStart, column } = this.p;
    const seen = this.seen;
    const list = this.list;
    const stamp = ++this.stamp;
    seen[j] = stamp;
    let count = 0;
    for (let q = colStart[j]!; q < colStart[j + 1]!; q++) {
      const i = row[q]!;
      for (let r = rowStart[i]!; r < rowStart[i + 1]!; r++) {
        const k = column[r]!;
        if (seen[k] !== stamp) {
          seen[k] = stamp;
          list[count++] = k;
        }
      }
    }
    return count;
  }
}

/** Each column's degree in the column intersection graph. */
export function columnDegrees(p: SparsePattern, walk: ColumnNeighbours = new ColumnNeighbours(p)): Int32Array {
  const degree = new Int32Array(p.n);
  for (let j = 0; j < p.n; j++) degree[j] = walk.of(j);
  return degree;
}

/** The widest row's entry count: every row's columns need groups of their own, so no grouping has fewer. */
export function widestRow(p: SparsePattern): number {
  let widest = 0;
  for (let i = 0; i < p.n; i++) widest = Math.max(widest, p.rowStart[i + 1]! - p.rowStart[i]!);
  return widest;
}
