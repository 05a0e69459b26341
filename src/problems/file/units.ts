// A problem file's units: every state or output named must exist, so a typo is said at load time.
import type { ProblemUnits } from '../../core/types.js';
import { fail, type Site } from './fail.js';

export function readUnits(site: Site, units: ProblemUnits, states: readonly string[], outputs: readonly string[]): ProblemUnits {
  for (const name of Object.keys(units.states ?? {})) {
    if (!states.includes(name)) fail(site, ['units', 'states', name], `'${name}' is not a state; states are ${states.join(', ')}`);
  }
  for (const name of Object.keys(units.outputs ?? {})) {
    if (!outputs.includes(name)) fail(site, ['units', 'outputs', name], `'${name}' is not an output${outputs.length ? `; outputs are ${outputs.join(', ')}` : ' (the problem has none)'}`);
  }
  return units;
}
