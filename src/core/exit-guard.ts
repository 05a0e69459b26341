// User code (problem and method modules) runs in the main process at --jobs 1. A module that
// calls process.exit would end the command silently, with whatever exit code it chose and no
// results written. While the guard is up, process.exit throws ExitCalledError instead, so the
// call fails the run that made it (recorded as `error`) and the sweep goes on.

export class ExitCalledError extends Error {
  readonly requestedCode: unknown;
  constructor(code: unknown) {
    super(`user code called process.exit(${code === undefined ? '' : String(code)}); stepgauge did not exit (a module must return or throw, not end the process)`);
    this.name = 'ExitCalledError';
    this.requestedCode = code;
  }
}

let depth = 0;
let realExit: typeof process.exit | undefined;

/** Raises the guard (nested calls are counted); the answer lowers it again. */
export function guardProcessExit(): () => void {
  if (depth++ === 0) {
    realExit = process.exit;
    process.exit = ((code?: unknown) => {
      throw new ExitCalledError(code);
    }) as typeof process.exit;
  }
  let lowered = false;
  return () => {
    if (lowered) return;
    lowered = true;
    if (--depth === 0 && realExit) {
      process.exit = realExit;
      realExit = undefined;
    }
  };
}

/** Ends the process for stepgauge's own reasons (a second Ctrl-C), past the guard. */
export function exitProcess(code: number): never {
  return (realExit ?? process.exit).call(process, code);
}
