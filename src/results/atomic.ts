// Atomic writes: an interrupted or failing write never leaves a half-written file or folder where
// a reader (CI, a report viewer, the next check) would pick it up. The temporary lives in the
// same folder as the target because rename is atomic only within one file system.
import { randomBytes } from 'node:crypto';
import { closeSync, fsyncSync, openSync, renameSync, rmSync, unlinkSync, writeSync } from 'node:fs';
import { lstat, mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import { assertReplaceableFolder, OUTPUT_MARKER, OUTPUT_MARKER_TEXT } from './ownership.js';
import { asFileSystemError } from '../core/errors.js';

/** A fresh temporary name beside `target` (hidden, with the process id and a random tag). */
export function tempSibling(target: string, tag: string): string {
  const abs = resolve(target);
  return join(dirname(abs), `.${basename(abs)}.${tag}-${process.pid}-${randomBytes(4).toString('hex')}`);
}

/** Writes `data` to `path` via a temporary sibling file and a rename; parent folders are created. */
export async function writeFileAtomic(path: string, data: string | Uint8Array): Promise<void> {
  try {
    await mkdir(dirname(resolve(path)), { recursive: true });
  } catch (e) {
    throw asFileSystemError(e, path);
  }
  writeFileAtomicSync(path, data);
}

/**
 * Writes `path` by `fill(tmp)`, which writes the whole file at the temporary sibling `tmp` (for a
 * file written piece by piece), then flushes it and renames it into place; on failure the
 * temporary is removed and nothing is left at `path`.
 */
export function writeFileAtomicWith(path: string, fill: (tmp: string) => void): void {
  const tmp = tempSibling(path, 'tmp');
  try {
    fill(tmp);
    const fd = openSync(tmp, 'r+');
    try {
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(tmp, path);
  } catch (e) {
    rmSync(tmp, { force: true });
    throw asFileSystemError(e, path);
  }
}

/**
 * Synchronous form of writeFileAtomic (the parent folder must exist). A system failure (disk
 * full, permission) is thrown as FileSystemError naming `path`, with no temporary left behind.
 */
export function writeFileAtomicSync(path: string, data: string | Uint8Array): void {
  const tmp = tempSibling(path, 'tmp');
  let fd: number | undefined;
  try {
    fd = openSync(tmp, 'wx');
    const bytes = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
    let off = 0;
    while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
    // Flush before the rename so a crash cannot leave the new name pointing at empty blocks.
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    renameSync(tmp, path);
  } catch (e) {
    if (fd !== undefined) closeSync(fd);
    try {
      unlinkSync(tmp);
    } catch {
      /* never created or already renamed */
    }
    throw asFileSystemError(e, path);
  }
}

/**
 * Fills a temporary sibling folder with `fill(tmpDir)` and renames it to `target`; the new folder
 * carries stepgauge's marker (src/results/ownership.ts). Only an absent or empty target, or one
 * stepgauge wrote, is replaced: anything else throws InputError before `fill` runs. An existing
 * target is moved aside first (a folder cannot be renamed over a non-empty one) and removed only
 * after the new folder is in place; if that rename fails, the old folder is put back. When `fill`
 * throws, the temporary folder is removed and the target is left untouched.
 */
export async function writeFolderAtomically(target: string, fill: (tmpDir: string) => Promise<void>, flag = '--out'): Promise<void> {
  try {
    await replaceFolder(target, fill, flag);
  } catch (e) {
    // A system failure names the folder the user gave, not a temporary inside it.
    throw asFileSystemError(e, `${flag} ${target}`);
  }
}

async function replaceFolder(target: string, fill: (tmpDir: string) => Promise<void>, flag: string): Promise<void> {
  assertReplaceableFolder(target, flag);
  const abs = resolve(target);
  await mkdir(dirname(abs), { recursive: true });
  const tmp = tempSibling(abs, 'tmp');
  await mkdir(tmp);
  try {
    await fill(tmp);
    await writeFile(join(tmp, OUTPUT_MARKER), OUTPUT_MARKER_TEXT);
  } catch (e) {
    await rm(tmp, { recursive: true, force: true });
    throw e;
  }
  let old: string | undefined;
  if (await exists(abs)) {
    // Checked again here: the folder may have changed while `fill` ran.
    try {
      assertReplaceableFolder(target, flag);
    } catch (e) {
      await rm(tmp, { recursive: true, force: true });
      throw e;
    }
    old = tempSibling(abs, 'old');
    await rename(abs, old);
  }
  try {
    await rename(tmp, abs);
  } catch (e) {
    if (old) await rename(old, abs);
    await rm(tmp, { recursive: true, force: true });
    throw e;
  }
  if (old) rmSync(old, { recursive: true, force: true });
}

/** True when something (a file, folder or link, even a dangling one) is at `p`. */
export async function exists(p: string): Promise<boolean> {
  try {
    await lstat(p);
    return true;
  } catch {
    return false;
  }
}
