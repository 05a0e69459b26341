// `choose`'s acceptance rules, each one small function: which measured error counts as confirmed,
// when a target is below what the reference can confirm, which settings are the reference's own,
// and when choose must refuse because there is no trustworthy reference at all.
import type { Method, Problem, Setting } from '../core/types.js';
import { isAdaptiveSetting } from '../core/types.js';
import { resolvedError, type RunResult } from '../results/contract.js';
import { measureOf, type ErrorMeasure } from '../measure/run-measures.js';
import { NEAR_RESOLUTION } from '../measure/resolution.js';

/** Three significant digits, as the tables print them. */
const sig3 = (v: number): string => v.toExponential(2);

export type TargetMeasure = ErrorMeasure;

/**
 * The run's error on `measure` when the reference confirms it (above its resolution); else null.
 * Orbit parts are the same state difference as error.final (or error.max for the -max ones) in
 * other units, so they are confirmed exactly when that figure is; event times carry no resolution.
 */
export function confirmedError(run: RunResult, measure: TargetMeasure): number | null {
  if (measure === 'final' || measure === 'max') return resolvedError(run, measure);
  if (measure !== 'event-time' && resolvedError(run, measure.endsWith('-max') ? 'max' : 'final') === null) return null;
  return measureOf(run, measure);
}

/** A run meets the target only with a confirmed error at or below it. */
export function meetsTarget(run: RunResult, target: number, measure: TargetMeasure): boolean {
  const e = confirmedError(run, measure);
  return e !== null && e <= target;
}

/**
 * True when the run ended ok with an error figure the reference cannot confirm (at its
 * resolution): a setting too tight to judge, so searches look between it and the last failing one.
 */
export function tooTightToConfirm(run: RunResult, measure: TargetMeasure): boolean {
  return run.status === 'ok' && measureOf(run, measure) !== null && confirmedError(run, measure) === null;
}

/**
 * When the target lies below what the reference can confirm at the run's own point: the sentence
 * saying so and what resolution would be needed (null when the target is confirmable).
 */
export function targetBelowResolution(run: RunResult, target: number, measure: TargetMeasure): string | null {
  if (measure !== 'final' && measure !== 'max') return null;
  const r = run.resolution?.[measure];
  if (r === null || r === undefined || !(target <= NEAR_RESOLUTION * r)) return null;
  return `target ${sig3(target)} is below what the reference can confirm (resolution ${sig3(r)} here; an error is confirmed only above ${NEAR_RESOLUTION}x that); it would need a reference resolving ${sig3(target / NEAR_RESOLUTION)} or finer`;
}

/**
 * True when the setting is the certifying run of this method or tighter: such a run is compared
 * with itself, so its error says nothing.
 */
export function isCertifyingSetting(problem: Problem, method: Method, setting: Setting): boolean {
  const by = problem.reference.certifiedBy;
  if (!by || !by.methods.includes(method.id)) return false;
  const rtol = by.runs?.find((r) => r.method === method.id)?.rtol ?? by.rtol;
  return rtol !== undefined && isAdaptiveSetting(setting) && setting.rtol <= rtol;
}

/** Fewer trusted digits than this and a certificate counts as no reference. */
export const MIN_TRUSTED_DIGITS = 2;

/** Why choose refuses to recommend anything on this problem (null: it may). */
export function refusal(problem: Problem): string | null {
  const ref = problem.reference;
  if (ref.unavailable) return `no reference: ${ref.unavailable}`;
  if (ref.untrusted) return ref.untrusted;
  if (ref.kind === 'certified' && ref.digits !== undefined && ref.digits < MIN_TRUSTED_DIGITS) {
    return `no reference: the certificate has ${ref.digits} trusted digit${ref.digits === 1 ? '' : 's'} (fewer than ${MIN_TRUSTED_DIGITS})`;
  }
  return null;
}

/** "12.3x inside the target", or why no margin can be given. */
export function marginText(achieved: number | null, target: number): string {
  if (achieved === null) return 'not confirmed';
  if (!(achieved > 0)) return 'no margin (error 0 is not a confirmed error)';
  return `${(target / achieved).toPrecision(3)}x inside the target`;
}
