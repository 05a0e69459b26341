// Linear state-space files: shape checks with matrix names, CSV cell errors with row and column,
// the exact reference by matrix exponential, and the example chain against the catalogue's.
import { mkdtempSync, writeFileSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { loadProblemFile } from '../src/problems/load-file.js';
import { linearOscillatorChain } from '../problems/linear-oscillator-chain.js';

const dir = mkdtempSync(join(tmpdir(), 'sg-user-linear-'));
for (const f of ['bad-cell.csv', 'ragged.csv']) copyFileSync(join('test/fixtures/user', f), join(dir, f));

function write(name: string, lines: string[]): string {
  const path = join(dir, name);
  writeFileSync(path, lines.join('\n'));
  return path;
}

const BASE = ['id: lin', 'title: Lin', 'initial: [1, 0]', 'span: [0, 2]'];

describe('linear example chain equals the catalogue chain', () => {
  test('f, Jacobian, outputs and exact reference agree to 1e-14', async () => {
    const p = await loadProblemFile('examples/linear-chain.yaml');
    const c = linearOscillatorChain;
    expect(p.dimension).toBe(4);
    expect(p.y0).toEqual(c.y0);
    expect([p.t0, p.tEnd]).toEqual([c.t0, c.tEnd]);
    expect(p.reference.kind).toBe('exact');
    expect(p.separable).toBeUndefined();
    expect(p.separableReason).toMatch(/v1 depends on v1 itself/);
    const a = new Float64Array(4);
    const b = new Float64Array(4);
    const ja = new Float64Array(16);
    const jb = new Float64Array(16);
    let seed = 99;
    const rnd = (): number => ((seed = (seed * 48271) % 2147483647) / 2147483647) * 2 - 1;
    for (let k = 0; k < 50; k++) {
      const y = Float64Array.from({ length: 4 }, rnd);
      const t = 15 * (rnd() + 1);
      p.f(t, y, a);
      c.f(t, y, b);
      for (let i = 0; i < 4; i++) expect(Math.abs(a[i]! - b[i]!)).toBeLessThan(1e-14);
      p.jacobian!(t, y, ja);
      c.jacobian!(t, y, jb);
      expect(Array.from(ja)).toEqual(Array.from(jb));
    }
    for (const t of [0.5, 3, 7.25, 12, 30]) {
      p.reference.exact!(t, a);
      c.reference.exact!(t, b);
      for (let i = 0; i < 4; i++) expect(Math.abs(a[i]! - b[i]!)).toBeLessThan(1e-14);
    }
    const out = new Float64Array(2);
    p.outputs!.fn(1, Float64Array.of(0.25, -0.5, 3, 4), out);
    expect(Array.from(out)).toEqual([0.25, -0.5]);
    expect(p.outputs!.names).toEqual(['q1', 'q2']);
  });
});

describe('exact reference from input generators', () => {
  test('scalar x\' = -x + (poly + exp + cos) matches the hand-solved solution', async () => {
    // x' = -x + 1 + 2t + 3 e^{-2t} + cos(t), x(0) = 1. Hand-solved (variation of constants):
    // x = C e^{-t} + (2t - 1) - 3 e^{-2t} + (cos t + sin t)/2, C from x(0) = 1: C = 1 + 1 + 3 - 1/2 = 4.5.
    const path = write('scalar.yaml', [
      'id: scalar', 'title: Scalar', 'initial: [1]', 'span: [0, 3]',
      'linear: { A: [[-1]], B: [[1]] }',
      'inputs:', '  - [ { poly: [1, 2] }, { exp: { amplitude: 3, rate: -2 } }, { cos: { omega: 1 } } ]',
    ]);
    const p = await loadProblemFile(path);
    expect(p.reference.kind).toBe('exact');
    const out = new Float64Array(1);
    for (const t of [0.5, 1.7, 3]) {
      p.reference.exact!(t, out);
      const want = 4.5 * Math.exp(-t) + (2 * t - 1) - 3 * Math.exp(-2 * t) + (Math.cos(t) + Math.sin(t)) / 2;
      expect(Math.abs(out[0]! - want)).toBeLessThan(1e-13);
    }
    const dy = new Float64Array(1);
    p.f(2, Float64Array.of(0.3), dy);
    expect(dy[0]).toBeCloseTo(-0.3 + 1 + 4 + 3 * Math.exp(-4) + Math.cos(2), 14);
  });
  test('a damped sine input with growth and a start time away from zero', async () => {
    // x' = e^{-0.3 t} sin(2 t + 0.4), x(1) = 0: x(t) = integral from 1 to t (hand: antiderivative
    // F(s) = e^{-0.3 s} (-0.3 sin(2s+0.4) - 2 cos(2s+0.4)) / (0.09 + 4)).
    const path = write('damped-sine.yaml', [
      'id: ds', 'title: Ds', 'initial: [0]', 'span: [1, 4]',
      'linear: { A: [[0]], B: [[1]] }',
      'inputs:', '  - sin: { amplitude: 1, omega: 2, phase: 0.4, growth: -0.3 }',
    ]);
    const p = await loadProblemFile(path);
    const F = (s: number): number => (Math.exp(-0.3 * s) * (-0.3 * Math.sin(2 * s + 0.4) - 2 * Math.cos(2 * s + 0.4))) / 4.09;
    const out = new Float64Array(1);
    p.reference.exact!(3.5, out);
    expect(Math.abs(out[0]! - (F(3.5) - F(1)))).toBeLessThan(1e-14);
  });
  test('an input given as an expression of t leaves the reference to certification', async () => {
    const p = await loadProblemFile(write('expr.yaml', [...BASE, 'linear: { A: [[0, 1], [-1, 0]], B: [[0], [1]] }', 'inputs: [ "sin(t)^2" ]']));
    expect(p.reference).toEqual({ kind: 'certified', points: [] });
    const dy = new Float64Array(2);
    p.f(0.5, Float64Array.of(1, 2), dy);
    expect(Array.from(dy)).toEqual([2, -1 + Math.sin(0.5) ** 2]);
    // x' = v (A's first row is a single 1, no input): the second-order form the Nystrom pairs need.
    expect(p.separable).toEqual({ positions: [0], velocities: [1], secondOrder: true });
  });
  test('a position row scaled or driven by an input is separable but not second-order', async () => {
    const scaled = await loadProblemFile(write('scaled.yaml', [...BASE, 'linear: { A: [[0, 2], [-1, 0]], B: [[0], [1]] }', 'inputs: [ "sin(t)^2" ]']));
    expect(scaled.separable).toEqual({ positions: [0], velocities: [1] });
    const driven = await loadProblemFile(write('driven.yaml', [...BASE, 'linear: { A: [[0, 1], [-1, 0]], B: [[1], [1]] }', 'inputs: [ "1" ]']));
    expect(driven.separable?.secondOrder).toBeUndefined();
  });
});

describe('linear file errors', () => {
  const msg = async (path: string): Promise<string> => loadProblemFile(path).then(() => 'no error', (e: Error) => e.message);
  test('A not square', async () => {
    expect(await msg(write('a.yaml', [...BASE, 'linear: { A: [[1, 2, 3], [4, 5, 6]] }']))).toMatch(/linear\.A: must be square \(n x n, n = number of states\); got 2 x 3/);
  });
  test('B of the wrong shape names the expected n x m', async () => {
    expect(await msg(write('b.yaml', [...BASE, 'linear: { A: [[0, 1], [-1, 0]], B: [[0, 1], [1, 0]] }', 'inputs: [1]']))).toMatch(/linear\.B: must be 2 x 1 \(n x m: n = 2 states from A, m = 1 inputs\); got 2 x 2/);
  });
  test('C with the wrong number of columns, D of the wrong shape', async () => {
    expect(await msg(write('c.yaml', [...BASE, 'linear: { A: [[0, 1], [-1, 0]], C: [[1, 0, 0]] }']))).toMatch(/linear\.C: must have 2 columns/);
    expect(await msg(write('d.yaml', [...BASE, 'linear: { A: [[0, 1], [-1, 0]], B: [[0], [1]], C: [[1, 0]], D: [[1, 2]] }', 'inputs: [1]']))).toMatch(/linear\.D: must be 1 x 1 \(p x m: p = 1 outputs from C, m = 1 inputs\); got 1 x 2/);
  });
  test('ragged inline rows', async () => {
    expect(await msg(write('r.yaml', [...BASE, 'linear: { A: [[0, 1], [-1]] }']))).toMatch(/linear\.A\[1\]: row 2 has 1 entries, row 1 has 2/);
  });
  test('non-numeric CSV cell names file, row and column', async () => {
    const m = await msg(write('csv.yaml', [...BASE, 'linear: { A: bad-cell.csv }']));
    expect(m).toContain(join(dir, 'bad-cell.csv'));
    expect(m).toMatch(/row 2, column 2: 'x' is not a number \(matrix linear\.A\)/);
  });
  test('ragged CSV', async () => {
    const m = await msg(write('rag.yaml', [...BASE, 'linear: { A: ragged.csv }']));
    expect(m).toMatch(/ragged\.csv: row 2 has 1 cells, row 1 has 2 \(ragged matrix for linear\.A\)/);
  });
  test('initial of the wrong length, missing CSV', async () => {
    expect(await msg(write('i.yaml', ['id: lin', 'title: Lin', 'initial: [1]', 'span: [0, 2]', 'linear: { A: [[0, 1], [-1, 0]] }']))).toMatch(/initial: has 1 values; the model has 2 states \(x1, x2\)/);
    expect(await msg(write('m.yaml', [...BASE, 'linear: { A: nowhere.csv }']))).toMatch(/linear\.A: cannot read matrix file nowhere\.csv \(ENOENT\)/);
  });
});
