// Values at the problem's output (check) times, taken from the run as a user would get them: the
// method's own published interpolant where it has one (given as a dense-step hook), otherwise a
// cubic Hermite interpolant between accepted steps built by stepgauge (its f evaluations are the
// measurement's, never counted as the method's work); exact values where a step lands on the time.
import type { Problem } from '../core/types.js';

/** Evaluates the interpolant of the step being reported, at t inside it. */
export type StepInterpolant = (t: number, out: Float64Array) => void;

export type OutputInterpolant = 'landed' | 'method' | 'hermite';

/** The output times strictly inside the span (the end is error.final's). */
export function outputTimes(problem: Problem): Float64Array {
  return Float64Array.from(problem.checkTimes.filter((t) => t > problem.t0 && t < problem.tEnd));
}

export interface OutputSampler {
  /** Sees every accepted step's end state (the run's observer calls it). */
  observe(t: number, y: Float64Array): void;
  /** Sees every accepted step with the method's own interpolant (replaces the Hermite path). */
  step(tOld: number, tNew: number, evaluate: StepInterpolant): void;
  /** Which interpolant produced the values (landed: every output time was a step's end). */
  interpolant(): OutputInterpolant | null;
}

/**
 * Calls visit(t, y) once for each output time, in order, with the run's value there. `method`:
 * the caller will feed step() with the method's interpolant.
 */
export function sampleOutputs(problem: Problem, method: boolean, visit: (t: number, y: Float64Array) => void): OutputSampler {
  const times = outputTimes(problem);
  const n = problem.dimension;
  const f = problem.f;
  const yPrev = new Float64Array(n);
  const fPrev = new Float64Array(n);
  const fNow = new Float64Array(n);
  const value = new Float64Array(n);
  let next = 0;
  let tPrev = NaN;
  let started = false;
  let interpolated = false;
  let landedAll = true;
  let visited = 0;
  const visitOne = (t: number, y: Float64Array) => {
    visited++;
    visit(t, y);
  };

  const hermite = (t: number, y: Float64Array) => {
    if (next >= times.length) return;
    if (times[next]! <= t) {
      let haveSlopes = false;
      while (next < times.length && times[next]! <= t) {
        const tc = times[next++]!;
        if (tc === t) {
          visitOne(tc, y);
          continue;
        }
        if (!haveSlopes) {
          f(tPrev, yPrev, fPrev);
          f(t, y, fNow);
          haveSlopes = true;
        }
        // Cubic Hermite on [tPrev, t] with end values and slopes (fourth-order accurate).
        const h = t - tPrev;
        const s = (tc - tPrev) / h;
        const h00 = (1 + 2 * s) * (1 - s) * (1 - s);
        const h10 = s * (1 - s) * (1 - s);
        const h01 = s * s * (3 - 2 * s);
        const h11 = s * s * (s - 1);
        for (let i = 0; i < n; i++) value[i] = h00 * yPrev[i]! + h10 * h * fPrev[i]! + h01 * y[i]! + h11 * h * fNow[i]!;
        interpolated = true;
        landedAll = false;
        visitOne(tc, value);
      }
    }
  };

  return {
    observe(t, y) {
      if (!method && started) hermite(t, y);
      started = true;
      tPrev = t;
      yPrev.set(y);
    },
    step(tOld, tNew, evaluate) {
      while (next < times.length && times[next]! <= tNew) {
        const tc = times[next++]!;
        if (tc < tOld) continue;
        evaluate(tc, value);
        if (tc !== tNew) landedAll = false;
        interpolated = true;
        visitOne(tc, value);
      }
    },
    interpolant() {
      if (visited === 0) return null;
      if (landedAll) return 'landed';
      return method ? 'method' : interpolated ? 'hermite' : null;
    },
  };
}
