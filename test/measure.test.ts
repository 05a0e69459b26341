// Measurement primitives: error norms in the design's definition, reference lookup, drift.
import { describe, expect, it } from 'vitest';
import { scaledMaxError, scaleFloors } from '../src/measure/error-norm.js';
import { referenceLookup } from '../src/measure/reference.js';
import { watchRun } from '../src/measure/observer.js';
import { robertson } from '../problems/robertson.js';
import { harmonicOscillator } from '../problems/harmonic-oscillator.js';

describe('error norms', () => {
  it('is the max over components of |y - ref| / scale (design definition, hand-computed)', () => {
    expect(scaledMaxError([1, 2], [1.5, 2.25], null, 2)).toBe(0.5);
    const floors = scaleFloors({ kind: 'relative', floor: 1e-3 }, 2);
    // |2 - 2.25| / 2.25 = 0.111..., |1e-6 - 0| / 1e-3 = 1e-3
    expect(scaledMaxError([2, 1e-6], [2.25, 0], floors, 2)).toBeCloseTo(0.25 / 2.25, 15);
    expect(scaledMaxError([NaN, 0], [0, 0], null, 2)).toBeNaN();
  });
});

describe('reference lookup', () => {
  it('matches a tabulated time relative to the time itself, not the span', () => {
    const look = referenceLookup(robertson);
    const out = new Float64Array(3);
    expect(look.at(39.95, out)).toBe(false);
    expect(look.at(40, out)).toBe(true);
    // Hairer and Wanner, Solving ODEs II, sec. IV.1: y1(40) = 0.7158270687
    expect(out[0]).toBe(0.7158270687);
    expect(look.at(1e11, out)).toBe(true);
    expect(look.at(40, out)).toBe(true);
  });
});

describe('run watcher', () => {
  it('measures drift relative to the initial invariant and thins the trace', () => {
    const w = watchRun(harmonicOscillator);
    const y = new Float64Array(2);
    const w2 = 4 * Math.PI * Math.PI;
    for (let k = 0; k <= 1000; k++) {
      const t = (20 * k) / 1000;
      // The exact orbit scaled by (1 + 1e-6 t): energy grows by the factor (1 + 1e-6 t)^2.
      const s = 1 + 1e-6 * t;
      y[0] = s * Math.cos(2 * Math.PI * t);
      y[1] = -s * 2 * Math.PI * Math.sin(2 * Math.PI * t);
      w.observer(t, y);
    }
    const e0 = w2 / 2;
    const drift = w.drift().energy!;
    expect(drift).toBeCloseTo((e0 * ((1 + 20e-6) ** 2) - e0) / e0, 10);
    expect(w.trace()!.t.length).toBeLessThanOrEqual(201);
    // Largest error is in p near t = 19.75: (s - 1) * 2 pi |sin| ~ 19.75e-6 * 2 pi = 1.241e-4.
    expect(w.maxError()).toBeGreaterThan(1.23e-4);
    expect(w.maxError()).toBeLessThan(1.25e-4);
  });
});

describe('timing margin', () => {
  it('is the 95% margin of the median from the MAD (normal-sample asymptotics)', async () => {
    const { medianMarginPercent } = await import('../src/measure/timing.js');
    // 1.96 * 1.2533 * 1.4826 * 0.1 / sqrt(100) * 100 = 3.642 (hand-computed)
    expect(medianMarginPercent(1, 0.1, 100)).toBeCloseTo(3.642, 3);
    expect(medianMarginPercent(0, 0.1, 100)).toBe(Infinity);
  });
});
