// A Jacobian's sparsity pattern in the compressed forms the sparse solvers read, built once per
// pattern: rows (CSR: the order a sparse Jacobian's values are stored in) and columns (CSC, with
// each entry's place in the row order), the diagonal always present. Validation of a declared
// pattern lives here too, so every door in (defineProblem, the catalogue, the solve) gives the
// same message.
import type { JacobianPattern } from './types.js';

/** Compressed pattern of an n x n matrix; values of a sparse matrix are stored in its row order. */
export class SparsePattern {
  /** Number of stored entries (the declared ones plus any missing diagonal). */
  readonly nnz: number;
  /** Row i's entries are rowStart[i] .. rowStart[i + 1] - 1, columns ascending. */
  readonly rowStart: Int32Array;
  readonly column: Int32Array;
  /** Place of (i, i) in the row order. */
  readonly diagonal: Int32Array;
  /** Column j's entries are colStart[j] .. colStart[j + 1] - 1, rows ascending. */
  readonly colStart: Int32Array;
  readonly row: Int32Array;
  /** For each column-order entry, its place in the row order. */
  readonly rowOrderOf: Int32Array;

  constructor(
    readonly n: number,
    rows: JacobianPattern,
  ) {
    const rowStart = new Int32Array(n + 1);
    const sorted: number[][] = [];
    for (let i = 0; i < n; i++) {
      const cols = [...new Set([...rows[i]!, i])].sort((a, b) => a - b);
      sorted.push(cols);
      rowStart[i + 1] = rowStart[i]! + cols.length;
    }
    this.nnz = rowStart[n]!;
    this.rowStart = rowStart;
    this.column = new Int32Array(this.nnz);
    this.diagonal = new Int32Array(n);
    const counts = new Int32Array(n + 1);
    sorted.forEach((cols, i) => {
      cols.forEach((j, k) => {
        const q = rowStart[i]! + k;
        this.column[q] = j;
        if (j === i) this.diagonal[i] = q;
        counts[j + 1]!++;
      });
    });
    for (let j = 0; j < n; j++) counts[j + 1]! += counts[j]!;
    this.colStart = Int32Array.from(counts);
    this.row = new Int32Array(this.nnz);
    this.rowOrderOf = new Int32Array(this.nnz);
    const next = Int32Array.from(counts);
    for (let i = 0; i < n; i++) {
      for (let q = rowStart[i]!; q < rowStart[i + 1]!; q++) {
        const p = next[this.column[q]!]!++;
        this.row[p] = i;
        this.rowOrderOf[p] = q;
      }
    }
  }
}

/**
 * What is wrong with a declared pattern for n states, or null: `field` names it in the message
 * (e.g. "jacobianPattern"). Rows must number n, each a list of distinct integer columns in 0..n-1.
 */
export function patternProblem(pattern: unknown, n: number, field: string): string | null {
  if (!Array.isArray(pattern)) return `${field} must be a list of rows (one list of column indices per state), got ${typeof pattern}`;
  if (pattern.length !== n) return `${field} has ${pattern.length} rows for ${n} states (one row per state expected)`;
  for (let i = 0; i < n; i++) {
    const cols: unknown = pattern[i];
    if (!Array.isArray(cols)) return `${field} row ${i} must be a list of column indices, got ${JSON.stringify(cols)}`;
    const seen = new Set<number>();
    for (const j of cols) {
      if (!Number.isInteger(j) || (j as number) < 0 || (j as number) >= n) {
        return `${field} row ${i}: column ${JSON.stringify(j)} is not an integer in 0..${n - 1}`;
      }
      if (seen.has(j as number)) return `${field} row ${i}: column ${j as number} is listed twice`;
      seen.add(j as number);
    }
  }
  return null;
}

/** Stored entries of a band (lower below, upper above) in an n x n matrix, the diagonal included. */
export function bandEntries(n: number, lower: number, upper: number): number {
  let count = 0;
  for (let i = 0; i < n; i++) count += Math.min(n - 1, i + upper) - Math.max(0, i - lower) + 1;
  return count;
}
