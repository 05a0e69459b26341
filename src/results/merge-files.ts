// `merge` on files of any size: each file is read and checked in turn, its runs written to a
// temporary file beside the output as the lines the merged file will hold, and only what orders
// and checks them kept (MergeSource); the merged file is then written run by run from there. So a
// merge holds one file's runs at a time, not all of them, and writes what mergeResults would.
import { rmSync } from 'node:fs';
import { resultsJsonPieces } from './json.js';
import { readResultsFile } from './read.js';
import { calibrationOf, checkFormat, mergeSources, ProblemMerger, runSlot, withCalibrationRatio, type MergeSource } from './merge.js';
import { FileSink, readSpans } from './file-sink.js';
import { tempSibling, writeFileAtomicWith } from './atomic.js';
import { InputError } from '../core/errors.js';
import { collectGarbage } from '../core/collect-garbage.js';

/** Reads one file into the spill: its fields and run slots, and where each run's line went. */
function spillFile(path: string, sink: FileSink, problems: ProblemMerger): { source: MergeSource; lines: (readonly [number, number])[] } {
  const results = readResultsFile(path);
  checkFormat(results, path);
  problems.add(path, results.problems);
  const calibration = calibrationOf(results);
  const lines: (readonly [number, number])[] = [];
  for (const run of results.runs) {
    const line = Buffer.from(JSON.stringify(withCalibrationRatio(run, calibration)));
    lines.push([sink.bytes, line.length]);
    sink.write(line);
  }
  return { source: { path, header: { ...results, runs: [], problems: [] }, slots: results.runs.map(runSlot) }, lines };
}

/** Merges the results files at `paths` into `out` (written atomically); answers the number of runs. */
export function mergeFiles(paths: readonly string[], out: string, onWarning: (message: string) => void = () => {}): number {
  if (paths.length === 0) throw new InputError('nothing to merge: give at least one results file');
  const spill = tempSibling(out, 'runs');
  try {
    const sink = new FileSink(spill, out);
    const spans: (readonly [number, number])[][] = [];
    const sources: MergeSource[] = [];
    const problems = new ProblemMerger();
    try {
      for (const path of paths) {
        const { source, lines } = spillFile(path, sink, problems);
        sources.push(source);
        spans.push(lines);
        // The file's runs and records are garbage now; collected before the next file is read, or
        // V8 lets several files' worth pile up (core/collect-garbage.ts).
        collectGarbage();
      }
    } finally {
      sink.close();
    }
    const { merged, order } = mergeSources(sources, problems, onWarning);
    const lines = { count: order.length, lines: () => readSpans(spill, order.map(([file, at]) => spans[file]![at]!)) };
    writeFileAtomicWith(out, (tmp) => {
      const json = new FileSink(tmp, out);
      try {
        for (const piece of resultsJsonPieces(merged, undefined, lines)) json.write(piece);
      } finally {
        json.close();
      }
    });
    return order.length;
  } finally {
    rmSync(spill, { force: true });
  }
}
