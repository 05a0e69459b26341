// Choosing a setting that holds across a dispersion: per method, the loosest tolerance (or fewest
// equal steps) at which a share q of the samples meet the target, with the samples that miss it
// named. Every trial runs every sample, so the figure is measured, not extrapolated from one case.
// The search follows `choose` for one problem: a decade grid loosest first (equal-step counts
// doubling), then bisection between the last failing and the first passing point; it assumes, as
// that search does, that the error falls as the setting tightens. It takes choose's acceptance rules
// (acceptance.ts) sample by sample: an error counts only when that sample's reference confirms it,
// at a setting that is not the sample's certifying run's, and a sample whose reference choose would
// refuse never meets the target.
import { confirmedError, isCertifyingSetting, refusal, targetBelowResolution, tooTightToConfirm } from './acceptance.js';
import type { Method, Problem, Setting } from '../core/types.js';
import type { RunResult } from '../results/contract.js';
import { measureRun, type RunOptions } from '../measure/run-one.js';
import { absoluteTolerance } from '../core/tolerance.js';
import { quantileOf } from '../core/quantile.js';
import { pairingGap, structuralGap } from './plan.js';
import { MAX_STEPS, MIN_STEPS, RTOL_GRID } from './choose.js';

/** `choose`'s decade grid and step range, with fewer bisections: each trial costs every sample. */
const RTOL_BISECTIONS = 5;

export interface EnvelopeOptions extends RunOptions {
  target: number;
  measure: 'final' | 'max';
  /** Share of the samples that must meet the target, in (0, 1]; 1 is the worst case. */
  quantile: number;
}

export interface EnvelopeCandidate {
  method: string;
  met: boolean;
  setting: RunResult['setting'] | null;
  /** Error at the quantile (nearest rank) over the samples at that setting. */
  quantileError: number | null;
  worstError: number | null;
  worstSample: string | null;
  /** Samples whose error exceeds the target at the chosen setting (failures included). */
  failing: string[];
  meanNfev: number | null;
  trials: number;
  note?: string;
}

export interface EnvelopeChoice {
  of: string;
  samples: number;
  target: number;
  measure: 'final' | 'max';
  quantile: number;
  candidates: EnvelopeCandidate[];
  recommended: EnvelopeCandidate | null;
  /** Set when no sample has a reference choose would judge by (acceptance.ts, `refusal`): why. */
  refused?: string;
}

interface Trial {
  setting: Setting;
  runs: RunResult[];
  errors: number[];
  q: number;
  /**
   * Fails, but would meet the target if the runs too tight for their reference to confirm had
   * met it: tighter settings can only be less confirmable, so the search looks looser (as choose does).
   */
  tooTight: boolean;
}

/**
 * A sample's error as choose counts it (acceptance.ts): confirmed by the sample's own reference, at
 * a setting looser than its certifying run's, on a sample whose reference is not refused; else
 * Infinity (failed runs too).
 */
function errorOf(p: Problem, m: Method, r: RunResult, setting: Setting, measure: 'final' | 'max'): number {
  if (refusal(p) !== null || isCertifyingSetting(p, m, setting)) return Infinity;
  const e = confirmedError(r, measure);
  return e !== null && Number.isFinite(e) ? e : Infinity;
}

function trial(samples: readonly Problem[], m: Method, setting: Setting, o: EnvelopeOptions): Trial {
  const settings = samples.map((p) => settingFor(p, setting));
  const runs = samples.map((p, i) => measureRun(p, m, settings[i]!, o));
  const errors = runs.map((r, i) => errorOf(samples[i]!, m, r, settings[i]!, o.measure));
  const q = quantileOf([...errors].sort((a, b) => a - b), o.quantile);
  const unconfirmable = runs.map((r, i) => errors[i] === Infinity && refusal(samples[i]!) === null && tooTightToConfirm(r, o.measure));
  const qIfConfirmed = quantileOf(errors.map((e, i) => (unconfirmable[i] ? 0 : e)).sort((a, b) => a - b), o.quantile);
  return { setting, runs, errors, q, tooTight: !(q <= o.target) && qIfConfirmed <= o.target };
}

/** Each sample's own atol from the shared rtol (samples of one problem share its atol scale). */
function settingFor(p: Problem, s: Setting): Setting {
  return 'rtol' in s ? { rtol: s.rtol, atol: absoluteTolerance(p, s.rtol) } : s;
}

interface Search {
  best: Trial | null;
  closest: Trial | null;
  trials: number;
  /** The trial that ended the search too tight to confirm, if one did. */
  tooTight: Trial | null;
}

function search(samples: readonly Problem[], m: Method, o: EnvelopeOptions): Search {
  let trials = 0;
  let closest: Trial | null = null;
  let tooTight: Trial | null = null;
  const at = (s: Setting): Trial => {
    trials++;
    const t = trial(samples, m, s, o);
    if (!closest || t.q < closest.q) closest = t;
    if (t.tooTight) tooTight = t;
    return t;
  };
  const meets = (t: Trial) => t.q <= o.target;
  const done = (best: Trial | null): Search => ({ best, closest, trials, tooTight: best ? null : tooTight });
  if (m.adaptive) {
    let failing: number | null = null;
    for (const rtol of RTOL_GRID) {
      const t = at({ rtol, atol: 0 });
      if (!meets(t) && !t.tooTight) {
        failing = rtol;
        continue;
      }
      let best = meets(t) ? t : null;
      if (failing !== null) {
        let lo = Math.log10(failing);
        let hi = Math.log10(rtol);
        for (let k = 0; k < RTOL_BISECTIONS; k++) {
          const mid = (lo + hi) / 2;
          const tm = at({ rtol: 10 ** mid, atol: 0 });
          if (meets(tm) || tm.tooTight) {
            hi = mid;
            if (meets(tm)) best = tm;
          } else lo = mid;
        }
      }
      return done(best);
    }
    return done(null);
  }
  const cap = Math.min(MAX_STEPS, o.maxSteps);
  let lo = 0;
  for (let n = MIN_STEPS; ; n = Math.min(cap, n * 2)) {
    const t = at({ steps: n });
    if (meets(t) || t.tooTight) {
      let best = meets(t) ? t : null;
      let hi = n;
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        const tm = at({ steps: mid });
        if (meets(tm) || tm.tooTight) {
          hi = mid;
          if (meets(tm)) best = tm;
        } else lo = mid;
      }
      return done(best);
    }
    lo = n;
    if (n >= cap) return done(null);
  }
}

/** Why the quantile missed the target: below what a sample's reference can confirm, with what it would need, or null. */
function belowResolutionNote(t: Trial | null, o: EnvelopeOptions): string | null {
  for (const r of t?.runs ?? []) {
    const why = r.status === 'ok' ? targetBelowResolution(r, o.target, o.measure) : null;
    if (why) return `${r.problem}: ${why}`;
  }
  return null;
}

export function chooseOverSamples(of: string, samples: readonly Problem[], methods: readonly Method[], o: EnvelopeOptions): EnvelopeChoice {
  const candidates: EnvelopeCandidate[] = [];
  // As choose refuses a problem without a reference it can judge by, so here when no sample has one.
  const refused = samples.every((p) => refusal(p) !== null) ? refusal(samples[0]!) : null;
  if (refused) return { of, samples: samples.length, target: o.target, measure: o.measure, quantile: o.quantile, candidates, recommended: null, refused };
  for (const m of methods) {
    const gap = pairingGap(samples[0]!, m);
    if (gap && (structuralGap(samples[0]!, m) || samples[0]!.stiff)) {
      candidates.push({ method: m.id, met: false, setting: null, quantileError: null, worstError: null, worstSample: null, failing: [], meanNfev: null, trials: 0, note: gap });
      continue;
    }
    const { best, closest, trials, tooTight } = search(samples, m, o);
    const shown = best ?? closest;
    if (!shown) {
      candidates.push({ method: m.id, met: false, setting: null, quantileError: null, worstError: null, worstSample: null, failing: [], meanNfev: null, trials, note: 'no run succeeded' });
      continue;
    }
    let worst = 0;
    shown.errors.forEach((e, i) => (e > shown.errors[worst]! ? (worst = i) : 0));
    const limited = shown.runs.filter((r) => r.status === 'step-limit').length;
    candidates.push({
      method: m.id,
      met: best !== null,
      setting: shown.runs[0]!.setting,
      quantileError: Number.isFinite(shown.q) ? shown.q : null,
      worstError: Number.isFinite(shown.errors[worst]!) ? shown.errors[worst]! : null,
      worstSample: shown.runs[worst]!.problem,
      failing: shown.runs.filter((_, i) => !(shown.errors[i]! <= o.target)).map((r) => r.problem),
      meanNfev: shown.runs.reduce((s, r) => s + r.counts.nfev, 0) / shown.runs.length,
      trials,
      ...(best ? {} : { note: belowResolutionNote(tooTight ?? closest, o) ?? `target not reached at the quantile${limited > 0 ? `; ${limited} sample(s) hit the step limit` : ''}` }),
    });
  }
  // Cost is evaluations: one timing per sample would cost more than the search, and counts are exact.
  const ranked = [...candidates].sort((a, b) => {
    if (a.met !== b.met) return a.met ? -1 : 1;
    if (a.met) return (a.meanNfev ?? Infinity) - (b.meanNfev ?? Infinity);
    return (a.quantileError ?? Infinity) - (b.quantileError ?? Infinity);
  });
  return { of, samples: samples.length, target: o.target, measure: o.measure, quantile: o.quantile, candidates: ranked, recommended: ranked[0]?.met ? ranked[0] : null };
}
