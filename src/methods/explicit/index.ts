// Fixed-step, embedded explicit and symplectic methods. A Runge-Kutta method is one tableau file
// (coefficients and identity, tableaus/*.ts) plus one line in tableaus/index.ts; a symplectic
// composition of Stormer-Verlet is one file in compositions/ plus one line in its index.ts. This
// file turns each into a Method (a tableau with its generated kernel).
import type { Family, Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { denseCapability, denseCapabilityFor, denseDormandPrince54, type DenseCapability } from './dense-dp54.js';
import { extraStageInterpolation } from './dense-extra-stages.js';
import { fsalHermiteFormula } from './dense-hermite.js';
import { solveEmbedded } from './embedded.js';
import { solveFixed } from './fixed.js';
import { solveVerletComposition, type CompositionMethod } from './symplectic.js';
import { compileTableau, type KernelFactory, type Tableau, type TableauData, type TableauMethod } from './tableau.js';
import { fixedStepKernel, unrolledKernel, type FixedKernelFactory } from './kernels/unrolled.js';
import * as registry from './tableaus/index.js';
import * as compositionRegistry from './compositions/index.js';
import { nystromMethods } from './nystrom/index.js';

export { dormandPrince54Dense, type DenseCapability, type DenseEvaluate, type DenseSolveResult } from './dense-dp54.js';
export { compileTableau, isFsal, type ExtraStageInterpolant, type KernelFactory, type StageKernel, type Tableau, type TableauData, type TableauMethod } from './tableau.js';
export {
  UNROLL_MAX_N,
  fixedStepKernel,
  fixedStepSource,
  unrolledKernel,
  unrolledSource,
  type FixedKernelFactory,
  type FixedStepKernel,
} from './kernels/unrolled.js';
export { solveEmbedded, type AcceptHook } from './embedded.js';
export { solveFixed } from './fixed.js';
export type { CompositionMethod } from './symplectic.js';

interface Meta {
  readonly id: string;
  readonly name: string;
  readonly source: string;
  readonly notes?: string;
}

/** A Method that also offers a continuous extension (dormand-prince-54, bogacki-shampine-32, dormand-prince-853, Verner's pairs). */
export interface DenseMethod extends Method {
  readonly dense: DenseCapability;
}

function describe(meta: Meta, family: Family, order: number, adaptive: boolean) {
  const m = { id: meta.id, name: meta.name, family, order, source: meta.source, adaptive, stiff: false };
  return meta.notes !== undefined ? { ...m, notes: meta.notes } : m;
}

export function fixedStepMethod(meta: Meta, data: TableauData, kernel?: FixedKernelFactory): Method {
  const tab = compileTableau(data);
  return {
    ...describe(meta, 'fixed-step', data.order, false),
    solve: (problem: Problem, setting: Setting, options: SolveOptions): SolveResult =>
      solveFixed(tab, meta.id, problem, setting, options, kernel),
  };
}

export function embeddedMethod(meta: Meta, data: TableauData, kernel?: KernelFactory): Method {
  return embeddedFromTableau(meta, compileTableau(data, kernel));
}

function embeddedFromTableau(meta: Meta, tab: Tableau): Method {
  return {
    ...describe(meta, 'embedded-explicit', tab.order, true),
    embeddedOrder: tab.embeddedOrder,
    solve: (problem: Problem, setting: Setting, options: SolveOptions): SolveResult =>
      solveEmbedded(tab, meta.id, problem, setting, options),
  };
}

function symplecticMethod(meta: CompositionMethod): Method {
  // One weights array per method: the engine keys its work buffers on it (work-lease.ts).
  const weights = Float64Array.from(meta.weights);
  return {
    ...describe(meta, 'symplectic', meta.order, false),
    needsSeparable: true,
    solve: (problem: Problem, setting: Setting, options: SolveOptions): SolveResult =>
      solveVerletComposition(weights, meta.id, problem, setting, options),
  };
}

/** A registered tableau as a Method: fixed-step without embedded weights, adaptive with them. */
function tableauMethod(rec: TableauMethod): Method | DenseMethod {
  const d = rec.tableau;
  if (!d.bHat) return fixedStepMethod(rec, d, fixedStepKernel(d, rec.id));
  const tab = compileTableau(d, unrolledKernel(d, rec.id));
  const method = embeddedFromTableau(rec, tab);
  const dense = rec.denseOutput;
  if (!dense) return method;
  // The last stage is f(t1, y1) only in a first-same-as-last pair.
  if (dense.form === 'fsal-hermite' && !tab.fsal) throw new Error(`${rec.id}: fsal-hermite dense output needs a first-same-as-last pair`);
  if (dense.form === 'extra-stages') return { ...method, dense: denseCapabilityFor(tab, rec.id, extraStageInterpolation(tab, dense)) };
  return { ...method, dense: dense.form === 'dopri5' ? denseDormandPrince54(tab, rec.id) : denseCapability(tab, rec.id, fsalHermiteFormula(tab.stages)) };
}

const familyRank = (d: TableauData): number => (d.bHat ? 1 : 0);
const byId = (x: { id: string }, y: { id: string }): number => (x.id < y.id ? -1 : x.id > y.id ? 1 : 0);

/** Every registered tableau, fixed-step first, then by published order, then by id. */
export const explicitTableaus: readonly TableauMethod[] = Object.values(registry).sort(
  (x, y) => familyRank(x.tableau) - familyRank(y.tableau) || x.tableau.order - y.tableau.order || byId(x, y),
);

const rungeKuttaMethods = explicitTableaus.map(tableauMethod);

/** The registered Runge-Kutta method with this id (throws if there is none). */
export function tableauMethodById(id: string): Method {
  const m = rungeKuttaMethods.find((x) => x.id === id);
  if (!m) throw new Error(`no registered tableau '${id}'`);
  return m;
}

/** Dormand-Prince 5(4) with its continuous extension. */
export const dormandPrince54 = tableauMethodById('dormand-prince-54') as DenseMethod;

/** Every registered symplectic composition, by published order, then by id. */
export const symplecticCompositions: readonly CompositionMethod[] = Object.values(compositionRegistry).sort(
  (x, y) => x.order - y.order || byId(x, y),
);

/** Fixed-step, embedded explicit (Runge-Kutta and Runge-Kutta-Nystrom) and symplectic methods. */
export const explicitMethods: Method[] = [...rungeKuttaMethods, ...nystromMethods, ...symplecticCompositions.map(symplecticMethod)];
