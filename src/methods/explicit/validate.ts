// Checks of the setting and options every explicit engine shares; bad input is an InputError
// naming the field.
import { InputError } from '../../core/errors.js';
import type { Problem, Setting, SolveOptions } from '../../core/types.js';
import { toleranceVector } from '../../core/vector.js';

export interface AdaptiveSetting {
  readonly rtol: number;
  readonly atol: Float64Array;
}

export function checkProblem(problem: Problem, methodId: string): void {
  const n = problem.dimension;
  if (!Number.isInteger(n) || n < 1) {
    throw new InputError(`problem.dimension must be a positive integer, got ${n}`, methodId);
  }
  if (problem.y0.length !== n) {
    throw new InputError(`problem.y0 has ${problem.y0.length} entries, expected dimension ${n}`, methodId);
  }
  if (!Number.isFinite(problem.t0) || !Number.isFinite(problem.tEnd) || !(problem.tEnd > problem.t0)) {
    throw new InputError(
      `problem.tEnd must be finite and greater than problem.t0 (got t0=${problem.t0}, tEnd=${problem.tEnd})`,
      methodId,
    );
  }
}

export function checkOptions(options: SolveOptions, methodId: string): void {
  if (!(options.maxSteps > 0)) {
    throw new InputError(`options.maxSteps must be a positive number, got ${options.maxSteps}`, methodId);
  }
  if (options.initialStep !== undefined && !(options.initialStep > 0 && Number.isFinite(options.initialStep))) {
    throw new InputError(`options.initialStep must be a positive finite number, got ${options.initialStep}`, methodId);
  }
}

export function adaptiveSetting(setting: Setting, n: number, methodId: string): AdaptiveSetting {
  if (!('rtol' in setting)) {
    throw new InputError(`setting must be { rtol, atol } for the adaptive method ${methodId}, got { steps }`, methodId);
  }
  const { rtol, atol } = setting;
  if (!(rtol >= 0 && Number.isFinite(rtol))) {
    throw new InputError(`setting.rtol must be a finite number >= 0, got ${rtol}`, methodId);
  }
  if (typeof atol !== 'number' && !Array.isArray(atol)) {
    throw new InputError('setting.atol must be a number or an array of numbers', methodId);
  }
  if (typeof atol !== 'number' && atol.length !== n) {
    throw new InputError(`setting.atol has ${atol.length} entries, expected one per component (${n})`, methodId);
  }
  const a = toleranceVector(atol, n);
  for (let i = 0; i < n; i++) {
    const v = a[i]!;
    if (!(v >= 0 && Number.isFinite(v))) {
      throw new InputError(`setting.atol[${i}] must be a finite number >= 0, got ${v}`, methodId);
    }
    if (v === 0 && rtol === 0) {
      throw new InputError(`setting.rtol and setting.atol[${i}] are both zero; one must be positive`, methodId);
    }
  }
  return { rtol, atol: a };
}

export function fixedSteps(setting: Setting, methodId: string): number {
  if (!('steps' in setting)) {
    throw new InputError(`setting must be { steps } for the fixed-step method ${methodId}, got { rtol, atol }`, methodId);
  }
  const { steps } = setting;
  if (!Number.isInteger(steps) || steps < 1) {
    throw new InputError(`setting.steps must be a positive integer, got ${steps}`, methodId);
  }
  return steps;
}
