// What stepgauge may replace. It replaces only what it made itself: a folder that carries its
// marker file or a stepgauge results.json, an empty folder, or a file that is one of its own
// formats. Anything else named as an output (a thesis folder, a source tree, `.`, a repository)
// is refused with an InputError naming the path and why, before any work starts.
import { closeSync, lstatSync, openSync, readSync, readdirSync, statSync } from 'node:fs';
import { isAbsolute, join, relative, resolve } from 'node:path';
import { InputError } from '../core/errors.js';

/** Written into every folder stepgauge creates; its presence says "stepgauge may replace this". */
export const OUTPUT_MARKER = '.stepgauge-output';
export const OUTPUT_MARKER_TEXT = 'This folder was written by stepgauge; `stepgauge run -o` may replace it whole.\n';

/** The first bytes of a file, enough to see which format it declares. */
function head(path: string, bytes = 512): string {
  const fd = openSync(path, 'r');
  try {
    const buf = Buffer.alloc(bytes);
    const n = readSync(fd, buf, 0, bytes, 0);
    return buf.subarray(0, n).toString('utf8');
  } finally {
    closeSync(fd);
  }
}

/** True when `path` is a regular file whose first bytes declare `"format": "<format>"`. */
export function declaresFormat(path: string, format: string): boolean {
  try {
    if (!statSync(path).isFile()) return false;
    return new RegExp(`^\\s*\\{\\s*"format"\\s*:\\s*"${format}"`).test(head(path));
  } catch {
    return false;
  }
}

function kind(path: string): 'absent' | 'folder' | 'file' | 'other' {
  try {
    const s = lstatSync(path);
    if (s.isSymbolicLink()) return statSync(path).isDirectory() ? 'folder' : 'other';
    return s.isDirectory() ? 'folder' : s.isFile() ? 'file' : 'other';
  } catch {
    return 'absent';
  }
}

/**
 * Throws unless `dir` may be written as an output folder: absent, empty, or stepgauge's own
 * (marker or results.json). `flag` is the option that named it, for the message. `whole`: the
 * folder is replaced whole (run), so the current folder and its parents are never allowed.
 */
export function assertReplaceableFolder(dir: string, flag = '--out', whole = true): void {
  if (dir.trim() === '') throw new InputError('an empty folder name; give the folder to write, e.g. reports/today', flag);
  const abs = resolve(dir);
  const where = `${flag} ${dir}`;
  // The current folder or one above it: replacing it would pull the ground from under the user.
  const up = relative(abs, process.cwd());
  if (whole && (up === '' || (!up.startsWith('..') && !isAbsolute(up)))) {
    throw new InputError('is the current folder or contains it; stepgauge writes only into a new folder or one it wrote before', where);
  }
  const k = kind(abs);
  if (k === 'absent') return;
  if (k !== 'folder') throw new InputError('exists and is not a folder; give a new folder name', where);
  const entries = readdirSync(abs);
  if (entries.length === 0) return;
  if (entries.includes(OUTPUT_MARKER) || declaresFormat(join(abs, 'results.json'), 'stepgauge-results')) return;
  throw new InputError(
    `is a folder stepgauge did not write (${entries.length} entr${entries.length === 1 ? 'y' : 'ies'}, no ${OUTPUT_MARKER} or stepgauge results.json); it is left untouched: give a new or empty folder`,
    where,
  );
}

/**
 * Throws unless `path` may be written as an output file: absent, empty, or already a file of
 * `format` (its first bytes declare it, or `recognise` says so).
 */
export function assertReplaceableFile(path: string, flag: string, recognise: (path: string) => boolean): void {
  if (path.trim() === '') throw new InputError('an empty file name', flag);
  const where = `${flag} ${path}`;
  const k = kind(resolve(path));
  if (k === 'absent') return;
  if (k === 'folder') throw new InputError('is a folder; give a file name', where);
  if (k !== 'file') throw new InputError('exists and is not a regular file; give a new file name', where);
  if (statSync(path).size === 0 || recognise(path)) return;
  throw new InputError('exists and is not a file stepgauge wrote; it is left untouched: give a new file name', where);
}

/** For JUnit XML: a file that starts like the XML `check --junit` writes. */
export function looksLikeOurJunit(path: string): boolean {
  try {
    return /^<\?xml[^>]*\?>\s*<testsuites name="stepgauge/.test(head(path));
  } catch {
    return false;
  }
}
