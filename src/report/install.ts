// Putting a finished report in place. The report shares its folder with results.json (by
// default the folder of the results file), so the folder itself cannot be swapped; instead the
// report is written to a temporary folder inside the target (same file system, so renames are
// atomic) and its top-level entries are renamed over the old ones one by one. Only a folder
// stepgauge wrote (or a new or empty one) is written into (src/results/ownership.ts).
import { randomBytes } from 'node:crypto';
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { exists } from '../results/atomic.js';
import { join, resolve } from 'node:path';
import type { ResultsFile } from '../results/contract.js';
import { asFileSystemError } from '../core/errors.js';
import { writeReport } from './index.js';
import { assertReplaceableFolder, OUTPUT_MARKER, OUTPUT_MARKER_TEXT } from '../results/ownership.js';


/** Writes the report for `results` into `target` (created if missing); returns absolute paths. */
export async function installReport(results: ResultsFile, target: string, options: { title?: string; flag?: string; levels?: readonly number[] } = {}): Promise<string[]> {
  const flag = options.flag ?? '--out';
  try {
    return await install(results, target, options, flag);
  } catch (e) {
    throw asFileSystemError(e, `${flag} ${target}`);
  }
}

async function install(results: ResultsFile, target: string, options: { title?: string; levels?: readonly number[] }, flag: string): Promise<string[]> {
  assertReplaceableFolder(target, flag, false);
  const dir = resolve(target);
  await mkdir(dir, { recursive: true });
  const tag = `${process.pid}-${randomBytes(4).toString('hex')}`;
  const tmp = join(dir, `.report-tmp-${tag}`);
  await mkdir(tmp);
  try {
    const { files } = await writeReport(results, tmp, options);
    const entries = [...new Set(files.map((f) => f.split('/')[0]!))];
    for (const name of entries) {
      const dest = join(dir, name);
      // A folder cannot be renamed over a non-empty one: move the old entry aside first, and
      // drop it only after the new one is in place (stale plots of an earlier report go with it).
      const old = (await exists(dest)) ? join(dir, `.report-old-${tag}-${name}`) : null;
      if (old) await rename(dest, old);
      try {
        await rename(join(tmp, name), dest);
      } catch (e) {
        if (old) await rename(old, dest);
        throw e;
      }
      if (old) await rm(old, { recursive: true, force: true });
    }
    if (!(await exists(join(dir, OUTPUT_MARKER)))) await writeFile(join(dir, OUTPUT_MARKER), OUTPUT_MARKER_TEXT);
    return files.map((f) => join(dir, f));
  } finally {
    await rm(tmp, { recursive: true, force: true });
  }
}
