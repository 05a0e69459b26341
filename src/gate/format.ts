// Text forms shared by the check report, JUnit output and test assertions, so a regression
// reads the same wherever it shows up.
import type { RunSetting } from '../results/contract.js';

/** Compact number for settings: 1e-6 rather than 0.000001, integers as they are. */
export function settingNumber(x: number): string {
  if (Number.isInteger(x) && Math.abs(x) < 1e6) return String(x);
  return x.toExponential().replace('e+', 'e');
}

/** "rtol=1e-6 atol=1e-9" or "steps=400". */
export function settingText(s: RunSetting): string {
  if ('rtol' in s) {
    const atol = Array.isArray(s.atol) ? `[${s.atol.map(settingNumber).join(',')}]` : settingNumber(s.atol);
    return `rtol=${settingNumber(s.rtol)} atol=${atol}`;
  }
  return `steps=${s.steps}`;
}

/** Three significant digits (the report convention); integers stay exact. */
export function num3(x: number | string | null): string {
  if (x === null) return 'none';
  if (typeof x === 'string') return x;
  if (Number.isNaN(x)) return 'NaN';
  if (!Number.isFinite(x)) return x > 0 ? 'Inf' : '-Inf';
  if (Number.isInteger(x) && Math.abs(x) < 1e9) return String(x);
  if (x === 0) return '0';
  const a = Math.abs(x);
  const r = Number(x.toPrecision(3));
  return a >= 1e-3 && a < 1e4 ? String(r) : r.toExponential().replace('e+', 'e');
}
