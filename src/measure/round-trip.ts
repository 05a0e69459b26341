// Round-trip error: integrate to the end, then back to the start with the same method and setting,
// and compare with the initial state. It needs no reference, which is why orbit analysts use it;
// it is skipped for stiff problems, whose backward flow is violently unstable.
import type { Method, Problem, Setting } from '../core/types.js';
import { scaleFloors, scaledMaxError } from './error-norm.js';
import type { RunOptions } from './run-options.js';
import { uniformProblem } from '../problems/uniform.js';

/** The same dynamics run backwards in time: s = tEnd - t, so y' = -f(tEnd - s, y). */
export function reversedProblem(problem: Problem, yEnd: ArrayLike<number>): Problem {
  const { f, jacobian, tEnd, dimension: n } = problem;
  const span = tEnd - problem.t0;
  return uniformProblem({
    ...problem,
    id: `${problem.id}-reversed`,
    t0: 0,
    tEnd: span,
    y0: Array.from(yEnd),
    f: (s, y, dy) => {
      f(tEnd - s, y, dy);
      for (let i = 0; i < n; i++) dy[i] = -dy[i]!;
    },
    jacobian: jacobian
      ? (s, y, jac) => {
          jacobian(tEnd - s, y, jac);
          for (let i = 0; i < n * n; i++) jac[i] = -jac[i]!;
        }
      : undefined,
    checkTimes: [],
    invariants: [],
    reference: { kind: 'exact', exact: undefined },
  });
}

export function roundTripError(problem: Problem, method: Method, setting: Setting, yEnd: ArrayLike<number>, options: RunOptions): number | null {
  if (problem.stiff || method.roundTrip === false) return null;
  const back = reversedProblem(problem, yEnd);
  const r = method.solve(back, setting, { maxSteps: options.maxSteps, ...(options.controller ? { controller: options.controller } : {}) });
  if (r.status !== 'ok') return null;
  return scaledMaxError(r.yFinal, Float64Array.from(problem.y0), scaleFloors(problem.errorScale, problem.dimension), problem.dimension);
}
