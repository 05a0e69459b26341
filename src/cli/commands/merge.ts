// `stepgauge merge`: join the shards of one sweep (or separate sweeps) into one results file.
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { assertReplaceableFile, declaresFormat } from '../../results/ownership.js';
import { mergeFiles } from '../../results/merge-files.js';
import { asFileSystemError } from '../../core/errors.js';
import type { RegisterCommand } from './register.js';

export const registerMerge: RegisterCommand = (program) => {
  program
    .command('merge')
    .description('merge results files (e.g. all shards of a sweep) into one, in plan order')
    .argument('<files...>', 'results.json files to merge')
    .requiredOption('--out <file>', 'merged results file to write (atomically)')
    .action(async (paths: string[], flags: { out: string }) => {
      assertReplaceableFile(flags.out, '--out', (p) => declaresFormat(p, 'stepgauge-results'));
      try {
        mkdirSync(dirname(resolve(flags.out)), { recursive: true });
      } catch (e) {
        throw asFileSystemError(e, flags.out);
      }
      // One file's runs in memory at a time (results/merge-files.ts).
      const runs = mergeFiles(paths, flags.out, (w) => process.stderr.write(`stepgauge: warning: ${w}\n`));
      process.stdout.write(`wrote ${flags.out}: ${runs} runs from ${paths.length} file(s)\n`);
    });
};
