// The optional `events` member of a program's response: the crossing times the program located
// itself, by event name, each list increasing and inside the span. stepgauge compares them with the
// reference crossings like a built-in method's (time error, missed, extra); an event the program
// leaves out is located by stepgauge on the program's reported states.
import type { Problem } from '../../core/types.js';

/** Slack on the span's ends for a reported crossing time, relative to the span. */
const SPAN_SLACK = 1e-12;

/** The event names and directions a request announces (empty when the problem declares none). */
export function requestEvents(problem: Problem): { name: string; direction: string }[] {
  return (problem.events ?? []).map((ev) => ({ name: ev.name, direction: ev.direction }));
}

/** The reported crossing times by event name, or a sentence saying what is wrong with them. */
export function readEventTimes(value: unknown, problem: Problem): Record<string, number[]> | string {
  const declared = (problem.events ?? []).map((ev) => ev.name);
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    return 'events must be an object mapping each event name to a list of crossing times';
  }
  const { t0, tEnd } = problem;
  const slack = SPAN_SLACK * Math.abs(tEnd - t0);
  // No prototype: an event name is only ever a key of this object.
  const out: Record<string, number[]> = Object.create(null) as Record<string, number[]>;
  for (const [name, list] of Object.entries(value)) {
    if (!declared.includes(name)) {
      return `events.${name}: the problem declares no event '${name}' (${declared.length > 0 ? `its events are ${declared.join(', ')}` : 'it declares no events'})`;
    }
    if (!Array.isArray(list)) return `events.${name} must be a list of crossing times`;
    const times: number[] = [];
    for (let k = 0; k < list.length; k++) {
      const t = list[k];
      if (typeof t !== 'number' || !Number.isFinite(t)) return `events.${name}[${k}] is not a finite number`;
      if (t < t0 - slack || t > tEnd + slack) return `events.${name}[${k}] = ${t} lies outside the span [${t0}, ${tEnd}]`;
      if (k > 0 && t < times[k - 1]!) return `events.${name} goes back (events.${name}[${k}] = ${t} after ${times[k - 1]})`;
      times.push(t);
    }
    out[name] = times;
  }
  return out;
}
