// The rules of a setting, in one place for everyone who reads one: the CLI and the planner (what a
// sweep may request), a resumed sweep's saved request, the results reader, and every engine (what
// a solve accepts). A broken rule is reported as a field and what is wrong with it.
import { InputError } from './errors.js';
import type { Setting } from './types.js';
import { toleranceVector } from './vector.js';

/** The relative tolerances a sweep may request: below 1, and not below double precision. */
export const REQUESTABLE_RTOL = { min: 1e-16, below: 1 } as const;

/** What is wrong with a requested relative tolerance, or null when a sweep may ask for it. */
export function requestedRtolProblem(rtol: number): string | null {
  if (!(rtol > 0) || !Number.isFinite(rtol)) return `tolerance ${rtol} must be a positive number`;
  if (rtol >= REQUESTABLE_RTOL.below) return `tolerance ${rtol} must be below ${REQUESTABLE_RTOL.below}`;
  if (rtol < REQUESTABLE_RTOL.min) return `tolerance ${rtol} is below double precision (${REQUESTABLE_RTOL.min})`;
  return null;
}

/** What is wrong with a requested equal-step count, or null. */
export function requestedStepsProblem(steps: number): string | null {
  return Number.isInteger(steps) && steps >= 1 ? null : `step count ${steps} must be a positive whole number`;
}

export interface SettingRules {
  /**
   * Whether rtol may be 0 (pure absolute control; atol must then be positive). The explicit pairs
   * allow it; the implicit engines and odex scale by rtol and need it positive.
   */
  readonly rtolMayBeZero: boolean;
  /** State dimension an atol array must match, when known. */
  readonly dimension?: number;
}

export interface SettingProblem {
  /** The field, relative to the setting: `rtol`, `atol[2]`, `steps`. */
  readonly field: string;
  readonly what: string;
}

/** The first broken rule of an adaptive setting's tolerances, or null when they are sound. */
export function toleranceProblem(rtol: unknown, atol: unknown, rules: SettingRules): SettingProblem | null {
  if (typeof rtol !== 'number' || !Number.isFinite(rtol) || !(rules.rtolMayBeZero ? rtol >= 0 : rtol > 0)) {
    return { field: 'rtol', what: `must be a finite number ${rules.rtolMayBeZero ? '>= 0' : '> 0'}, got ${String(rtol)}` };
  }
  const list = typeof atol === 'number' ? [atol] : atol;
  if (!Array.isArray(list)) return { field: 'atol', what: 'must be a number or an array of numbers' };
  if (Array.isArray(atol) && rules.dimension !== undefined && atol.length !== rules.dimension) {
    return { field: 'atol', what: `has ${atol.length} entries, expected one per component (${rules.dimension})` };
  }
  for (let i = 0; i < list.length; i++) {
    const a: unknown = list[i];
    const field = Array.isArray(atol) ? `atol[${i}]` : 'atol';
    if (typeof a !== 'number' || !(a >= 0) || !Number.isFinite(a)) return { field, what: `must be a finite number >= 0, got ${String(a)}` };
    if (a === 0 && rtol === 0) return { field, what: 'and rtol are both zero; one must be positive' };
  }
  return null;
}

/** The first broken rule of a fixed-step setting's step count, or null. */
export function stepsProblem(steps: unknown): SettingProblem | null {
  return typeof steps === 'number' && Number.isInteger(steps) && steps >= 1 ? null : { field: 'steps', what: `must be a positive integer, got ${String(steps)}` };
}

/** An adaptive method's tolerances from its setting, one atol per component; bad ones name `where`. */
export function adaptiveTolerances(setting: Setting, n: number, where: string, rules: Omit<SettingRules, 'dimension'>): { rtol: number; atol: Float64Array } {
  if (!('rtol' in setting)) throw new InputError(`setting must be { rtol, atol } for the adaptive method ${where}, got { steps }`, where);
  const problem = toleranceProblem(setting.rtol, setting.atol, { ...rules, dimension: n });
  if (problem) throw new InputError(`setting.${problem.field} ${problem.what}`, where);
  return { rtol: setting.rtol, atol: toleranceVector(setting.atol, n) };
}

/** A fixed-step method's step count from its setting; a bad one names `where`. */
export function fixedStepCount(setting: Setting, where: string): number {
  if (!('steps' in setting)) throw new InputError(`setting must be { steps } for the fixed-step method ${where}, got { rtol, atol }`, where);
  const problem = stepsProblem(setting.steps);
  if (problem) throw new InputError(`setting.${problem.field} ${problem.what}`, where);
  return setting.steps;
}
