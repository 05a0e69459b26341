// Every problem a sweep solves has one object layout (src/problems/uniform.ts), so the solvers'
// optimised code is not thrown away for each new kind of problem object. The layout is checked
// by its field names and their order (V8 gives objects built with the same fields in the same
// order the same hidden class; common practice, no source); the values must be the problem's own.
import { describe, expect, it } from 'vitest';
import { catalogue } from '../problems/index.js';
import { harmonicOscillator } from '../problems/harmonic-oscillator.js';
import { robertson } from '../problems/robertson.js';
import { resolveProblems } from '../src/sweep/resolve.js';
import { reversedProblem } from '../src/measure/round-trip.js';
import type { Problem } from '../src/core/types.js';

describe('uniform problem layout', () => {
  it('gives the catalogue, problem files, modules and reversed problems one layout', async () => {
    const files = await resolveProblems(
      ['examples/crane-payload-swing.yaml', 'examples/linear-chain.yaml', 'examples/orbit-raise.ts', 'test/fixtures/user/growth-module.ts'].join(','),
    );
    const all = [...catalogue, ...files.items, reversedProblem(catalogue[0]!, [1, 0])];
    const [first] = all;
    for (const p of all) {
      expect(Object.keys(p), p.id).toEqual(Object.keys(first!));
      expect(Object.keys(p.reference), p.id).toEqual(Object.keys(first!.reference));
      expect(Object.keys(p.errorScale), p.id).toEqual(Object.keys(first!.errorScale));
      for (const inv of p.invariants) expect(Object.keys(inv), p.id).toEqual(['name', 'fn']);
    }
  });

  it('keeps every value of the problem as written', () => {
    for (const [written, held] of [
      [harmonicOscillator, catalogue.find((p) => p.id === 'harmonic-oscillator')!],
      [robertson, catalogue.find((p) => p.id === 'robertson')!],
    ] as const) {
      for (const [key, value] of Object.entries(written)) {
        if (key === 'reference' || key === 'errorScale' || key === 'invariants') continue;
        expect(held[key as keyof Problem], key).toBe(value);
      }
      for (const [key, value] of Object.entries(written.reference)) expect(held.reference[key as keyof Problem['reference']], key).toBe(value);
      expect(held.errorScale).toMatchObject(written.errorScale);
      expect(held.invariants.map((i) => [i.name, i.fn])).toEqual(written.invariants.map((i) => [i.name, i.fn]));
      // Fields the written problem leaves out are present but undefined.
      for (const key of Object.keys(held)) if (!(key in written)) expect(held[key as keyof Problem], key).toBeUndefined();
    }
  });
});
