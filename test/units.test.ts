// Scale-aware step control: the same orbit in kilometres and in metres (positions and velocities
// times 1000, mu times 1e9) gives the same relative accuracy at the same rtol when atol is given in
// the model's own units (atolScale). In exact arithmetic the step sequences coincide, since every
// weight atol_i + rtol |y_i| scales with the state (Hairer, Norsett and Wanner, Solving ODEs I,
// sec. II.4, the error norm).
import { describe, expect, it } from 'vitest';
import type { Problem } from '../src/core/types.js';
import { measureRun } from '../src/measure/run-one.js';
import { findMethod } from '../src/methods/registry.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';

const S = 1000;

function inMetres(p: Problem): Problem {
  const n = p.dimension;
  const inner = new Float64Array(n);
  const dInner = new Float64Array(n);
  return {
    ...p,
    id: `${p.id}-metres`,
    y0: p.y0.map((v) => v * S),
    f: (t, y, dy) => {
      for (let i = 0; i < n; i++) inner[i] = y[i]! / S;
      p.f(t, inner, dInner);
      for (let i = 0; i < n; i++) dy[i] = dInner[i]! * S;
    },
    // d(S f(y / S))/dy = J(y / S): the Jacobian is unit-free.
    jacobian: (t, y, jac) => {
      for (let i = 0; i < n; i++) inner[i] = y[i]! / S;
      p.jacobian!(t, inner, jac);
    },
    invariants: [],
    reference: { kind: 'exact', exact: (t, out) => { p.reference.exact!(t, out); for (let i = 0; i < n; i++) out[i]! *= S; } },
    atolScale: S,
    definition: `${p.definition}\nunits: metres`,
  };
}

describe('units', () => {
  for (const id of ['dormand-prince-54', 'dormand-prince-853', 'radau-iia-5']) {
    it(`${id}: same relative accuracy and work in kilometres and metres`, () => {
      const m = findMethod(id)!;
      const km = measureRun(keplerEccentric, m, { rtol: 1e-8, atol: 1e-8 }, { maxSteps: 1e6 });
      const metres = measureRun(inMetres(keplerEccentric), m, { rtol: 1e-8, atol: 1e-8 * S }, { maxSteps: 1e6 });
      expect(km.status).toBe('ok');
      expect(metres.status).toBe('ok');
      // Work within 2% (roundoff can flip an accept/reject decision near the threshold).
      expect(Math.abs(metres.counts.nfev - km.counts.nfev) / km.counts.nfev).toBeLessThan(0.02);
      const relKm = km.error.final!;
      const relM = metres.error.final! / S;
      expect(Math.abs(relM - relKm) / relKm).toBeLessThan(0.05);
    });
  }
});
