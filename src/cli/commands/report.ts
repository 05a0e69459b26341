// `stepgauge report`: redraw plots, report.html and report.md from a results file, without
// integrating again.
import { dirname } from 'node:path';
import { readResultsFile } from '../../results/read.js';
import type { RegisterCommand } from './register.js';
import { parseLevels } from '../options.js';

export const registerReport: RegisterCommand = (program) => {
  program
    .command('report')
    .description('write plots/*.png, report.html and report.md from a results.json')
    .argument('<results>', 'results.json written by `stepgauge run` (or `merge`)')
    .option('-o, --out <dir>', 'folder to write the report into (default: the folder of the results file)')
    .option('--title <text>', 'report title')
    .option('--summary-levels <list>', "error levels for the summary table, e.g. a target: 1e-2,1e-4 (default: from the errors each problem's runs reached)")
    .action(async (path: string, flags: { out?: string; title?: string; summaryLevels?: string }) => {
      // The validating reader throws InputError naming the file and the field.
      const results = readResultsFile(path);
      const { installReport } = await import('../../report/install.js');
      const written = await installReport(results, flags.out ?? dirname(path), {
        ...(flags.title ? { title: flags.title } : {}),
        ...(flags.summaryLevels === undefined ? {} : { levels: parseLevels(flags.summaryLevels) }),
        flag: flags.out === undefined ? 'report folder (the results file\'s own)' : '--out',
      });
      for (const f of written) process.stdout.write(`wrote ${f}\n`);
    });
};
