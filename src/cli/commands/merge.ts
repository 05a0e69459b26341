// `stepgauge merge`: join the shards of one sweep (or separate sweeps) into one results file.
import { writeFileAtomic } from '../../results/atomic.js';
import { assertReplaceableFile, declaresFormat } from '../../results/ownership.js';
import { readResultsFile } from '../../results/read.js';
import { mergeResults } from '../../results/merge.js';
import { resultsJson } from '../../results/json.js';
import type { RegisterCommand } from './register.js';

export const registerMerge: RegisterCommand = (program) => {
  program
    .command('merge')
    .description('merge results files (e.g. all shards of a sweep) into one, in plan order')
    .argument('<files...>', 'results.json files to merge')
    .requiredOption('--out <file>', 'merged results file to write (atomically)')
    .action(async (paths: string[], flags: { out: string }) => {
      assertReplaceableFile(flags.out, '--out', (p) => declaresFormat(p, 'stepgauge-results'));
      const files = paths.map((path) => ({ path, results: readResultsFile(path) }));
      const merged = mergeResults(files, (w) => process.stderr.write(`stepgauge: warning: ${w}\n`));
      await writeFileAtomic(flags.out, resultsJson(merged));
      process.stdout.write(`wrote ${flags.out}: ${merged.runs.length} runs from ${files.length} file(s)\n`);
    });
};
