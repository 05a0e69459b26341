// Where a sweep's files go: reports/<date>-<time>/ by default, with reports/latest pointing at it.
import { accessSync, constants, existsSync, lstatSync, mkdirSync, renameSync, statSync, symlinkSync, unlinkSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { InputError } from '../core/errors.js';
import { assertReplaceableFolder } from '../results/ownership.js';

export function defaultOutDir(now = new Date()): string {
  const p = (n: number) => String(n).padStart(2, '0');
  const stamp = `${now.getFullYear()}-${p(now.getMonth() + 1)}-${p(now.getDate())}-${p(now.getHours())}${p(now.getMinutes())}${p(now.getSeconds())}`;
  return join('reports', stamp);
}

/**
 * Fails early (before any integration) when the output folder could not be written, or is not
 * one stepgauge may replace (src/results/ownership.ts).
 */
export function checkWritableTarget(dir: string, flag = '--out'): void {
  assertReplaceableFolder(dir, flag);
  const abs = resolve(dir);
  if (existsSync(abs) && !statSync(abs).isDirectory()) throw new InputError(`${dir} exists and is not a folder`, flag);
  // Find the nearest existing ancestor: that is where the temporary folder will be created.
  let probe = dirname(abs);
  while (!existsSync(probe)) {
    const up = dirname(probe);
    if (up === probe) break;
    probe = up;
  }
  if (!statSync(probe).isDirectory()) throw new InputError(`${probe} is not a folder, so ${dir} cannot be created`, flag);
  try {
    accessSync(probe, constants.W_OK);
  } catch {
    throw new InputError(`cannot write into ${probe}`, flag);
  }
}

/** Points <parent>/latest at the folder just written (a relative symlink, replaced atomically). */
export function pointLatest(dir: string): void {
  const abs = resolve(dir);
  const link = join(dirname(abs), 'latest');
  try {
    if (existsSync(link) && !lstatSync(link).isSymbolicLink()) return; // never replace a real folder
    const tmp = `${link}.${process.pid}.tmp`;
    if (existsSync(tmp)) unlinkSync(tmp);
    symlinkSync(basename(abs), tmp);
    renameSync(tmp, link);
  } catch {
    /* a missing latest link is cosmetic */
  }
}

export function ensureParent(dir: string): void {
  mkdirSync(dirname(resolve(dir)), { recursive: true });
}
