// Banded LU factorization with partial pivoting, real and complex, in place, for iteration
// matrices whose nonzeros lie within ml diagonals below and mu above the main one. Algorithm:
// Gaussian elimination with partial pivoting restricted to the band, Golub & Van Loan, Matrix
// Computations, 4th ed., sec. 4.3.5 ("banded Gaussian elimination with pivoting"): row swaps
// widen U to ml + mu diagonals above the main one, and L keeps ml multipliers per column, which
// are applied column by column with the swaps in the solve (as LAPACK's xGBTRF/xGBTRS do), so
// earlier multipliers never move. Work per factorization about 2 n ml (ml + mu) flops instead
// of 2 n^3 / 3.
//
// Storage ("band rows"): row i of the matrix holds columns i - ml .. i + mu + ml at
// a[i * w + (j - i + ml)], w = bandWidth(ml, mu) = 2 ml + mu + 1; the last ml places of a row
// start empty and receive the fill-in of row swaps. Entries outside the matrix stay 0.

/** Entries per stored row: ml below, the diagonal, mu above and ml of fill-in. */
export function bandWidth(ml: number, mu: number): number {
  return 2 * ml + mu + 1;
}

/** Position of entry (i, j), |j - i| inside the band, in band-row storage. */
export function bandIndex(i: number, j: number, ml: number, w: number): number {
  return i * w + (j - i + ml);
}

/**
 * Factor in place as P A = L U (piv[k]: the row swapped with row k at step k). Returns false on
 * a zero pivot (singular to working precision); a is then unusable.
 */
export function bandLuFactor(a: Float64Array, n: number, ml: number, mu: number, piv: Int32Array): boolean {
  const w = 2 * ml + mu + 1;
  for (let k = 0; k < n; k++) {
    const last = k + ml < n - 1 ? k + ml : n - 1;
    const right = k + ml + mu < n - 1 ? k + ml + mu : n - 1;
    let p = k;
    let maxAbs = Math.abs(a[k * w + ml]!);
    for (let i = k + 1; i <= last; i++) {
      const v = Math.abs(a[i * w + (k - i + ml)]!);
      if (v > maxAbs) {
        maxAbs = v;
        p = i;
      }
    }
    piv[k] = p;
    if (!(maxAbs > 0)) return false;
    const rk = k * w - k + ml;
    if (p !== k) {
      const rp = p * w - p + ml;
      for (let j = k; j <= right; j++) {
        const tmp = a[rk + j]!;
        a[rk + j] = a[rp + j]!;
        a[rp + j] = tmp;
      }
    }
    const inv = 1 / a[rk + k]!;
    for (let i = k + 1; i <= last; i++) {
      const ri = i * w - i + ml;
      const m = a[ri + k]! * inv;
      a[ri + k] = m;
      if (m !== 0) for (let j = k + 1; j <= right; j++) a[ri + j] = a[ri + j]! - m * a[rk + j]!;
    }
  }
  return true;
}

/** Solve A x = b in place (b becomes x) with the factors left by bandLuFactor. */
export function bandLuSolve(a: Float64Array, n: number, ml: number, mu: number, piv: Int32Array, b: Float64Array): void {
  const w = 2 * ml + mu + 1;
  for (let k = 0; k < n; k++) {
    const p = piv[k]!;
    if (p !== k) {
      const tmp = b[k]!;
      b[k] = b[p]!;
      b[p] = tmp;
    }
    const bk = b[k]!;
    if (bk === 0) continue;
    const last = k + ml < n - 1 ? k + ml : n - 1;
    for (let i = k + 1; i <= last; i++) b[i] = b[i]! - a[i * w + (k - i + ml)]! * bk;
  }
  const reach = ml + mu;
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * w - i + ml;
    const right = i + reach < n - 1 ? i + reach : n - 1;
    let s = b[i]!;
    for (let j = i + 1; j <= right; j++) s -= a[ri + j]! * b[j]!;
    b[i] = s / a[ri + i]!;
  }
}

/** Complex analogue of bandLuFactor (ar + i ai, same storage); pivots on |re| + |im| like complexLuFactor. */
export function complexBandLuFactor(ar: Float64Array, ai: Float64Array, n: number, ml: number, mu: number, piv: Int32Array): boolean {
  const w = 2 * ml + mu + 1;
  for (let k = 0; k < n; k++) {
    const last = k + ml < n - 1 ? k + ml : n - 1;
    const right = k + ml + mu < n - 1 ? k + ml + mu : n - 1;
    let p = k;
    let maxAbs = Math.abs(ar[k * w + ml]!) + Math.abs(ai[k * w + ml]!);
    for (let i = k + 1; i <= last; i++) {
      const q = i * w + (k - i + ml);
      const v = Math.abs(ar[q]!) + Math.abs(ai[q]!);
      if (v > maxAbs) {
        maxAbs = v;
        p = i;
      }
    }
    piv[k] = p;
    if (!(maxAbs > 0)) return false;
    const rk = k * w - k + ml;
    if (p !== k) {
      const rp = p * w - p + ml;
      for (let j = k; j <= right; j++) {
        let tmp = ar[rk + j]!;
        ar[rk + j] = ar[rp + j]!;
        ar[rp + j] = tmp;
        tmp = ai[rk + j]!;
        ai[rk + j] = ai[rp + j]!;
        ai[rp + j] = tmp;
      }
    }
    const pr = ar[rk + k]!;
    const pi = ai[rk + k]!;
    const den = pr * pr + pi * pi;
    const ir = pr / den;
    const ii = -pi / den;
    for (let i = k + 1; i <= last; i++) {
      const ri = i * w - i + ml;
      const xr = ar[ri + k]!;
      const xi = ai[ri + k]!;
      const mr = xr * ir - xi * ii;
      const mi = xr * ii + xi * ir;
      ar[ri + k] = mr;
      ai[ri + k] = mi;
      if (mr === 0 && mi === 0) continue;
      for (let j = k + 1; j <= right; j++) {
        const ur = ar[rk + j]!;
        const ui = ai[rk + j]!;
        ar[ri + j] = ar[ri + j]! - (mr * ur - mi * ui);
        ai[ri + j] = ai[ri + j]! - (mr * ui + mi * ur);
      }
    }
  }
  return true;
}

/** Solve (ar + i ai) x = br + i bi in place with the factors left by complexBandLuFactor. */
export function complexBandLuSolve(
  ar: Float64Array,
  ai: Float64Array,
  n: number,
  ml: number,
  mu: number,
  piv: Int32Array,
  br: Float64Array,
  bi: Float64Array,
): void {
  const w = 2 * ml + mu + 1;
  for (let k = 0; k < n; k++) {
    const p = piv[k]!;
    if (p !== k) {
      let tmp = br[k]!;
      br[k] = br[p]!;
      br[p] = tmp;
      tmp = bi[k]!;
      bi[k] = bi[p]!;
      bi[p] = tmp;
    }
    const xr = br[k]!;
    const xi = bi[k]!;
    if (xr === 0 && xi === 0) continue;
    const last = k + ml < n - 1 ? k + ml : n - 1;
    for (let i = k + 1; i <= last; i++) {
      const q = i * w + (k - i + ml);
      const lr = ar[q]!;
      const li = ai[q]!;
      br[i] = br[i]! - (lr * xr - li * xi);
      bi[i] = bi[i]! - (lr * xi + li * xr);
    }
  }
  const reach = ml + mu;
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * w - i + ml;
    const right = i + reach < n - 1 ? i + reach : n - 1;
    let sr = br[i]!;
    let si = bi[i]!;
    for (let j = i + 1; j <= right; j++) {
      const ur = ar[ri + j]!;
      const ui = ai[ri + j]!;
      const xr = br[j]!;
      const xi = bi[j]!;
      sr -= ur * xr - ui * xi;
      si -= ur * xi + ui * xr;
    }
    const dr = ar[ri + i]!;
    const di = ai[ri + i]!;
    const den = dr * dr + di * di;
    br[i] = (sr * dr + si * di) / den;
    bi[i] = (si * dr - sr * di) / den;
  }
}
