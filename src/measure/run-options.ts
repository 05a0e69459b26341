// What every measured or timed solve of a run is given: the step limit, the wall-clock limit and
// the controller, and how they become the integrator's own solve options.
import type { ControllerKind, Problem, SolveOptions } from '../core/types.js';

export interface RunOptions {
  maxSteps: number;
  /** Wall-clock limit for one solve, seconds (status `timeout` past it). */
  runTimeoutSeconds?: number;
  controller?: ControllerKind;
}

export function solveOptions(problem: Problem, options: RunOptions, observer?: SolveOptions['observer']): SolveOptions {
  const deadline = options.runTimeoutSeconds ? performance.now() + options.runTimeoutSeconds * 1000 : undefined;
  return {
    maxSteps: options.maxSteps,
    // Solvers take their own steps unless the problem really stops at its check times.
    ...(problem.landOnCheckTimes ? { checkTimes: problem.checkTimes } : {}),
    ...(observer ? { observer } : {}),
    ...(options.controller ? { controller: options.controller } : {}),
    ...(deadline !== undefined ? { deadline } : {}),
  };
}
