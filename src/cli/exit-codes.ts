// The exit codes, disjoint so a script can tell what happened (README "What happens when things
// go wrong" lists them; keep that table and DEVELOPERS.md in step with this file).
import { FileSystemError, isInputError, messageOf, systemCode } from '../core/errors.js';
import { ExitCalledError } from '../core/exit-guard.js';

export const EXIT = {
  ok: 0,
  /** `check` found regressions; `choose` found no method meeting the target. */
  verdict: 1,
  /** Bad input: a flag, a file, a field, or a path of the wrong kind. */
  badInput: 2,
  /** `run --fail-on-failed-runs` completed and wrote its results, but some runs failed. */
  runsFailed: 3,
  /** A bug in stepgauge (or a worker that could not start). */
  internal: 70,
  /** The system refused a read or write: disk full, permission, read-only file system. */
  io: 74,
  interrupted: 130,
} as const;

/** Codes that mean the user gave a path of the wrong kind (a folder where a file goes, ...): bad input. */
const WRONG_KIND = new Set(['EISDIR', 'ENOTDIR', 'EEXIST', 'ENAMETOOLONG', 'ELOOP']);

/** The one line to print and the exit code for a failure that reached the top of a command. */
export function failureOutcome(e: unknown): { line: string; code: number; internal: boolean } {
  if (isInputError(e)) return { line: e.message, code: EXIT.badInput, internal: false };
  if (e instanceof ExitCalledError) return { line: e.message, code: EXIT.badInput, internal: false };
  const sys = systemCode(e);
  if (e instanceof FileSystemError || (sys && typeof (e as { path?: unknown }).path === 'string')) {
    const code = e instanceof FileSystemError ? e.code : sys!;
    return { line: messageOf(e), code: WRONG_KIND.has(code) ? EXIT.badInput : EXIT.io, internal: false };
  }
  return { line: `internal error: ${messageOf(e)}`, code: EXIT.internal, internal: true };
}
