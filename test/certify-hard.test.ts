// Certification that is hard to fool: a 2-second push in a 1000-second span that the natural
// steps of every unbounded certifying run skip, and a chaotic span no double-precision
// computation can follow. Either a certificate that agrees with the answer within its stated
// trust, or none: then a warning, no error numbers, and choose refuses.
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { useTempCache } from './helpers/temp-cache.js';
import { runCli } from './helpers/cli.js';
import { loadUserProblem } from '../src/sweep/user-files.js';
import { withCertifiedReference } from '../src/measure/certify.js';
import { measureRun } from '../src/measure/run-one.js';
import { findMethod } from '../src/methods/registry.js';
import { chooseMethod } from '../src/sweep/choose.js';
import { DEFAULT_TIMING } from '../src/core/defaults.js';

const HARD = join(import.meta.dirname, 'fixtures', 'hard');
useTempCache('sg-cert-');

describe('a short pulse (0.2% of the span) from rest', () => {
  it('gets a certificate agreeing with x(1000) = 998 within its trust, or none; no run that missed the pulse shows a small error', async () => {
    const p = withCertifiedReference(await loadUserProblem(join(HARD, 'short-pulse.ts')));
    const end = p.reference.points?.find((q) => q.t === 1000);
    if (end) {
      // Hand-solved: x(1000) = 2 (1000 - 501) = 998, v = 2.
      const trust = 10 ** -(p.reference.digits ?? 0) * 998;
      expect(Math.abs(end.y[0]! - 998)).toBeLessThanOrEqual(trust);
      expect(Math.abs(end.y[1]! - 2)).toBeLessThanOrEqual(trust);
    } else {
      expect(p.reference.untrusted ?? p.reference.unavailable).toMatch(/no reference|could not certify/);
    }
    // Runs coarse enough to miss the pulse: either their large error is shown or none at all.
    for (const [id, setting] of [['euler', { steps: 1 }], ['dormand-prince-54', { rtol: 1e-3, atol: 1e-3 }], ['dormand-prince-853', { rtol: 1e-6, atol: 1e-6 }]] as const) {
      const run = measureRun(p, findMethod(id)!, setting, { maxSteps: 1e6 });
      const missed = Math.abs(run.yFinal[0]! - 998) > 1;
      if (missed && run.error.final !== null) expect(run.error.final).toBeGreaterThan(1);
    }
    const choice = await chooseMethod(p, ['euler', 'dormand-prince-54'].map((m) => findMethod(m)!), {
      target: 1e-6, measure: 'final', cost: 'nfev', timing: DEFAULT_TIMING, maxSteps: 200_000,
    });
    if (choice.recommended) {
      // Anything recommended must really be within the target of the hand-solved answer.
      const y = choice.recommended.run!.yFinal;
      expect(Math.abs(y[0]! - 998)).toBeLessThanOrEqual(1e-6 + 10 ** -(p.reference.digits ?? 0) * 998);
    }
  });
});

describe('Lorenz on [0, 50] (chaotic)', () => {
  it('is no reference: a warning, errors null, choose refuses', async () => {
    const r = await runCli(['choose', '-p', join(HARD, 'lorenz-50.ts'), '--target', '1e-6', '-m', 'dormand-prince-54', '--cost', 'nfev']);
    expect(r.stdout + r.stderr).toMatch(/warning: no reference for lorenz-50: the certifying runs .* agree to 0 digits/);
    expect(r.stdout).toMatch(/choose refuses/);
    expect(r.code).toBe(1);
    const p = withCertifiedReference(await loadUserProblem(join(HARD, 'lorenz-50.ts')));
    const run = measureRun(p, findMethod('dormand-prince-54')!, { rtol: 1e-8, atol: 1e-8 }, { maxSteps: 1e6 });
    expect(run.error).toEqual({ final: null, max: null });
    expect(run.message).toMatch(/no reference/);
  });
});
