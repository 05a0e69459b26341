// Sparse Jacobians (problem.jacobianPattern): column groups for grouped differences (Curtis,
// Powell and Reid, J. Inst. Math. Appl. 13 (1974) 117-119), the pattern read from a problem
// file's equations, the choice of structure, the checks on a declared pattern, and every implicit
// method's sparse solve against the same method's dense and band solves on the 2-D heat equation
// (problems/heat-2d.ts) at m = 8, 64 states: same steps, states equal to rounding.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { defineProblem } from '../src/authoring/define-problem.js';
import { columnGroups } from '../src/core/column-groups.js';
import { finiteDifferenceJacobian, makeJacobianSource, sparseFiniteDifferenceJacobian } from '../src/core/jacobian.js';
import { jacobianStructure, SparseJacobian, sparseJacobian } from '../src/core/jacobian-structure.js';
import { SparsePattern } from '../src/core/sparse-pattern.js';
import type { Problem } from '../src/core/types.js';
import { zeroCounts } from '../src/core/types.js';
import { implicitMethods } from '../src/methods/implicit/index.js';
import { loadProblemFile } from '../src/problems/load-file.js';
import { uniformProblem } from '../src/problems/uniform.js';
import { heatPattern, heatProblem, heatRhs } from '../problems/heat-2d.js';
import { catalogue } from '../problems/index.js';
import { patternProblem } from '../src/core/sparse-pattern.js';
import { writeGridFile } from './helpers/grid-file.js';

const patternArb = fc.integer({ min: 1, max: 30 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    rows: fc.array(fc.uniqueArray(fc.integer({ min: 0, max: n - 1 }), { maxLength: Math.min(n, 6) }), { minLength: n, maxLength: n }),
  }),
);

describe('Curtis-Powell-Reid column groups', () => {
  it('random patterns: every column in exactly one group, no two columns of a group share a row', () => {
    fc.assert(
      fc.property(patternArb, ({ n, rows }) => {
        const p = new SparsePattern(n, rows);
        const g = columnGroups(p);
        expect(g.start[g.count]).toBe(n);
        expect([...g.columns].sort((a, b) => a - b)).toEqual(Array.from({ length: n }, (_, j) => j));
        for (let k = 0; k < g.count; k++) {
          const seen = new Set<number>();
          for (let c = g.start[k]!; c < g.start[k + 1]!; c++) {
            const j = g.columns[c]!;
            for (let q = p.colStart[j]!; q < p.colStart[j + 1]!; q++) {
              expect(seen.has(p.row[q]!)).toBe(false);
              seen.add(p.row[q]!);
            }
          }
        }
        // A row with r entries needs r different groups (Curtis, Powell and Reid's lower bound).
        let widest = 0;
        for (let i = 0; i < n; i++) widest = Math.max(widest, p.rowStart[i + 1]! - p.rowStart[i]!);
        expect(g.count).toBeGreaterThanOrEqual(widest);
      }),
      { numRuns: 300 },
    );
  });

  const m = 8;
  const n = m * m;
  const sparse = new SparseJacobian(new SparsePattern(n, heatPattern(m)));
  const f = heatRhs(m);
  const y = Float64Array.from({ length: n }, (_, k) => Math.sin(k) + 0.5);
  const fy = new Float64Array(n);
  f(0, y, fy);
  const work = () => ({ yWork: new Float64Array(n), fWork: new Float64Array(n), dWork: new Float64Array(n) });

  it('5-point Laplacian on 8 x 8: 5 groups, the widest row (test/column-groups.test.ts has more grids), one evaluation each', () => {
    // A row with 5 entries needs 5 groups (Curtis, Powell and Reid's lower bound); (i + 2j) mod 5
    // shows 5 suffice (common practice, no source).
    const values = new Float64Array(sparse.pattern.nnz);
    const evals = sparseFiniteDifferenceJacobian(f, 0, y, fy, values, sparse.pattern, sparse.groups, work());
    expect(evals).toBe(sparse.groups.count);
    expect(sparse.groups.count).toBe(5);
  });

  it('grouped differences equal the column-by-column ones exactly, and the stencil kappa (m+1)^2 (1, 1, -4, 1, 1) to difference accuracy', () => {
    const values = new Float64Array(sparse.pattern.nnz);
    sparseFiniteDifferenceJacobian(f, 0, y, fy, values, sparse.pattern, sparse.groups, work());
    const dense = new Float64Array(n * n);
    finiteDifferenceJacobian(f, 0, y, fy, dense, n, { yWork: new Float64Array(n), fWork: new Float64Array(n) });
    const c = (m + 1) * (m + 1) / 50; // kappa = 1/50 (problems/heat-2d.ts)
    const p = sparse.pattern;
    for (let i = 0; i < n; i++) {
      for (let q = p.rowStart[i]!; q < p.rowStart[i + 1]!; q++) {
        const j = p.column[q]!;
        expect(values[q]).toBe(dense[i * n + j]);
        expect(Math.abs(values[q]! - (i === j ? -4 * c : c))).toBeLessThan(1e-6 * c);
      }
    }
  });

  it('a sparse source counts one njev and one nfev per group per Jacobian; its values follow the pattern', () => {
    const counts = zeroCounts();
    const src = makeJacobianSource(f, undefined, n, counts, undefined, sparse);
    src.evaluate(0, y, fy);
    src.evaluate(0, y, fy);
    expect(counts).toMatchObject({ njev: 2, nfev: 2 * sparse.groups.count });
    expect(src.jac.length).toBe(sparse.pattern.nnz);
    expect(sparse.pattern.nnz).toBe(5 * n - 4 * m); // 5 a row less the 4m missing at the boundary
  });
});

describe('which structure a solve takes', () => {
  it('heat at m = 30: sparse (4380 entries against 81,900 in the band); m = 4 (16 states): below 32 states, the band', () => {
    const big = heatProblem(30);
    expect(jacobianStructure(big, 900)).toBeInstanceOf(SparseJacobian);
    const small = heatProblem(4);
    expect(jacobianStructure(small, 16)).toEqual({ lower: 4, upper: 4 });
    expect(jacobianStructure({ ...small, jacobianBand: undefined }, 16)).toBeNull();
  });
  it('a tridiagonal pattern stays with its band (3n entries against 4n stored)', () => {
    const n = 50;
    const rows = Array.from({ length: n }, (_, i) => [i - 1, i, i + 1].filter((j) => j >= 0 && j < n));
    expect(jacobianStructure({ jacobianPattern: rows, jacobianBand: { lower: 1, upper: 1 } }, n)).toEqual({ lower: 1, upper: 1 });
    // Without a band, the dense matrix stores 2500: the pattern is used.
    expect(jacobianStructure({ jacobianPattern: rows }, n)).toBeInstanceOf(SparseJacobian);
  });
  it('a pattern is prepared once and shared by every solve of it', () => {
    const rows = heatPattern(6);
    expect(sparseJacobian(rows, 36)).toBe(sparseJacobian(rows, 36));
  });
});

describe('the catalogue declares its structure truly', () => {
  const structured = catalogue.filter((p) => p.jacobianPattern || p.jacobianBand);
  it.each(structured.map((p) => [p.id, p] as const))('%s: column-by-column differences vanish outside the declared pattern and band', (_id, p) => {
    const n = p.dimension;
    if (p.jacobianPattern) expect(patternProblem(p.jacobianPattern, n, 'jacobianPattern')).toBeNull();
    const y = Float64Array.from(p.y0, (v, i) => v + 0.01 * Math.sin(i + 1));
    const fy = new Float64Array(n);
    p.f(p.t0, y, fy);
    const dense = new Float64Array(n * n);
    finiteDifferenceJacobian(p.f, p.t0, y, fy, dense, n, { yWork: new Float64Array(n), fWork: new Float64Array(n) });
    const allowed = p.jacobianPattern?.map((row, i) => new Set([...row, i]));
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const outside = (allowed && !allowed[i]!.has(j)) || (p.jacobianBand && (i - j > p.jacobianBand.lower || j - i > p.jacobianBand.upper));
        // A perturbation of y_j leaves f_i bit for bit unchanged when f_i does not read y_j.
        if (outside) expect(dense[i * n + j], `${p.id} J[${i}][${j}]`).toBe(0);
      }
    }
  });
});

describe('declared patterns are checked', () => {
  const base = { id: 'tiny', title: 'Tiny', source: 'test', y0: [1, 2, 3], span: [0, 1] as [number, number], f: () => {} };
  it.each([
    [[[0], [1]], 'jacobianPattern has 2 rows for 3 states (one row per state expected)'],
    [[[0], [1, 3], [2]], 'jacobianPattern row 1: column 3 is not an integer in 0..2'],
    [[[0], [1, 1], [2]], 'jacobianPattern row 1: column 1 is listed twice'],
    [[[0], 'x', [2]], 'jacobianPattern row 1 must be a list of column indices, got "x"'],
    [[[0], [0.5], [2]], 'jacobianPattern row 1: column 0.5 is not an integer in 0..2'],
  ])('%j is refused: %s', (pattern, message) => {
    expect(() => defineProblem({ ...base, jacobianPattern: pattern as never })).toThrow(`defineProblem(tiny): ${message}`);
  });
  it('a good pattern and band are kept', () => {
    const p = defineProblem({ ...base, jacobianPattern: [[0, 1], [1], [1, 2]], jacobianBand: { lower: 1, upper: 1 } });
    expect(p.jacobianPattern).toEqual([[0, 1], [1], [1, 2]]);
    expect(p.jacobianBand).toEqual({ lower: 1, upper: 1 });
    expect(() => defineProblem({ ...base, jacobianBand: { lower: 3, upper: 0 } })).toThrow('jacobianBand must be { lower, upper } with whole numbers in 0..2');
  });
});

describe('problem files: the pattern is read from the equations', () => {
  const dir = mkdtempSync(join(tmpdir(), 'sg-sparse-'));
  const grid = (k: number): string => writeGridFile(dir, k);
  it('a 3 x 3 grid gets the 5-point pattern, row by row as the equations name the states', async () => {
    const p = await loadProblemFile(grid(3));
    // Worked out by hand: state (i, j) at 3 i + j reads itself and its grid neighbours.
    expect(p.jacobianPattern).toEqual([
      [0, 1, 3],
      [0, 1, 2, 4],
      [1, 2, 5],
      [0, 3, 4, 6],
      [1, 3, 4, 5, 7],
      [2, 4, 5, 8],
      [3, 6, 7],
      [4, 6, 7, 8],
      [5, 7, 8],
    ]);
    expect(p.jacobianPattern).toEqual(heatPattern(3));
  });
  it('a 7 x 7 grid (49 states) solves with the sparse structure; a full coupling declares no pattern', async () => {
    const p = await loadProblemFile(grid(7));
    expect(p.jacobianBand).toEqual({ lower: 7, upper: 7 });
    expect(jacobianStructure(p, 49)).toBeInstanceOf(SparseJacobian);
    const path = join(dir, 'full.yaml');
    writeFileSync(path, 'id: full\ntitle: Full\nstates: [a, b]\nequations:\n  a: b - a\n  b: a * b\ninitial: { a: 1, b: 2 }\nspan: [0, 1]\n');
    expect((await loadProblemFile(path)).jacobianPattern).toBeUndefined();
  });
});

describe('implicit methods: sparse solve against the dense and band ones (heat, m = 8, 64 states)', () => {
  const m = 8;
  const n = m * m;
  const heat = uniformProblem(heatProblem(m));
  const groups = sparseJacobian(heat.jacobianPattern!, n).groups.count;
  const c = (m + 1) * (m + 1) / 50;
  /** The Laplacian's matrix, dense, worked out from the stencil (problems/heat-2d.ts). */
  const analytic = (_t: number, _y: Float64Array, out: Float64Array): void => {
    out.fill(0);
    heatPattern(m).forEach((row, i) => row.forEach((j) => (out[i * n + j] = i === j ? -4 * c : c)));
  };
  const variant = (structure: 'sparse' | 'band' | 'dense', withJacobian: boolean): Problem =>
    uniformProblem({
      ...heat,
      ...(structure === 'sparse' ? {} : { jacobianPattern: undefined }),
      ...(structure === 'dense' ? { jacobianBand: undefined } : {}),
      ...(withJacobian ? { jacobian: analytic } : {}),
    });
  for (const method of implicitMethods) {
    const setting = method.adaptive ? { rtol: 1e-6, atol: 1e-6 } : { steps: 40 };
    it(`${method.id}: same steps and LU count, states agree to 1e-10; differences cost ${groups} evaluations instead of 64 (or 17 banded)`, () => {
      const opts = { maxSteps: 100_000 };
      for (const withJacobian of [false, true]) {
        const sparse = method.solve(variant('sparse', withJacobian), setting, opts);
        const dense = method.solve(variant('dense', withJacobian), setting, opts);
        const band = method.solve(variant('band', withJacobian), setting, opts);
        for (const r of [sparse, dense, band]) expect(r.status).toBe('ok');
        const { nfev: nfevSparse, ...stepsSparse } = sparse.counts;
        const { nfev: nfevDense, ...stepsDense } = dense.counts;
        const { nfev: nfevBand, ...stepsBand } = band.counts;
        expect(stepsSparse).toEqual(stepsDense);
        expect(stepsBand).toEqual(stepsDense);
        // Analytic: the same evaluations. Differences: n per Jacobian dense, 2m + 1 banded, one per group sparse.
        expect(nfevDense - nfevSparse).toBe(withJacobian ? 0 : dense.counts.njev * (n - groups));
        expect(nfevBand - nfevSparse).toBe(withJacobian ? 0 : dense.counts.njev * (2 * m + 1 - groups));
        for (let i = 0; i < n; i++) expect(Math.abs(sparse.yFinal[i]! - dense.yFinal[i]!)).toBeLessThanOrEqual(1e-10);
      }
    });
  }
});
