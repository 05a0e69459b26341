// The checks every engine makes before it steps (explicit, implicit, external alike): the problem
// and the solve options. The setting's own rules live in core/setting.ts, where the CLI, the
// planner and the results reader read them too. Bad input is an InputError naming the field.
import { InputError } from '../core/errors.js';
import { CONTROLLER_KINDS, type Problem, type SolveOptions } from '../core/types.js';

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
  if (options.controller !== undefined && !CONTROLLER_KINDS.includes(options.controller)) {
    throw new InputError(`options.controller must be one of ${CONTROLLER_KINDS.join(', ')}, got ${JSON.stringify(options.controller)}`, methodId);
  }
  if (options.initialStep !== undefined && !(options.initialStep > 0 && Number.isFinite(options.initialStep))) {
    throw new InputError(`options.initialStep must be a positive finite number, got ${options.initialStep}`, methodId);
  }
}
