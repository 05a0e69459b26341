// Compiled problem files against the catalogue's hand-written right-hand sides and Jacobians on
// random states: the same arithmetic, so equal to the last bit or within a few ulps (the
// compiler may associate products differently).
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { loadProblemFile } from '../src/problems/load-file.js';
import { vanDerPol } from '../problems/van-der-pol.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';
import type { Problem } from '../src/core/types.js';

const dir = join(import.meta.dirname, 'fixtures', 'catalogue-as-files');

/** A small deterministic generator (common practice, no source: a linear congruential step). */
function random(seed: number): () => number {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

function ulpsApart(a: number, b: number): number {
  if (a === b) return 0;
  const scale = Math.max(Math.abs(a), Math.abs(b));
  return Math.abs(a - b) / (scale * Number.EPSILON);
}

function compare(file: Problem, hand: Problem, makeState: (r: () => number) => number[], ulps: number): void {
  const n = hand.dimension;
  const r = random(12345);
  const y = new Float64Array(n);
  const a = new Float64Array(n);
  const b = new Float64Array(n);
  const ja = new Float64Array(n * n);
  const jb = new Float64Array(n * n);
  expect(file.y0.map((v, i) => ulpsApart(v, hand.y0[i]!))).toEqual(hand.y0.map(() => 0));
  for (let k = 0; k < 200; k++) {
    y.set(makeState(r));
    const t = 20 * r();
    file.f(t, y, a);
    hand.f(t, y, b);
    for (let i = 0; i < n; i++) expect(ulpsApart(a[i]!, b[i]!)).toBeLessThanOrEqual(ulps);
    file.jacobian!(t, y, ja);
    hand.jacobian!(t, y, jb);
    // Jacobian entries: allow a little more, symbolic differentiation may reorder terms.
    for (let i = 0; i < n * n; i++) expect(Math.abs(ja[i]! - jb[i]!)).toBeLessThanOrEqual(8 * Number.EPSILON * Math.max(1, Math.abs(jb[i]!)));
  }
}

describe('compiled files vs hand-written catalogue functions', () => {
  it('van der Pol', async () => {
    const p = await loadProblemFile(join(dir, 'van-der-pol.yaml'));
    compare(p, vanDerPol, (r) => [4 * r() - 2, 6 * r() - 3], 2);
  });
  it('Kepler, e = 0.6', async () => {
    const p = await loadProblemFile(join(dir, 'kepler.yaml'));
    expect(p.separable).toBeDefined();
    compare(p, keplerEccentric, (r) => [0.5 + r(), r() - 0.5, r() - 0.5, 2 * r() - 1], 4);
  });
});
