// results.json serialisation. Non-finite numbers have no JSON form: JSON.stringify writes them as
// null, which the contract reads as "does not apply / not measured".
//
// Layout: the file is indented, except that each run takes one line. A run's drift trace holds
// hundreds of numbers, which indentation would put one to a line: the catalogue sweep's file was
// 8.2 MB that way and took a quarter of a second to build and write, at the end of every sweep,
// when nothing else can run. One line per run keeps diffs readable run by run.
import type { ResultsFile, RunResult } from '../core/results.js';

/** Continues a value's indented JSON at one level deeper (JSON strings hold no raw newlines). */
function nested(value: unknown): string {
  return JSON.stringify(value, null, 2).replace(/\n/g, '\n  ');
}

function runLines(runs: readonly RunResult[]): string {
  if (runs.length === 0) return '[]';
  return `[\n${runs.map((r) => `    ${JSON.stringify(r)}`).join(',\n')}\n  ]`;
}

export function resultsJson(results: ResultsFile): string {
  const fields = Object.entries(results)
    .filter(([, v]) => v !== undefined)
    .map(([k, v]) => `  ${JSON.stringify(k)}: ${k === 'runs' ? runLines(v as RunResult[]) : nested(v)}`);
  return `{\n${fields.join(',\n')}\n}\n`;
}
