// Planning a sweep: which (problem, method, setting) runs to make, in a fixed canonical order.
import type { Method, Problem, Setting } from '../core/types.js';
import { InputError } from '../core/errors.js';
import { sha256, sha256Parts } from '../core/hash.js';
import { absoluteTolerance, type AtolOverride } from '../core/tolerance.js';
import { DEFAULT_TOLERANCE_RANGE } from '../core/defaults.js';
import { requestedRtolProblem, requestedStepsProblem } from '../core/setting.js';

export interface PlannedRun {
  problem: string;
  method: string;
  setting: Setting;
  /** Position in the full plan; shards and merges keep runs in this order. */
  planIndex: number;
  /** Rough relative cost, for balancing shards. */
  expectedCost: number;
}

export interface SkippedPair {
  problem: string;
  method: string;
  reason: string;
}

export interface SweepPlan {
  runs: PlannedRun[];
  skipped: SkippedPair[];
  /** Fingerprint of the whole plan, so shards of different plans are never merged. */
  sha256: string;
}

/**
 * What planning reads of a problem. A dispersion sample is planned from a light stand-in (its id,
 * its definition's hash, what pairing and settings read), so a plan of many samples does not hold
 * every sample's model.
 */
export type PlanProblem = Pick<Problem, 'id' | 'stiff' | 'separable' | 'separableReason' | 'modelOnlyInPrograms' | 'defaultTolerances' | 'defaultSteps' | 'atolScale' | 'dimension'> & {
  /** Only its presence is read (a linear-only method needs it). */
  readonly linear?: unknown;
  /** The canonical definition, or its SHA-256 already computed (a stand-in carries only that). */
  readonly definition?: string;
  readonly definitionSha256?: string;
};

/** The stand-in a sample is planned from (see PlanProblem). */
export function planStandIn(p: Problem): PlanProblem {
  return {
    id: p.id,
    stiff: p.stiff,
    separable: p.separable,
    separableReason: p.separableReason,
    modelOnlyInPrograms: p.modelOnlyInPrograms,
    defaultTolerances: p.defaultTolerances,
    defaultSteps: p.defaultSteps,
    atolScale: p.atolScale,
    dimension: p.dimension,
    linear: p.linear ? true : undefined,
    definitionSha256: sha256(p.definition),
  };
}

export interface PlanRequest {
  problems: readonly PlanProblem[];
  methods: readonly Method[];
  /** Tolerances the user gave; undefined: each problem's own list, else DEFAULT_TOLERANCES. */
  tolerances: readonly number[] | undefined;
  /** Step counts the user gave; undefined: each problem's own ladder, else DEFAULT_STEPS. */
  steps: readonly number[] | undefined;
  /** Methods the user named: they run even where the default pairing would leave them out. */
  methodsNamed: boolean;
  /** --atol: replaces the problem's own atol for every rtol. */
  atol?: AtolOverride;
}

/** The default tolerance list (core/defaults.ts), one per decade. */
export const DEFAULT_TOLERANCES: readonly number[] = decades(DEFAULT_TOLERANCE_RANGE.loose, DEFAULT_TOLERANCE_RANGE.tight);
/** A doubling ladder of equal-step counts for fixed-step methods. */
export const DEFAULT_STEPS: readonly number[] = [100, 200, 400, 800, 1600, 3200, 6400, 12800];

/** One tolerance per decade from `loose` to `tight`, either direction: "1e-3..1e-12". */
export function decades(loose: number, tight: number): number[] {
  const a = Math.round(Math.log10(loose));
  const b = Math.round(Math.log10(tight));
  const out: number[] = [];
  const dir = a >= b ? -1 : 1;
  for (let k = a; dir < 0 ? k >= b : k <= b; k += dir) out.push(Number(`1e${k}`));
  return out;
}

/**
 * The method cannot run on the problem at all (a structure it needs is missing), as opposed to
 * a pairing that is only left out by default (a non-stiff method on a stiff problem).
 */
export function structuralGap(problem: PlanProblem, method: Method): boolean {
  return (
    (method.needsSeparable === true && !problem.separable) ||
    (method.needsSecondOrder === true && !problem.separable?.secondOrder) ||
    (method.needsLinear === true && !problem.linear) ||
    (problem.modelOnlyInPrograms === true && !method.program)
  );
}

/** Why a method does not pair with a problem by default (null when it does). */
export function pairingGap(problem: PlanProblem, method: Method): string | null {
  if (problem.modelOnlyInPrograms && !method.program) return `${problem.id} has no equations (its model lives only in the user's program): only external programs can run it`;
  if (method.needsSeparable && !problem.separable) {
    const why = problem.separableReason;
    return `${method.id} needs a separable problem (positions driven only by velocities, velocities only by positions and t)${why ? `: ${why}` : ''}`;
  }
  if (method.needsSecondOrder && !problem.separable?.secondOrder) {
    const why = problem.separable ? 'its split does not say that each position\'s rate is its velocity' : problem.separableReason;
    return `${method.id} needs a second-order problem (positions' rates are the velocities, q' = v, and the accelerations depend only on positions and t)${why ? `: ${why}` : ''}`;
  }
  if (method.needsLinear && !problem.linear) return `${method.id} needs a linear problem x' = A x + B u (a linear model file or a catalogue linear problem)`;
  if (problem.stiff && !method.stiff) return `${problem.id} is stiff and ${method.id} is not meant for stiff problems`;
  return null;
}

/** Order assumed for planning when a method states none (an external program). */
const UNSTATED_ORDER = 4;

function costOf(method: Method, setting: Setting): number {
  const order = Number.isFinite(method.order) ? method.order : UNSTATED_ORDER;
  if ('steps' in setting) return setting.steps * Math.max(1, order);
  const growth = method.stepGrowth ?? 1 / Math.max(1, order + 1);
  return 10 * Math.pow(1 / setting.rtol, growth) * Math.max(1, order);
}

export function planSweep(req: PlanRequest): SweepPlan {
  if (req.problems.length === 0) throw new InputError('no problems selected', '--problem');
  if (req.methods.length === 0) throw new InputError('no methods selected', '--method');
  // The same rules as the CLI's flags (core/setting.ts), for library callers and resumed sweeps.
  for (const rtol of req.tolerances ?? []) {
    const problem = requestedRtolProblem(rtol);
    if (problem) throw new InputError(problem, '--tolerances');
  }
  for (const steps of req.steps ?? []) {
    const problem = requestedStepsProblem(steps);
    if (problem) throw new InputError(problem, '--steps');
  }
  const runs: PlannedRun[] = [];
  const skipped: SkippedPair[] = [];
  for (const problem of req.problems) {
    for (const method of req.methods) {
      const gap = pairingGap(problem, method);
      // A named explicit method still runs on a stiff problem (its step limit is the result),
      // but a symplectic method cannot run at all without a separable split.
      if (gap && (structuralGap(problem, method) || !req.methodsNamed)) {
        skipped.push({ problem: problem.id, method: method.id, reason: gap });
        continue;
      }
      const settings: Setting[] = method.adaptive
        ? (req.tolerances ?? problem.defaultTolerances ?? DEFAULT_TOLERANCES).map((rtol) => ({ rtol, atol: absoluteTolerance(problem, rtol, req.atol) }))
        : (req.steps ?? problem.defaultSteps ?? DEFAULT_STEPS).map((steps) => ({ steps }));
      for (const setting of settings) {
        runs.push({ problem: problem.id, method: method.id, setting, planIndex: runs.length, expectedCost: costOf(method, setting) });
      }
    }
  }
  // The SHA-256 of JSON.stringify({ runs: [[problem, method, setting], ...], problems: [[id,
  // sha256 of definition], ...] }), hashed a run at a time rather than built as one text.
  const fingerprint = sha256Parts(
    (function* () {
      yield '{"runs":[';
      for (let i = 0; i < runs.length; i++) yield (i > 0 ? ',' : '') + JSON.stringify([runs[i]!.problem, runs[i]!.method, runs[i]!.setting]);
      yield `],"problems":${JSON.stringify(req.problems.map((p) => [p.id, p.definitionSha256 ?? sha256(p.definition ?? '')]))}}`;
    })(),
  );
  return { runs, skipped, sha256: fingerprint };
}
