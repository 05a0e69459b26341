// Reading a file a user named (a problem file, a matrix a problem file refers to) without letting
// the file's kind or size hang or swamp the tool: only regular files (a FIFO would block the open
// forever, /dev/zero never ends), at most a fixed number of bytes, opened without blocking and
// checked again on the open descriptor so a file swapped in between is caught.
import { constants, type Stats } from 'node:fs';
import { open, realpath, stat } from 'node:fs/promises';
import { relative, isAbsolute, dirname, resolve, sep } from 'node:path';

/** Largest problem file read (YAML or JSON); real models are a few kilobytes. */
export const MAX_PROBLEM_FILE_BYTES = 1024 * 1024;
/** Largest matrix file a problem file may refer to (a dense 1000 x 1000 matrix is about 20 MB). */
export const MAX_MATRIX_FILE_BYTES = 64 * 1024 * 1024;

/** Why a file could not be read; `reason` is a short phrase for a one-line message. */
export class UnreadableFile extends Error {
  constructor(readonly reason: string) {
    super(reason);
    this.name = 'UnreadableFile';
  }
}

/** "a folder", "a FIFO (named pipe)", ...: what a path is when it is not a regular file. */
export function kindOf(s: Stats): string {
  if (s.isDirectory()) return 'a folder';
  if (s.isFIFO()) return 'a FIFO (named pipe)';
  if (s.isCharacterDevice() || s.isBlockDevice()) return 'a device';
  if (s.isSocket()) return 'a socket';
  if (s.isSymbolicLink()) return 'a symbolic link';
  return 'not a regular file';
}

function bytes(n: number): string {
  return n >= 1024 * 1024 && n % (1024 * 1024) === 0 ? `${n / (1024 * 1024)} MB` : `${n} bytes`;
}

/** The text of a regular file of at most maxBytes, as UTF-8. Throws UnreadableFile. */
export async function readRegularFile(path: string, maxBytes: number): Promise<string> {
  let before: Stats;
  try {
    before = await stat(path);
  } catch (e) {
    throw new UnreadableFile((e as NodeJS.ErrnoException).code ?? String(e));
  }
  if (!before.isFile()) throw new UnreadableFile(`${kindOf(before)}, not a regular file`);
  if (before.size > maxBytes) throw new UnreadableFile(`${bytes(before.size)}, larger than the ${bytes(maxBytes)} allowed`);
  let handle;
  try {
    handle = await open(path, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (e) {
    throw new UnreadableFile((e as NodeJS.ErrnoException).code ?? String(e));
  }
  try {
    const s = await handle.stat();
    if (!s.isFile()) throw new UnreadableFile(`${kindOf(s)}, not a regular file`);
    // Read at most one byte past the cap, so a file that grew since stat is caught too.
    const buffer = Buffer.alloc(Math.min(s.size, maxBytes) + 1);
    let filled = 0;
    for (;;) {
      const { bytesRead } = await handle.read(buffer, filled, buffer.length - filled, filled);
      if (bytesRead === 0) break;
      filled += bytesRead;
      if (filled > maxBytes) throw new UnreadableFile(`larger than the ${bytes(maxBytes)} allowed`);
      if (filled === buffer.length) break;
    }
    return buffer.subarray(0, filled).toString('utf8');
  } catch (e) {
    if (e instanceof UnreadableFile) throw e;
    throw new UnreadableFile((e as NodeJS.ErrnoException).code ?? String(e));
  } finally {
    await handle.close();
  }
}

/**
 * The real path of `reference`, written relative to the folder of `fromFile`, when it lies inside
 * that folder after every symbolic link is resolved; throws UnreadableFile otherwise. A problem
 * file may refer only to files beside it or below it, so a file someone hands over cannot read
 * keys or passwords elsewhere on the machine.
 */
export async function referencedFile(fromFile: string, reference: string): Promise<string> {
  if (isAbsolute(reference)) throw new UnreadableFile('an absolute path; give a path relative to the problem file, inside its folder');
  const folder = dirname(await realpath(fromFile));
  let target: string;
  try {
    target = await realpath(resolve(folder, reference));
  } catch (e) {
    throw new UnreadableFile((e as NodeJS.ErrnoException).code ?? String(e));
  }
  const inside = relative(folder, target);
  if (inside === '' || inside === '..' || inside.startsWith(`..${sep}`) || isAbsolute(inside)) {
    throw new UnreadableFile("outside the problem file's folder (after resolving links); keep referenced files beside the problem file or below it");
  }
  return target;
}
