// Every `choose` recommendation on the catalogue, rerun at its setting, meets the target against
// a reference independent of the one choose used: odex (E. Hairer and G. Wanner's ODEX, the npm
// port, an implementation not shared with stepgauge's integrators) at rtol = atol = 1e-14 for the
// non-stiff problems, the Test Set's published end states for the stiff ones.
import { describe, expect, it } from 'vitest';
import { catalogue } from '../problems/index.js';
import { findMethod } from '../src/methods/registry.js';
import { odexMethod } from '../src/methods/external/odex.js';
import { measureRun } from '../src/measure/run-one.js';
import { errorMeter } from '../src/measure/error-norm.js';
import { chooseMethod } from '../src/sweep/choose.js';
import { DEFAULT_TIMING } from '../src/core/defaults.js';
import type { Problem, Setting } from '../src/core/types.js';

const TARGET = 1e-6;

/** Test Set for IVP Solvers (Mazzia and Magherini): ROBER at t = 1e11, VDPOL rescaled to t = 2000. */
const PUBLISHED: Record<string, number[]> = {
  robertson: [0.2083340149701255e-7, 0.8333360770334713e-13, 0.9999999791665050],
  'van-der-pol-stiff': [1.706167732170469, -0.8928097010248125e-3],
};

function independentEnd(p: Problem): Float64Array {
  const published = PUBLISHED[p.id];
  if (published) return Float64Array.from(published);
  const r = odexMethod.solve(p, { rtol: 1e-14, atol: 1e-14 }, { maxSteps: 1e7 });
  expect(r.status).toBe('ok');
  return r.yFinal;
}

describe(`choose on every catalogue problem, target ${TARGET} (final)`, () => {
  it.each(catalogue.map((p) => [p.id, p] as const))('%s: the recommendation meets the target against an independent reference', async (_id, p) => {
    const methods = (p.stiff ? ['radau-iia-5', 'hairer-wanner-rodas4'] : ['dormand-prince-54', 'rk4']).map((m) => findMethod(m)!);
    const choice = await chooseMethod(p, methods, { target: TARGET, measure: 'final', cost: 'nfev', timing: DEFAULT_TIMING, maxSteps: 1_000_000 });
    const rec = choice.recommended;
    expect(rec, `${p.id}: ${choice.candidates.map((c) => `${c.method}: ${c.note ?? c.achieved}`).join('; ')}`).not.toBeNull();
    const setting = rec!.run!.setting as Setting;
    const rerun = measureRun(p, findMethod(rec!.method)!, 'rtol' in setting ? { rtol: setting.rtol, atol: setting.atol } : { steps: setting.steps }, { maxSteps: 1_000_000 });
    const ref = independentEnd(p);
    const err = errorMeter(p).error(p.tEnd, Float64Array.from(rerun.yFinal), ref);
    expect(err).toBeLessThanOrEqual(TARGET);
  }, 120_000);
});
