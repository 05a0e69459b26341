// Stiffness diagnostic: the ratio max |Re lambda| / min |Re lambda| of the eigenvalues of the
// Jacobian df/dy along a trajectory (Hairer & Wanner, Solving ODEs II, sec. IV.1, discuss why this
// ratio is only a rough indicator). Eigenvalues with |Re lambda| below a tiny fraction of the
// largest are treated as zero and left out, so conserved quantities do not make every system
// look infinitely stiff.
import { eigenvalues } from '../core/eigen.js';
import { makeJacobianSource } from '../core/jacobian.js';
import { InputError } from '../core/errors.js';
import type { Problem } from '../core/types.js';
import { zeroCounts } from '../core/types.js';

/** |Re lambda| <= ZERO_FRACTION * max |lambda| counts as zero. */
const ZERO_FRACTION = 1e-10;

export interface StiffnessReport {
  /** Ratio at each given time; NaN where no eigenvalue has a nonzero real part. */
  readonly ratios: number[];
  /** Largest finite ratio over the times (NaN if none). */
  readonly max: number;
}

export function stiffnessRatioAt(jac: ArrayLike<number>, n: number): number {
  const { re, im } = eigenvalues(jac, n);
  let maxMod = 0;
  for (let i = 0; i < n; i++) maxMod = Math.max(maxMod, Math.hypot(re[i]!, im[i]!));
  const tiny = ZERO_FRACTION * maxMod;
  let lo = Infinity;
  let hi = 0;
  for (let i = 0; i < n; i++) {
    const a = Math.abs(re[i]!);
    if (a <= tiny || a === 0) continue;
    lo = Math.min(lo, a);
    hi = Math.max(hi, a);
  }
  return hi > 0 ? hi / lo : NaN;
}

/**
 * Stiffness ratio of the problem's Jacobian (analytic, else forward differences) at each
 * (times[k], states[k]).
 */
export function stiffnessRatio(problem: Problem, times: readonly number[], states: readonly ArrayLike<number>[]): StiffnessReport {
  if (times.length !== states.length) throw new InputError(`got ${times.length} times but ${states.length} states`);
  const n = problem.dimension;
  const counts = zeroCounts();
  const src = makeJacobianSource(problem.f, problem.jacobian, n, counts);
  const y = new Float64Array(n);
  const fy = new Float64Array(n);
  const ratios: number[] = [];
  let max = NaN;
  for (let k = 0; k < times.length; k++) {
    const s = states[k]!;
    if (s.length !== n) throw new InputError(`state ${k} has ${s.length} entries, expected ${n}`);
    for (let i = 0; i < n; i++) y[i] = s[i]!;
    if (!src.analytic) problem.f(times[k]!, y, fy);
    src.evaluate(times[k]!, y, fy);
    const r = stiffnessRatioAt(src.jac, n);
    ratios.push(r);
    if (Number.isFinite(r) && !(r <= max)) max = r;
  }
  return { ratios, max };
}
