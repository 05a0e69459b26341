// Float64Array helpers for the hot loops: all write into caller-owned buffers.

/** out = a + s * b */
export function axpy(out: Float64Array, a: Float64Array, s: number, b: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) out[i] = a[i]! + s * b[i]!;
}

/** True when every entry is finite. */
export function allFinite(y: Float64Array, n: number): boolean {
  for (let i = 0; i < n; i++) {
    const v = y[i]!;
    if (v - v !== 0) return false;
  }
  return true;
}

/** Expand a scalar-or-vector tolerance into a per-component buffer. */
export function toleranceVector(tol: number | readonly number[], n: number): Float64Array {
  const out = new Float64Array(n);
  if (typeof tol === 'number') out.fill(tol);
  else {
    if (tol.length !== n) throw new RangeError(`tolerance vector has ${tol.length} entries, expected ${n}`);
    for (let i = 0; i < n; i++) out[i] = tol[i]!;
  }
  return out;
}

/**
 * The error norm every adaptive engine steps by: the RMS of err_i / sc_i with the scale
 * sc_i = atol_i + rtol * max(|y_i|, |yNew_i|) of Hairer, Norsett and Wanner, Solving ODEs I,
 * sec. II.4. scaledRmsNorm divides by sc_i; an engine that takes several norms with one scale
 * (bdf-variable) keeps 1 / sc_i (inverseScales) and multiplies (weightedRms). Each engine keeps
 * the form it was measured with: the two differ in the last bit, and a bit can move a step.
 */
export function scaledRmsNorm(
  err: Float64Array,
  y: Float64Array,
  yNew: Float64Array,
  rtol: number,
  atol: Float64Array,
  n: number,
): number {
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const a = Math.abs(y[i]!);
    const b = Math.abs(yNew[i]!);
    const sc = atol[i]! + rtol * (a > b ? a : b);
    const r = err[i]! / sc;
    sum += r * r;
  }
  return Math.sqrt(sum / n);
}

/** 1 / sc_i for weightedRms: out_i = 1 / (atol_i + rtol * max(|y_i|, |yNew_i|)). */
export function inverseScales(y: Float64Array, yNew: Float64Array, rtol: number, atol: Float64Array, out: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) {
    const a = Math.abs(y[i]!);
    const b = Math.abs(yNew[i]!);
    out[i] = 1 / (atol[i]! + rtol * (a > b ? a : b));
  }
}

/** RMS of v_i / sc_i for scales kept through a step (tr-bdf2's Newton test); the divide form of weightedRms. */
export function rmsOverScales(v: Float64Array, sc: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) {
    const r = v[i]! / sc[i]!;
    s += r * r;
  }
  return Math.sqrt(s / n);
}

/** RMS of v_i * w_i, w from inverseScales. */
export function weightedRms(v: Float64Array, w: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) {
    const r = v[i]! * w[i]!;
    s += r * r;
  }
  return Math.sqrt(s / n);
}
