// Unrolled step for Dormand-Prince 5(4), the method the benchmarks time most: the same arithmetic
// as the generic sweep (coefficients read from the one tableau), with the stage sums written out
// so V8 runs straight-line code instead of short loops. Agreement with the generic engine is
// tested to rounding.
import type { Rhs } from '../../../core/types.js';
import type { StageKernel } from '../tableau.js';
import { DORMAND_PRINCE_54 as T } from '../tableaus/dormand-prince-54.js';

const A = T.a;
const A21 = A[1]![0]!;
const [A31, A32] = A[2] as [number, number];
const [A41, A42, A43] = A[3] as [number, number, number];
const [A51, A52, A53, A54] = A[4] as [number, number, number, number];
const [A61, A62, A63, A64, A65] = A[5] as [number, number, number, number, number];
const [B1, , B3, B4, B5, B6] = T.b as [number, number, number, number, number, number, number];
const BH = T.bHat!;
const E1 = B1 - BH[0]!;
const E3 = B3 - BH[2]!;
const E4 = B4 - BH[3]!;
const E5 = B5 - BH[4]!;
const E6 = B6 - BH[5]!;
const E7 = -BH[6]!;
const [, C2, C3, C4, C5] = T.c as [number, number, number, number, number, number, number];

export const dormandPrince54Kernel: StageKernel = (
  f: Rhs,
  t: number,
  tNew: number,
  h: number,
  y: Float64Array,
  yNew: Float64Array,
  ys: Float64Array,
  K: Float64Array,
  kRow: readonly Float64Array[],
  errVec: Float64Array,
  n: number,
): void => {
  const o2 = n;
  const o3 = 2 * n;
  const o4 = 3 * n;
  const o5 = 4 * n;
  const o6 = 5 * n;
  const o7 = 6 * n;
  for (let j = 0; j < n; j++) ys[j] = y[j]! + h * (A21 * K[j]!);
  f(t + C2 * h, ys, kRow[1]!);
  for (let j = 0; j < n; j++) ys[j] = y[j]! + h * (A31 * K[j]! + A32 * K[o2 + j]!);
  f(t + C3 * h, ys, kRow[2]!);
  for (let j = 0; j < n; j++) ys[j] = y[j]! + h * (A41 * K[j]! + A42 * K[o2 + j]! + A43 * K[o3 + j]!);
  f(t + C4 * h, ys, kRow[3]!);
  for (let j = 0; j < n; j++) {
    ys[j] = y[j]! + h * (A51 * K[j]! + A52 * K[o2 + j]! + A53 * K[o3 + j]! + A54 * K[o4 + j]!);
  }
  f(t + C5 * h, ys, kRow[4]!);
  for (let j = 0; j < n; j++) {
    ys[j] = y[j]! + h * (A61 * K[j]! + A62 * K[o2 + j]! + A63 * K[o3 + j]! + A64 * K[o4 + j]! + A65 * K[o5 + j]!);
  }
  f(tNew, ys, kRow[5]!);
  for (let j = 0; j < n; j++) {
    yNew[j] = y[j]! + h * (B1 * K[j]! + B3 * K[o3 + j]! + B4 * K[o4 + j]! + B5 * K[o5 + j]! + B6 * K[o6 + j]!);
  }
  f(tNew, yNew, kRow[6]!);
  for (let j = 0; j < n; j++) {
    errVec[j] =
      h * (E1 * K[j]! + E3 * K[o3 + j]! + E4 * K[o4 + j]! + E5 * K[o5 + j]! + E6 * K[o6 + j]! + E7 * K[o7 + j]!);
  }
};
