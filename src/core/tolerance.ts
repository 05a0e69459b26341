// The absolute tolerance that goes with a relative one for a problem: atol = rtol unless the
// problem scales it (atolScale, per component or for all), so one rtol means the same in any units.
import type { Problem } from './types.js';

export function absoluteTolerance(problem: Pick<Problem, 'atolScale'>, rtol: number): number | number[] {
  const s = problem.atolScale;
  if (s === undefined) return rtol;
  if (typeof s === 'number') return rtol * s;
  return s.map((v) => rtol * v);
}
