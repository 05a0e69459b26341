// Problem and method modules: bundling with relative imports, the 'stepgauge' self-import,
// refusal of modules that export neither, and the example Heun method's measured order.
import { describe, expect, test } from 'vitest';
import { loadMethodModule, loadModule, loadProblemModule } from '../src/authoring/module-loader.js';
import { defineProblem } from '../src/authoring/define-problem.js';
import { defineMethod } from '../src/authoring/define-method.js';

describe('problem modules', () => {
  test('a .ts module with a relative import and `import from stepgauge` loads', async () => {
    const p = await loadProblemModule('test/fixtures/user/growth-module.ts');
    expect(p.id).toBe('fixture-growth');
    const dy = new Float64Array(1);
    p.f(0, Float64Array.of(2), dy);
    expect(dy[0]).toBe(-1); // RATE * y = -0.5 * 2 from the helper file
    expect(p.checkTimes).toEqual([]);
    expect(p.errorScale).toEqual({ kind: 'absolute' });
    expect(p.stiff).toBe(false);
    expect(p.definition).toMatch(/module-sources-sha256: [0-9a-f]{64}$/);
  });
  test('the orbit-raise example: circular start, thrust along the velocity', async () => {
    const p = await loadProblemModule('examples/orbit-raise.ts');
    expect(p.reference.kind).toBe('certified');
    const dy = new Float64Array(4);
    p.f(0, Float64Array.from(p.y0), dy);
    // Hand: at (1, 0, 0, 1) gravity is (-1, 0), thrust 0.01 along (0, 1).
    expect(Array.from(dy)).toEqual([0, 1, -1, 0.01]);
  });
  test('a module exporting neither a problem nor a method is refused, naming the file', async () => {
    await expect(loadModule('test/fixtures/user/not-a-problem.ts')).rejects.toThrow(/not-a-problem\.ts: exports neither a problem nor a method/);
  });
  test('a plain object export is refused: not made with defineProblem', async () => {
    await expect(loadModule('test/fixtures/user/plain-object.ts')).rejects.toThrow(/plain-object\.ts: the export `problem` was not made with defineProblem/);
  });
  test('asking for a method from a problem module says so', async () => {
    await expect(loadMethodModule('test/fixtures/user/growth-module.ts')).rejects.toThrow(/exports a problem, not a method/);
  });
  test('missing file and wrong extension', async () => {
    await expect(loadModule('test/fixtures/user/nowhere.ts')).rejects.toThrow(/nowhere\.ts: module file not found/);
    await expect(loadModule('test/fixtures/user/bad-cell.csv')).rejects.toThrow(/a module must end in/);
  });
});

describe('method modules', () => {
  test('my-heun: second order on y\' = -y (error ratio 4 per halving)', async () => {
    const heun = await loadMethodModule('examples/my-heun.ts');
    expect([heun.id, heun.family, heun.order, heun.adaptive]).toEqual(['heun-2', 'fixed-step', 2, false]);
    const decay = defineProblem({
      id: 'decay', title: 'Decay', source: "y' = -y, y = e^{-t} (hand-solved)", y0: [1], span: [0, 1],
      f: (_t, y, dy) => { dy[0] = -y[0]!; },
    });
    const errors = [20, 40, 80].map((steps) => {
      const r = heun.solve(decay, { steps }, { maxSteps: 1000 });
      expect(r.status).toBe('ok');
      expect(r.counts.nfev).toBe(2 * steps);
      expect(r.counts.accepted).toBe(steps);
      return Math.abs(r.yFinal[0]! - Math.exp(-1));
    });
    // One step of Heun on y' = -y multiplies by 1 - h + h^2/2 (hand-derived); check exactly.
    const r20 = heun.solve(decay, { steps: 20 }, { maxSteps: 1000 });
    expect(r20.yFinal[0]).toBeCloseTo((1 - 0.05 + 0.05 ** 2 / 2) ** 20, 14);
    const order = Math.log2(errors[1]! / errors[2]!);
    expect(order).toBeGreaterThan(1.95);
    expect(order).toBeLessThan(2.05);
  });
});

describe('defineProblem and defineMethod validate', () => {
  const base = { id: 'ok', title: 'Ok', source: 's', y0: [1], span: [0, 1] as [number, number], f: (_t: number, _y: Float64Array, dy: Float64Array) => { dy[0] = 1; } };
  test('bad fields are InputErrors naming the problem', () => {
    expect(() => defineProblem({ ...base, id: 'Not Kebab' })).toThrow(/defineProblem\(Not Kebab\): id must be kebab-case/);
    expect(() => defineProblem({ ...base, span: [1, 1] })).toThrow(/defineProblem\(ok\): span \[1, 1\] is empty/);
    expect(() => defineProblem({ ...base, f: (_t, _y, dy) => { dy[0] = NaN; } })).toThrow(/non-finite derivative for component 0/);
    expect(() => defineProblem({ ...base, checkTimes: [2] })).toThrow(/check time 2 is outside the span/);
  });
  test('defineMethod checks what a method says about itself', () => {
    const m = { id: 'm', name: 'M', family: 'fixed-step' as const, order: 2, source: 's', adaptive: false, stiff: false, solve: () => { throw new Error('unused'); } };
    expect(defineMethod(m).id).toBe('m');
    expect(() => defineMethod({ ...m, family: 'magic' as never })).toThrow(/family must be one of/);
    expect(() => defineMethod({ ...m, order: 0 })).toThrow(/order must be a positive integer/);
    expect(() => defineMethod({ ...m, solve: 3 as never })).toThrow(/solve must be a function/);
    expect(() => defineMethod({ ...m, stepGrowth: 0 })).toThrow(/stepGrowth must be a number in \(0, 1\]/);
    expect(defineMethod({ ...m, stepGrowth: 0.5 }).stepGrowth).toBe(0.5);
  });
});
