// Writes a sweep's folder at once (a temporary sibling renamed into place): results.json,
// results.csv and whatever the caller adds (the report, drawn by a layer above this one).
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { ResultsFile } from './contract.js';
import { writeFolderAtomically } from './atomic.js';
import { resultsCsv } from './csv.js';
import { resultsJsonBytes, type KnownRunLine } from './json.js';

export interface SweepFolderOptions {
  /** Run lines already serialised (the journal's), reused in results.json. */
  known?: KnownRunLine;
  /** Writes more files into the temporary folder before it is renamed into place. */
  addFiles?: (tmpDir: string) => Promise<unknown>;
}

export async function writeSweepFolder(outDir: string, results: ResultsFile, options: SweepFolderOptions = {}): Promise<void> {
  await writeFolderAtomically(outDir, async (tmp) => {
    await writeFile(join(tmp, 'results.json'), resultsJsonBytes(results, options.known));
    await writeFile(join(tmp, 'results.csv'), resultsCsv(results));
    await options.addFiles?.(tmp);
  });
}
