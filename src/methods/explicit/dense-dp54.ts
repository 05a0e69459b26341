// Continuous extension of Dormand-Prince 5(4): the fourth-order interpolant of Shampine (1986) in
// the form of HNW I, sec. II.6; and the dense capability any pair's step formula plugs into
// (denseCapability, or denseCapabilityFor when the interpolation has work of its own per solve).
// Only built when asked for, so plain solves pay nothing for it.
import { InputError } from '../../core/errors.js';
import type { Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { solveEmbedded } from './embedded.js';
import type { Tableau } from './tableau.js';
import { DORMAND_PRINCE_54_DENSE } from './tableaus/dormand-prince-54.js';
import type { StepFormula } from './dense-hermite.js';

const D1 = DORMAND_PRINCE_54_DENSE[0]!;
const D3 = DORMAND_PRINCE_54_DENSE[2]!;
const D4 = DORMAND_PRINCE_54_DENSE[3]!;
const D5 = DORMAND_PRINCE_54_DENSE[4]!;
const D6 = DORMAND_PRINCE_54_DENSE[5]!;
const D7 = DORMAND_PRINCE_54_DENSE[6]!;

/**
 * y(tOld + theta*h) from one Dormand-Prince 5(4) step: y0 and y1 its end states, k its seven
 * stage derivatives row-major (stage i at k[i*n ..]). theta in [0, 1] interpolates.
 */
export function dormandPrince54Dense(
  out: Float64Array,
  theta: number,
  h: number,
  y0: Float64Array,
  y1: Float64Array,
  k: Float64Array,
  n: number,
): void {
  const theta1 = 1 - theta;
  for (let j = 0; j < n; j++) {
    const k1 = k[j]!;
    const k7 = k[6 * n + j]!;
    const dy = y1[j]! - y0[j]!;
    const bspl = h * k1 - dy;
    const r4 = dy - h * k7 - bspl;
    const r5 = h * (D1 * k1 + D3 * k[2 * n + j]! + D4 * k[3 * n + j]! + D5 * k[4 * n + j]! + D6 * k[5 * n + j]! + D7 * k7);
    out[j] = y0[j]! + theta * (dy + theta1 * (bspl + theta * (r4 + theta1 * r5)));
  }
}

/** Evaluates the interpolant of the step being reported, at t in [tOld, tNew]. */
export type DenseEvaluate = (t: number, out: Float64Array) => void;

export interface DenseSolveResult extends SolveResult {
  /** The last accepted step, or null when none was taken. */
  lastStep: { tOld: number; tNew: number } | null;
  /** y(t) for t inside the last accepted step. */
  evaluate: DenseEvaluate;
  /**
   * Right-hand-side evaluations the interpolant made for its own stages so far (values between
   * steps), outside `counts`; present only for interpolants that have such stages.
   */
  readonly denseEvaluations?: number;
}

/** How a dense capability interpolates its accepted steps; one per solve. */
export interface StepInterpolation {
  readonly formula: StepFormula;
  /** Called at each accepted step before its values are asked for. */
  readonly begin?: (tOld: number, tNew: number) => void;
  /** Right-hand-side evaluations made so far for values between steps. */
  readonly evaluations?: () => number;
}

export interface DenseCapability {
  /**
   * Solve like `solve`, keeping each accepted step's interpolant. onStep (optional) sees every
   * accepted step with an evaluator valid during the call.
   */
  solve(
    problem: Problem,
    setting: Setting,
    options: SolveOptions,
    onStep?: (tOld: number, tNew: number, evaluate: DenseEvaluate) => void,
  ): DenseSolveResult;
}

/** Relative slack when checking that t lies inside the step. */
const INSIDE = 1e-12;
/** Ulps of the step's end times allowed beyond it (t = tNew computed another way). */
const ROUNDING_ULPS = 4;

export function denseDormandPrince54(tab: Tableau, methodId: string): DenseCapability {
  return denseCapability(tab, methodId, dormandPrince54Dense);
}

/** Solves keeping each accepted step's end states and stages, interpolated by `formula`. */
export function denseCapability(tab: Tableau, methodId: string, formula: StepFormula): DenseCapability {
  return denseCapabilityFor(tab, methodId, () => ({ formula }));
}

/** The same with an interpolation made per solve (one that evaluates stages of its own, say). */
export function denseCapabilityFor(tab: Tableau, methodId: string, interpolationFor: (problem: Problem) => StepInterpolation): DenseCapability {
  return {
    solve(problem, setting, options, onStep) {
      const n = problem.dimension;
      const { formula, begin, evaluations } = interpolationFor(problem);
      const y0 = new Float64Array(n);
      const y1 = new Float64Array(n);
      const k = new Float64Array(tab.stages * n);
      let tOld = NaN;
      let hStep = NaN;
      let tNewStep = NaN;
      let taken = false;
      const evaluate: DenseEvaluate = (t, out) => {
        if (!taken) throw new InputError('no accepted step to interpolate in', methodId);
        const theta = (t - tOld) / hStep;
        // tNew = tOld + h rounded: far from t = 0 its distance from tOld differs from h by an ulp of t.
        const slack = INSIDE * hStep + ROUNDING_ULPS * Number.EPSILON * Math.max(Math.abs(tOld), Math.abs(tNewStep));
        if (!(t >= tOld - slack && t <= tNewStep + slack)) {
          throw new InputError(`t=${t} must lie inside the step [${tOld}, ${tNewStep}]`, methodId);
        }
        formula(out, theta, hStep, y0, y1, k, n);
      };
      const result = solveEmbedded(tab, methodId, problem, setting, options, (t, tNew, h, yOld, yNew, kk) => {
        y0.set(yOld);
        y1.set(yNew);
        k.set(kk);
        tOld = t;
        hStep = h;
        tNewStep = tNew;
        taken = true;
        if (begin) begin(t, tNew);
        if (onStep) onStep(t, tNew, evaluate);
      });
      const dense = Object.assign(result, {
        lastStep: taken ? { tOld, tNew: tNewStep } : null,
        evaluate,
      });
      // A getter: the last step's values may still be asked for after the solve returns.
      if (evaluations) Object.defineProperty(dense, 'denseEvaluations', { get: evaluations, enumerable: true });
      return dense;
    },
  };
}
