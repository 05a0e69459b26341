// Fixed-step loop shared by the one-step implicit methods used for order checks: h = span/steps,
// observer after every step, step limit, deadline and non-finite states as in SolveOptions.
import type { Counts, Problem, SolveOptions, SolveResult, Status } from '../../core/types.js';
import { allFinite } from '../../core/vector.js';
import { budgetStop } from '../budget.js';

/** Advances y from t by h in place; returns an error message when the step cannot be taken. */
export type FixedStep = (t: number, h: number) => string | undefined;

export function driveFixed(
  problem: Problem,
  options: SolveOptions,
  y: Float64Array,
  steps: number,
  step: FixedStep,
  counts: Counts,
): SolveResult {
  const n = problem.dimension;
  const h = (problem.tEnd - problem.t0) / steps;
  let t = problem.t0;
  const finish = (status: Status, message?: string): SolveResult => {
    const r: SolveResult = { status, tFinal: t, yFinal: Float64Array.from(y), counts, h };
    if (message !== undefined) r.message = message;
    return r;
  };
  options.observer?.(t, y);
  for (let i = 1; i <= steps; i++) {
    const budget = budgetStop(counts.accepted, options.maxSteps, options.deadline, t);
    if (budget !== null) return finish(budget.status, budget.message);
    const msg = step(t, h);
    if (msg !== undefined) return finish('error', `${msg} at t=${t}`);
    counts.accepted++;
    // t from the step index, so the grid does not drift and the last step lands on tEnd exactly.
    t = i === steps ? problem.tEnd : problem.t0 + i * h;
    if (!allFinite(y, n)) return finish('diverged', `non-finite state at t=${t}`);
    options.observer?.(t, y);
  }
  return finish('ok');
}
