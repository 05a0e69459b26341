// What a sweep's results depend on besides its request: the stepgauge version and the bytes of
// every problem and method file it names. Recorded in the journal and in an interrupted
// results.json, and compared by `run --resume`, so a resumed sweep never mixes runs of an old and
// a new model (or integrator, or stepgauge) under one results file.
import { createHash } from 'node:crypto';
import { readFileSync, statSync } from 'node:fs';
import { InputError } from '../core/errors.js';
import { packageVersion } from '../core/version.js';
import { fileEntries } from './resolve.js';

export interface SweepInputs {
  stepgauge: string;
  /** SHA-256 of each problem and method file, by its entry in --problem / --method. */
  files: Record<string, string>;
}

function fileSha256(path: string): string | null {
  try {
    // Only a regular file is read: reading a FIFO would block this process for good (issue 22);
    // the loader then says what the path is.
    if (!statSync(path).isFile()) return null;
    return createHash('sha256').update(readFileSync(path)).digest('hex');
  } catch {
    return null;
  }
}

/** The inputs of a request with these --problem and --method lists, as they are now. */
export function sweepInputs(req: { problem?: string; method?: string }): SweepInputs {
  const files: Record<string, string> = Object.create(null) as Record<string, string>;
  for (const entry of [...fileEntries(req.problem), ...fileEntries(req.method)]) files[entry] = fileSha256(entry) ?? 'unreadable';
  return { stepgauge: packageVersion(), files };
}

/**
 * Refuses to resume (InputError naming `where`) when the recorded inputs are missing (a journal
 * from a stepgauge that did not record them) or differ from `now`, saying what changed.
 */
export function assertSameInputs(recorded: unknown, now: SweepInputs, where: string): void {
  const rec = recorded as Partial<SweepInputs> | undefined;
  if (!rec || typeof rec !== 'object' || typeof rec.stepgauge !== 'string' || !rec.files || typeof rec.files !== 'object') {
    throw new InputError('was written by a stepgauge that did not record the hashes of its inputs, so a resume could mix old and new runs; run the sweep again', where);
  }
  const changed: string[] = [];
  if (rec.stepgauge !== now.stepgauge) changed.push(`stepgauge ${rec.stepgauge} -> ${now.stepgauge}`);
  for (const [entry, sha] of Object.entries(now.files)) {
    const before = (rec.files as Record<string, unknown>)[entry];
    if (before !== sha) changed.push(sha === 'unreadable' ? `${entry} (now unreadable)` : `${entry} (SHA-256 ${String(before).slice(0, 12)}... -> ${sha.slice(0, 12)}...)`);
  }
  if (changed.length > 0) {
    throw new InputError(`cannot resume: changed since the sweep started: ${changed.join('; ')}; run the sweep again (into a new folder) instead`, where);
  }
}

/** Refuses a resume whose plan (problem definitions, method selection, settings) is not the recorded one. */
export function assertSamePlan(recorded: unknown, now: string, where: string): void {
  if (typeof recorded === 'string' && recorded !== now) {
    throw new InputError(`cannot resume: the sweep's plan changed since it started (a problem's definition or the methods that apply); run the sweep again instead`, where);
  }
}
