// Choosing a method and setting for an accuracy target: for each method the loosest tolerance
// (adaptive) or the fewest equal steps (fixed-step) whose measured error meets the target, found on
// a decade grid and refined by bisection, then confirmed by a final measured (and timed) run.
import type { Method, Problem, Setting } from '../core/types.js';
import type { RunResult } from '../results/contract.js';
import type { Candidate, Choice, ChooseOptions, ErrorMeasure, TrialPoint } from './choose-types.js';
import type { FixedCandidate } from './fixed-rates.js';
import { measureRun } from '../measure/run-one.js';
import { timeRecord, timeRun } from '../measure/timing.js';
import { pairingGap, structuralGap } from './plan.js';
import { absoluteTolerance } from '../core/tolerance.js';
import { InputError } from '../core/errors.js';
import { measureGap, measureOf } from '../measure/run-measures.js';
import { stepCost } from './fixed-rates.js';
import { checkNeighbours } from './choose-neighbours.js';
import { rankCandidates, recommendation } from './choose-rank.js';
import { confirmedError, isCertifyingSetting, meetsTarget, refusal, targetBelowResolution, tooTightToConfirm } from './acceptance.js';

/**
 * Decade grid searched for adaptive methods, loosest first. It ends at 1e-15, about 4.5 times
 * the unit round-off of a double (2.2e-16), below which a relative tolerance asks for more than
 * the arithmetic holds. Tight targets need the last decades: on kepler-eccentric a final error of
 * 1e-10 takes rtol near 3e-14 with dormand-prince-853, since round-off grows with the step count.
 */
export const RTOL_GRID = [1e-2, 1e-3, 1e-4, 1e-5, 1e-6, 1e-7, 1e-8, 1e-9, 1e-10, 1e-11, 1e-12, 1e-13, 1e-14, 1e-15];
/** Bisection steps in log10(rtol) between the last failing and the first passing decade. */
const RTOL_BISECTIONS = 8;
/** Smallest and largest equal-step counts tried for fixed-step methods. */
export const MIN_STEPS = 4;
export const MAX_STEPS = 1 << 22;

export type { Candidate, Choice, ChooseOptions, CostMeasure, ErrorMeasure, TrialPoint } from './choose-types.js';

/** The confirmed error (acceptance.ts): null when the run failed or the reference cannot resolve it. */
function errorOf(run: RunResult, measure: ErrorMeasure): number | null {
  return confirmedError(run, measure);
}

/** Meets the target with a confirmed error, at a setting that is not a certifying run's (or tighter). */
function meets(run: RunResult, o: ChooseOptions, p: Problem, m: Method, s: Setting): boolean {
  return meetsTarget(run, o.target, o.measure) && !isCertifyingSetting(p, m, s);
}

interface Search {
  best: RunResult | null;
  setting: Setting | null;
  trials: number;
  closest: RunResult | null;
  tried: TrialPoint[];
  /** The tightest run that ended ok (to say when the target is below the reference's resolution). */
  lastOk?: RunResult | null;
}

function trialPoint(run: RunResult, o: ChooseOptions): TrialPoint {
  return { setting: run.setting, status: run.status, error: measureOf(run, o.measure), nfev: run.counts.nfev };
}

/**
 * The loosest rtol whose trial passes: the first passing value of the decade grid, refined by
 * bisections of log10 rtol against the grid value before it; null when none passes. `onGridFail`
 * sees each failing grid trial. The plain form of searchAdaptive's grid and bisections, for
 * callers that measure the error themselves (the bench's compiled peers, matched to a target on
 * the same grid); choose's own search adds its confirmation rules on top.
 */
export function loosestRtol<T>(tryAt: (rtol: number) => T, passes: (r: T) => boolean, onGridFail?: (r: T) => void): { rtol: number; result: T } | null {
  let failing: number | null = null;
  for (const rtol of RTOL_GRID) {
    const run = tryAt(rtol);
    if (passes(run)) {
      let hi = Math.log10(rtol);
      let best = run;
      if (failing !== null) {
        let lo = Math.log10(failing);
        for (let k = 0; k < RTOL_BISECTIONS; k++) {
          const mid: number = (lo + hi) / 2;
          const r = tryAt(10 ** mid);
          if (passes(r)) {
            hi = mid;
            best = r;
          } else lo = mid;
        }
      }
      return { rtol: 10 ** hi, result: best };
    }
    failing = rtol;
    onGridFail?.(run);
  }
  return null;
}

function searchAdaptive(p: Problem, m: Method, o: ChooseOptions): Search {
  let trials = 0;
  const tried: TrialPoint[] = [];
  const settingAt = (rtol: number): Setting => ({ rtol, atol: absoluteTolerance(p, rtol, o.atol) });
  const at = (rtol: number) => {
    trials++;
    const run = measureRun(p, m, settingAt(rtol), o);
    tried.push(trialPoint(run, o));
    return run;
  };
  let failing: number | null = null;
  let closest: RunResult | null = null;
  let lastOk: RunResult | null = null;
  for (const rtol of RTOL_GRID) {
    const run = at(rtol);
    const meetsHere = meets(run, o, p, m, settingAt(rtol));
    if (meetsHere && failing === null) return { best: run, setting: settingAt(rtol), trials, closest: run, tried };
    if (run.status === 'ok') lastOk = run;
    // Met, or the error fell below what the reference confirms (tighter settings can only be less
    // confirmable): the loosest confirmed setting that meets lies between the last failing decade and this one.
    if (meetsHere || tooTightToConfirm(run, o.measure)) {
      if (failing !== null) {
        let lo = Math.log10(failing);
        let hi = Math.log10(rtol);
        let best: RunResult | null = meetsHere ? run : null;
        let bestRtol = rtol;
        for (let k = 0; k < RTOL_BISECTIONS; k++) {
          const mid: number = (lo + hi) / 2;
          const r = at(10 ** mid);
          if (meets(r, o, p, m, settingAt(10 ** mid))) {
            hi = mid;
            best = r;
            bestRtol = 10 ** mid;
          } else if (tooTightToConfirm(r, o.measure)) hi = mid;
          else lo = mid;
        }
        if (best) return { best, setting: settingAt(bestRtol), trials, closest: best, tried };
      }
      break;
    }
    failing = rtol;
    const e = errorOf(run, o.measure);
    if (e !== null && (closest === null || e < (errorOf(closest, o.measure) ?? Infinity))) closest = run;
  }
  return { best: null, setting: null, trials, closest, tried, lastOk };
}

/** The listed candidates, fewest steps first: the first that meets the target is the lowest rate that does. */
function searchCandidates(p: Problem, m: Method, o: ChooseOptions, list: readonly FixedCandidate[]): Search {
  let trials = 0;
  let closest: RunResult | null = null;
  const tried: TrialPoint[] = [];
  for (const c of list) {
    trials++;
    const run = measureRun(p, m, { steps: c.steps }, o);
    tried.push(trialPoint(run, o));
    if (meets(run, o, p, m, { steps: c.steps })) return { best: run, setting: { steps: c.steps }, trials, closest: run, tried };
    const e = errorOf(run, o.measure);
    if (e !== null && (closest === null || e < (errorOf(closest, o.measure) ?? Infinity))) closest = run;
  }
  return { best: null, setting: null, trials, closest, tried };
}

function searchFixed(p: Problem, m: Method, o: ChooseOptions): Search {
  if (o.fixedCandidates && o.fixedCandidates.length > 0) return searchCandidates(p, m, o, o.fixedCandidates);
  let trials = 0;
  const tried: TrialPoint[] = [];
  const at = (steps: number) => {
    trials++;
    const run = measureRun(p, m, { steps }, o);
    tried.push(trialPoint(run, o));
    return run;
  };
  let closest: RunResult | null = null;
  let lastOk: RunResult | null = null;
  let lo = 0; // largest step count known to fail
  const cap = Math.min(MAX_STEPS, o.maxSteps);
  // Doubling, and the cap itself last, so the step limit is never left untried.
  const ladder: number[] = [];
  for (let n = MIN_STEPS; n < cap; n *= 2) ladder.push(n);
  ladder.push(cap);
  for (const n of ladder) {
    const run = at(n);
    const meetsHere = meets(run, o, p, m, { steps: n });
    if (run.status === 'ok') lastOk = run;
    // As for adaptive methods: between the last failing count and this one (met, or too tight to confirm).
    if (meetsHere || tooTightToConfirm(run, o.measure)) {
      let hi = n;
      let best: RunResult | null = meetsHere ? run : null;
      let bestSteps = n;
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        const r = at(mid);
        if (meets(r, o, p, m, { steps: mid })) {
          best = r;
          bestSteps = mid;
          hi = mid;
        } else if (tooTightToConfirm(r, o.measure)) hi = mid;
        else lo = mid;
      }
      if (best) return { best, setting: { steps: bestSteps }, trials, closest: best, tried };
      break;
    }
    lo = n;
    const e = errorOf(run, o.measure);
    if (e !== null && (closest === null || e < (errorOf(closest, o.measure) ?? Infinity))) closest = run;
  }
  return { best: null, setting: null, trials, closest, tried, lastOk };
}

/**
 * Why a method did not reach the target: below what the reference can confirm (with what would be
 * needed), the step limit when that is what stopped it, or the best confirmed error.
 */
function missNote(search: Search, best: number | null, o: ChooseOptions): string {
  const below = search.lastOk ? targetBelowResolution(search.lastOk, o.target, o.measure) : null;
  if (below) return below;
  const limited = search.tried.filter((t) => t.status === 'step-limit');
  const bestText = best === null ? 'no run gave a confirmed error' : `best confirmed error ${best.toExponential(2)}`;
  const last = search.tried.at(-1)?.setting;
  if (last && 'steps' in last && last.steps === o.maxSteps) {
    return `step limit: the largest step count allowed (--max-steps ${o.maxSteps}) was tried and did not reach the target; ${bestText}`;
  }
  if (limited.length > 0) {
    return `step limit: ${limited.length} of ${search.tried.length} settings tried used up --max-steps ${o.maxSteps} before the end of the span; ${bestText}`;
  }
  return best === null ? bestText : `target not reached; ${bestText}`;
}

export async function chooseMethod(problem: Problem, methods: readonly Method[], o: ChooseOptions): Promise<Choice> {
  const gap = measureGap(problem, o.measure);
  if (gap) throw new InputError(gap, '--measure');
  const safety = o.safety ?? 1;
  // The search looks for target / safety; margins are stated against the user's own target.
  const inner: ChooseOptions = { ...o, target: o.target / safety };
  const candidates: Candidate[] = [];
  const refused = refusal(problem);
  if (refused) {
    return {
      problem: problem.id, target: o.target, safety, required: inner.target, measure: o.measure, cost: o.cost,
      candidates, recommended: null, why: `refused: ${refused}`, refused,
    };
  }
  for (const m of methods) {
    const gap = pairingGap(problem, m);
    if (gap && (structuralGap(problem, m) || problem.stiff)) {
      candidates.push({ method: m.id, family: m.family, met: false, run: null, achieved: null, margin: null, cost: null, trials: 0, note: gap, tried: [] });
      continue;
    }
    const search = m.adaptive ? searchAdaptive(problem, m, inner) : searchFixed(problem, m, inner);
    if (!search.setting || !search.best) {
      const best = search.closest ? errorOf(search.closest, o.measure) : null;
      candidates.push({
        method: m.id, family: m.family, met: false, run: search.closest, achieved: best, margin: null, cost: null, trials: search.trials,
        note: missNote(search, best, o), tried: search.tried,
      });
      continue;
    }
    // Confirmation: a fresh measured run at the chosen setting, then timing when time is the cost.
    const confirmed = measureRun(problem, m, search.setting, o);
    const achieved = errorOf(confirmed, o.measure);
    const ok = meets(confirmed, inner, problem, m, search.setting);
    let cost: number | null = confirmed.countsReported === false ? null : confirmed.counts.nfev;
    let timeMarginPercent: number | null = null;
    if (o.cost === 'time' && ok) {
      const t = await timeRun(problem, m, search.setting, o, o.timing);
      if (t) confirmed.time = timeRecord(t);
      cost = t ? t.medianSeconds : null;
      timeMarginPercent = t ? t.rmePercent : null;
    }
    const neighbours = ok ? checkNeighbours(problem, m, search.setting, confirmed, inner, (r) => errorOf(r, o.measure)) : undefined;
    const candidate: Candidate = {
      method: m.id, family: m.family, met: ok, run: confirmed, achieved,
      margin: achieved && achieved > 0 ? o.target / achieved : null, cost, trials: search.trials + 1,
      tried: search.tried, timeMarginPercent,
      ...(neighbours ? { neighbours } : {}),
      ...(neighbours?.fragile ? { note: `fragile: ${neighbours.summary}` } : {}),
    };
    if (!m.adaptive && o.fixedCandidates?.length && 'steps' in search.setting) {
      const steps = search.setting.steps;
      candidate.rateHz = o.fixedCandidates.find((c) => c.steps === steps)?.rateHz ?? null;
      const sc = ok ? stepCost(problem, m, search.setting, o.maxSteps) : null;
      const seconds = confirmed.time.medianSeconds;
      candidate.stepCost = sc ? { ...sc, meanSeconds: seconds !== null ? seconds / steps : null } : null;
    }
    candidates.push(candidate);
  }
  const ranked = rankCandidates(candidates, o.cost);
  const { recommended, why } = recommendation(ranked, { target: o.target, safety, cost: o.cost, measure: o.measure });
  return {
    problem: problem.id, target: o.target, safety, required: inner.target, measure: o.measure, cost: o.cost,
    candidates: ranked, recommended, why,
  };
}
