// Matrix exponential of a small dense matrix, for exact solutions of linear problems.
// Scaling and squaring with diagonal Pade approximants of degree 3, 5, 7, 9 or 13 chosen from
// the 1-norm, as in N. J. Higham, "The scaling and squaring method for the matrix exponential
// revisited", SIAM J. Matrix Anal. Appl. 26(4), 2005, 1179-1193 (Algorithm 2.3). Matrices are
// row-major Float64Array of length n*n. Called once per evaluation time, so it allocates freely.

/** Degrees tried in order, with theta_m from Higham (2005), Table 2.3. */
const PADE_DEGREES = [3, 5, 7, 9] as const;
const THETA: Record<number, number> = {
  3: 1.495585217958292e-2,
  5: 2.539398330063230e-1,
  7: 9.504178996162932e-1,
  9: 2.097847961257068e0,
  13: 5.371920351148152e0,
};

/**
 * Coefficients b_j of the [m/m] Pade numerator of exp, b_j = (2m-j)! m! / ((2m)! j! (m-j)!),
 * by the ratio b_{j+1}/b_j = (m-j) / ((2m-j)(j+1)) so no factorial overflows.
 */
function padeCoefficients(m: number): number[] {
  const b = [1];
  for (let j = 0; j < m; j++) b.push((b[j]! * (m - j)) / ((2 * m - j) * (j + 1)));
  return b;
}

function multiply(a: Float64Array, b: Float64Array, n: number): Float64Array {
  const c = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < n; k++) {
      const aik = a[i * n + k]!;
      if (aik === 0) continue;
      for (let j = 0; j < n; j++) c[i * n + j]! += aik * b[k * n + j]!;
    }
  }
  return c;
}

function identity(n: number): Float64Array {
  const m = new Float64Array(n * n);
  for (let i = 0; i < n; i++) m[i * n + i] = 1;
  return m;
}

/** Largest absolute column sum. */
export function norm1(a: Float64Array, n: number): number {
  let best = 0;
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += Math.abs(a[i * n + j]!);
    if (s > best) best = s;
  }
  return best;
}

/** out += s * a */
function addScaled(out: Float64Array, s: number, a: Float64Array): void {
  for (let i = 0; i < out.length; i++) out[i]! += s * a[i]!;
}

/** Solves P X = Q for X (n x n each) by Gaussian elimination with partial pivoting. */
function solveMatrix(p: Float64Array, q: Float64Array, n: number): Float64Array {
  const a = Float64Array.from(p);
  const x = Float64Array.from(q);
  for (let k = 0; k < n; k++) {
    let piv = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i * n + k]!) > Math.abs(a[piv * n + k]!)) piv = i;
    const pivot = a[piv * n + k]!;
    if (pivot === 0) throw new RangeError('expm: Pade denominator is singular');
    if (piv !== k) {
      for (let j = 0; j < n; j++) {
        const t = a[k * n + j]!; a[k * n + j] = a[piv * n + j]!; a[piv * n + j] = t;
        const u = x[k * n + j]!; x[k * n + j] = x[piv * n + j]!; x[piv * n + j] = u;
      }
    }
    for (let i = k + 1; i < n; i++) {
      const l = a[i * n + k]! / pivot;
      if (l === 0) continue;
      for (let j = k; j < n; j++) a[i * n + j]! -= l * a[k * n + j]!;
      for (let j = 0; j < n; j++) x[i * n + j]! -= l * x[k * n + j]!;
    }
  }
  for (let k = n - 1; k >= 0; k--) {
    const d = a[k * n + k]!;
    for (let j = 0; j < n; j++) {
      let s = x[k * n + j]!;
      for (let i = k + 1; i < n; i++) s -= a[k * n + i]! * x[i * n + j]!;
      x[k * n + j] = s / d;
    }
  }
  return x;
}

/** r_m(A) = (V - U)^{-1} (V + U), with U the odd and V the even part of the Pade numerator. */
function padeLowDegree(a: Float64Array, n: number, m: number): Float64Array {
  const b = padeCoefficients(m);
  const a2 = multiply(a, a, n);
  const odd = new Float64Array(n * n);
  const v = new Float64Array(n * n);
  let power = identity(n);
  for (let j = 0; j <= m; j += 2) {
    addScaled(odd, b[j + 1]!, power);
    addScaled(v, b[j]!, power);
    if (j + 2 <= m) power = multiply(power, a2, n);
  }
  return finish(multiply(a, odd, n), v, n);
}

/** Degree 13 with Higham's grouping, which needs only six matrix products. */
function padeDegree13(a: Float64Array, n: number): Float64Array {
  const b = padeCoefficients(13);
  const id = identity(n);
  const a2 = multiply(a, a, n);
  const a4 = multiply(a2, a2, n);
  const a6 = multiply(a4, a2, n);
  const inner = new Float64Array(n * n);
  addScaled(inner, b[13]!, a6);
  addScaled(inner, b[11]!, a4);
  addScaled(inner, b[9]!, a2);
  const odd = multiply(a6, inner, n);
  addScaled(odd, b[7]!, a6);
  addScaled(odd, b[5]!, a4);
  addScaled(odd, b[3]!, a2);
  addScaled(odd, b[1]!, id);
  const innerV = new Float64Array(n * n);
  addScaled(innerV, b[12]!, a6);
  addScaled(innerV, b[10]!, a4);
  addScaled(innerV, b[8]!, a2);
  const v = multiply(a6, innerV, n);
  addScaled(v, b[6]!, a6);
  addScaled(v, b[4]!, a4);
  addScaled(v, b[2]!, a2);
  addScaled(v, b[0]!, id);
  return finish(multiply(a, odd, n), v, n);
}

function finish(u: Float64Array, v: Float64Array, n: number): Float64Array {
  const p = Float64Array.from(v);
  const q = Float64Array.from(v);
  addScaled(p, -1, u);
  addScaled(q, 1, u);
  return solveMatrix(p, q, n);
}

/** exp(A) for a row-major n x n matrix A. */
export function expm(a: Float64Array, n: number): Float64Array {
  if (a.length !== n * n) throw new RangeError(`expm: matrix has ${a.length} entries, expected ${n * n}`);
  for (let i = 0; i < a.length; i++) {
    if (!Number.isFinite(a[i]!)) throw new RangeError('expm: matrix has a non-finite entry');
  }
  const norm = norm1(a, n);
  for (const m of PADE_DEGREES) {
    if (norm <= THETA[m]!) return padeLowDegree(a, n, m);
  }
  const s = Math.max(0, Math.ceil(Math.log2(norm / THETA[13]!)));
  const scaled = Float64Array.from(a);
  const factor = 2 ** -s;
  for (let i = 0; i < scaled.length; i++) scaled[i]! *= factor;
  let r = padeDegree13(scaled, n);
  for (let k = 0; k < s; k++) r = multiply(r, r, n);
  return r;
}

/** out = exp(A t) z0, for one evaluation time. */
export function expmApply(a: Float64Array, n: number, t: number, z0: ArrayLike<number>, out: Float64Array): void {
  const at = new Float64Array(n * n);
  for (let i = 0; i < at.length; i++) at[i] = a[i]! * t;
  const e = expm(at, n);
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let j = 0; j < n; j++) s += e[i * n + j]! * z0[j]!;
    out[i] = s;
  }
}
