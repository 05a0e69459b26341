// The error figures a run can be judged by (`choose --measure`, reports): the problem's own error
// scale (final, max), the orbit error parts in the problem's position unit (final values by
// name, maxima along the run with -max), and the worst event-time error.
import type { Problem } from '../core/types.js';
import type { OrbitErrorParts, RunResult } from '../results/contract.js';
import { worstEventTimeError } from './events.js';

export const ERROR_MEASURES = [
  'final', 'max',
  'position', 'radial', 'in-track', 'cross-track',
  'position-max', 'radial-max', 'in-track-max', 'cross-track-max',
  'event-time',
] as const;

export type ErrorMeasure = (typeof ERROR_MEASURES)[number];

const PART: Record<string, keyof OrbitErrorParts> = { position: 'position', radial: 'radial', 'in-track': 'inTrack', 'cross-track': 'crossTrack' };

export function isErrorMeasure(s: string): s is ErrorMeasure {
  return (ERROR_MEASURES as readonly string[]).includes(s);
}

/** Why the problem cannot be judged by this measure, or null when it can. */
export function measureGap(problem: Problem, measure: ErrorMeasure): string | null {
  if (measure === 'event-time') return problem.events?.length ? null : `${problem.id} declares no events`;
  if (measure !== 'final' && measure !== 'max' && !problem.orbit) return `${problem.id} names no orbit position and velocity, so it has no ${measure} error`;
  return null;
}

/** The run's figure for the measure (absolute values), null when not measured; Infinity for missed or extra events. */
export function measureOf(run: RunResult, measure: ErrorMeasure): number | null {
  if (run.status !== 'ok') return null;
  if (measure === 'final') return run.error.final;
  if (measure === 'max') return run.error.max;
  if (measure === 'event-time') return worstEventTimeError(run.events);
  const along = measure.endsWith('-max');
  const part = PART[along ? measure.slice(0, -4) : measure]!;
  const rec = along ? run.orbitError?.max : run.orbitError?.final;
  return rec ? Math.abs(rec[part]) : null;
}

/** Unit of the measure for the problem: its orbit unit, seconds (time unit) for events, none for the error scale. */
export function measureUnit(problem: Problem, measure: ErrorMeasure): string {
  if (measure === 'final' || measure === 'max') return '';
  if (measure === 'event-time') return 'time units';
  return problem.orbit?.unit ?? '';
}
