// A flag the user gave that no planned run uses is said, not silently ignored: -t with only
// fixed-step methods, -s with only adaptive ones, --atol without an adaptive method, --controller
// without an explicit pair.
import type { Method } from '../core/types.js';
import type { PlannedRun } from '../sweep/plan.js';

export interface GivenFlags {
  tolerances: boolean;
  steps: boolean;
  atol: boolean;
  controller: boolean;
}

export function unusedFlagNotes(given: GivenFlags, runs: readonly PlannedRun[], methods: readonly Method[]): string[] {
  const planned = new Set(runs.map((r) => r.method));
  const used = methods.filter((m) => planned.has(m.id));
  const adaptive = runs.some((r) => 'rtol' in r.setting);
  const fixed = runs.some((r) => 'steps' in r.setting);
  const pairs = used.some((m) => m.family === 'embedded-explicit');
  const notes: string[] = [];
  const names = used.map((m) => m.id).join(', ');
  if (given.tolerances && !adaptive) notes.push(`-t/--tolerances applies to adaptive methods, and none is planned (the planned methods, ${names}, take equal steps: set them with -s)`);
  if (given.atol && !adaptive) notes.push(`--atol applies to adaptive methods, and none is planned (${names})`);
  if (given.steps && !fixed) notes.push(`-s/--steps applies to fixed-step methods, and none is planned (the planned methods, ${names}, are adaptive: set them with -t)`);
  if (given.controller && !pairs) notes.push(`--controller applies to the explicit embedded pairs, and none is planned (${names})`);
  return notes;
}
