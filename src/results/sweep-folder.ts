// Writes a sweep's folder at once (a temporary sibling renamed into place): results.json,
// results.csv and whatever the caller adds (the report, drawn by a layer above this one).
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { ResultsFile, RunResult } from './contract.js';
import { writeStreamedResults, type StreamedRuns } from './streamed-results.js';
import { writeFolderAtomically } from './atomic.js';
import { resultsCsv } from './csv.js';
import { resultsJsonBytes, type KnownRunLine } from './json.js';

export interface SweepFolderOptions {
  /** Run lines already serialised (the journal's), reused in results.json. */
  known?: KnownRunLine;
  /**
   * The runs, kept on disk (the journal's lines in plan order): written one at a time instead of
   * `results.runs`, whatever the sweep's size (see writeStreamedResults).
   */
  runs?: StreamedRuns;
  /** Writes more files into the temporary folder before it is renamed into place. */
  addFiles?: (tmpDir: string) => Promise<unknown>;
}

/** Writes the folder; answers the runs' summary views when they came from `options.runs`. */
export async function writeSweepFolder(outDir: string, results: ResultsFile, options: SweepFolderOptions = {}): Promise<RunResult[] | undefined> {
  let views: RunResult[] | undefined;
  await writeFolderAtomically(outDir, async (tmp) => {
    if (options.runs) views = writeStreamedResults(tmp, results, options.runs);
    else {
      await writeFile(join(tmp, 'results.json'), resultsJsonBytes(results, options.known));
      await writeFile(join(tmp, 'results.csv'), resultsCsv(results));
    }
    await options.addFiles?.(tmp);
  });
  return views;
}
