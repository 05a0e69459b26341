// choose's acceptance rules: an error the reference cannot confirm never meets a target (choose
// says what would be needed), a certifying run's own setting (or tighter) is never recommended,
// and a margin is only printed for a confirmed, non-zero error.
import { describe, expect, it } from 'vitest';
import { findMethod } from '../src/methods/registry.js';
import { chooseMethod } from '../src/sweep/choose.js';
import { isCertifyingSetting, marginText, refusal } from '../src/sweep/acceptance.js';
import { DEFAULT_TIMING } from '../src/core/defaults.js';
import { vanDerPol } from '../problems/van-der-pol.js';
import { harmonicOscillator } from '../problems/harmonic-oscillator.js';
import type { Problem } from '../src/core/types.js';

describe('targets below the reference resolution', () => {
  it('van-der-pol (certified to 11 digits): target 1e-11 is refused as unconfirmable, with what would be needed', async () => {
    const choice = await chooseMethod(vanDerPol, [findMethod('dormand-prince-853')!], {
      target: 1e-11, measure: 'final', cost: 'nfev', timing: DEFAULT_TIMING, maxSteps: 1_000_000,
    });
    expect(choice.recommended).toBeNull();
    // Resolution 1e-11 of |y| = 2.008 (the catalogue's 11 digits): 2.0e-11; confirmed only above 10x.
    expect(choice.candidates[0]!.note).toMatch(/below what the reference can confirm \(resolution 2\.01e-11 here/);
    expect(choice.candidates[0]!.note).toMatch(/would need a reference resolving 1\.00e-12 or finer/);
  });
});

describe('certifying settings', () => {
  const certified: Problem = {
    ...harmonicOscillator,
    reference: { ...harmonicOscillator.reference, certifiedBy: { methods: ['dormand-prince-853'], rtol: 1e-13 } },
  };
  const dop853 = findMethod('dormand-prince-853')!;
  it('the certifying run and anything tighter are excluded, looser settings are not', () => {
    expect(isCertifyingSetting(certified, dop853, { rtol: 1e-13, atol: 1e-13 })).toBe(true);
    expect(isCertifyingSetting(certified, dop853, { rtol: 1e-14, atol: 1e-14 })).toBe(true);
    expect(isCertifyingSetting(certified, dop853, { rtol: 1e-12, atol: 1e-12 })).toBe(false);
    expect(isCertifyingSetting(certified, findMethod('verner-65')!, { rtol: 1e-13, atol: 1e-13 })).toBe(false);
  });
});

describe('refusal and margins', () => {
  it('a certificate with fewer than two digits is no reference; margins only for confirmed errors', () => {
    const oneDigit: Problem = { ...vanDerPol, reference: { kind: 'certified', digits: 1, points: vanDerPol.reference.points } };
    expect(refusal(oneDigit)).toMatch(/1 trusted digit/);
    expect(refusal(vanDerPol)).toBeNull();
    expect(marginText(0, 1e-6)).not.toMatch(/undefined/);
    expect(marginText(null, 1e-6)).toBe('not confirmed');
    expect(marginText(1e-7, 1e-6)).toBe('10.0x inside the target');
  });
});
