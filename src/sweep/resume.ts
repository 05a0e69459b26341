// What `run --resume DIR` continues from: the request and finished runs of an interrupted sweep in
// DIR, read from its journal (killed mid-sweep) or else its results.json (stopped by Ctrl-C).
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../core/errors.js';
import type { RunResult } from '../results/contract.js';
import { readResultsFile } from '../results/read.js';
import { journalPath, readJournal } from './journal.js';
import { requestFromRecord, type ResumableRequest } from './request-record.js';

export interface InterruptedSweep {
  request: ResumableRequest;
  finished: readonly RunResult[];
  /** The plan fingerprint the sweep recorded (checked against the new plan). */
  planSha256: unknown;
  /** The file it was read from, for messages. */
  where: string;
}

/** `label` names the folder in messages, e.g. "--resume reports/x". */
export function interruptedSweep(dir: string, label: string): InterruptedSweep {
  const journal = readJournal(dir);
  if (journal) return { request: requestFromRecord(journal.header.request, journalPath(dir)), finished: journal.runs, planSha256: journal.header.planSha256, where: journalPath(dir) };
  const file = join(dir, 'results.json');
  if (!existsSync(file)) throw new InputError(`no interrupted sweep here (neither a journal nor results.json)`, label);
  const old = readResultsFile(file);
  if (!old.interrupted) throw new InputError('that sweep finished; nothing to resume', label);
  if (!old.request) throw new InputError('results.json has no request record to resume from', file);
  return { request: requestFromRecord(old.request, file), finished: old.runs, planSha256: (old.plan as { sha256?: unknown } | undefined)?.sha256, where: file };
}
