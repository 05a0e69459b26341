// `stepgauge envelope`: a dispersion's error distributions from a results file (a merged cluster
// sweep, say) and, given a target, the cheapest swept setting per method that meets it on a share
// of the samples, with the samples that miss it named. Reads results only; integrates nothing.
import type { RegisterCommand } from './register.js';
import { InputError } from '../../core/errors.js';
import { parsePositive } from '../options.js';
import { readResultsFile } from '../../results/read.js';

interface EnvelopeFlags {
  target?: string;
  quantile?: string;
  measure: string;
  json?: boolean;
}

export const registerEnvelope: RegisterCommand = (program, setExit) => {
  program
    .command('envelope')
    .description("a dispersion's error distribution per method and setting, from a results file; with --target, the cheapest swept setting meeting it on a share of the samples")
    .argument('<results>', 'results.json of a sweep over a dispersed problem (or the merge of its shards)')
    .option('--target <error>', 'largest acceptable error in the problem\'s error scale')
    .option('--quantile <q>', "share of the samples that must meet the target, in (0, 1], or 'worst'", '0.95')
    .option('--measure <which>', 'final or max', 'final')
    .option('--json', 'print the distributions (and choice) as JSON')
    .action(async (path: string, flags: EnvelopeFlags) => {
      const { parseQuantile } = await import('../choose-dispersed.js');
      const { dispersionSummary } = await import('../../report/dispersion-summary.js');
      const { envelopeFromSummary, envelopeSummaryText } = await import('../envelope-text.js');
      if (flags.measure !== 'final' && flags.measure !== 'max') throw new InputError(`'${flags.measure}' is not final or max`, '--measure');
      const q = parseQuantile(flags.quantile);
      const results = readResultsFile(path);
      const summary = dispersionSummary(results, q, flags.measure);
      if (summary.rows.length === 0) throw new InputError('holds no runs of dispersion samples (problems with a `dispersion` entry)', path);
      const target = flags.target === undefined ? undefined : parsePositive(flags.target, '--target');
      const choice = target === undefined ? undefined : envelopeFromSummary(summary, results, target);
      if (flags.json) process.stdout.write(`${JSON.stringify({ summary, choice }, (_k, v) => (v === Infinity ? null : v), 2)}\n`);
      else process.stdout.write(`${envelopeSummaryText(summary, choice)}\n`);
      if (choice && choice.every((c) => c.recommended === null)) setExit(1);
    });
};
