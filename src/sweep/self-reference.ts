// Self-references: for a problem whose model only the user's program has and for which no better
// reference exists, the program itself at a much tighter setting is the reference, and its trust is
// how far the two tightest settings agree at the end of the span. It is marked in every run: it can
// show how the error falls with the setting, never a model error or a bias every setting shares.
import type { Method, Problem, ReferencePoint, Setting } from '../core/types.js';
import { absoluteTolerance } from '../core/tolerance.js';
import { errorMeter } from '../measure/error-norm.js';
import { uniformProblem } from '../problems/uniform.js';
import { DEFAULT_STEPS } from './plan.js';

/** Tolerances of the two tightest settings for programs that take a tolerance. */
const SELF_RTOL = [1e-12, 1e-11] as const;
/** Step counts of the two tightest settings, as multiples of the largest count of the ladder. */
const SELF_STEP_FACTORS = [4, 2] as const;

export const SELF_REFERENCE_CAUTION =
  'measured against a self-reference (the program itself at a much tighter setting): it shows how the error falls with the setting, but cannot reveal a model error or a bias shared by every setting';

const cache = new Map<string, Problem>();

function settingText(s: Setting): string {
  return 'rtol' in s ? `rtol ${s.rtol}` : `${s.steps} steps`;
}

function tightSettings(problem: Problem, method: Method): [Setting, Setting] {
  if (method.adaptive) {
    const [a, b] = SELF_RTOL.map((rtol) => ({ rtol, atol: absoluteTolerance(problem, rtol) }));
    return [a!, b!];
  }
  const most = Math.max(...(problem.defaultSteps ?? DEFAULT_STEPS));
  return [{ steps: most * SELF_STEP_FACTORS[0] }, { steps: most * SELF_STEP_FACTORS[1] }];
}

/** The problem with the method's own self-reference (computed once per problem and method). */
export function selfReferenced(problem: Problem, method: Method, maxSteps: number): Problem {
  const key = `${problem.id}\u0000${method.id}`;
  const known = cache.get(key);
  if (known) return known;
  const [tight, next] = tightSettings(problem, method);
  const points: ReferencePoint[] = [];
  const withReference = (reference: Problem['reference']): Problem => {
    const p = uniformProblem({ ...problem, reference });
    cache.set(key, p);
    return p;
  };
  const unavailable = (why: string) => withReference({ kind: 'self', source: problem.reference.source, unavailable: `no self-reference: ${why}` });
  let a;
  let b;
  try {
    a = method.solve(problem, tight, {
      maxSteps,
      checkTimes: problem.checkTimes,
      observer: (t, y) => {
        if (t > problem.t0) points.push({ t, y: Array.from(y) });
      },
    });
    b = method.solve(problem, next, { maxSteps, checkTimes: problem.checkTimes });
  } catch (e) {
    return unavailable(`${method.id} threw: ${e instanceof Error ? e.message : String(e)}`);
  }
  if (a.status !== 'ok') return unavailable(`${method.id} at ${settingText(tight)} ended with ${a.status}${a.message ? ` (${a.message})` : ''}`);
  if (b.status !== 'ok') return unavailable(`${method.id} at ${settingText(next)} ended with ${b.status}${b.message ? ` (${b.message})` : ''}`);
  // Trust: the two tightest settings' disagreement at the end, on the problem's error scale.
  const trust = errorMeter(problem).error(problem.tEnd, b.yFinal, a.yFinal);
  let scale = 1;
  if (problem.errorScale.kind === 'absolute') for (const v of a.yFinal) scale = Math.max(scale, Math.abs(v));
  const digits = Math.max(1, Math.min(17, Math.floor(-Math.log10(Math.max(trust / scale, 1e-17)))));
  return withReference({
    kind: 'self',
    digits,
    source: `self-reference: ${method.id} at ${settingText(tight)}; trust ${trust.toExponential(2)} (its disagreement with ${settingText(next)} at the end of the span)`,
    points,
  });
}
