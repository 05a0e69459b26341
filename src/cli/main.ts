// CLI entry: builds the command tree and maps failures to exit codes
// (0 success, 1 a check found regressions or nothing met a target, 2 bad input,
// 3 a sweep completed with failed runs, 70 internal error, 130 interrupted).
import { Command, CommanderError } from 'commander';
import { isInputError, messageOf } from '../core/errors.js';
import { commands } from './commands/index.js';
import { packageVersion } from '../core/version.js';

export async function main(argv: string[]): Promise<number> {
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
  try {
    await program.parseAsync(argv, { from: 'user' });
    return code;
  } catch (e) {
    if (e instanceof CommanderError) {
      if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version' || e.code === 'commander.help') return 0;
      return 2;
    }
    if (isInputError(e)) {
      process.stderr.write(`stepgauge: ${e.message}\n`);
      return 2;
    }
    process.stderr.write(`stepgauge: internal error: ${messageOf(e)}\n`);
    if (process.env.STEPGAUGE_DEBUG) process.stderr.write(`${(e as Error).stack ?? ''}\n`);
    else process.stderr.write('stepgauge: set STEPGAUGE_DEBUG=1 for a stack trace, and please report this\n');
    return 70;
  }
}
