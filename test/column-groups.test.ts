// Column groups for grouped difference Jacobians (src/core/column-groups.ts): the natural-order
// greedy grouping of Curtis, Powell and Reid (J. Inst. Math. Appl. 13 (1974) 117-119), improved by
// the orderings of the column intersection graph (Coleman and More, SIAM J. Numer. Anal. 20 (1983)
// 187-209; Brelaz, Comm. ACM 22 (1979) 251-256) when it misses the lower bound.
// Lower bound: a row with r entries needs r groups (Curtis, Powell and Reid).
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ColumnNeighbours, columnDegrees, widestRow } from '../src/core/column-graph.js';
import { type ColumnGraph, incidenceDegreeOrder, saturationColouring, smallestLastOrder } from '../src/core/column-colourings.js';
import { type ColumnGroups, columnGroups } from '../src/core/column-groups.js';
import { ColumnHeap } from '../src/core/column-heap.js';
import { makeJacobianSource, sparseFiniteDifferenceJacobian } from '../src/core/jacobian.js';
import { jacobianStructure, SparseJacobian } from '../src/core/jacobian-structure.js';
import { SparsePattern } from '../src/core/sparse-pattern.js';
import { type JacobianPattern, zeroCounts } from '../src/core/types.js';
import { implicitMethods } from '../src/methods/implicit/index.js';
import { loadProblemFile } from '../src/problems/load-file.js';
import { uniformProblem } from '../src/problems/uniform.js';
import { heatPattern, HEAT_M } from '../problems/heat-2d.js';
import { writeGridFile } from './helpers/grid-file.js';

/** The 5-point stencil's pattern on a rows x cols grid, state (i, j) at i cols + j. */
function fivePoint(rows: number, cols: number): JacobianPattern {
  const pattern: number[][] = [];
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < cols; j++) {
      const row = [[i, j], [i - 1, j], [i + 1, j], [i, j - 1], [i, j + 1]]
        .filter(([a, b]) => a! >= 0 && a! < rows && b! >= 0 && b! < cols)
        .map(([a, b]) => a! * cols + b!);
      pattern.push(row);
    }
  }
  return pattern;
}

/** Each column's group, from the groups' lists. */
function groupOf(g: ColumnGroups, n: number): Int32Array {
  const of = new Int32Array(n).fill(-1);
  for (let k = 0; k < g.count; k++) for (let c = g.start[k]!; c < g.start[k + 1]!; c++) of[g.columns[c]!] = k;
  return of;
}

/** True when no row has two columns of one colour (the grouping is usable for differences). */
function validColouring(p: SparsePattern, colour: ArrayLike<number>): boolean {
  for (let i = 0; i < p.n; i++) {
    const seen = new Set<number>();
    for (let r = p.rowStart[i]!; r < p.rowStart[i + 1]!; r++) {
      const c = colour[p.column[r]!]!;
      if (seen.has(c)) return false;
      seen.add(c);
    }
  }
  return true;
}

/** Curtis, Powell and Reid's grouping written plainly: each column, in natural order, joins the first group it fits. */
function naturalGreedy(p: SparsePattern): number[][] {
  const groups: { columns: number[]; rows: Set<number> }[] = [];
  for (let j = 0; j < p.n; j++) {
    const rows = Array.from(p.row.subarray(p.colStart[j]!, p.colStart[j + 1]!));
    let g = groups.find((x) => rows.every((i) => !x.rows.has(i)));
    if (!g) groups.push((g = { columns: [], rows: new Set() }));
    g.columns.push(j);
    rows.forEach((i) => g.rows.add(i));
  }
  return groups.map((g) => g.columns);
}

const lists = (g: ColumnGroups): number[][] =>
  Array.from({ length: g.count }, (_, k) => Array.from(g.columns.subarray(g.start[k]!, g.start[k + 1]!)));

describe('the 5-point grid: 5 groups, the optimum', () => {
  it.each([
    [3, 3],
    [4, 4],
    [5, 5],
    [8, 8],
    [12, 12],
    [HEAT_M, HEAT_M],
    [31, 31],
    [7, 13],
    [13, 7],
    [40, 25],
  ])('%i x %i grid: 5 groups (natural order needs 6 or 7)', (rows, cols) => {
    const p = new SparsePattern(rows * cols, fivePoint(rows, cols));
    // Lower bound: an interior row has 5 entries. Upper: (i + 2j) mod 5 gives the five
    // neighbours of a stencil five different colours (common practice, no source); checked here.
    expect(widestRow(p)).toBe(5);
    const diagonalColouring = Array.from({ length: p.n }, (_, k) => (Math.floor(k / cols) + 2 * (k % cols)) % 5);
    expect(validColouring(p, diagonalColouring)).toBe(true);
    const g = columnGroups(p);
    expect(g.count).toBe(5);
    expect(validColouring(p, groupOf(g, p.n))).toBe(true);
    expect(naturalGreedy(p).length).toBeGreaterThan(5);
  });

  it('the catalogue heat-2d pattern (20 x 20): 5 groups where natural order took 7', () => {
    const p = new SparsePattern(HEAT_M * HEAT_M, heatPattern(HEAT_M));
    // 7: the natural-order count before the orderings were added (bench/README.md, issue 27).
    expect(naturalGreedy(p).length).toBe(7);
    expect(columnGroups(p).count).toBe(5);
  });
});

describe('patterns the natural order already groups optimally keep their groups', () => {
  it.each([
    [1, 1],
    [2, 2],
    [0, 3],
    [3, 1],
    [5, 0],
  ])('a full band, %i below and %i above, 40 states: lower + upper + 1 groups, every (lower + upper + 1)-th column together', (lower, upper) => {
    const n = 40;
    const w = lower + upper + 1;
    const rows = Array.from({ length: n }, (_, i) => Array.from({ length: w }, (_, k) => i - lower + k).filter((j) => j >= 0 && j < n));
    const g = columnGroups(new SparsePattern(n, rows));
    // Curtis, Powell and Reid (1974): columns j and j + w share no row of a band of width w.
    expect(lists(g)).toEqual(Array.from({ length: w }, (_, r) => Array.from({ length: n }, (_, j) => j).filter((j) => j % w === r)));
  });

  it('random patterns: valid groups, never more than natural order, natural order kept exactly when it meets the bound', () => {
    const patternArb = fc.integer({ min: 1, max: 60 }).chain((n) =>
      fc.record({
        n: fc.constant(n),
        rows: fc.array(fc.uniqueArray(fc.integer({ min: 0, max: n - 1 }), { maxLength: Math.min(n, 8) }), { minLength: n, maxLength: n }),
      }),
    );
    fc.assert(
      fc.property(patternArb, ({ n, rows }) => {
        const p = new SparsePattern(n, rows);
        const g = columnGroups(p);
        const of = groupOf(g, n);
        expect(of.every((k) => k >= 0)).toBe(true);
        expect(g.start[g.count]).toBe(n);
        expect(validColouring(p, of)).toBe(true);
        for (const list of lists(g)) expect(list).toEqual([...list].sort((a, b) => a - b));
        const natural = naturalGreedy(p);
        expect(g.count).toBeGreaterThanOrEqual(widestRow(p));
        expect(g.count).toBeLessThanOrEqual(natural.length);
        if (natural.length === widestRow(p)) expect(lists(g)).toEqual(natural);
        // Deterministic: a second pattern object with the same rows gives the same groups.
        expect(lists(columnGroups(new SparsePattern(n, rows)))).toEqual(lists(g));
      }),
      { numRuns: 400 },
    );
  });
});

describe('the orderings meet their definitions (Coleman and More 1983, Brelaz 1979)', () => {
  const arb = fc.integer({ min: 1, max: 40 }).chain((n) =>
    fc.array(fc.uniqueArray(fc.integer({ min: 0, max: n - 1 }), { maxLength: Math.min(n, 5) }), { minLength: n, maxLength: n }),
  );
  /** Plain adjacency of the column intersection graph. */
  const adjacency = (p: SparsePattern): Set<number>[] =>
    Array.from({ length: p.n }, (_, j) => {
      const s = new Set<number>();
      for (let q = p.colStart[j]!; q < p.colStart[j + 1]!; q++) {
        const i = p.row[q]!;
        for (let r = p.rowStart[i]!; r < p.rowStart[i + 1]!; r++) if (p.column[r] !== j) s.add(p.column[r]!);
      }
      return s;
    });
  const graphOf = (p: SparsePattern): ColumnGraph => {
    const walk = new ColumnNeighbours(p);
    return { n: p.n, walk, degree: columnDegrees(p, walk) };
  };

  it('smallest-last: each column has the smallest degree among itself and the columns before it', () => {
    fc.assert(
      fc.property(arb, (rows) => {
        const p = new SparsePattern(rows.length, rows);
        const adj = adjacency(p);
        const order = Array.from(smallestLastOrder(graphOf(p)));
        expect([...order].sort((a, b) => a - b)).toEqual(order.map((_, j) => j));
        for (let k = 0; k < order.length; k++) {
          const before = new Set(order.slice(0, k + 1));
          const degreeIn = (v: number) => [...adj[v]!].filter((u) => before.has(u)).length;
          const least = Math.min(...order.slice(0, k + 1).map(degreeIn));
          expect(degreeIn(order[k]!)).toBe(least);
        }
      }),
      { numRuns: 150 },
    );
  });

  it('incidence degree: each column has the most neighbours among the columns before it, of those not yet placed', () => {
    fc.assert(
      fc.property(arb, (rows) => {
        const p = new SparsePattern(rows.length, rows);
        const adj = adjacency(p);
        const order = Array.from(incidenceDegreeOrder(graphOf(p)));
        expect([...order].sort((a, b) => a - b)).toEqual(order.map((_, j) => j));
        for (let k = 0; k < order.length; k++) {
          const placed = new Set(order.slice(0, k));
          const incidence = (v: number) => [...adj[v]!].filter((u) => placed.has(u)).length;
          const most = Math.max(...order.slice(k).map(incidence));
          expect(incidence(order[k]!)).toBe(most);
        }
      }),
      { numRuns: 150 },
    );
  });

  it('saturation: a valid colouring with no colour gaps, and null when it cannot beat the limit', () => {
    fc.assert(
      fc.property(arb, (rows) => {
        const p = new SparsePattern(rows.length, rows);
        const g = graphOf(p);
        const found = saturationColouring(g, p.n + 1)!;
        expect(validColouring(p, found.colour)).toBe(true);
        expect(new Set(found.colour).size).toBe(found.count);
        expect(Math.max(...found.colour)).toBe(found.count - 1);
        expect(saturationColouring(g, found.count)).toBeNull();
      }),
      { numRuns: 150 },
    );
  });

  it('the heap takes columns by key, then tie, then smaller index, as keys rise and fall', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: -3, max: 3 }), fc.integer({ min: 0, max: 2 })), { minLength: 1, maxLength: 30 }),
        fc.array(fc.tuple(fc.nat(), fc.integer({ min: -2, max: 2 })), { maxLength: 40 }),
        (start, changes) => {
          const n = start.length;
          const key = Int32Array.from(start, ([k]) => k);
          const tie = Int32Array.from(start, ([, t]) => t);
          const heap = new ColumnHeap(key, tie);
          const left = new Set(Array.from({ length: n }, (_, j) => j));
          changes.forEach(([at, by], s) => {
            const j = at % n;
            if (s % 3 === 2 && left.size > 0) {
              const expected = [...left].sort((a, b) => key[b]! - key[a]! || tie[b]! - tie[a]! || a - b)[0]!;
              expect(heap.pop()).toBe(expected);
              left.delete(expected);
            } else if (heap.has(j) && by !== 0) {
              key[j]! += by;
              if (by > 0) heap.raised(j);
              else heap.lowered(j);
            }
          });
          const rest = [...left].sort((a, b) => key[b]! - key[a]! || tie[b]! - tie[a]! || a - b);
          expect(rest.map(() => heap.pop())).toEqual(rest);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('difference Jacobians from the new groups', () => {
  it('a nonlinear 5-point problem on 10 x 10: 5 evaluations, every entry equal to the analytic Jacobian to difference accuracy', () => {
    const m = 10;
    const n = m * m;
    const pattern = new SparsePattern(n, fivePoint(m, m));
    const neighbours = (k: number) => pattern.column.subarray(pattern.rowStart[k]!, pattern.rowStart[k + 1]!).filter((j) => j !== k);
    // f_k = y_k * (sum of neighbours - 4 y_k) + sin(y_k), differentiated by hand:
    // df_k/dy_nb = y_k, df_k/dy_k = sum of neighbours - 8 y_k + cos(y_k).
    const f = (_t: number, y: Float64Array, dy: Float64Array): void => {
      for (let k = 0; k < n; k++) {
        let s = 0;
        for (const j of neighbours(k)) s += y[j]!;
        dy[k] = y[k]! * (s - 4 * y[k]!) + Math.sin(y[k]!);
      }
    };
    const y = Float64Array.from({ length: n }, (_, k) => 1 + 0.5 * Math.sin(k));
    const fy = new Float64Array(n);
    f(0, y, fy);
    const groups = columnGroups(pattern);
    const values = new Float64Array(pattern.nnz);
    const work = { yWork: new Float64Array(n), fWork: new Float64Array(n), dWork: new Float64Array(n) };
    expect(sparseFiniteDifferenceJacobian(f, 0, y, fy, values, pattern, groups, work)).toBe(5);
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (const j of neighbours(i)) s += y[j]!;
      for (let q = pattern.rowStart[i]!; q < pattern.rowStart[i + 1]!; q++) {
        const j = pattern.column[q]!;
        const exact = i === j ? s - 8 * y[i]! + Math.cos(y[i]!) : y[i]!;
        // Forward differences: truncation |f''| delta / 2 with delta = sqrt(eps |y|) about 2e-8 and
        // |f''| below 10, plus rounding eps |f| / delta, both near 1e-7 (Dennis and Schnabel, sec. 5.4).
        expect(Math.abs(values[q]! - exact), `J[${i}][${j}]`).toBeLessThan(1e-6);
      }
    }
  });
});

describe('a problem file whose pattern is read from its equations', () => {
  const dir = mkdtempSync(join(tmpdir(), 'sg-groups-'));
  /** Heat on a k x k grid with a clipped decay term: `max` leaves the Jacobian to differences. */
  const grid = (k: number): string => writeGridFile(dir, k, (self, neighbours) => `10 * (${neighbours} - 4 * ${self}) - max(${self}, -1)`);

  it('7 x 7 grid (49 states): 5 groups, so each difference Jacobian costs 44 evaluations fewer than dense and 10 fewer than the 15-wide band', async () => {
    const loaded = await loadProblemFile(grid(7));
    expect(loaded.jacobian).toBeUndefined();
    expect(loaded.jacobianBand).toEqual({ lower: 7, upper: 7 });
    const structure = jacobianStructure(loaded, 49) as SparseJacobian;
    expect(structure).toBeInstanceOf(SparseJacobian);
    expect(structure.groups.count).toBe(5);
    const sparse = uniformProblem(loaded);
    const band = uniformProblem({ ...loaded, jacobianPattern: undefined });
    const dense = uniformProblem({ ...loaded, jacobianPattern: undefined, jacobianBand: undefined });
    const counts = zeroCounts();
    const source = makeJacobianSource(sparse.f, undefined, 49, counts, undefined, structure);
    const fy = new Float64Array(49);
    sparse.f(0, Float64Array.from(sparse.y0), fy);
    source.evaluate(0, Float64Array.from(sparse.y0), fy);
    expect(counts).toMatchObject({ njev: 1, nfev: 5 });
    // Rosenbrock methods take a fixed number of evaluations a step and no Newton iteration, so
    // with the same steps their counts differ by the Jacobians' evaluations alone. (A Newton
    // method's iterations may differ by one between the dense and sparse LU's roundings.)
    for (const id of ['hairer-wanner-rodas4', 'hairer-wanner-ros4-l-stable']) {
      const method = implicitMethods.find((x) => x.id === id)!;
      const [s, b, d] = [sparse, band, dense].map((p) => method.solve(p, { rtol: 1e-6, atol: 1e-8 }, { maxSteps: 100_000 }));
      for (const r of [s, b, d]) expect(r!.status).toBe('ok');
      const { nfev: nfevSparse, ...stepsSparse } = s!.counts;
      const { nfev: nfevBand, ...stepsBand } = b!.counts;
      const { nfev: nfevDense, ...stepsDense } = d!.counts;
      expect(stepsSparse).toEqual(stepsDense);
      expect(stepsBand).toEqual(stepsDense);
      expect(s!.counts.njev).toBeGreaterThan(0);
      // Differences: 49 evaluations per Jacobian dense, 2 * 7 + 1 banded, one per group sparse.
      expect([id, nfevDense - nfevSparse, nfevBand - nfevSparse]).toEqual([id, s!.counts.njev * (49 - 5), s!.counts.njev * (15 - 5)]);
    }
  });
});
