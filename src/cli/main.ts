// CLI entry: builds the command tree and maps failures to exit codes (src/cli/exit-codes.ts:
// 0 success, 1 a check found regressions or nothing met a target, 2 bad input, 3 a sweep
// completed with failed runs and --fail-on-failed-runs was given, 70 internal error, 74 an I/O
// failure, 130 interrupted).
import { Command, CommanderError } from 'commander';
import { ExitCalledError, exitProcess, guardProcessExit } from '../core/exit-guard.js';
import { EXIT, failureOutcome } from './exit-codes.js';
import { commands } from './commands/index.js';
import { packageVersion } from '../core/version.js';
import { setCommandLine } from './command-line.js';

export async function main(argv: string[]): Promise<number> {
  setCommandLine(argv);
  const program = new Command('stepgauge')
    .description('Measure, compare and gate ODE integrators on problems with known solutions.')
    .version(packageVersion())
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) })
    .showHelpAfterError('(run with --help for usage)');
  let code = 0;
  for (const register of commands) {
    register(program, (c) => {
      code = Math.max(code, c);
    });
  }
  // User modules run in this process at --jobs 1: a process.exit of theirs fails their run
  // instead of ending the command (src/core/exit-guard.ts).
  const lower = guardProcessExit();
  try {
    await program.parseAsync(argv, { from: 'user' });
    return code;
  } catch (e) {
    if (e instanceof CommanderError) {
      if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version' || e.code === 'commander.help') return EXIT.ok;
      return EXIT.badInput;
    }
    const outcome = failureOutcome(e);
    process.stderr.write(`stepgauge: ${outcome.line}\n`);
    if (outcome.internal) {
      if (process.env.STEPGAUGE_DEBUG) process.stderr.write(`${(e as Error).stack ?? ''}\n`);
      else process.stderr.write('stepgauge: set STEPGAUGE_DEBUG=1 for a stack trace, and please report this\n');
    }
    return outcome.code;
  } finally {
    lower();
  }
}

/**
 * Process-wide hooks for the command-line launcher (not for library callers or in-process tests):
 * a closed standard output (`stepgauge run ... | head`) ends writing to it quietly, and a failure
 * no command caught (a module's process.exit or throw from a timer) still gets one line and its
 * exit code (src/cli/exit-codes.ts), never a stack trace with exit 1.
 */
export function installProcessHooks(): void {
  for (const stream of [process.stdout, process.stderr]) {
    stream.on('error', (e: NodeJS.ErrnoException) => {
      if (e.code !== 'EPIPE') throw e;
      // The reader has gone: whatever the command still prints is dropped, the command finishes.
      stream.write = (() => true) as typeof stream.write;
    });
  }
  const fatal = (e: unknown) => {
    const outcome = failureOutcome(e);
    if (e instanceof ExitCalledError) {
      outcome.line = `${e.message}, from a timer or callback outside any run; the command stopped without writing results (a sweep's finished runs stay in its journal: stepgauge run --resume <folder>)`;
    }
    try {
      process.stderr.write(`stepgauge: ${outcome.line}\n`);
      if (outcome.internal && process.env.STEPGAUGE_DEBUG) process.stderr.write(`${(e as Error).stack ?? ''}\n`);
    } finally {
      exitProcess(outcome.code);
    }
  };
  process.on('uncaughtException', fatal);
  process.on('unhandledRejection', fatal);
}
