// Dense LU factorization with partial pivoting, in place on row-major Float64Array storage,
// and the matching forward/back substitution. A complex variant (real and imaginary parts in
// separate arrays) serves the complex stage system of Radau IIA.
// Algorithm: Gaussian elimination with partial pivoting, Golub & Van Loan, Matrix
// Computations, sec. 3.4.

/**
 * Factor the n x n matrix a (row-major) in place as P A = L U, L unit lower triangular stored
 * below the diagonal, U on and above it. piv[k] is the row swapped with row k at step k.
 * Returns false when a zero pivot is met (the matrix is singular to working precision);
 * the contents of a are then unusable.
 */
export function luFactor(a: Float64Array, n: number, piv: Int32Array): boolean {
  for (let k = 0; k < n; k++) {
    let p = k;
    let maxAbs = Math.abs(a[k * n + k]!);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(a[i * n + k]!);
      if (v > maxAbs) {
        maxAbs = v;
        p = i;
      }
    }
    piv[k] = p;
    // A NaN pivot compares false with everything, so test for "not positive" explicitly.
    if (!(maxAbs > 0)) return false;
    if (p !== k) {
      const rk = k * n;
      const rp = p * n;
      for (let j = 0; j < n; j++) {
        const tmp = a[rk + j]!;
        a[rk + j] = a[rp + j]!;
        a[rp + j] = tmp;
      }
    }
    const rk = k * n;
    const inv = 1 / a[rk + k]!;
    for (let i = k + 1; i < n; i++) {
      const ri = i * n;
      const m = a[ri + k]! * inv;
      a[ri + k] = m;
      if (m !== 0) for (let j = k + 1; j < n; j++) a[ri + j] = a[ri + j]! - m * a[rk + j]!;
    }
  }
  return true;
}

/** Solve A x = b in place (b becomes x) with the factors left by luFactor. */
export function luSolve(a: Float64Array, n: number, piv: Int32Array, b: Float64Array): void {
  for (let k = 0; k < n; k++) {
    const p = piv[k]!;
    if (p !== k) {
      const tmp = b[k]!;
      b[k] = b[p]!;
      b[p] = tmp;
    }
  }
  for (let i = 1; i < n; i++) {
    const ri = i * n;
    let s = b[i]!;
    for (let j = 0; j < i; j++) s -= a[ri + j]! * b[j]!;
    b[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * n;
    let s = b[i]!;
    for (let j = i + 1; j < n; j++) s -= a[ri + j]! * b[j]!;
    b[i] = s / a[ri + i]!;
  }
}

/**
 * Complex analogue of luFactor: the matrix is ar + i*ai (both row-major n x n), factored in
 * place. Pivots on |re| + |im|, which ranks rows like the modulus within a factor sqrt(2) and
 * avoids a square root per candidate. Returns false on a zero pivot.
 */
export function complexLuFactor(ar: Float64Array, ai: Float64Array, n: number, piv: Int32Array): boolean {
  for (let k = 0; k < n; k++) {
    let p = k;
    let maxAbs = Math.abs(ar[k * n + k]!) + Math.abs(ai[k * n + k]!);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(ar[i * n + k]!) + Math.abs(ai[i * n + k]!);
      if (v > maxAbs) {
        maxAbs = v;
        p = i;
      }
    }
    piv[k] = p;
    if (!(maxAbs > 0)) return false;
    const rk = k * n;
    if (p !== k) {
      const rp = p * n;
      for (let j = 0; j < n; j++) {
        let tmp = ar[rk + j]!;
        ar[rk + j] = ar[rp + j]!;
        ar[rp + j] = tmp;
        tmp = ai[rk + j]!;
        ai[rk + j] = ai[rp + j]!;
        ai[rp + j] = tmp;
      }
    }
    // 1 / (pr + i pi) = (pr - i pi) / (pr^2 + pi^2)
    const pr = ar[rk + k]!;
    const pi = ai[rk + k]!;
    const den = pr * pr + pi * pi;
    const ir = pr / den;
    const ii = -pi / den;
    for (let i = k + 1; i < n; i++) {
      const ri = i * n;
      const xr = ar[ri + k]!;
      const xi = ai[ri + k]!;
      const mr = xr * ir - xi * ii;
      const mi = xr * ii + xi * ir;
      ar[ri + k] = mr;
      ai[ri + k] = mi;
      if (mr === 0 && mi === 0) continue;
      for (let j = k + 1; j < n; j++) {
        const ur = ar[rk + j]!;
        const ui = ai[rk + j]!;
        ar[ri + j] = ar[ri + j]! - (mr * ur - mi * ui);
        ai[ri + j] = ai[ri + j]! - (mr * ui + mi * ur);
      }
    }
  }
  return true;
}

/** Solve (ar + i ai) x = br + i bi in place with the factors left by complexLuFactor. */
export function complexLuSolve(
  ar: Float64Array,
  ai: Float64Array,
  n: number,
  piv: Int32Array,
  br: Float64Array,
  bi: Float64Array,
): void {
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
  }
  for (let i = 1; i < n; i++) {
    const ri = i * n;
    let sr = br[i]!;
    let si = bi[i]!;
    for (let j = 0; j < i; j++) {
      const lr = ar[ri + j]!;
      const li = ai[ri + j]!;
      const xr = br[j]!;
      const xi = bi[j]!;
      sr -= lr * xr - li * xi;
      si -= lr * xi + li * xr;
    }
    br[i] = sr;
    bi[i] = si;
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * n;
    let sr = br[i]!;
    let si = bi[i]!;
    for (let j = i + 1; j < n; j++) {
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
