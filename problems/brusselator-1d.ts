// One-dimensional Brusselator with diffusion, by the method of lines (E. Hairer and G. Wanner,
// Solving Ordinary Differential Equations II, 2nd ed. (1996), sec. IV.10, problem
// BRUSS; the equations and data as we recall them from that section, from memory), N = 500 grid
// points, 1000 states:
//   u_i' = 1 + u_i^2 v_i - 4 u_i + alpha (N+1)^2 (u_{i-1} - 2 u_i + u_{i+1}),
//   v_i' = 3 u_i - u_i^2 v_i     + alpha (N+1)^2 (v_{i-1} - 2 v_i + v_{i+1}),
// alpha = 1/50, x_i = i / (N + 1), boundary u_0 = u_{N+1} = 1, v_0 = v_{N+1} = 3, initial
// u_i(0) = 1 + sin(2 pi x_i), v_i(0) = 3, t in [0, 10]. The states are interleaved
// (u_1, v_1, u_2, v_2, ...) as the book orders them, so the Jacobian has 2 diagonals below and 2
// above the main one (jacobianBand), and the implicit methods factor band matrices.
// Reference: certified here (no published values at t = 10 to our knowledge): radau-iia-5 and
// bdf-variable at rtol = atol = 1e-12 (src/measure/certify.ts), the certificate written into
// brusselator-1d-reference.ts by `node dist/bench/certify-brusselator.js`; test/catalogue-brusselator.test.ts
// checks it against hairer-wanner-rodas4, which is not one of the certifying pair. Error: absolute.
// Invariants: none. Stiff: the diffusion's eigenvalues reach -4 alpha (N+1)^2, about -2e4.
import type { Problem } from '../src/core/types.js';
import { BRUSSELATOR_REFERENCE } from './brusselator-1d-reference.js';
import { catalogueProblem } from './from-source.js';

export const BRUSSELATOR_N = 500;
const ALPHA = 1 / 50;

/** The right-hand side for N grid points, interleaved states. */
export function brusselatorRhs(N: number): Problem['f'] {
  const c = ALPHA * (N + 1) * (N + 1);
  return (_t, y, dy) => {
    for (let i = 0; i < N; i++) {
      const u = y[2 * i]!;
      const v = y[2 * i + 1]!;
      const uL = i > 0 ? y[2 * i - 2]! : 1;
      const uR = i < N - 1 ? y[2 * i + 2]! : 1;
      const vL = i > 0 ? y[2 * i - 1]! : 3;
      const vR = i < N - 1 ? y[2 * i + 3]! : 3;
      const uuv = u * u * v;
      dy[2 * i] = 1 + uuv - 4 * u + c * (uL - 2 * u + uR);
      dy[2 * i + 1] = 3 * u - uuv + c * (vL - 2 * v + vR);
    }
  };
}

export function brusselatorInitial(N: number): number[] {
  const y: number[] = [];
  for (let i = 1; i <= N; i++) y.push(1 + Math.sin((2 * Math.PI * i) / (N + 1)), 3);
  return y;
}

export const brusselator1d: Problem = catalogueProblem(import.meta.url, {
  id: 'brusselator-1d',
  title: 'Brusselator with diffusion, 1-D, N = 500 (1000 states, stiff, banded)',
  source: 'Hairer and Wanner, Solving ODEs II, 2nd ed., sec. IV.10, problem BRUSS (method of lines)',
  dimension: 2 * BRUSSELATOR_N,
  t0: 0,
  tEnd: 10,
  y0: brusselatorInitial(BRUSSELATOR_N),
  f: brusselatorRhs(BRUSSELATOR_N),
  jacobianBand: { lower: 2, upper: 2 },
  stiff: true,
  invariants: [],
  errorScale: { kind: 'absolute' },
  reference: {
    kind: 'certified',
    digits: BRUSSELATOR_REFERENCE.digits,
    source: BRUSSELATOR_REFERENCE.source,
    points: [{ t: 10, y: BRUSSELATOR_REFERENCE.y }],
  },
  checkTimes: [],
  // Kept affordable in the default sweep (bench/README.md): 1000 states cost every method far
  // more per step than the small problems; -t and -s override these as everywhere.
  defaultTolerances: [1e-3, 1e-4, 1e-5, 1e-6, 1e-7],
  defaultSteps: [100, 200, 400, 800],
});
