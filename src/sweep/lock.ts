// One sweep at a time per output folder. Two sweeps writing one folder would lose one's results
// and interleave their lines in the shared journal. The lock is a file beside the folder (like the
// journal, since the folder itself appears only at the end) holding the owner's pid and host; a
// lock whose process is gone (killed, crashed) is taken over.
import { closeSync, mkdirSync, openSync, readFileSync, rmdirSync, unlinkSync, writeSync } from 'node:fs';
import { hostname } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { asFileSystemError, InputError, systemCode } from '../core/errors.js';

interface LockOwner {
  pid: number;
  host: string;
  startedAt: string;
}

export function lockPath(outDir: string): string {
  const abs = resolve(outDir);
  return join(dirname(abs), `.${basename(abs)}.lock`);
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    // EPERM: the process exists but belongs to someone else.
    return systemCode(e) === 'EPERM';
  }
}

function readOwner(path: string): LockOwner | null {
  try {
    const o = JSON.parse(readFileSync(path, 'utf8')) as Partial<LockOwner>;
    return typeof o.pid === 'number' && typeof o.host === 'string' ? { pid: o.pid, host: o.host, startedAt: String(o.startedAt) } : null;
  } catch {
    return null;
  }
}

function create(path: string, owner: LockOwner): boolean {
  let fd: number;
  try {
    fd = openSync(path, 'wx');
  } catch (e) {
    if (systemCode(e) === 'EEXIST') return false;
    throw asFileSystemError(e, path, 'cannot create the lock');
  }
  try {
    writeSync(fd, JSON.stringify(owner));
  } finally {
    closeSync(fd);
  }
  return true;
}

export interface SweepLock {
  readonly path: string;
  release(): void;
}

/**
 * Takes the lock of output folder `outDir`, or throws InputError naming `where` when a live
 * process holds it. A lock left by a process that no longer runs (on this host) is taken over.
 */
export function takeLock(outDir: string, where: string): SweepLock {
  const path = lockPath(outDir);
  const me: LockOwner = { pid: process.pid, host: hostname(), startedAt: new Date().toISOString() };
  let made: string | undefined;
  try {
    made = mkdirSync(dirname(path), { recursive: true });
  } catch (e) {
    throw asFileSystemError(e, dirname(path), 'cannot create the folder');
  }
  for (let attempt = 0; attempt < 2; attempt++) {
    if (create(path, me)) {
      return {
        path,
        release: () => {
          // Only our own lock: a later sweep may have taken over one we no longer hold.
          if (readOwner(path)?.pid === me.pid) unlinkSync(path);
          if (made) removeEmptyUpTo(dirname(path), made);
        },
      };
    }
    const owner = readOwner(path);
    // A lock from another host cannot be checked: it is respected.
    if (owner && (owner.host !== me.host || alive(owner.pid))) {
      const who = owner.host === me.host ? `pid ${owner.pid}` : `pid ${owner.pid} on ${owner.host}`;
      throw new InputError(
        `another stepgauge sweep (${who}, started ${owner.startedAt}) is writing this folder; wait for it to end or choose another folder (if it is not running, delete ${path})`,
        where,
      );
    }
    // Its owner is gone (or the file is unreadable): take it over.
    try {
      unlinkSync(path);
    } catch (e) {
      if (systemCode(e) !== 'ENOENT') throw asFileSystemError(e, path, 'cannot take over the lock');
    }
  }
  throw new InputError(`another stepgauge sweep took this folder's lock at the same moment; try again`, where);
}

/** Removes the folders this lock created (from `dir` up to `top`) that stayed empty: bad input writes nothing. */
function removeEmptyUpTo(dir: string, top: string): void {
  for (let d = dir; ; d = dirname(d)) {
    try {
      rmdirSync(d);
    } catch {
      return; // not empty (the results are there) or already gone
    }
    if (d === resolve(top) || dirname(d) === d) return;
  }
}
