// A Runge-Kutta-Nystrom pair for q'' = g(t, q) as data (HNW I, sec. II.14): stage positions
// Q_i = q + c_i h v + h^2 sum_j a_ij g_j, then q_new = q + h v + h^2 sum b_i g_i and
// v_new = v + h sum b'_i g_i, with embedded weights for the error estimate.
import { InputError } from '../../../core/errors.js';

export interface NystromPair {
  /** kebab-case, after the published method. */
  readonly id: string;
  readonly name: string;
  readonly source: string;
  readonly notes?: string;
  /** Published order of the propagated solution, and of the embedded one. */
  readonly order: number;
  readonly embeddedOrder: number;
  readonly c: readonly number[];
  /** Strictly lower rows: a[i] holds a_i0 .. a_i(i-1) (shorter rows are zero-padded). */
  readonly a: readonly (readonly number[])[];
  readonly bPosition: readonly number[];
  readonly bVelocity: readonly number[];
  readonly bPositionHat: readonly number[];
  readonly bVelocityHat: readonly number[];
}

/** The last stage is g(t + h, q_new): the next step's first, at no cost there. */
export function nystromFsal(p: NystromPair): boolean {
  const s = p.c.length;
  const last = p.a[s - 1] ?? [];
  return (
    s > 1 &&
    p.c[s - 1] === 1 &&
    p.bPosition[s - 1] === 0 &&
    p.bVelocity[s - 1] === 0 &&
    p.bPosition.every((b, j) => j === s - 1 || (last[j] ?? 0) === b)
  );
}

/** Throws on a malformed pair (sizes, rows longer than their stage). */
export function checkNystromPair(p: NystromPair): void {
  const s = p.c.length;
  const lists = [p.a, p.bPosition, p.bVelocity, p.bPositionHat, p.bVelocityHat];
  if (lists.some((l) => l.length !== s)) throw new InputError(`${p.id}: a Nystrom pair needs ${s} rows and weights for its ${s} nodes`);
  p.a.forEach((row, i) => {
    if (row.length > i) throw new InputError(`${p.id}: row ${i} of a has ${row.length} entries, at most ${i} (explicit)`);
  });
}
