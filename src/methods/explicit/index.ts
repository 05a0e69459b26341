// Fixed-step, embedded explicit and symplectic methods: each is its tableau (or composition
// weights) plus one line here.
import type { Family, Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { denseDormandPrince54, type DenseCapability } from './dense-dp54.js';
import { solveEmbedded } from './embedded.js';
import { solveFixed } from './fixed.js';
import { YOSHIDA4_WEIGHTS, VERLET_WEIGHTS, solveVerletComposition } from './symplectic.js';
import { compileTableau, type KernelFactory, type Tableau, type TableauData } from './tableau.js';
import { fixedStepKernel, unrolledKernel, type FixedKernelFactory } from './kernels/unrolled.js';
import { BOGACKI_SHAMPINE_32 } from './tableaus/bogacki-shampine-32.js';
import { CASH_KARP_45 } from './tableaus/cash-karp-45.js';
import { DORMAND_PRINCE_54 } from './tableaus/dormand-prince-54.js';
import { DORMAND_PRINCE_853 } from './tableaus/dormand-prince-853.js';
import { FEHLBERG_45 } from './tableaus/fehlberg-45.js';
import { EULER, EXPLICIT_MIDPOINT, RK4, RK4_38 } from './tableaus/fixed.js';
import { TSITOURAS_54 } from './tableaus/tsitouras-54.js';
import { VERNER_65 } from './tableaus/verner-65.js';
import { VERNER_76 } from './tableaus/verner-76.js';
import { VERNER_87 } from './tableaus/verner-87.js';

export { dormandPrince54Dense, type DenseCapability, type DenseEvaluate, type DenseSolveResult } from './dense-dp54.js';
export { compileTableau, isFsal, type KernelFactory, type StageKernel, type Tableau, type TableauData } from './tableau.js';
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

interface Meta {
  readonly id: string;
  readonly name: string;
  readonly source: string;
  readonly notes?: string;
}

/** A Method that also offers a continuous extension (dormand-prince-54). */
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

function symplecticMethod(meta: Meta, order: number, weights: Float64Array): Method {
  return {
    ...describe(meta, 'symplectic', order, false),
    needsSeparable: true,
    solve: (problem: Problem, setting: Setting, options: SolveOptions): SolveResult =>
      solveVerletComposition(weights, meta.id, problem, setting, options),
  };
}

export const euler = fixedStepMethod(
  { id: 'euler', name: 'Euler', source: 'L. Euler, Institutionum calculi integralis, vol. 1 (1768)' },
  EULER,
  fixedStepKernel(EULER, 'euler'),
);
export const midpoint = fixedStepMethod(
  {
    id: 'midpoint',
    name: 'Explicit midpoint (Runge)',
    source: 'C. Runge, Ueber die numerische Aufloesung von Differentialgleichungen, Math. Ann. 46 (1895) 167-178',
  },
  EXPLICIT_MIDPOINT,
  fixedStepKernel(EXPLICIT_MIDPOINT, 'midpoint'),
);
export const rk4 = fixedStepMethod(
  {
    id: 'rk4',
    name: 'Classic Runge-Kutta 4 (Kutta)',
    source: 'W. Kutta, Beitrag zur naeherungsweisen Integration totaler Differentialgleichungen, Z. Math. Phys. 46 (1901) 435-453',
  },
  RK4,
  fixedStepKernel(RK4, 'rk4'),
);
export const rk438 = fixedStepMethod(
  {
    id: 'rk4-38',
    name: "Kutta's 3/8 rule",
    source: 'W. Kutta, Beitrag zur naeherungsweisen Integration totaler Differentialgleichungen, Z. Math. Phys. 46 (1901) 435-453',
  },
  RK4_38,
  fixedStepKernel(RK4_38, 'rk4-38'),
);

export const bogackiShampine32 = embeddedMethod(
  {
    id: 'bogacki-shampine-32',
    name: 'Bogacki-Shampine 3(2)',
    source: 'P. Bogacki and L. F. Shampine, A 3(2) pair of Runge-Kutta formulas, Appl. Math. Lett. 2 (1989) 321-325',
  },
  BOGACKI_SHAMPINE_32,
  unrolledKernel(BOGACKI_SHAMPINE_32, 'bogacki-shampine-32'),
);
export const fehlberg45 = embeddedMethod(
  {
    id: 'fehlberg-45',
    name: 'Runge-Kutta-Fehlberg 4(5)',
    source:
      'E. Fehlberg, Low-order classical Runge-Kutta formulas with stepsize control and their application to some heat transfer problems, NASA TR R-315 (1969)',
    notes: 'propagates the fourth-order solution, as published',
  },
  FEHLBERG_45,
  unrolledKernel(FEHLBERG_45, 'fehlberg-45'),
);
export const cashKarp45 = embeddedMethod(
  {
    id: 'cash-karp-45',
    name: 'Cash-Karp 5(4)',
    source:
      'J. R. Cash and A. H. Karp, A variable order Runge-Kutta method for initial value problems with rapidly varying right-hand sides, ACM Trans. Math. Softw. 16 (1990) 201-222',
  },
  CASH_KARP_45,
  unrolledKernel(CASH_KARP_45, 'cash-karp-45'),
);
const DP54_TABLEAU = compileTableau(DORMAND_PRINCE_54, unrolledKernel(DORMAND_PRINCE_54, 'dormand-prince-54'));
const DP54_META: Meta = {
  id: 'dormand-prince-54',
  name: 'Dormand-Prince 5(4)',
  source: 'J. R. Dormand and P. J. Prince, A family of embedded Runge-Kutta formulae, J. Comput. Appl. Math. 6 (1980) 19-26',
  notes: 'dense output: Shampine (1986) 4th-order continuous extension, HNW I sec. II.6',
};
export const dormandPrince54: DenseMethod = {
  ...embeddedFromTableau(DP54_META, DP54_TABLEAU),
  dense: denseDormandPrince54(DP54_TABLEAU, DP54_META.id),
};
export const tsitouras54 = embeddedMethod(
  {
    id: 'tsitouras-54',
    name: 'Tsitouras 5(4)',
    source:
      'Ch. Tsitouras, Runge-Kutta pairs of order 5(4) satisfying only the first column simplifying assumption, Comput. Math. Appl. 62 (2011) 770-775',
  },
  TSITOURAS_54,
  unrolledKernel(TSITOURAS_54, 'tsitouras-54'),
);
export const verner65 = embeddedMethod(
  {
    id: 'verner-65',
    name: 'Verner 6(5), 8 stages (1978)',
    source:
      'J. H. Verner, Explicit Runge-Kutta methods with estimates of the local truncation error, SIAM J. Numer. Anal. 15 (1978) 772-790',
  },
  VERNER_65,
  unrolledKernel(VERNER_65, 'verner-65'),
);
export const verner76 = embeddedMethod(
  {
    id: 'verner-76',
    name: 'Verner 7(6), 10 stages, "most efficient" (2010)',
    source:
      'J. H. Verner, Numerically optimal Runge-Kutta pairs with interpolants, Numer. Algorithms 53 (2010) 383-396 (pair RKV76.IIa, efficient)',
  },
  VERNER_76,
  unrolledKernel(VERNER_76, 'verner-76'),
);
export const dormandPrince853 = embeddedMethod(
  {
    id: 'dormand-prince-853',
    name: 'Dormand-Prince 8(5,3) (DOP853)',
    source:
      'P. J. Prince and J. R. Dormand, High order embedded Runge-Kutta formulae, J. Comput. Appl. Math. 7 (1981) 67-75; coefficients and combined 5th/3rd-order error estimate of E. Hairer, S. P. Norsett and G. Wanner, Solving Ordinary Differential Equations I, 2nd ed. (1993), sec. II.10',
  },
  DORMAND_PRINCE_853,
  unrolledKernel(DORMAND_PRINCE_853, 'dormand-prince-853'),
);

export const verner87 = embeddedMethod(
  {
    id: 'verner-87',
    name: 'Verner 8(7), 13 stages, "most efficient" (2010)',
    source:
      'J. H. Verner, Numerically optimal Runge-Kutta pairs with interpolants, Numer. Algorithms 53 (2010) 383-396 (pair RKV87.IIa, efficient)',
  },
  VERNER_87,
  unrolledKernel(VERNER_87, 'verner-87'),
);

export const stormerVerlet = symplecticMethod(
  {
    id: 'stormer-verlet',
    name: 'Stormer-Verlet (velocity Verlet)',
    source:
      'E. Hairer, C. Lubich and G. Wanner, Geometric numerical integration illustrated by the Stormer-Verlet method, Acta Numerica 12 (2003) 399-450',
  },
  2,
  VERLET_WEIGHTS,
);
export const yoshida4 = symplecticMethod(
  {
    id: 'yoshida-4',
    name: 'Yoshida 4th-order triple jump',
    source: 'H. Yoshida, Construction of higher order symplectic integrators, Phys. Lett. A 150 (1990) 262-268',
  },
  4,
  YOSHIDA4_WEIGHTS,
);

/** Fixed-step, embedded explicit and symplectic methods. */
export const explicitMethods: Method[] = [
  euler,
  midpoint,
  rk4,
  rk438,
  bogackiShampine32,
  fehlberg45,
  cashKarp45,
  dormandPrince54,
  tsitouras54,
  verner65,
  verner76,
  dormandPrince853,
  verner87,
  stormerVerlet,
  yoshida4,
];
