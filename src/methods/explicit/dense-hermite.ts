// The cubic Hermite interpolant of one step from its end values and slopes: y0, y1 and
// f(t0, y0) = k_1, f(t1, y1) = k_s, the first and last stages of a first-same-as-last pair, so it
// costs no evaluation. Third-order accurate (local error O(h^4)); the dense output Bogacki and
// Shampine's 3(2) pair is used with (e.g. SciPy's RK23 documents "a cubic Hermite polynomial is
// used for the dense output" for this pair). Basis: the textbook cubic Hermite
// h00 = (1 + 2s)(1 - s)^2, h10 = s(1 - s)^2, h01 = s^2(3 - 2s), h11 = s^2(s - 1).

/** y(tOld + theta*h) into out, from a step's end states and its stages k (row-major, s rows of n). */
export type StepFormula = (out: Float64Array, theta: number, h: number, y0: Float64Array, y1: Float64Array, k: Float64Array, n: number) => void;

/** The cubic Hermite formula for a first-same-as-last pair of s stages (k row s - 1 is f(t1, y1)). */
export function fsalHermiteFormula(stages: number): StepFormula {
  const last = stages - 1;
  return (out, theta, h, y0, y1, k, n) => {
    const s = theta;
    const u = 1 - s;
    const h00 = (1 + 2 * s) * u * u;
    const h10 = s * u * u * h;
    const h01 = s * s * (3 - 2 * s);
    const h11 = s * s * (s - 1) * h;
    const off = last * n;
    for (let j = 0; j < n; j++) out[j] = h00 * y0[j]! + h10 * k[j]! + h01 * y1[j]! + h11 * k[off + j]!;
  };
}
