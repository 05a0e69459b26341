// Exact discretisations of a linear model x' = A x + B u at a fixed step h, the discrete-time
// models a digital controller runs on (Franklin, Powell and Workman, Digital Control of Dynamic
// Systems, 3rd ed., ch. 4 (zero-order hold) and ch. 6 (triangle / first-order hold); chapters
// from memory):
//   zero-order hold:  x_k+1 = Phi x_k + Gam u(t_k), u held constant over the step;
//   first-order hold: x_k+1 = Phi x_k + Gam u(t_k) + Lam (u(t_k+1) - u(t_k)) / h, u linear over it,
// with [Phi Gam Lam] the top block row of expm(M h), M = [[A, B, 0], [0, 0, I], [0, 0, 0]] (the
// augmented system whose extra states are u and its slope; the zero-order hold uses the first
// two block columns). Both are exact when the input really is held (or ramps) between samples,
// and so measure what sampling the input costs against the continuous truth. One matrix
// exponential per solve; each step is two small matrix-vector products. Counts: no right-hand
// side evaluations (nfev 0), one accepted step per sample.
import type { Counts, Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { expm } from '../../core/expm.js';
import { fixedStepCount } from '../../core/setting.js';

type Hold = 'zero' | 'first';

/** Phi, Gam and Lam / h (Lam then multiplies u_k+1 - u_k) for step h, row-major. */
export function holdMatrices(A: Float64Array, B: Float64Array, n: number, m: number, h: number): { phi: Float64Array; gam: Float64Array; lam: Float64Array } {
  const size = n + 2 * m;
  const M = new Float64Array(size * size);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) M[i * size + j] = A[i * n + j]! * h;
    for (let c = 0; c < m; c++) M[i * size + n + c] = B[i * m + c]! * h;
  }
  for (let c = 0; c < m; c++) M[(n + c) * size + n + m + c] = h;
  const E = expm(M, size);
  const phi = new Float64Array(n * n);
  const gam = new Float64Array(n * m);
  const lam = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) phi[i * n + j] = E[i * size + j]!;
    for (let c = 0; c < m; c++) {
      gam[i * m + c] = E[i * size + n + c]!;
      // The third block state is the input's slope (u_k+1 - u_k)/h; the 1/h is folded in here.
      lam[i * m + c] = E[i * size + n + m + c]! / h;
    }
  }
  return { phi, gam, lam };
}

function solveHold(hold: Hold, methodId: string, problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
  const lin = problem.linear;
  if (!lin) throw new Error(`${methodId} needs a linear problem x' = A x + B u; ${problem.id} is not one`);
  const steps = fixedStepCount(setting, methodId);
  const n = problem.dimension;
  const m = lin.inputs;
  const t0 = problem.t0;
  const h = (problem.tEnd - t0) / steps;
  const { phi, gam, lam } = holdMatrices(lin.A, lin.B, n, m, h);
  const x = Float64Array.from(problem.y0);
  const next = new Float64Array(n);
  const u0 = new Float64Array(m);
  const u1 = new Float64Array(m);
  const counts: Counts = zeroCounts();
  const observer = options.observer;
  if (observer) observer(t0, x);
  lin.input(t0, u0);
  let t = t0;
  for (let k = 0; k < steps; k++) {
    if (counts.accepted >= options.maxSteps) {
      return { status: 'step-limit', message: `${options.maxSteps} steps reached`, tFinal: t, yFinal: x, counts, h };
    }
    if (options.deadline !== undefined && performance.now() > options.deadline) {
      return { status: 'timeout', tFinal: t, yFinal: x, counts, h };
    }
    const tNext = k === steps - 1 ? problem.tEnd : t0 + (k + 1) * h;
    if (hold === 'first') lin.input(tNext, u1);
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += phi[i * n + j]! * x[j]!;
      for (let c = 0; c < m; c++) {
        s += gam[i * m + c]! * u0[c]!;
        if (hold === 'first') s += lam[i * m + c]! * (u1[c]! - u0[c]!);
      }
      next[i] = s;
    }
    x.set(next);
    t = tNext;
    counts.accepted++;
    if (hold === 'first') u0.set(u1);
    else lin.input(t, u0);
    if (observer) observer(t, x);
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(x[i]!)) return { status: 'diverged', message: 'a state is not finite', tFinal: t, yFinal: x, counts, h };
  }
  return { status: 'ok', tFinal: t, yFinal: x, counts, h };
}

const SOURCE = 'G. F. Franklin, J. D. Powell, M. L. Workman, Digital Control of Dynamic Systems, 3rd ed., Addison-Wesley 1998, ch. 4 and 6';

export const zeroOrderHold: Method = {
  id: 'zero-order-hold',
  name: 'Zero-order hold (exact discretisation)',
  family: 'fixed-step',
  order: 1,
  source: SOURCE,
  adaptive: false,
  stiff: true,
  needsLinear: true,
  notes: 'exact for inputs held constant between samples; order 1 in the sampling of a smooth input',
  solve: (problem, setting, options) => solveHold('zero', 'zero-order-hold', problem, setting, options),
};

export const firstOrderHold: Method = {
  id: 'first-order-hold',
  name: 'First-order (triangle) hold (exact discretisation)',
  family: 'fixed-step',
  order: 2,
  source: SOURCE,
  adaptive: false,
  stiff: true,
  needsLinear: true,
  notes: 'exact for inputs linear between samples; order 2 in the sampling of a smooth input',
  solve: (problem, setting, options) => solveHold('first', 'first-order-hold', problem, setting, options),
};

export const discreteMethods: readonly Method[] = [zeroOrderHold, firstOrderHold];
