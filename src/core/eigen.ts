// Eigenvalues of a small dense real matrix: Householder reduction to upper Hessenberg form, then
// the QR algorithm with Wilkinson shifts and deflation, carried out in complex arithmetic so
// complex pairs need no double-shift bookkeeping. Golub & Van Loan, Matrix Computations, 4th ed.,
// sec. 7.4 (Hessenberg reduction) and 7.5 (shifted QR).

const EPS = 2.220446049250313e-16;
const MAX_ITER_PER_EIGENVALUE = 60;

export interface Eigenvalues {
  readonly re: Float64Array;
  readonly im: Float64Array;
}

/** Reduce the row-major n x n matrix a (copied) to upper Hessenberg form by Householder reflections. */
function hessenberg(a: ArrayLike<number>, n: number): Float64Array {
  const h = Float64Array.from(a as ArrayLike<number>);
  const v = new Float64Array(n);
  for (let k = 0; k < n - 2; k++) {
    let norm = 0;
    for (let i = k + 1; i < n; i++) norm += h[i * n + k]! ** 2;
    norm = Math.sqrt(norm);
    if (norm === 0) continue;
    const x0 = h[(k + 1) * n + k]!;
    const alpha = x0 > 0 ? -norm : norm;
    let vn = 0;
    for (let i = k + 1; i < n; i++) {
      v[i] = h[i * n + k]!;
      if (i === k + 1) v[i] = v[i]! - alpha;
      vn += v[i]! ** 2;
    }
    vn = Math.sqrt(vn);
    if (vn === 0) continue;
    for (let i = k + 1; i < n; i++) v[i] = v[i]! / vn;
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let i = k + 1; i < n; i++) s += v[i]! * h[i * n + j]!;
      for (let i = k + 1; i < n; i++) h[i * n + j] = h[i * n + j]! - 2 * v[i]! * s;
    }
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = k + 1; j < n; j++) s += h[i * n + j]! * v[j]!;
      for (let j = k + 1; j < n; j++) h[i * n + j] = h[i * n + j]! - 2 * s * v[j]!;
    }
    for (let i = k + 2; i < n; i++) h[i * n + k] = 0;
  }
  return h;
}

/**
 * All n eigenvalues of the real row-major matrix a, in the order they deflate (not sorted).
 * Throws when the iteration does not converge (which needs a pathological matrix).
 */
export function eigenvalues(a: ArrayLike<number>, n: number): Eigenvalues {
  if (a.length !== n * n) throw new RangeError(`matrix has ${a.length} entries, expected ${n * n}`);
  const hr = hessenberg(a, n);
  const hi = new Float64Array(n * n);
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  const cs = new Float64Array(n);
  const snr = new Float64Array(n);
  const sni = new Float64Array(n);
  let top = n - 1;
  let iter = 0;
  while (top >= 0) {
    if (top === 0) {
      re[0] = hr[0]!;
      im[0] = hi[0]!;
      break;
    }
    let l = top;
    while (l > 0) {
      const sub = Math.abs(hr[l * n + l - 1]!) + Math.abs(hi[l * n + l - 1]!);
      const diag =
        Math.abs(hr[l * n + l]!) + Math.abs(hi[l * n + l]!) + Math.abs(hr[(l - 1) * n + l - 1]!) + Math.abs(hi[(l - 1) * n + l - 1]!);
      if (sub <= EPS * diag || sub < 1e-300) {
        hr[l * n + l - 1] = 0;
        hi[l * n + l - 1] = 0;
        break;
      }
      l--;
    }
    if (l === top) {
      re[top] = hr[top * n + top]!;
      im[top] = hi[top * n + top]!;
      top--;
      iter = 0;
      continue;
    }
    if (++iter > MAX_ITER_PER_EIGENVALUE) throw new Error('eigenvalue iteration did not converge');
    // Wilkinson shift: eigenvalue of the trailing 2x2 block closer to its last diagonal entry.
    const p = top - 1;
    const ar = hr[p * n + p]!, ai = hi[p * n + p]!;
    const br = hr[p * n + top]!, bi = hi[p * n + top]!;
    const cr = hr[top * n + p]!, ci = hi[top * n + p]!;
    const dr = hr[top * n + top]!, di = hi[top * n + top]!;
    const hr2 = (ar - dr) / 2, hi2 = (ai - di) / 2;
    // disc = sqrt(((a-d)/2)^2 + b c)
    const qr = hr2 * hr2 - hi2 * hi2 + (br * cr - bi * ci);
    const qi = 2 * hr2 * hi2 + (br * ci + bi * cr);
    const mod = Math.hypot(qr, qi);
    let sr = Math.sqrt(Math.max(0, (mod + qr) / 2));
    let si = Math.sqrt(Math.max(0, (mod - qr) / 2));
    if (qi < 0) si = -si;
    const mr = (ar + dr) / 2, mi = (ai + di) / 2;
    let mur = mr + sr, mui = mi + si;
    if (Math.hypot(mr - sr - dr, mi - si - di) < Math.hypot(mur - dr, mui - di)) {
      mur = mr - sr;
      mui = mi - si;
    }
    if (iter % 11 === 10) {
      // Exceptional shift breaks rare cycles of the plain Wilkinson shift.
      mur = dr + 0.75 * Math.abs(hr[top * n + p]!);
      mui = di + 0.5 * Math.abs(hr[top * n + p]!);
    }
    sr = 0;
    si = 0;
    for (let k = l; k <= top; k++) {
      hr[k * n + k] = hr[k * n + k]! - mur;
      hi[k * n + k] = hi[k * n + k]! - mui;
    }
    // H - mu I = Q R by Givens rotations G_k = [[c, s], [-conj(s), c]] acting on rows k, k+1.
    for (let k = l; k < top; k++) {
      const xr = hr[k * n + k]!, xi = hi[k * n + k]!;
      const yr = hr[(k + 1) * n + k]!, yi = hi[(k + 1) * n + k]!;
      const ax = Math.hypot(xr, xi);
      const r = Math.hypot(ax, Math.hypot(yr, yi));
      let c: number, s_r: number, s_i: number;
      if (r === 0) {
        c = 1; s_r = 0; s_i = 0;
      } else if (ax === 0) {
        c = 0; s_r = 1; s_i = 0;
      } else {
        c = ax / r;
        // s = (x/|x|) conj(y) / r
        const ur = xr / ax, ui = xi / ax;
        s_r = (ur * yr + ui * yi) / r;
        s_i = (ui * yr - ur * yi) / r;
      }
      cs[k] = c; snr[k] = s_r; sni[k] = s_i;
      for (let j = k; j <= top; j++) {
        const pr = hr[k * n + j]!, pi = hi[k * n + j]!;
        const qr2 = hr[(k + 1) * n + j]!, qi2 = hi[(k + 1) * n + j]!;
        // row k: c p + s q ; row k+1: -conj(s) p + c q
        hr[k * n + j] = c * pr + (s_r * qr2 - s_i * qi2);
        hi[k * n + j] = c * pi + (s_r * qi2 + s_i * qr2);
        hr[(k + 1) * n + j] = -(s_r * pr + s_i * pi) + c * qr2;
        hi[(k + 1) * n + j] = -(s_r * pi - s_i * pr) + c * qi2;
      }
    }
    // R Q = R G_l^H G_{l+1}^H ...: columns k, k+1 times [[c, -s], [conj(s), c]].
    for (let k = l; k < top; k++) {
      const c = cs[k]!, s_r = snr[k]!, s_i = sni[k]!;
      const last = Math.min(k + 2, top);
      for (let i = l; i <= last; i++) {
        const pr = hr[i * n + k]!, pi = hi[i * n + k]!;
        const qr2 = hr[i * n + k + 1]!, qi2 = hi[i * n + k + 1]!;
        // col k: p c + q conj(s) ; col k+1: -p s + q c
        hr[i * n + k] = pr * c + (qr2 * s_r + qi2 * s_i);
        hi[i * n + k] = pi * c + (qi2 * s_r - qr2 * s_i);
        hr[i * n + k + 1] = -(pr * s_r - pi * s_i) + qr2 * c;
        hi[i * n + k + 1] = -(pr * s_i + pi * s_r) + qi2 * c;
      }
    }
    for (let k = l; k <= top; k++) {
      hr[k * n + k] = hr[k * n + k]! + mur;
      hi[k * n + k] = hi[k * n + k]! + mui;
    }
  }
  return { re, im };
}
