// Banded Jacobians (problem.jacobianBand): the implicit methods factor band matrices
// (src/core/band-lu.ts) and difference grouped columns (Curtis, Powell and Reid, J. Inst. Math.
// Appl. 13 (1974) 117-119). Checked on the 1-D Brusselator of Hairer and Wanner II, sec. IV.10,
// at N = 20 (40 states, band 2 and 2): the grouped differences against the Jacobian worked out by
// hand from the equations, and every implicit method's banded solve against the same method's
// dense solve (same steps; the states agree to rounding).
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadProblemFile } from '../src/problems/load-file.js';
import { bandIndex, bandWidth } from '../src/core/band-lu.js';
import { bandedFiniteDifferenceJacobian, finiteDifferenceJacobian, makeJacobianSource } from '../src/core/jacobian.js';
import type { Problem } from '../src/core/types.js';
import { zeroCounts } from '../src/core/types.js';
import { implicitMethods } from '../src/methods/implicit/index.js';
import { uniformProblem } from '../src/problems/uniform.js';
import { brusselator1d, brusselatorInitial, brusselatorRhs } from '../problems/brusselator-1d.js';

const N = 20;
const n = 2 * N;
const ALPHA = 1 / 50;

/** d f / d y of the Brusselator, by hand from the equations (problems/brusselator-1d.ts). */
function analyticJacobian(y: Float64Array): Float64Array {
  const c = ALPHA * (N + 1) * (N + 1);
  const J = new Float64Array(n * n);
  for (let i = 0; i < N; i++) {
    const u = y[2 * i]!;
    const v = y[2 * i + 1]!;
    const U = 2 * i;
    const V = 2 * i + 1;
    J[U * n + U] = 2 * u * v - 4 - 2 * c;
    J[U * n + V] = u * u;
    J[V * n + U] = 3 - 2 * u * v;
    J[V * n + V] = -u * u - 2 * c;
    if (i > 0) {
      J[U * n + U - 2] = c;
      J[V * n + V - 2] = c;
    }
    if (i < N - 1) {
      J[U * n + U + 2] = c;
      J[V * n + V + 2] = c;
    }
  }
  return J;
}

function small(band: boolean, analytic: boolean): Problem {
  return uniformProblem({
    ...brusselator1d,
    id: `brusselator-${N}`,
    dimension: n,
    y0: brusselatorInitial(N),
    f: brusselatorRhs(N),
    ...(band ? { jacobianBand: { lower: 2, upper: 2 } } : { jacobianBand: undefined }),
    ...(analytic ? { jacobian: (_t: number, y: Float64Array, out: Float64Array) => out.set(analyticJacobian(y)) } : {}),
    tEnd: 2,
    reference: { kind: 'certified', points: [] },
  });
}

describe('grouped (Curtis-Powell-Reid) finite differences', () => {
  const y = Float64Array.from(brusselatorInitial(N), (v, i) => v + 0.1 * Math.sin(i));
  const f = brusselatorRhs(N);
  const fy = new Float64Array(n);
  f(0, y, fy);
  const w = bandWidth(2, 2);
  const band = new Float64Array(n * w);
  const evals = bandedFiniteDifferenceJacobian(f, 0, y, fy, band, n, { lower: 2, upper: 2 }, { yWork: new Float64Array(n), fWork: new Float64Array(n), dWork: new Float64Array(n) });
  it('costs lower + upper + 1 = 5 evaluations instead of n = 40', () => {
    expect(evals).toBe(5);
  });
  it('agrees with the analytic Jacobian to forward-difference accuracy (~sqrt(eps) relative)', () => {
    const J = analyticJacobian(y);
    for (let i = 0; i < n; i++) {
      for (let j = Math.max(0, i - 2); j <= Math.min(n - 1, i + 2); j++) {
        const want = J[i * n + j]!;
        expect(Math.abs(band[bandIndex(i, j, 2, w)]! - want)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(want)));
      }
    }
  });
  it('equals the column-by-column differences exactly: no row of a group sees two perturbed columns', () => {
    const dense = new Float64Array(n * n);
    expect(finiteDifferenceJacobian(f, 0, y, fy, dense, n, { yWork: new Float64Array(n), fWork: new Float64Array(n) })).toBe(n);
    for (let i = 0; i < n; i++) {
      for (let j = Math.max(0, i - 2); j <= Math.min(n - 1, i + 2); j++) expect(band[bandIndex(i, j, 2, w)]).toBe(dense[i * n + j]);
    }
  });
  it('a banded source counts one njev and 5 nfev per Jacobian', () => {
    const counts = zeroCounts();
    const src = makeJacobianSource(f, undefined, n, counts, undefined, { lower: 2, upper: 2 });
    src.evaluate(0, y, fy);
    src.evaluate(0, y, fy);
    expect(counts).toMatchObject({ njev: 2, nfev: 10 });
    expect(src.jac.length).toBe(n * w);
  });
});

describe('implicit methods: banded solve against the dense one (Brusselator, N = 20, t in [0, 2])', () => {
  for (const method of implicitMethods) {
    const setting = method.adaptive ? { rtol: 1e-6, atol: 1e-6 } : { steps: 40 };
    it(`${method.id}: same steps, states agree to 1e-9; finite differences cost 5 evaluations instead of 40`, () => {
      const opts = { maxSteps: 100_000 };
      for (const analytic of [true, false]) {
        const dense = method.solve(small(false, analytic), setting, opts);
        const banded = method.solve(small(true, analytic), setting, opts);
        expect(dense.status).toBe('ok');
        expect(banded.status).toBe('ok');
        const { nfev: nfevDense, ...stepsDense } = dense.counts;
        const { nfev: nfevBand, ...stepsBand } = banded.counts;
        expect(stepsBand).toEqual(stepsDense);
        // Analytic: the same evaluations. Differences: n per Jacobian dense, 5 banded.
        expect(nfevDense - nfevBand).toBe(analytic ? 0 : dense.counts.njev * (n - 5));
        for (let i = 0; i < n; i++) expect(Math.abs(banded.yFinal[i]! - dense.yFinal[i]!)).toBeLessThanOrEqual(1e-9);
      }
    });
  }
});

describe('problem files: the band is read from the equations', () => {
  const dir = mkdtempSync(join(tmpdir(), 'sg-band-'));
  /** A heat-equation chain of m cells, c_i' = c_{i-1} - 2 c_i + c_{i+1}, through a definition for the flux. */
  function chain(m: number, extra = ''): string {
    const states = Array.from({ length: m }, (_, i) => `c${i}`);
    const defs = states.map((s, i) => `  q${i}: ${i > 0 ? states[i - 1] : 0} - ${s}`);
    const eqs = states.map((s, i) => `  ${s}: q${i} - ${i < m - 1 ? `q${i + 1}` : 0}${i === 0 ? extra : ''}`);
    const path = join(dir, `chain-${m}-${extra.length}.yaml`);
    writeFileSync(path, `id: chain\ntitle: Chain\nstates: [${states.join(', ')}]\nstiff: true\ndefinitions:\n${defs.join('\n')}\nequations:\n${eqs.join('\n')}\ninitial: { ${states.map((s, i) => `${s}: ${i === 0 ? 1 : 0}`).join(', ')} }\nspan: [0, 1]\n`);
    return path;
  }
  it('a 12-cell chain (each cell sees its neighbours through the flux definitions) gets band 1 and 1', async () => {
    const p = await loadProblemFile(chain(12));
    expect(p.jacobianBand).toEqual({ lower: 1, upper: 1 });
  });
  it('one equation reaching across the chain widens the band; a band as wide as the matrix is not declared', async () => {
    expect((await loadProblemFile(chain(12, ' + 0 * c5'))).jacobianBand).toEqual({ lower: 1, upper: 5 });
    expect((await loadProblemFile(chain(12, ' + 0 * c11'))).jacobianBand).toBeUndefined();
    expect((await loadProblemFile(chain(3))).jacobianBand).toBeUndefined();
  });
});
