// The one fixed-step driver: h = span / steps, the step limit and deadline, a non-finite state
// and the observer after every step, handled alike for the explicit Runge-Kutta tableaus, the
// symplectic compositions and the one-stage implicit methods. Each supplies only its step.
import type { Counts, Problem, SolveOptions, SolveResult } from '../core/types.js';
import { allFinite } from '../core/vector.js';
import { budgetStop } from './budget.js';
import { finish } from './finish.js';

/**
 * Advances y in place from t to tNext = t + h (tNext is exact on the grid: the last step ends on
 * tEnd); returns an error message when the step cannot be taken. Counts its own evaluations.
 */
export type FixedStep = (t: number, h: number, tNext: number) => string | undefined;

/** `start` runs once after y0 is found finite, before the observer sees it (a first evaluation). */
export function driveFixed(problem: Problem, options: SolveOptions, y: Float64Array, steps: number, step: FixedStep, counts: Counts, start?: () => void): SolveResult {
  const n = problem.dimension;
  const t0 = problem.t0;
  const tEnd = problem.tEnd;
  const h = (tEnd - t0) / steps;
  let t = t0;
  if (!allFinite(y, n)) return finish('diverged', 'y0 is not finite', t, y, counts, h);
  start?.();
  options.observer?.(t, y);
  for (let i = 1; i <= steps; i++) {
    const stop = budgetStop(counts.accepted, options.maxSteps, options.deadline, t);
    if (stop !== null) return finish(stop.status, stop.message, t, y, counts, h);
    // t from the step index, not by summing h, so the grid does not drift and the last step lands on tEnd.
    const tNext = i === steps ? tEnd : t0 + i * h;
    const msg = step(t, h, tNext);
    if (msg !== undefined) return finish('error', `${msg} at t=${t}`, t, y, counts, h);
    counts.accepted++;
    t = tNext;
    if (!allFinite(y, n)) return finish('diverged', `state became non-finite at t=${t}`, t, y, counts, h);
    options.observer?.(t, y);
  }
  return finish('ok', undefined, t, y, counts, h);
}
