// Runge-Kutta-Nystrom pairs as Methods: each steps the problem's second-order form q'' = g(t, q)
// (its separable split with secondOrder, q' = v) through the embedded engine's adaptive loop.
import { InputError } from '../../../core/errors.js';
import type { Method, Problem, Setting, SolveOptions, SolveResult } from '../../../core/types.js';
import { solveWithStep, type StepShape } from '../embedded.js';
import { splitOf } from '../symplectic.js';
import { nystromKernels } from './kernel.js';
import { checkNystromPair, nystromFsal, type NystromPair } from './pair.js';
import { DORMAND_EL_MIKKAWY_PRINCE_86 } from './dormand-el-mikkawy-prince-86.js';
import { DORMAND_EL_MIKKAWY_PRINCE_1210 } from './dormand-el-mikkawy-prince-1210.js';

export { nystromSource, nystromKernels, NYSTROM_UNROLL_MAX_N } from './kernel.js';
export { nystromFsal, type NystromPair } from './pair.js';
export { DORMAND_EL_MIKKAWY_PRINCE_86 } from './dormand-el-mikkawy-prince-86.js';
export { DORMAND_EL_MIKKAWY_PRINCE_1210 } from './dormand-el-mikkawy-prince-1210.js';

/** The position/velocity pairs of a second-order problem, checked, or a message naming what is missing. */
function secondOrderSplit(problem: Problem, methodId: string): { pos: Int32Array; vel: Int32Array } {
  if (!problem.separable?.secondOrder) {
    throw new InputError(
      `problem ${problem.id} does not declare the second-order form q' = v (separable.secondOrder): ${methodId} is a Runge-Kutta-Nystrom method and steps q'' = g(t, q)`,
      methodId,
    );
  }
  const split = splitOf(problem, methodId);
  if (split.pos.length !== split.vel.length) {
    throw new InputError(`problem ${problem.id}: separable.secondOrder needs as many positions as velocities`, methodId);
  }
  return split;
}

export function nystromMethod(pair: NystromPair): Method {
  checkNystromPair(pair);
  const shape: StepShape = { stages: pair.c.length, fsal: nystromFsal(pair), order: pair.order, controlOrder: Math.min(pair.order, pair.embeddedOrder) };
  const kernels = nystromKernels(pair);
  const method: Method = {
    id: pair.id,
    name: pair.name,
    family: 'embedded-explicit',
    order: pair.order,
    source: pair.source,
    adaptive: true,
    stiff: false,
    needsSecondOrder: true,
    embeddedOrder: pair.embeddedOrder,
    solve: (problem: Problem, setting: Setting, options: SolveOptions): SolveResult => {
      return solveWithStep(shape, pair.id, problem, setting, options, () => {
        const { pos, vel } = secondOrderSplit(problem, pair.id);
        return kernels(pos, vel);
      });
    },
  };
  return pair.notes !== undefined ? { ...method, notes: pair.notes } : method;
}

/** Every registered Runge-Kutta-Nystrom pair. */
export const nystromMethods: Method[] = [DORMAND_EL_MIKKAWY_PRINCE_86, DORMAND_EL_MIKKAWY_PRINCE_1210].map(nystromMethod);
