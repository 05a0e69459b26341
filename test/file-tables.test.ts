// Tables in problem files: the drag model written as a file (vectors, a CSV table, log-linear)
// has the catalogue's right-hand side and Jacobian (problems/decaying-orbit-drag.ts, written by
// hand); the file's symbolic Jacobian takes the interpolant's exact slope (centred differences of
// f agree away from breakpoints, common practice, no source); a table of t offers its breakpoints
// as check times; bad tables are refused with the field named.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadProblemFile } from '../src/problems/load-file.js';
import { findProblem } from '../problems/index.js';

const here = (p: string) => join(import.meta.dirname, '..', p);

describe('tables in problem files', () => {
  it('decaying-orbit-drag as a file: same f and Jacobian as the catalogue problem', async () => {
    const file = await loadProblemFile(here('examples/decaying-orbit-drag.yaml'));
    const cat = findProblem('decaying-orbit-drag')!;
    expect(file.jacobianSource).toBe('symbolic');
    for (let i = 0; i < 6; i++) expect(file.y0[i]!).toBeCloseTo(cat.y0[i]!, 6);
    const n = 6;
    const [ff, fc] = [new Float64Array(n), new Float64Array(n)];
    const [jf, jc] = [new Float64Array(n * n), new Float64Array(n * n)];
    // Altitudes 150-420 km, off the breakpoints.
    for (const [alt, speed] of [[163e3, 7800], [210e3, 7780], [237e3, 7760], [311e3, 7720], [418e3, 7670]] as const) {
      const r = 6378137 + alt;
      const y = Float64Array.from([r * 0.6, r * 0.48, r * 0.64, -speed * 0.5, speed * 0.7, speed * 0.1]);
      const rn = Math.hypot(y[0]!, y[1]!, y[2]!);
      for (let k = 0; k < 3; k++) y[k] = (y[k]! * r) / rn;
      file.f(0, y, ff);
      cat.f(0, y, fc);
      for (let i = 0; i < n; i++) expect(Math.abs(ff[i]! - fc[i]!)).toBeLessThanOrEqual(1e-14 * Math.max(1, Math.abs(fc[i]!)));
      file.jacobian!(0, y, jf);
      cat.jacobian!(0, y, jc);
      for (let k = 0; k < n * n; k++) expect(Math.abs(jf[k]! - jc[k]!), `J[${Math.floor(k / n)}][${k % n}] at ${alt}`).toBeLessThanOrEqual(1e-12 * Math.max(1e-6, Math.abs(jc[k]!)));
    }
  });

  it('monotone cubic table of t: the Jacobian is exact for the interpolant and breakpoints become check times', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sg-tab-'));
    try {
      const file = join(dir, 'thrust.yaml');
      writeFileSync(
        file,
        [
          'id: thrust-table', 'title: mass on a spring pushed by a tabulated force', 'states: [q, p]',
          'tables:', '  force: { x: [0, 0.3, 0.7, 1.2, 2], y: [0, 1.5, 1.8, 0.4, 0], interpolation: monotone-cubic, nonSmoothTimes: true }',
          '  stiffness: { x: [-2, 0, 2], y: [3, 1, 3], interpolation: monotone-cubic }',
          'equations:', '  q: p', '  p: -stiffness(q) * q + force(t) * (1 + q^2)',
          'initial: { q: 0.1, p: 0 }', 'span: [0, 2]', 'checkTimes: [1]',
        ].join('\n'),
      );
      const p = await loadProblemFile(file);
      expect(p.jacobianSource).toBe('symbolic');
      expect(p.checkTimes).toEqual([0.3, 0.7, 1, 1.2]);
      const jac = new Float64Array(4);
      const f0 = new Float64Array(2);
      const f1 = new Float64Array(2);
      for (const [t, q] of [[0.1, 0.4], [0.5, -0.7], [1.5, 1.3], [1.9, -1.6]] as const) {
        const y = Float64Array.from([q, 0.2]);
        p.jacobian!(t, y, jac);
        const h = 1e-6;
        p.f(t, Float64Array.from([q + h, 0.2]), f1);
        p.f(t, Float64Array.from([q - h, 0.2]), f0);
        expect(jac[2]!).toBeCloseTo((f1[1]! - f0[1]!) / (2 * h), 7);
        expect(jac[3]).toBe(0);
        expect(jac[1]).toBe(1);
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('refuses a bad table with the field named', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sg-tab-'));
    try {
      const file = join(dir, 'bad.yaml');
      const base = ['id: bad', 'title: t', 'states: [q]', 'equations: { q: -g(q) }', 'initial: { q: 1 }', 'span: [0, 1]'];
      writeFileSync(file, [...base, 'tables:', '  g: { x: [0, 1, 1], y: [0, 1, 2] }'].join('\n'));
      await expect(loadProblemFile(file)).rejects.toThrow(/tables\.g.*increase strictly/);
      writeFileSync(file, [...base, 'tables:', '  g: { x: [1, 2], y: [0, 1], interpolation: log-linear }'].join('\n'));
      await expect(loadProblemFile(file)).rejects.toThrow(/tables\.g.*y > 0/);
      writeFileSync(file, [...base, 'tables:', '  g: { csv: missing.csv }'].join('\n'));
      await expect(loadProblemFile(file)).rejects.toThrow(/tables\.g\.csv.*cannot read/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
