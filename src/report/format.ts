// Number and setting text shared by plots, HTML and Markdown: 3 significant digits for measured
// values (the JSON keeps full precision), exact integers for counts.
import type { RunSetting } from '../results/contract.js';

/** 3 significant digits; "—" for null/undefined, and NaN/Infinity spelled out. */
export function sig3(v: number | null | undefined): string {
  if (v === null || v === undefined) return '—';
  if (Number.isNaN(v)) return 'NaN';
  if (!Number.isFinite(v)) return v > 0 ? 'Inf' : '-Inf';
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e-3 && a < 1e5) return String(Number(v.toPrecision(3)));
  // "1.23e-8" rather than toPrecision's "1.23e-8"/"1.23e+5" mix; keep trailing zeros meaningful.
  const [m, e] = v.toExponential(2).split('e');
  return `${m}e${Number(e)}`;
}

export function integer(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  return String(Math.round(v));
}

export function isAdaptive(s: RunSetting): s is { rtol: number; atol: number | number[] } {
  return 'rtol' in s;
}

export function settingLabel(s: RunSetting): string {
  if (isAdaptive(s)) {
    const atol = Array.isArray(s.atol) ? `[${s.atol.map(sig3).join(', ')}]` : sig3(s.atol);
    return `rtol ${sig3(s.rtol)}, atol ${atol}`;
  }
  return `${s.steps} steps, h ${sig3(s.h)}`;
}

/** Larger is tighter: steps for fixed-step settings, -log10(rtol) for adaptive ones. */
export function tightness(s: RunSetting): number {
  return isAdaptive(s) ? -Math.log10(s.rtol) : s.steps;
}
