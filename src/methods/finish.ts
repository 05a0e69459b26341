// Builds the SolveResult every engine's driver returns (the state is copied out of the work buffer).
import type { Counts, SolveResult, Status } from '../core/types.js';

export function finish(
  status: Status,
  message: string | undefined,
  t: number,
  y: Float64Array,
  counts: Counts,
  h?: number,
): SolveResult {
  const r: SolveResult = { status, tFinal: t, yFinal: y.slice(), counts };
  if (message !== undefined) r.message = message;
  if (h !== undefined) r.h = h;
  return r;
}
