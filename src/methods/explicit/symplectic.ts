// Fixed-step symplectic integrators for separable problems q' = g(p), p' = h(t, q): Stormer-Verlet
// and compositions of it. The right-hand side is the problem's full f; each call is one nfev and
// only the components the sub-flow needs are read from it.
import { InputError } from '../../core/errors.js';
import type { Counts, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { withLease, type WorkLease } from '../work-lease.js';
import { driveFixed } from '../fixed-step.js';
import { checkOptions, checkProblem } from '../rules.js';
import { fixedStepCount } from '../../core/setting.js';

/**
 * A symplectic method as data: its identity and the relative lengths of its Stormer-Verlet
 * substeps (summing to 1). One file per method in compositions/, one line in compositions/index.ts.
 */
export interface CompositionMethod {
  readonly id: string;
  readonly name: string;
  readonly source: string;
  readonly notes?: string;
  /** The published order. */
  readonly order: number;
  readonly weights: readonly number[];
}

/** Position and velocity indices as typed arrays, checked to split 0..n-1 exactly (the Nystrom pairs use it too). */
export function splitOf(problem: Problem, methodId: string): { pos: Int32Array; vel: Int32Array } {
  const sep = problem.separable;
  if (!sep) {
    throw new InputError(
      `problem.separable is missing: ${methodId} is a symplectic splitting method and needs the ` +
        'positions/velocities index split (position derivatives depending only on velocities, ' +
        'velocity derivatives only on positions and t) to kick and drift separately',
      methodId,
    );
  }
  const n = problem.dimension;
  const seen = new Uint8Array(n);
  for (const [name, list] of [
    ['positions', sep.positions],
    ['velocities', sep.velocities],
  ] as const) {
    for (const i of list) {
      if (!Number.isInteger(i) || i < 0 || i >= n) {
        throw new InputError(`problem.separable.${name} has index ${i}, expected an integer in [0, ${n})`, methodId);
      }
      if (seen[i]) throw new InputError(`problem.separable: index ${i} appears more than once`, methodId);
      seen[i] = 1;
    }
  }
  if (sep.positions.length + sep.velocities.length !== n) {
    throw new InputError(`problem.separable must cover all ${n} components between positions and velocities`, methodId);
  }
  return { pos: Int32Array.from(sep.positions), vel: Int32Array.from(sep.velocities) };
}

/**
 * Steps a composition of Stormer-Verlet (kick-drift-kick) substeps with relative lengths `weights`
 * (summing to 1). The force at the end of a substep is the force at the start of the next one, so
 * each substep costs two f calls (drift, then force) and the solve one more at t0.
 */
export function solveVerletComposition(
  weights: Float64Array,
  methodId: string,
  problem: Problem,
  setting: Setting,
  options: SolveOptions,
): SolveResult {
  checkProblem(problem, methodId);
  checkOptions(options, methodId);
  const steps = fixedStepCount(setting, methodId);
  const split = splitOf(problem, methodId);
  return withLease(weights, problem.dimension, (lease) => stepComposition(lease, weights, split, problem, options, steps));
}

function stepComposition(
  lease: WorkLease,
  weights: Float64Array,
  { pos, vel }: { pos: Int32Array; vel: Int32Array },
  problem: Problem,
  options: SolveOptions,
  steps: number,
): SolveResult {
  const np = pos.length;
  const nv = vel.length;
  const n = problem.dimension;
  const f = problem.f;
  const m = weights.length;
  const y = lease.copyOf(problem.y0);
  const force = lease.float64(n);
  const drift = lease.float64(n);
  const counts: Counts = zeroCounts();
  const start = (): void => {
    f(problem.t0, y, force);
    counts.nfev++;
  };
  return driveFixed(problem, options, y, steps, (t, h, tNext) => {
    let tau = t;
    for (let k = 0; k < m; k++) {
      const hk = h * weights[k]!;
      const half = 0.5 * hk;
      for (let i = 0; i < nv; i++) {
        const v = vel[i]!;
        y[v] = y[v]! + half * force[v]!;
      }
      f(tau + half, y, drift);
      for (let i = 0; i < np; i++) {
        const q = pos[i]!;
        y[q] = y[q]! + hk * drift[q]!;
      }
      tau = k + 1 === m ? tNext : tau + hk;
      f(tau, y, force);
      for (let i = 0; i < nv; i++) {
        const v = vel[i]!;
        y[v] = y[v]! + half * force[v]!;
      }
    }
    counts.nfev += 2 * m;
    return undefined;
  }, counts, start);
}
