// Every `choose` recommendation on the catalogue, rerun at its setting, meets the target against
// a reference independent of the one choose used: odex (E. Hairer and G. Wanner's ODEX, the npm
// port, an implementation not shared with stepgauge's integrators) at rtol = atol = 1e-14 for the
// non-stiff problems, with its own uncertainty taken as its distance from odex at 1e-13; the Test
// Set's published end states for the stiff ones. Targets are 1e-6 of the problem's largest initial
// component (at least 1e-6): metres on the orbit problems, where 1e-6 m is below what any double-
// precision reference confirms.
import { describe, expect, it } from 'vitest';
import { catalogue } from '../problems/index.js';
import { findMethod } from '../src/methods/registry.js';
import { odexMethod } from '../src/methods/external/odex.js';
import { measureRun } from '../src/measure/run-one.js';
import { errorMeter } from '../src/measure/error-norm.js';
import { chooseMethod } from '../src/sweep/choose.js';
import { DEFAULT_TIMING } from '../src/core/defaults.js';
import { withCertifiedReference } from '../src/measure/certify.js';
import { useTempCache } from './helpers/temp-cache.js';
import type { Problem, Setting } from '../src/core/types.js';

useTempCache('sg-choose-cat-');

const targetOf = (p: Problem) => 1e-6 * Math.max(1, ...p.y0.map(Math.abs));

/** Test Set for IVP Solvers (Mazzia and Magherini): ROBER at t = 1e11, VDPOL rescaled to t = 2000. */
const PUBLISHED: Record<string, number[]> = {
  robertson: [0.2083340149701255e-7, 0.8333360770334713e-13, 0.9999999791665050],
  'van-der-pol-stiff': [1.706167732170469, -0.8928097010248125e-3],
};

/** The independent end state and its uncertainty in the problem's error measure. */
function independentEnd(p: Problem): { y: Float64Array; uncertainty: number } {
  const published = PUBLISHED[p.id];
  if (published) return { y: Float64Array.from(published), uncertainty: 0 };
  const fine = odexMethod.solve(p, { rtol: 1e-14, atol: 1e-14 }, { maxSteps: 1e7 });
  const coarse = odexMethod.solve(p, { rtol: 1e-13, atol: 1e-13 }, { maxSteps: 1e7 });
  expect(fine.status).toBe('ok');
  return { y: fine.yFinal, uncertainty: errorMeter(p).error(p.tEnd, coarse.yFinal, fine.yFinal) };
}

describe('choose on every catalogue problem (final error)', () => {
  // brusselator-1d (1000 stiff states) is left out: odex, the independent reference here, is
  // explicit and would take minutes on it; test/catalogue-brusselator.test.ts checks its reference
  // against a method that did not certify it.
  it.each(catalogue.filter((p) => p.id !== 'brusselator-1d').map((p) => [p.id, p] as const))('%s: the recommendation meets the target against an independent reference', async (_id, given) => {
    const p = withCertifiedReference(given);
    const TARGET = targetOf(p);
    const methods = (p.stiff ? ['radau-iia-5', 'hairer-wanner-rodas4'] : ['dormand-prince-54', 'rk4']).map((m) => findMethod(m)!);
    const choice = await chooseMethod(p, methods, { target: TARGET, measure: 'final', cost: 'nfev', timing: DEFAULT_TIMING, maxSteps: 200_000 });
    const rec = choice.recommended;
    expect(rec, `${p.id}: ${choice.candidates.map((c) => `${c.method}: ${c.note ?? c.achieved}`).join('; ')}`).not.toBeNull();
    const setting = rec!.run!.setting as Setting;
    const rerun = measureRun(p, findMethod(rec!.method)!, 'rtol' in setting ? { rtol: setting.rtol, atol: setting.atol } : { steps: setting.steps }, { maxSteps: 1_000_000 });
    const ref = independentEnd(p);
    const err = errorMeter(p).error(p.tEnd, Float64Array.from(rerun.yFinal), ref.y);
    expect(err).toBeLessThanOrEqual(TARGET + ref.uncertainty);
  }, 120_000);
});
