// The sparse LU keeps each factorization's searches and reads them back while the pivots match
// the last factorization's (src/core/sparse-lu.ts). A factorization of a matrix must then give
// the same bits as a fresh object's factorization of that matrix, whatever came before it:
// pivots that stay, pivots that move, and a factorization that failed on a zero pivot. The fresh
// factorization is the reference here; its accuracy is checked against mathjs in
// test/property-sparse-lu.test.ts.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ComplexSparseLu, SparseLu, SparseLuAnalysis } from '../src/core/sparse-lu.js';
import { SparsePattern } from '../src/core/sparse-pattern.js';

const entry = fc.integer({ min: -1000, max: 1000 }).map((v) => v / 1000);

/** A pattern (diagonal always kept) and a sequence of value sets over it, each with its own diagonal shift. */
const sequenceArb = fc
  .record({ n: fc.integer({ min: 1, max: 14 }), density: fc.integer({ min: 5, max: 40 }), count: fc.integer({ min: 2, max: 5 }) })
  .chain(({ n, density, count }) =>
    fc.record({
      n: fc.constant(n),
      keep: fc.array(fc.integer({ min: 0, max: 99 }).map((v) => v < density), { minLength: n * n, maxLength: n * n }),
      sets: fc.array(
        fc.record({
          re: fc.array(entry, { minLength: n * n, maxLength: n * n }),
          im: fc.array(entry, { minLength: n * n, maxLength: n * n }),
          // Mostly a dominant diagonal (pivots stay), sometimes a weak one (pivots move), sometimes a zero column.
          shift: fc.oneof(fc.constant(4), fc.integer({ min: -1500, max: 1500 }).map((v) => v / 1000)),
          zeroColumn: fc.integer({ min: -3, max: n - 1 }),
          // Small values (scaled by 1e-3) keep a dominant diagonal without changing the structure.
          scale: fc.constantFrom(1, 1e-3),
        }),
        { minLength: count, maxLength: count },
      ),
      b: fc.array(entry, { minLength: 2 * n, maxLength: 2 * n }),
    }),
  );

type Draw = { n: number; keep: boolean[]; sets: { re: number[]; im: number[]; shift: number; zeroColumn: number; scale: number }[]; b: number[] };

function patternOf(d: Draw): SparsePattern {
  const rows = Array.from({ length: d.n }, (_, i) => Array.from({ length: d.n }, (_, j) => j).filter((j) => d.keep[i * d.n + j] || i === j));
  return new SparsePattern(d.n, rows);
}

/** Values in the pattern's row order for one set; a chosen column is zeroed (a singular matrix). */
function values(p: SparsePattern, set: Draw['sets'][number], part: 're' | 'im'): Float64Array {
  const out = new Float64Array(p.nnz);
  for (let i = 0; i < p.n; i++) {
    for (let q = p.rowStart[i]!; q < p.rowStart[i + 1]!; q++) {
      const j = p.column[q]!;
      const v = set[part][i * p.n + j]! * set.scale + (part === 're' && i === j ? set.shift : 0);
      out[q] = j === set.zeroColumn ? 0 : v;
    }
  }
  return out;
}

const same = (a: Float64Array, b: Float64Array): boolean => a.every((v, i) => Object.is(v, b[i]));

describe('sparse LU: searches kept between factorizations', () => {
  it('real: every factorization in a sequence gives the bits of a fresh factorization of that matrix', () => {
    let reused = 0;
    let moved = 0;
    let failed = 0;
    fc.assert(
      fc.property(sequenceArb, (d) => {
        const draw = d as Draw;
        const analysis = new SparseLuAnalysis(patternOf(draw));
        const kept = new SparseLu(analysis);
        let lastOff = -1;
        for (const set of draw.sets) {
          const v = values(analysis.pattern, set, 're');
          const fresh = new SparseLu(analysis);
          const okFresh = fresh.factor(v);
          const okKept = kept.factor(v);
          expect(okKept).toBe(okFresh);
          if (!okFresh) {
            failed++;
            continue;
          }
          expect(kept.factorEntries()).toBe(fresh.factorEntries());
          expect(kept.offDiagonalPivots()).toBe(fresh.offDiagonalPivots());
          if (lastOff >= 0 && lastOff !== fresh.offDiagonalPivots()) moved++;
          lastOff = fresh.offDiagonalPivots();
          const x1 = Float64Array.from(draw.b.slice(0, draw.n));
          const x2 = Float64Array.from(x1);
          kept.solve(x1);
          fresh.solve(x2);
          expect(same(x1, x2)).toBe(true);
        }
        reused += kept.searchesReused;
      }),
      { numRuns: 300, seed: 20261205 },
    );
    // The property must have exercised all three paths.
    expect(reused).toBeGreaterThan(100);
    expect(moved).toBeGreaterThan(5);
    expect(failed).toBeGreaterThan(5);
  });

  it('complex: the same', () => {
    let reused = 0;
    fc.assert(
      fc.property(sequenceArb, (d) => {
        const draw = d as Draw;
        const analysis = new SparseLuAnalysis(patternOf(draw));
        const kept = new ComplexSparseLu(analysis);
        for (const set of draw.sets) {
          const re = values(analysis.pattern, set, 're');
          const im = values(analysis.pattern, set, 'im');
          const fresh = new ComplexSparseLu(analysis);
          const okFresh = fresh.factor(re, im);
          expect(kept.factor(re, im)).toBe(okFresh);
          if (!okFresh) continue;
          expect(kept.offDiagonalPivots()).toBe(fresh.offDiagonalPivots());
          const r1 = Float64Array.from(draw.b.slice(0, draw.n));
          const i1 = Float64Array.from(draw.b.slice(draw.n));
          const r2 = Float64Array.from(r1);
          const i2 = Float64Array.from(i1);
          kept.solve(r1, i1);
          fresh.solve(r2, i2);
          expect(same(r1, r2) && same(i1, i2)).toBe(true);
        }
        reused += kept.searchesReused;
      }),
      { numRuns: 200, seed: 20261206 },
    );
    expect(reused).toBeGreaterThan(100);
  });
});
