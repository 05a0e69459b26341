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
export type Piece = string | Uint8Array;

/**
 * Where the runs' lines come from when they are not in `results.runs`: how many there are, and
 * each line in order (the UTF-8 of JSON.stringify of the run), e.g. read back from the sweep
 * journal one at a time, so a sweep of any size is written without holding its runs.
 */
export interface RunLines {
  count: number;
  lines(): Iterable<Uint8Array>;
}

/** Text is handed on in pieces of about this many characters at most (plus one element). */
const PIECE_CHARS = 1 << 20;

/** Continues a value's indented JSON at one level deeper (JSON strings hold no raw newlines). */
function nested(value: unknown): string {
  return JSON.stringify(value, null, 2).replace(/\n/g, '\n  ');
}

/**
 * The file's pieces in order. The runs are `results.runs` (each line from `known` where it has
 * one), or `runLines` when given. Consecutive text is joined into one piece.
 */
export function* resultsJsonPieces(results: ResultsFile, known?: KnownRunLine, runLines?: RunLines): Generator<Piece> {
  let text = '';
  const fields = Object.entries(results).filter(([, v]) => v !== undefined);
  text += '{\n';
  for (const [i, [k, v]] of fields.entries()) {
    text += `  ${JSON.stringify(k)}: `;
    if (k !== 'runs' && Array.isArray(v) && v.length > 0) {
      // A long list (a dispersion's problem records) goes element by element, never as one text.
      for (const [j, item] of v.entries()) {
        text += `${j === 0 ? '[' : ','}\n    ${JSON.stringify(item === undefined || typeof item === 'function' ? null : item, null, 2).replace(/\n/g, '\n    ')}`;
        if (text.length >= PIECE_CHARS) {
          yield text;
          text = '';
        }
      }
      text += '\n  ]';
    } else if (k !== 'runs') text += nested(v);
    else {
      const count = runLines ? runLines.count : (v as RunResult[]).length;
      if (count === 0) text += '[]';
      else {
        text += '[\n';
        let j = 0;
        const each = runLines ? runLines.lines() : (v as RunResult[]).map((run) => known?.(run) ?? JSON.stringify(run));
        for (const line of each) {
          text += '    ';
          if (typeof line === 'string') text += line;
          else {
            yield text;
            yield line;
            text = '';
          }
          text += ++j < count ? ',\n' : '\n  ]';
        }
        if (j !== count) throw new Error(`results.json: expected ${count} run lines, got ${j}`);
      }
    }
    text += i < fields.length - 1 ? ',\n' : '\n';
  }
  yield `${text}}\n`;
}

export function resultsJson(results: ResultsFile): string {
  return [...resultsJsonPieces(results)].join('');
}

/**
 * results.json as bytes. `known` lets a caller that serialised the runs as they finished (the
 * CLI's journal does, during the sweep, while its workers run) pass those lines instead of
 * serialising and encoding every run again after the last one; the bytes are the same.
 */
export function resultsJsonBytes(results: ResultsFile, known?: KnownRunLine): Buffer {
  return Buffer.concat([...resultsJsonPieces(results, known)].map((p) => (typeof p === 'string' ? Buffer.from(p) : p)));
}
