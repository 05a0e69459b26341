// Heat equation on the unit square, u_t = kappa (u_xx + u_yy), kappa = 1/50, homogeneous Dirichlet
// boundary, by the method of lines: the 5-point Laplacian on an m x m interior grid, h = 1/(m+1),
//   u_ij' = kappa / h^2 (u_{i-1,j} + u_{i+1,j} + u_{i,j-1} + u_{i,j+1} - 4 u_ij),   i, j = 1..m,
// boundary values 0, states u_ij at index (i-1) m + (j-1); m = 20, 400 states, t in [0, 5].
// Initial state: two discrete sine modes, v_pq(i, j) = sin(p pi i h) sin(q pi j h), u(0) = v_11 +
// v_23 / 2. Each v_pq is an eigenvector of the 5-point Laplacian with eigenvalue
// lambda_pq = -(4/h^2)(sin^2(p pi h/2) + sin^2(q pi h/2)) (R. J. LeVeque, Finite Difference
// Methods for Ordinary and Partial Differential Equations, SIAM 2007, sec. 3.4, from memory; the
// identity is sin(a - b) + sin(a + b) = 2 sin(a) cos(b) applied in each direction, and the test
// checks it on the grid), so the semi-discrete system's exact solution is
//   u(t) = exp(kappa lambda_11 t) v_11 + exp(kappa lambda_23 t) v_23 / 2.
// The reference is this formula for the ODE system itself: errors measure the integrators, not
// the discretisation of the PDE. Resolution: each component is two products of a sine pair and
// an exponential, each to a few units of round-off relative to its size (|kappa lambda t| stays
// below 2 for v_11; it reaches 12.7 for v_23, whose term is then below 1e-5 of the state), so the
// formula holds to 16 eps of the state's largest component (bound worked out here, no source).
// Error: absolute (the state is at most 1). Invariants: none. Stiff: the Laplacian's eigenvalues
// reach -8 kappa / h^2, about -71, against -0.39 for the slowest mode, over a span where that mode
// decays to 0.14. The Jacobian is sparse (5 entries a row) but its band is m wide: jacobianPattern
// declares the entries, and the implicit methods factor sparse matrices and difference grouped
// columns. m = 20 rather than larger: the stiffness ratio every sweep reports is computed from the
// dense Jacobian's eigenvalues at each reference state, n^3 work (bench/README.md).
import type { JacobianPattern, Problem } from '../src/core/types.js';
import { catalogueProblem } from './from-source.js';

export const HEAT_M = 20;
const KAPPA = 1 / 50;
/** The modes of the initial state: (p, q, amplitude). */
const MODES: readonly (readonly [number, number, number])[] = [
  [1, 1, 1],
  [2, 3, 0.5],
];

/** The 5-point Laplacian times kappa on an m x m grid with zero boundary values. */
export function heatRhs(m: number): Problem['f'] {
  const c = (KAPPA * (m + 1)) * (m + 1);
  return (_t, y, dy) => {
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < m; j++) {
        const k = i * m + j;
        const up = i > 0 ? y[k - m]! : 0;
        const down = i < m - 1 ? y[k + m]! : 0;
        const left = j > 0 ? y[k - 1]! : 0;
        const right = j < m - 1 ? y[k + 1]! : 0;
        dy[k] = c * (up + down + left + right - 4 * y[k]!);
      }
    }
  };
}

/** Row k lists the states equation k reads: itself and its grid neighbours. */
export function heatPattern(m: number): JacobianPattern {
  const rows: number[][] = [];
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < m; j++) {
      const k = i * m + j;
      const row: number[] = [];
      if (i > 0) row.push(k - m);
      if (j > 0) row.push(k - 1);
      row.push(k);
      if (j < m - 1) row.push(k + 1);
      if (i < m - 1) row.push(k + m);
      rows.push(row);
    }
  }
  return rows;
}

/** The discrete eigenvalue lambda_pq of the 5-point Laplacian (header). */
export function heatEigenvalue(m: number, p: number, q: number): number {
  const h = 1 / (m + 1);
  const sp = Math.sin((p * Math.PI * h) / 2);
  const sq = Math.sin((q * Math.PI * h) / 2);
  return (-4 / (h * h)) * (sp * sp + sq * sq);
}

/** The mode v_pq on the grid. */
export function heatMode(m: number, p: number, q: number): Float64Array {
  const h = 1 / (m + 1);
  const v = new Float64Array(m * m);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < m; j++) v[i * m + j] = Math.sin(p * Math.PI * (i + 1) * h) * Math.sin(q * Math.PI * (j + 1) * h);
  }
  return v;
}

export function heatProblem(m: number): Problem {
  const n = m * m;
  const modes = MODES.map(([p, q, a]) => ({ rate: KAPPA * heatEigenvalue(m, p, q), v: heatMode(m, p, q), a }));
  const exact = (t: number, out: Float64Array): void => {
    out.fill(0);
    for (const { rate, v, a } of modes) {
      const e = a * Math.exp(rate * t);
      for (let k = 0; k < n; k++) out[k] = out[k]! + e * v[k]!;
    }
  };
  const y0 = new Float64Array(n);
  exact(0, y0);
  return catalogueProblem(
    import.meta.url,
    {
      id: m === HEAT_M ? 'heat-2d' : `heat-2d-m${m}`,
      title: `Heat equation on the unit square, 5-point Laplacian, ${m} x ${m} grid (${n} states, stiff, sparse)`,
      source: 'Method of lines, 5-point Laplacian; discrete eigenvalues as in LeVeque, Finite Difference Methods for ODEs and PDEs (2007), sec. 3.4',
      dimension: n,
      t0: 0,
      tEnd: 5,
      y0: Array.from(y0),
      f: heatRhs(m),
      jacobianBand: { lower: m, upper: m },
      jacobianPattern: heatPattern(m),
      stiff: true,
      invariants: [],
      errorScale: { kind: 'absolute' },
      reference: {
        kind: 'exact',
        source: 'analytic: exp(kappa lambda_pq t) v_pq summed over the two initial modes',
        exact,
        floor: 16 * Number.EPSILON,
      },
      checkTimes: [1, 2.5],
      // Kept affordable in the default sweep (bench/README.md), like the other large problem.
      defaultTolerances: [1e-3, 1e-4, 1e-5, 1e-6, 1e-7, 1e-8],
      defaultSteps: [50, 100, 200, 400],
    },
    { m },
  );
}

export const heat2d: Problem = heatProblem(HEAT_M);
