// results.json serialisation. Non-finite numbers have no JSON form: they are written as null,
// which the contract reads as "does not apply / not measured".
import type { ResultsFile } from '../core/results.js';

export function resultsJson(results: ResultsFile): string {
  return `${JSON.stringify(results, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`;
}
