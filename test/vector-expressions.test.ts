// Vector expressions in problem files: the J2 orbit written with vectors has the same right-hand
// side (to round-off) and the same Jacobian as the scalar form, and both agree with the
// catalogue's hand-written leo-j2 (problems/leo-j2.ts); the Jacobians also match centred
// differences of f (common practice, no source). Misuse is refused with the field named.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadProblemFile } from '../src/problems/load-file.js';
import { findProblem } from '../problems/index.js';

const here = (p: string) => join(import.meta.dirname, '..', p);

/** Deterministic states near the orbit (common practice, no source). */
function states(y0: readonly number[]): Float64Array[] {
  const out: Float64Array[] = [];
  let s = 7;
  const rand = () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0), s / 2 ** 32);
  for (let k = 0; k < 20; k++) out.push(Float64Array.from(y0, (v) => v * (1 + 0.3 * (rand() - 0.5)) + 1e5 * (rand() - 0.5) * (Math.abs(v) > 1e4 ? 1 : 0.01)));
  return out;
}

describe('vector expressions', () => {
  it('J2 with vectors: same f and Jacobian as the scalar file and the catalogue, to round-off', async () => {
    const vec = await loadProblemFile(here('examples/leo-j2-vectors.yaml'));
    const sca = await loadProblemFile(here('examples/leo-j2-scalar.yaml'));
    const cat = findProblem('leo-j2')!;
    expect(vec.jacobianSource).toBe('symbolic');
    expect(sca.jacobianSource).toBe('symbolic');
    expect(vec.y0).toEqual(cat.y0);
    const n = 6;
    const [fv, fs, fc] = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
    const [jv, js, jc] = [new Float64Array(n * n), new Float64Array(n * n), new Float64Array(n * n)];
    for (const y of states(cat.y0)) {
      vec.f(0, y, fv);
      sca.f(0, y, fs);
      cat.f(0, y, fc);
      for (let i = 0; i < n; i++) {
        const size = Math.abs(fc[i]!) + 1e-300;
        expect(Math.abs(fv[i]! - fs[i]!) / size).toBeLessThan(1e-14);
        expect(Math.abs(fv[i]! - fc[i]!) / size).toBeLessThan(1e-14);
      }
      vec.jacobian!(0, y, jv);
      sca.jacobian!(0, y, js);
      cat.jacobian!(0, y, jc);
      let big = 0;
      for (let k = 0; k < n * n; k++) if (k % n < 3 && k >= 3 * n) big = Math.max(big, Math.abs(jc[k]!));
      for (let k = 0; k < n * n; k++) {
        expect(Math.abs(jv[k]! - js[k]!), `J[${Math.floor(k / n)}][${k % n}]`).toBeLessThan(1e-13 * Math.max(big, Math.abs(jc[k]!)));
        expect(Math.abs(jv[k]! - jc[k]!), `J[${Math.floor(k / n)}][${k % n}]`).toBeLessThan(1e-13 * Math.max(big, Math.abs(jc[k]!)));
      }
    }
    const y = Float64Array.from(cat.y0);
    for (const name of ['energy', 'angular-momentum-z']) {
      const a = vec.invariants.find((i) => i.name === name)!.fn(0, y);
      const b = cat.invariants.find((i) => i.name === name)!.fn(0, y);
      expect(Math.abs(a - b) / Math.abs(b)).toBeLessThan(1e-14);
    }
  });

  it('cross and dot: h = r x v written with vectors equals the components written out', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sg-vec-'));
    try {
      const file = join(dir, 'p.yaml');
      writeFileSync(
        file,
        [
          'id: cross-check', 'title: t', 'states: [x, y, z, vx, vy, vz]', 'vectors: { r: [x, y, z], v: [vx, vy, vz] }',
          'definitions:', '  h: cross(r, v)', 'equations:', '  r: v', '  v: -r / norm(r)^3',
          'initial: { x: 1, y: 0, z: 0, vx: 0, vy: 1, vz: 0.1 }', 'span: [0, 1]',
          'invariants:', '  hz: h_3', '  h2: dot(h, h)', '  rv: dot(r, v) - 2 * x * vx / 2',
        ].join('\n'),
      );
      const p = await loadProblemFile(file);
      const y = Float64Array.from([0.3, -1.2, 0.7, 0.4, 0.5, -0.9]);
      const [x, yy, z, vx, vy, vz] = y as unknown as number[];
      const h = [yy! * vz! - z! * vy!, z! * vx! - x! * vz!, x! * vy! - yy! * vx!];
      const inv = (name: string) => p.invariants.find((i) => i.name === name)!.fn(0, y);
      expect(inv('hz')).toBeCloseTo(h[2]!, 15);
      expect(inv('h2')).toBeCloseTo(h[0]! ** 2 + h[1]! ** 2 + h[2]! ** 2, 14);
      expect(inv('rv')).toBeCloseTo(yy! * vy! + z! * vz!, 15);
      const dy = new Float64Array(6);
      p.f(0, y, dy);
      const r3 = Math.hypot(x!, yy!, z!) ** 3;
      expect(Array.from(dy)).toEqual([vx, vy, vz, -x! / r3, -yy! / r3, -z! / r3].map((v) => expect.closeTo(v, 14)));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('refuses vector misuse with the file, line and field named', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sg-vec-'));
    try {
      const base = ['id: bad', 'title: t', 'states: [x, y, vx, vy]', 'vectors: { r: [x, y], v: [vx, vy] }', 'initial: { x: 1, y: 0, vx: 0, vy: 1 }', 'span: [0, 1]'];
      const cases: [string[], RegExp][] = [
        [['equations:', '  r: v', '  v: r * v'], /p.yaml:9:6: equations\.v.*use dot\(u, w\) or cross/],
        [['equations:', '  r: v', '  v: r + 1'], /equations\.v.*between a vector and a number/],
        [['equations:', '  r: v', '  vx: r', '  vy: 0'], /equations\.vx.*one state; its equation is a vector/],
        [['equations:', '  r: v', '  v: cross(r, v)'], /equations\.v.*length 3/],
      ];
      for (const [lines, want] of cases) {
        const file = join(dir, 'p.yaml');
        writeFileSync(file, [...base, ...lines].join('\n'));
        await expect(loadProblemFile(file)).rejects.toThrow(want);
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
