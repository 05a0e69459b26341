// The absolute tolerance that goes with a relative one for a problem: atol = rtol unless the
// problem scales it (atolScale, per component or for all), so one rtol means the same in any units.
// A user's --atol (one value, or one per state) replaces that for every rtol.
import { InputError } from './errors.js';
import type { Problem } from './types.js';

export type AtolOverride = number | readonly number[];

export function absoluteTolerance(problem: Pick<Problem, 'atolScale' | 'dimension' | 'id'>, rtol: number, override?: AtolOverride): number | number[] {
  if (override !== undefined) {
    if (typeof override === 'number') return override;
    if (override.length !== problem.dimension) {
      throw new InputError(`${override.length} values given but ${problem.id} has ${problem.dimension} states; give one value or one per state`, '--atol');
    }
    return [...override];
  }
  const s = problem.atolScale;
  if (s === undefined) return rtol;
  if (typeof s === 'number') return rtol * s;
  return s.map((v) => rtol * v);
}
