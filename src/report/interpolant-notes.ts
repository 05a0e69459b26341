// One line per interpolant a section's runs were measured with between their steps: which
// interpolant located the event crossings (and for which methods), and which one error.dense
// measured, so a reader of the table knows whose dense output a figure belongs to.
import type { RunResult } from '../results/contract.js';

function grouped(runs: readonly RunResult[], key: (r: RunResult) => string[]): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const r of runs) {
    for (const k of new Set(key(r))) {
      const methods = out.get(k) ?? [];
      if (!methods.includes(r.method)) methods.push(r.method);
      out.set(k, methods);
    }
  }
  return out;
}

/** Plain-text sentences (empty when the section has no events and no error.dense). */
export function interpolantNotes(runs: readonly RunResult[]): string[] {
  const notes: string[] = [];
  const events = grouped(runs, (r) => Object.values(r.events ?? {}).map((e) => e.locatedBy ?? 'not recorded'));
  for (const [how, methods] of events) notes.push(`Event times of ${methods.join(', ')}: located on ${how}.`);
  const dense = grouped(runs, (r) => (r.denseInterpolant !== undefined ? [r.denseInterpolant] : []));
  for (const [how, methods] of dense) notes.push(`error.dense of ${methods.join(', ')}: ${how}, at the midpoint of every accepted step.`);
  return notes;
}
