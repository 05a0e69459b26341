// `stepgauge check`: gate a results file against a committed baseline (exit 1 on regressions).
import { readBaselineOrResults } from '../../gate/baseline.js';
import { compareResults } from '../../gate/compare.js';
import { junitXml } from '../../gate/junit.js';
import { formatComparison } from '../../gate/report-text.js';
import { writeFileAtomic } from '../../results/atomic.js';
import { assertReplaceableFile, looksLikeOurJunit } from '../../results/ownership.js';
import { readResultsFile } from '../../results/read.js';
import { parseNumber } from '../options.js';
import type { RegisterCommand } from './register.js';

interface CheckFlags {
  baseline: string;
  junit?: string;
  json?: boolean;
  errorFactor: string;
  driftFactor: string;
  workFraction: string;
  floor?: string;
  allowMissing?: boolean;
  time?: string;
  verbose?: boolean;
}

export const registerCheck: RegisterCommand = (program, setExit) => {
  program
    .command('check')
    .description('compare a results file with a baseline run by run; exit 1 on any regression')
    .argument('<results>', 'results.json of the current sweep')
    .requiredOption('--baseline <file>', 'baseline file (from `stepgauge baseline`) or an earlier results.json')
    .option('--junit <file>', 'also write JUnit XML: one testcase per run, one failure per regression')
    .option('--json', 'print the comparison as JSON instead of text')
    .option('--error-factor <x>', 'fail when error.final or error.max grows by more than this factor', '2')
    .option('--drift-factor <x>', 'fail when an invariant drift grows by more than this factor', '2')
    .option('--work-fraction <f>', 'fail when nfev, njev or nlu grows by more than this fraction', '0.1')
    .option('--floor <v>', 'errors and drifts are raised to this floor before ratios (default 64 ulp, ~1.4e-14)')
    .option('--allow-missing', 'baseline runs absent from the results are warnings, not failures')
    .option('--time <factor>', 'also fail when a run is slower than this factor, in units of the calibration workload')
    .option('--verbose', 'list notes for new runs too')
    .action(async (resultsPath: string, flags: CheckFlags) => {
      if (flags.junit !== undefined) assertReplaceableFile(flags.junit, '--junit', looksLikeOurJunit);
      const baseline = readBaselineOrResults(flags.baseline);
      const current = readResultsFile(resultsPath);
      const comparison = compareResults(baseline, current, {
        errorFactor: parseNumber(flags.errorFactor, '--error-factor'),
        driftFactor: parseNumber(flags.driftFactor, '--drift-factor'),
        workFraction: parseNumber(flags.workFraction, '--work-fraction'),
        ...(flags.floor !== undefined ? { floor: parseNumber(flags.floor, '--floor') } : {}),
        allowMissing: flags.allowMissing ?? false,
        timeFactor: flags.time !== undefined ? parseNumber(flags.time, '--time') : null,
        labels: { baseline: flags.baseline, current: resultsPath },
      });
      if (flags.junit) await writeFileAtomic(flags.junit, junitXml(comparison, { timestamp: new Date().toISOString() }));
      if (flags.json) process.stdout.write(`${JSON.stringify(comparison, null, 2)}\n`);
      else process.stdout.write(formatComparison(comparison, { verbose: flags.verbose ?? false }));
      if (!comparison.ok) setExit(1);
    });
};
