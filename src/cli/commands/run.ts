// `stepgauge run`: parse the flags, run the sweep as a session that writes a folder
// (src/sweep/session.ts: lock, resume, workers, journal, Ctrl-C) and print what happened.
// The integrators, the sweep machinery and the report renderer load inside the action, after the
// session started a parallel sweep's workers, so the workers load their modules meanwhile.
import type { Command } from 'commander';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { createReadStream } from 'node:fs';
import { pipeline } from 'node:stream/promises';
import type { RegisterCommand } from './register.js';
import { commandLine } from '../command-line.js';
import { CONTROLLER_HELP, parseAtol, parseController, parseJobs, parseLevels, parsePositive, parsePositiveInt, parseRunTimeout, parseSteps, parseTolerances } from '../options.js';
import { checkWritableTarget, defaultOutDir, pointLatest } from '../output-folder.js';
import type { ProgressLine } from '../progress.js';
import type { GivenFlags } from '../flag-notes.js';
import { DEFAULT_STEPS } from '../../sweep/plan.js';
import type { SweepRequest } from '../../sweep/run.js';
import { parseShardSpec } from '../../sweep/shard.js';
import { openSweepSession, type SweepSession } from '../../sweep/session.js';
import { DEFAULT_MAX_STEPS, DEFAULT_TIMING, DEFAULT_TOLERANCE_RANGE } from '../../core/defaults.js';
import { InputError } from '../../core/errors.js';
import { EXIT } from '../exit-codes.js';
import { divertStdout } from '../divert-stdout.js';

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
  jobs?: string;
  runTimeout?: string;
  shard?: string;
  resume?: string;
  failOnFailedRuns?: boolean;
  atol?: string;
  summaryLevels?: string;
}

/** Turns validated flags into a sweep request; every bad value names its flag. */
export function requestFromFlags(flags: RunFlags): SweepRequest {
  const req: SweepRequest = {
    ...(flags.tolerances === undefined ? {} : { tolerances: parseTolerances(flags.tolerances) }),
    ...(flags.atol === undefined ? {} : { atol: parseAtol(flags.atol) }),
    ...(flags.steps === undefined ? {} : { steps: parseSteps(flags.steps) }),
    maxSteps: parsePositiveInt(flags.maxSteps, '--max-steps'),
    timing: flags.timing ? { ...DEFAULT_TIMING, budgetSeconds: parsePositive(flags.timeBudget, '--time-budget') } : null,
    controller: parseController(flags.controller),
    jobs: flags.jobs === undefined ? availableParallelism() : parseJobs(flags.jobs, availableParallelism(), (m) => process.stderr.write(`stepgauge: note: ${m}\n`)),
  };
  if (flags.problem !== undefined) req.problem = flags.problem;
  if (flags.method !== undefined) req.method = flags.method;
  if (flags.runTimeout !== undefined) req.runTimeoutSeconds = parseRunTimeout(flags.runTimeout);
  if (flags.shard !== undefined) req.shard = parseShardSpec(flags.shard);
  return req;
}

export const registerRun: RegisterCommand = (program: Command, setExit) => {
  program
    .command('run')
    .description('integrate the selected problems with the selected methods over a tolerance/step sweep')
    .option('-p, --problem <list>', 'problem ids or files, comma-separated (default: the whole catalogue)')
    .option('-m, --method <list>', 'method ids or module files, comma-separated (default: all that apply)')
    .option('-t, --tolerances <list>', `rtol values: a list 1e-4,1e-8 or a range 1e-3..1e-12 (one per decade) (default: each problem's own list, else ${DEFAULT_TOLERANCE_RANGE.loose.toExponential()}..${DEFAULT_TOLERANCE_RANGE.tight.toExponential()})`)
    .option('--atol <list>', "absolute tolerance with every rtol: one value, or one per state (default: rtol, scaled where the problem says so)")
    .option('-s, --steps <list>', `equal-step counts for fixed-step methods (default: each problem's own doubling ladder, else ${DEFAULT_STEPS.join(',')})`)
    .option('-o, --out <dir>', 'output folder (default reports/<date>-<time>, with reports/latest pointing at it)')
    .option('--no-timing', 'skip wall-time measurement (time is recorded as null)')
    .option('--time-budget <seconds>', 'timing budget per run; long solves get fewer samples', String(DEFAULT_TIMING.budgetSeconds))
    .option('--max-steps <n>', 'step limit per run (accepted + rejected); past it the run ends with status step-limit', String(DEFAULT_MAX_STEPS))
    .option('--controller <kind>', CONTROLLER_HELP, 'standard')
    .option('-j, --jobs <n>', 'parallel workers (default: available cores; at most twice that, or 4)')
    .option('--run-timeout <seconds>', 'end a run that takes longer (its worker is terminated); status timeout; at most 86400')
    .option('--shard <K/N or N>', 'run only the K-th of N balanced slices of the plan (merge them with `stepgauge merge`); with N alone, K comes from the batch engine (JOB_COMPLETION_INDEX, AWS_BATCH_JOB_ARRAY_INDEX or CI_NODE_INDEX)')
    .option('--no-report', 'write only results.json and results.csv, no plots or report')
    .option('--summary-levels <list>', "error levels for the report's summary table, e.g. a target: 1e-2,1e-4 (default: from the errors each problem's runs reached)")
    .option('--json', 'print results.json to standard output instead of the summary')
    .option('-q, --quiet', 'no progress line')
    .option('--fail-on-failed-runs', 'exit 3 when any run ended with a failure status (by default a finished, written sweep exits 0: failures are results)')
    .option('--resume <dir>', 'finish an interrupted sweep written to <dir>, without repeating its finished runs')
    .action(async (flags: RunFlags, cmd: Command) => {
      const request = requestFromFlags(flags);
      const levels = flags.summaryLevels === undefined ? undefined : parseLevels(flags.summaryLevels);
      const fromUser = (name: string) => cmd.getOptionValueSource(name) === 'cli';
      const given: GivenFlags = { tolerances: fromUser('tolerances'), steps: fromUser('steps'), atol: fromUser('atol'), controller: fromUser('controller') };
      const flag = flags.resume !== undefined ? '--resume' : '--out';
      const outDir = flags.resume ?? flags.out ?? defaultOutDir();
      checkWritableTarget(outDir, flag);
      const session = await openSweepSession(request, { outDir, label: `${flag} ${outDir}`, resume: flags.resume !== undefined });
      try {
        await sweepAndPrint(session, flags, outDir, levels, given, setExit);
      } finally {
        await session.close();
      }
    });
};

/** Runs the session with hooks that print (progress, notes, skipped pairs), then the summary. */
async function sweepAndPrint(
  session: SweepSession,
  flags: RunFlags,
  outDir: string,
  levels: readonly number[] | undefined,
  given: GivenFlags,
  setExit: (code: number) => void,
): Promise<void> {
  const { unusedFlagNotes } = await import('../flag-notes.js');
  const { progressLine } = await import('../progress.js');
  const { summaryText } = await import('../summary.js');
  const { writeSweepFolder } = await import('../../results/sweep-folder.js');
  const stdout = divertStdout();
  const log = (s: string) => (flags.json ? process.stderr.write(`${s}\n`) : stdout.write(`${s}\n`));
  let progress: ProgressLine = { update() {}, stop() {} };
  const results = await session.run(
    {
      onPlan: (plan, selected, methods, req) => {
        if (!flags.quiet) for (const n of unusedFlagNotes(given, selected, methods)) process.stderr.write(`stepgauge: note: ${n}\n`);
        // Pairs the user asked for by name deserve a reason; default pairings left out are expected.
        if (req.method !== undefined) for (const s of plan.skipped) log(`skipped ${s.problem} x ${s.method}: ${s.reason}`);
        else if (plan.skipped.length > 0 && !flags.quiet) {
          log(`${plan.skipped.length} default pairings left out (stiff problems take stiff methods; symplectic methods need a separable problem, Runge-Kutta-Nystrom methods one in second-order form); see "skipped" in results.json`);
        }
        if (selected.length === 0) throw new InputError('the selection pairs no method with any problem', req.method ? '--method' : '--problem');
        progress = progressLine(selected.length, Boolean(flags.quiet || flags.json));
      },
      onRun: (p) => progress.update(p),
      onWarning: (message) => process.stderr.write(`stepgauge: warning: ${message}\n`),
      ...(flags.quiet ? {} : { onNote: (message: string) => process.stderr.write(`stepgauge: ${message}\n`) }),
      onStopAsked: () => process.stderr.write('\nstepgauge: stopping after the runs in flight (press Ctrl-C again to quit now)\n'),
      onRunsEnded: () => {
        progress.stop();
        stdout.restore();
      },
    },
    async (done, runs) => {
      done.command = commandLine();
      // The renderer (chart.js, the canvas binding, fonts) is loaded only for a report, after the runs.
      const writeReport = flags.report ? (await import('../../report/index.js')).writeReport : null;
      const { readResultsFile } = await import('../../results/read.js');
      // A report draws every run, so it reads them all back (a large dispersion: --no-report, then `stepgauge envelope`).
      const views = await writeSweepFolder(outDir, done, {
        runs,
        ...(writeReport ? { addFiles: (tmp) => writeReport(readResultsFile(join(tmp, 'results.json')), tmp, levels ? { levels } : {}) } : {}),
      });
      return views ?? [];
    },
  );
  if (!flags.out && flags.resume === undefined) pointLatest(outDir);
  if (results.interrupted) {
    process.stderr.write(`stepgauge: interrupted; ${results.runs.length} finished runs written to ${outDir}; finish with: stepgauge run --resume ${outDir}\n`);
    setExit(130);
    return;
  }

  if (flags.json) await pipeline(createReadStream(join(outDir, 'results.json')), process.stdout, { end: false });
  else {
    log(summaryText(results));
    log(`\nwrote ${join(outDir, 'results.json')}, results.csv${flags.report ? ', report.html, report.md and plots/' : ''}`);
  }
  // Failed runs are results: the sweep finished and was written, so 0, unless asked for 3.
  const failed = results.runs.filter((r) => r.status !== 'ok').length;
  if (failed > 0 && flags.failOnFailedRuns) setExit(EXIT.runsFailed);
}
