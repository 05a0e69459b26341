// The generic embedded step: any compiled tableau, stage sums as axpy sweeps over the nonzero
// couplings. It has the StageKernel shape, so the engine's loop calls one step function whatever
// the method, and no method's branches pollute another's feedback in the engine.
import { scaledRmsNorm } from '../../core/vector.js';
import { COMBINED_ERR3_WEIGHT } from './control.js';
import { IO_ERR, IO_H, IO_NONFINITE, IO_RTOL, IO_T, IO_T_NEW, type StageKernel, type Tableau } from './tableau.js';

/** Start of each referenced stage row in the flat stage buffer. */
function offsets(cols: Int32Array, n: number): Int32Array {
  const out = new Int32Array(cols.length);
  for (let p = 0; p < cols.length; p++) out[p] = cols[p]! * n;
  return out;
}

/** The generic step for systems of n states (its scratch is allocated here, once per solve). */
export function genericStep(tab: Tableau, n: number): StageKernel {
  const { c, aStart, aVal, bVal, eVal, e2Val, fsal, increments } = tab;
  const last = tab.stages - 1;
  const lastFromA = fsal ? last - 1 : last;
  const nb = bVal.length;
  const ne = eVal.length;
  const ne2 = e2Val.length;
  const combined = ne2 > 0;
  const aOff = offsets(tab.aCol, n);
  const bOff = offsets(tab.bCol, n);
  const eOff = offsets(tab.eCol, n);
  const e2Off = offsets(tab.e2Col, n);
  const errVec = new Float64Array(n);

  return (f, io, y, yNew, yStage, K, kRow, atol) => {
    const t = io[IO_T]!;
    const tNew = io[IO_T_NEW]!;
    const hs = io[IO_H]!;
    const rtol = io[IO_RTOL]!;
    for (let i = 1; i <= lastFromA; i++) {
      for (let j = 0; j < n; j++) yStage[j] = y[j]!;
      const p1 = aStart[i + 1]!;
      for (let p = aStart[i]!; p < p1; p++) {
        const cf = hs * aVal[p]!;
        const off = aOff[p]!;
        for (let j = 0; j < n; j++) yStage[j]! += cf * K[off + j]!;
      }
      f(t + c[i]! * hs, yStage, kRow[i]!);
      if (increments) {
        const ki = kRow[i]!;
        for (let j = 0; j < n; j++) ki[j]! -= K[j]!;
      }
    }
    for (let j = 0; j < n; j++) yNew[j] = y[j]!;
    for (let p = 0; p < nb; p++) {
      const cf = hs * bVal[p]!;
      const off = bOff[p]!;
      for (let j = 0; j < n; j++) yNew[j]! += cf * K[off + j]!;
    }
    if (fsal) f(tNew, yNew, kRow[last]!);
    let bad = 0;
    for (let j = 0; j < n; j++) bad += yNew[j]! - yNew[j]!;
    if (fsal) {
      const kLast = kRow[last]!;
      for (let j = 0; j < n; j++) bad += kLast[j]! - kLast[j]!;
    }
    io[IO_NONFINITE] = bad;

    if (combined) {
      let s5 = 0;
      let s3 = 0;
      for (let j = 0; j < n; j++) {
        let a5 = 0;
        for (let p = 0; p < ne; p++) a5 += eVal[p]! * K[eOff[p]! + j]!;
        let a3 = 0;
        for (let p = 0; p < ne2; p++) a3 += e2Val[p]! * K[e2Off[p]! + j]!;
        const ya = Math.abs(y[j]!);
        const yb = Math.abs(yNew[j]!);
        const sk = atol[j]! + rtol * (ya > yb ? ya : yb);
        a5 /= sk;
        a3 /= sk;
        s5 += a5 * a5;
        s3 += a3 * a3;
      }
      let deno = s5 + COMBINED_ERR3_WEIGHT * s3;
      if (!(deno > 0)) deno = 1;
      io[IO_ERR] = Math.abs(hs) * s5 * Math.sqrt(1 / (n * deno));
    } else {
      for (let j = 0; j < n; j++) errVec[j] = 0;
      for (let p = 0; p < ne; p++) {
        const cf = hs * eVal[p]!;
        const off = eOff[p]!;
        for (let j = 0; j < n; j++) errVec[j]! += cf * K[off + j]!;
      }
      io[IO_ERR] = scaledRmsNorm(errVec, y, yNew, rtol, atol, n);
    }
  };
}
