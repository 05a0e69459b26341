// Fixed-step candidates given as a flight loop states them: rates in Hz (the problem's time unit
// taken as seconds) or step sizes. Each must divide the span into whole equal steps, so the step
// run is exactly the step asked for. And the cost of one step: the most right-hand-side
// evaluations any single step took (implicit methods vary with their Newton iterations; explicit
// ones never do), counted on a copy of the problem whose f counts its calls, without touching
// the method's steps.
import type { Method, Problem, Setting } from '../core/types.js';
import { InputError } from '../core/errors.js';

export interface FixedCandidate {
  steps: number;
  h: number;
  /** The rate asked for, Hz; null when a step size was given. */
  rateHz: number | null;
}

/** Relative slack for "a whole number of steps" (the rate times the span as typed in decimal). */
const WHOLE = 1e-9;

export function fixedCandidates(problem: Problem, spec: { rates?: readonly number[]; stepSizes?: readonly number[] }): FixedCandidate[] {
  const span = problem.tEnd - problem.t0;
  const out: FixedCandidate[] = [];
  const add = (steps: number, rateHz: number | null, flag: string, given: number) => {
    const whole = Math.round(steps);
    if (whole < 1 || Math.abs(steps - whole) > WHOLE * steps) {
      throw new InputError(`${given} does not divide ${problem.id}'s span of ${span} into whole steps (${steps.toPrecision(6)} steps)`, flag);
    }
    out.push({ steps: whole, h: span / whole, rateHz });
  };
  for (const r of spec.rates ?? []) add(span * r, r, '--rates', r);
  for (const h of spec.stepSizes ?? []) add(span / h, null, '--step-sizes', h);
  return out.sort((a, b) => a.steps - b.steps);
}

export interface StepCost {
  /** Most right-hand-side evaluations of one accepted step. */
  worstNfev: number;
  meanNfev: number;
}

export function stepCost(problem: Problem, method: Method, setting: Setting, maxSteps: number): StepCost | null {
  let calls = 0;
  const f = problem.f;
  const counting: Problem = { ...problem, f: (t, y, dy) => (calls++, f(t, y, dy)) };
  let last = 0;
  let worst = 0;
  let steps = -1;
  const result = method.solve(counting, setting, {
    maxSteps,
    observer: () => {
      if (steps >= 0) worst = Math.max(worst, calls - last);
      last = calls;
      steps++;
    },
  });
  if (result.status !== 'ok' || steps <= 0) return null;
  return { worstNfev: worst, meanNfev: calls / steps };
}
