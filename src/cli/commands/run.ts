// `stepgauge run`: plan the sweep, integrate, write results.json/results.csv (and the report).
import type { Command } from 'commander';
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { RegisterCommand } from './index.js';
import { parsePositive, parsePositiveInt, parseSteps, parseTolerances } from '../options.js';
import { checkWritableTarget, defaultOutDir, pointLatest } from '../output-folder.js';
import { progressLine } from '../progress.js';
import { summaryText } from '../summary.js';
import { DEFAULT_STEPS, DEFAULT_TOLERANCES, planSweep } from '../../sweep/plan.js';
import { resolveMethods, resolveProblems } from '../../sweep/resolve.js';
import { assembleResults, executePlan } from '../../sweep/run.js';
import { DEFAULT_TIMING } from '../../measure/timing.js';
import { writeFolderAtomically } from '../../report/atomic.js';
import { resultsCsv } from '../../report/csv.js';
import { resultsJson } from '../../report/json.js';
import { InputError } from '../../core/errors.js';

interface RunFlags {
  problem?: string;
  method?: string;
  tolerances?: string;
  steps?: string;
  out?: string;
  timing: boolean;
  json?: boolean;
  maxSteps: string;
  timeBudget: string;
  controller: string;
  report: boolean;
  quiet?: boolean;
}

export const registerRun: RegisterCommand = (program: Command, setExit) => {
  program
    .command('run')
    .description('integrate the selected problems with the selected methods over a tolerance/step sweep')
    .option('-p, --problem <list>', 'problem ids or files, comma-separated (default: the whole catalogue)')
    .option('-m, --method <list>', 'method ids or module files, comma-separated (default: all that apply)')
    .option('-t, --tolerances <list>', 'rtol values: a list 1e-4,1e-8 or a range 1e-3..1e-12 (one per decade)', '1e-3..1e-10')
    .option('-s, --steps <list>', `equal-step counts for fixed-step methods (default ${DEFAULT_STEPS.join(',')})`)
    .option('-o, --out <dir>', 'output folder (default reports/<date>-<time>, with reports/latest pointing at it)')
    .option('--no-timing', 'skip wall-time measurement (time is recorded as null)')
    .option('--time-budget <seconds>', 'timing budget per run; long solves get fewer samples', String(DEFAULT_TIMING.budgetSeconds))
    .option('--max-steps <n>', 'step limit per run (accepted + rejected); past it the run ends with status step-limit', '100000')
    .option('--controller <kind>', 'step-size controller for explicit pairs: standard or pi', 'standard')
    .option('--no-report', 'write only results.json and results.csv, no plots or report')
    .option('--json', 'print results.json to standard output instead of the summary')
    .option('-q, --quiet', 'no progress line')
    .action(async (flags: RunFlags) => {
      const tolerances = flags.tolerances === undefined ? [...DEFAULT_TOLERANCES] : parseTolerances(flags.tolerances);
      const steps = flags.steps === undefined ? [...DEFAULT_STEPS] : parseSteps(flags.steps);
      const maxSteps = parsePositiveInt(flags.maxSteps, '--max-steps');
      const budget = parsePositive(flags.timeBudget, '--time-budget');
      if (flags.controller !== 'standard' && flags.controller !== 'pi') {
        throw new InputError(`'${flags.controller}' is not a controller; expected standard or pi`, '--controller');
      }
      const problems = await resolveProblems(flags.problem);
      const methods = await resolveMethods(flags.method);
      const outDir = flags.out ?? defaultOutDir();
      checkWritableTarget(outDir);

      const plan = planSweep({ problems: problems.items, methods: methods.items, tolerances, steps, methodsNamed: methods.named });
      const log = (s: string) => (flags.json ? process.stderr : process.stdout).write(`${s}\n`);
      if (methods.named || problems.named) for (const s of plan.skipped) log(`skipped ${s.problem} x ${s.method}: ${s.reason}`);
      if (plan.runs.length === 0) throw new InputError('the selection pairs no method with any problem (see the skipped lines above)', '--method');

      const progress = progressLine(plan.runs.length, Boolean(flags.quiet || flags.json));
      const timing = flags.timing ? { ...DEFAULT_TIMING, budgetSeconds: budget } : null;
      const runs = await executePlan(
        plan.runs,
        new Map(problems.items.map((p) => [p.id, p])),
        new Map(methods.items.map((m) => [m.id, m])),
        { maxSteps, timing, controller: flags.controller as 'standard' | 'pi', onRun: (p) => progress.update(p) },
      );
      progress.stop();
      const results = await assembleResults({ plan, problems: problems.items, methods: methods.items, runs, timed: timing !== null });

      await writeFolderAtomically(outDir, async (tmp) => {
        await writeFile(join(tmp, 'results.json'), resultsJson(results));
        await writeFile(join(tmp, 'results.csv'), resultsCsv(results));
        if (flags.report) {
          // TEMPORARY until the report module lands: resolved at run time.
          const reportModule: string = '../../report/index.js';
          const { writeReport } = (await import(reportModule)) as { writeReport: (r: unknown, d: string) => Promise<unknown> };
          await writeReport(results, tmp);
        }
      });
      if (!flags.out) pointLatest(outDir);

      if (flags.json) process.stdout.write(resultsJson(results));
      else {
        log(summaryText(results));
        log(`\nwrote ${join(outDir, 'results.json')}, results.csv${flags.report ? ', report.html, report.md and plots/' : ''}`);
      }
      if (results.runs.some((r) => r.status !== 'ok')) setExit(1);
    });
};
