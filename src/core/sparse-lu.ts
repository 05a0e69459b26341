// Sparse LU factorization with threshold partial pivoting, real and complex, for iteration
// matrices whose Jacobian has a declared sparsity pattern (src/core/sparse-pattern.ts).
//
// Analysis, once per pattern (SparseLuAnalysis): a fill-reducing order of the columns by minimum
// degree on A + A^T (src/core/min-degree.ts) and the factors' expected sizes. Factorization,
// per matrix: left-looking, one column at a time, as Gilbert and Peierls, "Sparse partial
// pivoting in time proportional to arithmetic operations", SIAM J. Sci. Stat. Comput. 9 (1988)
// 862-874: the nonzeros of column k of L^{-1} A are found by a depth-first search in the graph
// of the columns of L already computed (their topological order is the order of the triangular
// solve), so the work is proportional to the flops. Pivot: threshold partial pivoting (Duff,
// Erisman and Reid, Direct Methods for Sparse Matrices, 1986, sec. 7.8): the diagonal entry of
// the ordered matrix is kept when it is at least PIVOT_THRESHOLD times the largest candidate
// in its column, which keeps the fill of the analysis; otherwise the largest is taken, as dense
// partial pivoting would. Growth of the factors is therefore bounded by (1 + 1/threshold) per
// step, as with partial pivoting by 2.
//
// Storage: values of A come in the pattern's row order; L (unit lower) and U (upper) by columns of
// the permuted matrix, row indices in step numbering once factored. Every work array is made once
// per solve; the factors' arrays grow (the one allocation) only if pivoting away from the
// diagonal fills beyond the analysis' estimate.
import { minimumDegreeOrder } from './min-degree.js';
import type { SparsePattern } from './sparse-pattern.js';

/** Relative size a diagonal pivot needs to be kept (0.1: the common choice, Duff, Erisman and Reid, sec. 7.8). */
export const PIVOT_THRESHOLD = 0.1;

/** The part of a sparse LU that depends only on the pattern: computed once, shared by every solve. */
export class SparseLuAnalysis {
  /** Columns (and their preferred pivot rows) in elimination order. */
  readonly order: Int32Array;
  /** Entries L and U each need when every pivot stays on the diagonal. */
  readonly factorEntries: number;

  constructor(readonly pattern: SparsePattern) {
    const { order, offDiagonal } = minimumDegreeOrder(pattern);
    this.order = order;
    this.factorEntries = offDiagonal;
  }
}

type Buffers = { float64(length: number): Float64Array; int32(length: number): Int32Array };

const FRESH: Buffers = { float64: (l) => new Float64Array(l), int32: (l) => new Int32Array(l) };

/** Pattern work of a factorization shared by the real and complex forms: the search and L's and U's structure. */
class SparseLuStructure {
  protected readonly n: number;
  protected readonly p: SparsePattern;
  protected readonly order: Int32Array;
  /** Row -> step at which it became pivotal (-1: not yet); prow: step -> row. */
  protected readonly pinv: Int32Array;
  protected readonly prow: Int32Array;
  protected readonly lStart: Int32Array;
  protected readonly uStart: Int32Array;
  protected lRow: Int32Array;
  protected uRow: Int32Array;
  /** Search output: xi[top..n-1] holds the reached rows in topological order. */
  protected readonly xi: Int32Array;
  private readonly stack: Int32Array;
  private readonly next: Int32Array;
  protected readonly mark: Int32Array;
  protected stamp = 0;
  /** Values of L and U (one array for the real form; real and imaginary parts for the complex). */
  protected readonly lValues: Float64Array[] = [];
  protected readonly uValues: Float64Array[] = [];
  /** U's diagonal and the column being computed, by part likewise. */
  protected readonly diagonal: Float64Array[] = [];
  protected readonly work: Float64Array[] = [];
  /** Times the factors' storage had to grow (pivots off the diagonal filling past the estimate). */
  growths = 0;
  /**
   * The searches of the last factorization, kept: step k's reached rows, in xi's order, are
   * reachRows[reachStart[k] .. reachStart[k + 1] - 1], and keptProw its pivots. While every pivot
   * so far falls on the row it fell on last time, L's columns so far and the pivotal rows are
   * the same, so step k's search would reach the same rows in the same order: it is read back
   * instead of made again, and the factors are the same bits.
   */
  private reachRows: Int32Array;
  private readonly reachStart: Int32Array;
  private readonly keptProw: Int32Array;
  /** Steps whose search is kept (0 before the first factorization, and after a failed one's step). */
  private keptSteps = 0;
  /** Whether every pivot of the factorization under way so far matched the kept one. */
  private samePivots = false;
  /** Searches read back rather than made, over this object's life (for tests and the bench). */
  searchesReused = 0;

  /** `slack`: room past the analysis' estimate in each factor (n unless a test asks for less); parts: 1 real, 2 complex. */
  constructor(analysis: SparseLuAnalysis, buffers: Buffers, slack: number, parts: number) {
    const n = analysis.pattern.n;
    this.n = n;
    this.p = analysis.pattern;
    this.order = analysis.order;
    this.pinv = buffers.int32(n);
    this.prow = buffers.int32(n);
    this.lStart = buffers.int32(n + 1);
    this.uStart = buffers.int32(n + 1);
    const cap = analysis.factorEntries + slack;
    this.lRow = buffers.int32(cap);
    this.uRow = buffers.int32(cap);
    this.xi = buffers.int32(n);
    this.stack = buffers.int32(n);
    this.next = buffers.int32(n);
    this.mark = buffers.int32(n);
    this.reachRows = buffers.int32(2 * cap + n);
    this.reachStart = buffers.int32(n + 1);
    this.keptProw = buffers.int32(n);
    for (let k = 0; k < parts; k++) {
      this.lValues.push(buffers.float64(cap));
      this.uValues.push(buffers.float64(cap));
      this.diagonal.push(buffers.float64(n));
      this.work.push(buffers.float64(n));
    }
  }

  protected begin(): void {
    this.pinv.fill(-1);
    this.mark.fill(0);
    this.stamp = 0;
    this.samePivots = true;
  }

  /**
   * Step k's search (column j of A): the kept one while the pivots so far match, else a fresh
   * one, which is then kept. Returns top (see xi); the reached rows are marked with this step's
   * stamp either way.
   */
  protected search(k: number, j: number): number {
    const { xi, mark, reachStart } = this;
    if (this.samePivots && k < this.keptSteps) {
      const stamp = ++this.stamp;
      const rows = this.reachRows;
      const from = reachStart[k]!;
      const top = this.n - (reachStart[k + 1]! - from);
      for (let q = from, t = top; t < this.n; q++, t++) {
        const i = rows[q]!;
        xi[t] = i;
        mark[i] = stamp;
      }
      this.searchesReused++;
      return top;
    }
    const top = this.reach(j);
    const from = reachStart[k]!;
    const length = this.n - top;
    if (from + length > this.reachRows.length) this.reachRows = grownInt(this.reachRows, Math.max(2 * this.reachRows.length, from + length));
    const rows = this.reachRows;
    for (let t = top, q = from; t < this.n; t++, q++) rows[q] = xi[t]!;
    reachStart[k + 1] = from + length;
    // Steps after k were searched under other pivots; k's own pivot is settled by `pivoted`.
    this.keptSteps = k;
    return top;
  }

  /** Step k's pivot row, once chosen: whether the next search may be read back. */
  protected pivoted(k: number, row: number): void {
    if (this.samePivots && k < this.keptSteps && this.keptProw[k] === row) return;
    this.samePivots = false;
    this.keptProw[k] = row;
    this.keptSteps = k + 1;
  }

  /** Rows reached from column j of A through the columns of L so far; returns top (see xi). */
  protected reach(j: number): number {
    const { p, pinv, lStart, xi, stack, next, mark } = this;
    const lRow = this.lRow;
    const stamp = ++this.stamp;
    let top = this.n;
    for (let q = p.colStart[j]!; q < p.colStart[j + 1]!; q++) {
      const start = p.row[q]!;
      if (mark[start] === stamp) continue;
      let head = 0;
      stack[0] = start;
      mark[start] = stamp;
      next[0] = pinv[start]! >= 0 ? lStart[pinv[start]!]! : 0;
      while (head >= 0) {
        const i = stack[head]!;
        const s = pinv[i]!;
        const end = s >= 0 ? lStart[s + 1]! : 0;
        let descended = false;
        for (let r = next[head]!; r < end; r++) {
          const child = lRow[r]!;
          if (mark[child] === stamp) continue;
          next[head] = r + 1;
          mark[child] = stamp;
          stack[++head] = child;
          next[head] = pinv[child]! >= 0 ? lStart[pinv[child]!]! : 0;
          descended = true;
          break;
        }
        if (!descended) {
          head--;
          xi[--top] = i;
        }
      }
    }
    return top;
  }

  /** Room for `more` entries in L and U past lnz and unz (grows them by doubling when short). */
  protected room(lnz: number, unz: number, more: number): void {
    if (lnz + more > this.lRow.length) {
      const cap = Math.max(2 * this.lRow.length, lnz + more);
      this.lRow = grownInt(this.lRow, cap);
      for (let k = 0; k < this.lValues.length; k++) this.lValues[k] = grownFloat(this.lValues[k]!, cap);
      this.growths++;
    }
    if (unz + more > this.uRow.length) {
      const cap = Math.max(2 * this.uRow.length, unz + more);
      this.uRow = grownInt(this.uRow, cap);
      for (let k = 0; k < this.uValues.length; k++) this.uValues[k] = grownFloat(this.uValues[k]!, cap);
      this.growths++;
    }
  }

  /** Steps of the last factorization whose pivot left the diagonal of the ordered matrix. */
  offDiagonalPivots(): number {
    let count = 0;
    for (let k = 0; k < this.n; k++) if (this.prow[k] !== this.order[k]) count++;
    return count;
  }

  /** Entries stored in L and U (off their diagonals) by the last factorization. */
  factorEntries(): number {
    return this.lStart[this.n]! + this.uStart[this.n]!;
  }

  /** After the last column: L's row indices from row numbers to steps. */
  protected finish(): void {
    const lRow = this.lRow;
    const end = this.lStart[this.n]!;
    for (let q = 0; q < end; q++) lRow[q] = this.pinv[lRow[q]!]!;
  }
}

function grownInt(a: Int32Array, cap: number): Int32Array {
  const b = new Int32Array(cap);
  b.set(a);
  return b;
}

function grownFloat(a: Float64Array, cap: number): Float64Array {
  const b = new Float64Array(cap);
  b.set(a);
  return b;
}

export class SparseLu extends SparseLuStructure {
  constructor(analysis: SparseLuAnalysis, buffers: Buffers = FRESH, slack = analysis.pattern.n) {
    super(analysis, buffers, slack, 1);
  }

  /** Factor the matrix with these values (the pattern's row order); false on a zero pivot. */
  factor(values: Float64Array): boolean {
    const { n, p, order, pinv, prow, lStart, uStart, xi, mark } = this;
    const x = this.work[0]!;
    const uDiag = this.diagonal[0]!;
    this.begin();
    let lnz = 0;
    let unz = 0;
    for (let k = 0; k < n; k++) {
      const j = order[k]!;
      const top = this.search(k, j);
      this.room(lnz, unz, n - top);
      const lRow = this.lRow;
      const lVal = this.lValues[0]!;
      const uRow = this.uRow;
      const uVal = this.uValues[0]!;
      for (let t = top; t < n; t++) x[xi[t]!] = 0;
      for (let q = p.colStart[j]!; q < p.colStart[j + 1]!; q++) x[p.row[q]!] = values[p.rowOrderOf[q]!]!;
      for (let t = top; t < n; t++) {
        const s = pinv[xi[t]!]!;
        if (s < 0) continue;
        const xs = x[xi[t]!]!;
        if (xs === 0) continue;
        for (let q = lStart[s]!; q < lStart[s + 1]!; q++) x[lRow[q]!] = x[lRow[q]!]! - lVal[q]! * xs;
      }
      let pivotRow = -1;
      let largest = -1;
      for (let t = top; t < n; t++) {
        const i = xi[t]!;
        const s = pinv[i]!;
        if (s >= 0) {
          uRow[unz] = s;
          uVal[unz++] = x[i]!;
        } else {
          const a = Math.abs(x[i]!);
          if (a > largest) {
            largest = a;
            pivotRow = i;
          }
        }
      }
      // A NaN candidate compares false with everything, so test for "not positive" explicitly.
      if (!(largest > 0)) return false;
      if (mark[j] === this.stamp && pinv[j]! < 0 && Math.abs(x[j]!) >= PIVOT_THRESHOLD * largest) pivotRow = j;
      const pivot = x[pivotRow]!;
      uDiag[k] = pivot;
      pinv[pivotRow] = k;
      prow[k] = pivotRow;
      this.pivoted(k, pivotRow);
      const inv = 1 / pivot;
      for (let t = top; t < n; t++) {
        const i = xi[t]!;
        if (pinv[i]! >= 0) continue;
        lRow[lnz] = i;
        lVal[lnz++] = x[i]! * inv;
      }
      lStart[k + 1] = lnz;
      uStart[k + 1] = unz;
    }
    this.finish();
    return true;
  }

  /** Solve A x = b in place (b becomes x) with the last factors. */
  solve(b: Float64Array): void {
    const { n, order, prow, lStart, uStart, lRow, uRow } = this;
    const lVal = this.lValues[0]!;
    const uVal = this.uValues[0]!;
    const uDiag = this.diagonal[0]!;
    const x = this.work[0]!;
    for (let k = 0; k < n; k++) x[k] = b[prow[k]!]!;
    for (let k = 0; k < n; k++) {
      const xk = x[k]!;
      if (xk === 0) continue;
      for (let q = lStart[k]!; q < lStart[k + 1]!; q++) x[lRow[q]!] = x[lRow[q]!]! - lVal[q]! * xk;
    }
    for (let k = n - 1; k >= 0; k--) {
      const xk = x[k]! / uDiag[k]!;
      x[k] = xk;
      if (xk === 0) continue;
      for (let q = uStart[k]!; q < uStart[k + 1]!; q++) x[uRow[q]!] = x[uRow[q]!]! - uVal[q]! * xk;
    }
    for (let k = 0; k < n; k++) b[order[k]!] = x[k]!;
  }
}

/** Complex analogue of SparseLu (values re + i im); pivots on |re| + |im| like complexLuFactor. */
export class ComplexSparseLu extends SparseLuStructure {
  constructor(analysis: SparseLuAnalysis, buffers: Buffers = FRESH, slack = analysis.pattern.n) {
    super(analysis, buffers, slack, 2);
  }

  /** Factor the matrix re + i im (values in the pattern's row order); false on a zero pivot. */
  factor(re: Float64Array, im: Float64Array): boolean {
    const { n, p, order, pinv, prow, lStart, uStart, xi, mark } = this;
    const xr = this.work[0]!;
    const xm = this.work[1]!;
    const dRe = this.diagonal[0]!;
    const dIm = this.diagonal[1]!;
    this.begin();
    let lnz = 0;
    let unz = 0;
    for (let k = 0; k < n; k++) {
      const j = order[k]!;
      const top = this.search(k, j);
      this.room(lnz, unz, n - top);
      const { lRow, uRow } = this;
      const lRe = this.lValues[0]!;
      const lIm = this.lValues[1]!;
      const uRe = this.uValues[0]!;
      const uIm = this.uValues[1]!;
      for (let t = top; t < n; t++) {
        xr[xi[t]!] = 0;
        xm[xi[t]!] = 0;
      }
      for (let q = p.colStart[j]!; q < p.colStart[j + 1]!; q++) {
        xr[p.row[q]!] = re[p.rowOrderOf[q]!]!;
        xm[p.row[q]!] = im[p.rowOrderOf[q]!]!;
      }
      for (let t = top; t < n; t++) {
        const s = pinv[xi[t]!]!;
        if (s < 0) continue;
        const ar = xr[xi[t]!]!;
        const ai = xm[xi[t]!]!;
        if (ar === 0 && ai === 0) continue;
        for (let q = lStart[s]!; q < lStart[s + 1]!; q++) {
          const r = lRow[q]!;
          const lr = lRe[q]!;
          const li = lIm[q]!;
          xr[r] = xr[r]! - (lr * ar - li * ai);
          xm[r] = xm[r]! - (lr * ai + li * ar);
        }
      }
      let pivotRow = -1;
      let largest = -1;
      for (let t = top; t < n; t++) {
        const i = xi[t]!;
        const s = pinv[i]!;
        if (s >= 0) {
          uRow[unz] = s;
          uRe[unz] = xr[i]!;
          uIm[unz++] = xm[i]!;
        } else {
          const a = Math.abs(xr[i]!) + Math.abs(xm[i]!);
          if (a > largest) {
            largest = a;
            pivotRow = i;
          }
        }
      }
      if (!(largest > 0)) return false;
      if (mark[j] === this.stamp && pinv[j]! < 0 && Math.abs(xr[j]!) + Math.abs(xm[j]!) >= PIVOT_THRESHOLD * largest) pivotRow = j;
      const pr = xr[pivotRow]!;
      const pi = xm[pivotRow]!;
      dRe[k] = pr;
      dIm[k] = pi;
      pinv[pivotRow] = k;
      prow[k] = pivotRow;
      this.pivoted(k, pivotRow);
      // 1 / (pr + i pi) = (pr - i pi) / (pr^2 + pi^2)
      const den = pr * pr + pi * pi;
      const ir = pr / den;
      const ii = -pi / den;
      for (let t = top; t < n; t++) {
        const i = xi[t]!;
        if (pinv[i]! >= 0) continue;
        const a = xr[i]!;
        const b = xm[i]!;
        lRow[lnz] = i;
        lRe[lnz] = a * ir - b * ii;
        lIm[lnz++] = a * ii + b * ir;
      }
      lStart[k + 1] = lnz;
      uStart[k + 1] = unz;
    }
    this.finish();
    return true;
  }

  /** Solve (re + i im) x = br + i bi in place with the last factors. */
  solve(br: Float64Array, bi: Float64Array): void {
    const { n, order, prow, lStart, uStart, lRow, uRow } = this;
    const lRe = this.lValues[0]!;
    const lIm = this.lValues[1]!;
    const uRe = this.uValues[0]!;
    const uIm = this.uValues[1]!;
    const dRe = this.diagonal[0]!;
    const dIm = this.diagonal[1]!;
    const xr = this.work[0]!;
    const xm = this.work[1]!;
    for (let k = 0; k < n; k++) {
      xr[k] = br[prow[k]!]!;
      xm[k] = bi[prow[k]!]!;
    }
    for (let k = 0; k < n; k++) {
      const ar = xr[k]!;
      const ai = xm[k]!;
      if (ar === 0 && ai === 0) continue;
      for (let q = lStart[k]!; q < lStart[k + 1]!; q++) {
        const r = lRow[q]!;
        xr[r] = xr[r]! - (lRe[q]! * ar - lIm[q]! * ai);
        xm[r] = xm[r]! - (lRe[q]! * ai + lIm[q]! * ar);
      }
    }
    for (let k = n - 1; k >= 0; k--) {
      const sr = xr[k]!;
      const si = xm[k]!;
      const dr = dRe[k]!;
      const di = dIm[k]!;
      const den = dr * dr + di * di;
      const ar = (sr * dr + si * di) / den;
      const ai = (si * dr - sr * di) / den;
      xr[k] = ar;
      xm[k] = ai;
      if (ar === 0 && ai === 0) continue;
      for (let q = uStart[k]!; q < uStart[k + 1]!; q++) {
        const r = uRow[q]!;
        xr[r] = xr[r]! - (uRe[q]! * ar - uIm[q]! * ai);
        xm[r] = xm[r]! - (uRe[q]! * ai + uIm[q]! * ar);
      }
    }
    for (let k = 0; k < n; k++) {
      br[order[k]!] = xr[k]!;
      bi[order[k]!] = xm[k]!;
    }
  }
}
