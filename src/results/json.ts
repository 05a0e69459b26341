// results.json serialisation. Non-finite numbers have no JSON form: JSON.stringify writes them as
// null, which the contract reads as "does not apply / not measured".
//
// Layout: the file is indented, except that each run takes one line. A run's drift trace holds
// hundreds of numbers, which indentation would put one to a line: the catalogue sweep's file was
// 8.2 MB that way and took a quarter of a second to build and write, at the end of every sweep,
// when nothing else can run. One line per run keeps diffs readable run by run.
import type { ResultsFile, RunResult } from './contract.js';

/**
 * A run's line as already serialised and encoded, e.g. by the sweep journal, or undefined to
 * serialise it here. It must be the UTF-8 of exactly JSON.stringify of the run as it is now.
 */
export type KnownRunLine = (run: RunResult) => Uint8Array | undefined;

/** The file as pieces written one after the other: text, and run lines already encoded. */
type Piece = string | Uint8Array;

/** Continues a value's indented JSON at one level deeper (JSON strings hold no raw newlines). */
function nested(value: unknown): string {
  return JSON.stringify(value, null, 2).replace(/\n/g, '\n  ');
}

function pieces(results: ResultsFile, known: KnownRunLine | undefined): Piece[] {
  const out: Piece[] = [''];
  const text = (s: string): void => {
    const last = out.length - 1;
    if (typeof out[last] === 'string') out[last] += s;
    else out.push(s);
  };
  const fields = Object.entries(results).filter(([, v]) => v !== undefined);
  text('{\n');
  fields.forEach(([k, v], i) => {
    text(`  ${JSON.stringify(k)}: `);
    if (k !== 'runs') text(nested(v));
    else if ((v as RunResult[]).length === 0) text('[]');
    else {
      const runs = v as RunResult[];
      text('[\n');
      runs.forEach((run, j) => {
        text('    ');
        const line = known?.(run);
        if (line) out.push(line);
        else text(JSON.stringify(run));
        text(j < runs.length - 1 ? ',\n' : '\n  ]');
      });
    }
    text(i < fields.length - 1 ? ',\n' : '\n');
  });
  text('}\n');
  return out;
}

export function resultsJson(results: ResultsFile): string {
  return pieces(results, undefined).join('');
}

/**
 * results.json as bytes. `known` lets a caller that serialised the runs as they finished (the
 * CLI's journal does, during the sweep, while its workers run) pass those lines instead of
 * serialising and encoding every run again after the last one; the bytes are the same.
 */
export function resultsJsonBytes(results: ResultsFile, known?: KnownRunLine): Buffer {
  return Buffer.concat(pieces(results, known).map((p) => (typeof p === 'string' ? Buffer.from(p) : p)));
}
