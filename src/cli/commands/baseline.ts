// `stepgauge baseline`: reduce a results file to a committed baseline with reproducible bytes.
import { assertBaselineSource, BASELINE_FORMAT, makeBaseline, serializeBaseline } from '../../gate/baseline.js';
import { writeFileAtomic } from '../../results/atomic.js';
import { assertReplaceableFile, declaresFormat } from '../../results/ownership.js';
import { readResultsFile } from '../../results/read.js';
import type { RegisterCommand } from './register.js';

export const registerBaseline: RegisterCommand = (program) => {
  program
    .command('baseline')
    .description('write the baseline a later `check` compares against (sorted, byte-stable)')
    .argument('<results>', 'results.json of a complete sweep')
    .requiredOption('--out <file>', 'baseline file to write (atomically)')
    .option('--keep-time', 'keep run times and the calibration, for `check --time`')
    .action(async (resultsPath: string, flags: { out: string; keepTime?: boolean }) => {
      assertReplaceableFile(flags.out, '--out', (p) => declaresFormat(p, BASELINE_FORMAT));
      const results = readResultsFile(resultsPath);
      assertBaselineSource(results, resultsPath, flags.keepTime ?? false);
      const baseline = makeBaseline(results, { keepTime: flags.keepTime ?? false });
      await writeFileAtomic(flags.out, serializeBaseline(baseline));
      process.stdout.write(
        `wrote ${flags.out}: ${baseline.runs.length} runs over ${baseline.problems.length} problems${flags.keepTime ? ', with calibrated times' : ''}\n`,
      );
    });
};
