// `stepgauge run`: plan the sweep, integrate, write results.json/results.csv (and the report).
// The integrators, the sweep machinery and the report renderer are loaded inside the action,
// after the workers of a parallel sweep were started (prestartLanes), so the workers load their
// modules while this process loads its own.
import type { Command } from 'commander';
import { availableParallelism } from 'node:os';
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { existsSync } from 'node:fs';
import type { RegisterCommand } from './register.js';
import { commandLine } from '../command-line.js';
import { parseAtol, parseJobs, parseLevels, parsePositive, parsePositiveInt, parseRunTimeout, parseSteps, parseTolerances } from '../options.js';
import { checkWritableTarget, defaultOutDir, pointLatest } from '../output-folder.js';
import type { ProgressLine } from '../progress.js';
import type { GivenFlags } from '../flag-notes.js';
import { DEFAULT_STEPS } from '../../sweep/plan.js';
import type { SweepRequest } from '../../sweep/run.js';
import { parseShardSpec } from '../../sweep/shard.js';
import { DEFAULT_MAX_STEPS, DEFAULT_TIMING, DEFAULT_TOLERANCE_RANGE } from '../../core/defaults.js';
import type { ResultsFile, RunResult } from '../../results/contract.js';
import type { KnownRunLine } from '../../results/json.js';
import { InputError } from '../../core/errors.js';
import { exitProcess } from '../../core/exit-guard.js';
import { EXIT } from '../exit-codes.js';
import { Journal, journalPath, readJournal } from '../../sweep/journal.js';
import { takeLock } from '../../sweep/lock.js';
import { requestFromRecord, type ResumableRequest } from '../../sweep/request-record.js';
import { divertStdout } from '../divert-stdout.js';
import { readResultsFile } from '../../results/read.js';
import { prestartLanes, workerLaneCount, type PrestartedLanes } from '../../sweep/lanes.js';

/**
 * The request and finished runs of an interrupted sweep in `dir` (journal first, then
 * results.json), with the plan fingerprint it recorded and the file it came from.
 */
function resumeState(dir: string): { request: ResumableRequest; finished: ResultsFile['runs']; planSha256: unknown; where: string } {
  const journal = readJournal(dir);
  if (journal) return { request: requestFromRecord(journal.header.request, journalPath(dir)), finished: journal.runs, planSha256: journal.header.planSha256, where: journalPath(dir) };
  const file = join(dir, 'results.json');
  if (!existsSync(file)) throw new InputError(`no interrupted sweep here (neither a journal nor results.json)`, `--resume ${dir}`);
  const old = readResultsFile(file);
  if (!old.interrupted) throw new InputError('that sweep finished; nothing to resume', `--resume ${dir}`);
  if (!old.request) throw new InputError('results.json has no request record to resume from', file);
  return { request: requestFromRecord(old.request, file), finished: old.runs, planSha256: (old.plan as { sha256?: unknown } | undefined)?.sha256, where: file };
}


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
  if (flags.controller !== 'standard' && flags.controller !== 'pi') {
    throw new InputError(`'${flags.controller}' is not a controller; expected standard or pi`, '--controller');
  }
  const req: SweepRequest = {
    ...(flags.tolerances === undefined ? {} : { tolerances: parseTolerances(flags.tolerances) }),
    ...(flags.atol === undefined ? {} : { atol: parseAtol(flags.atol) }),
    ...(flags.steps === undefined ? {} : { steps: parseSteps(flags.steps) }),
    maxSteps: parsePositiveInt(flags.maxSteps, '--max-steps'),
    timing: flags.timing ? { ...DEFAULT_TIMING, budgetSeconds: parsePositive(flags.timeBudget, '--time-budget') } : null,
    controller: flags.controller,
    jobs: flags.jobs === undefined ? availableParallelism() : parseJobs(flags.jobs, availableParallelism(), (m) => process.stderr.write(`stepgauge: note: ${m}\n`)),
  };
  if (flags.problem !== undefined) req.problem = flags.problem;
  if (flags.method !== undefined) req.method = flags.method;
  if (flags.runTimeout !== undefined) req.runTimeoutSeconds = parseRunTimeout(flags.runTimeout);
  if (flags.shard !== undefined) req.shard = parseShardSpec(flags.shard);
  return req;
}

/** `known`: run lines already serialised (see resultsJson). */
export async function writeSweepFolder(outDir: string, results: ResultsFile, withReport: boolean, known?: KnownRunLine, levels?: readonly number[]): Promise<void> {
  const { writeFolderAtomically } = await import('../../results/atomic.js');
  const { resultsCsv } = await import('../../results/csv.js');
  const { resultsJsonBytes } = await import('../../results/json.js');
  // The renderer (chart.js, the canvas binding, fonts) is loaded only for a report.
  const writeReport = withReport ? (await import('../../report/index.js')).writeReport : null;
  await writeFolderAtomically(outDir, async (tmp) => {
    await writeFile(join(tmp, 'results.json'), resultsJsonBytes(results, known));
    await writeFile(join(tmp, 'results.csv'), resultsCsv(results));
    if (writeReport) {
      await writeReport(results, tmp, levels ? { levels } : {});
    }
  });
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
    .option('--controller <kind>', 'step-size controller for explicit pairs: standard or pi', 'standard')
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
      let req = requestFromFlags(flags);
      if (flags.summaryLevels !== undefined) parseLevels(flags.summaryLevels);
      const fromUser = (name: string) => cmd.getOptionValueSource(name) === 'cli';
      const given: GivenFlags = { tolerances: fromUser('tolerances'), steps: fromUser('steps'), atol: fromUser('atol'), controller: fromUser('controller') };
      const flag = flags.resume !== undefined ? '--resume' : '--out';
      const outDir = flags.resume ?? flags.out ?? defaultOutDir();
      checkWritableTarget(outDir, flag);
      // One sweep per folder: taken before the journal is read or written, released however the
      // command ends (a killed one leaves it to be taken over).
      const lock = takeLock(outDir, `${flag} ${outDir}`);
      try {
        const { sweepInputs, assertSameInputs, assertSamePlan } = await import('../../sweep/inputs.js');
        let checkPlan: ((sha256: string) => void) | undefined;
        if (flags.resume !== undefined) {
          const state = resumeState(flags.resume);
          const now = sweepInputs(state.request);
          assertSameInputs(state.request.inputs, now, state.where);
          req = { ...state.request, finished: state.finished, jobs: req.jobs ?? 1, inputs: now };
          checkPlan = (sha256) => assertSamePlan(state.planSha256, sha256, state.where);
        } else req.inputs = sweepInputs(req);
        // Workers go first (see the header); only a sweep that will use them starts them.
        const laneCount = workerLaneCount(req);
        const lanes = laneCount > 0 ? prestartLanes(laneCount) : undefined;
        try {
          await sweepAndWrite(req, flags, outDir, setExit, lanes, given, checkPlan);
        } finally {
          await lanes?.release();
        }
      } finally {
        lock.release();
      }
    });
};

/** The sweep itself: progress, journal, Ctrl-C handling, the output folder and the summary. */
async function sweepAndWrite(
  req: SweepRequest,
  flags: RunFlags,
  outDir: string,
  setExit: (code: number) => void,
  lanes: PrestartedLanes | undefined,
  given: GivenFlags,
  checkPlan?: (sha256: string) => void,
): Promise<void> {
  const { unusedFlagNotes } = await import('../flag-notes.js');
  const { runSweep, sweepRequestRecord } = await import('../../sweep/run.js');
  const { progressLine } = await import('../progress.js');
  const { summaryText } = await import('../summary.js');
  const { resultsJson } = await import('../../results/json.js');
  if (lanes) req.lanes = lanes;
  const stdout = divertStdout();
  const log = (s: string) => (flags.json ? process.stderr.write(`${s}\n`) : stdout.write(`${s}\n`));
  let progress: ProgressLine = { update() {}, stop() {} };
  let journal: Journal | undefined;
  req.onPlan = (plan, selected, methods) => {
    checkPlan?.(plan.sha256);
    if (!flags.quiet) for (const n of unusedFlagNotes(given, selected, methods)) process.stderr.write(`stepgauge: note: ${n}\n`);
    // Pairs the user asked for by name deserve a reason; default pairings left out are expected.
    if (req.method !== undefined) for (const s of plan.skipped) log(`skipped ${s.problem} x ${s.method}: ${s.reason}`);
    else if (plan.skipped.length > 0 && !flags.quiet) {
      log(`${plan.skipped.length} default pairings left out (stiff problems take stiff methods; symplectic methods need a separable problem); see "skipped" in results.json`);
    }
    if (selected.length === 0) throw new InputError('the selection pairs no method with any problem', req.method ? '--method' : '--problem');
    progress = progressLine(selected.length, Boolean(flags.quiet || flags.json));
    journal = new Journal(outDir, { planSha256: plan.sha256, request: sweepRequestRecord(req) }, req.finished ?? []);
    listenForSignals();
  };
  req.onWarning = (message) => process.stderr.write(`stepgauge: warning: ${message}\n`);
  if (!flags.quiet) req.onNote = (message) => process.stderr.write(`stepgauge: ${message}\n`);
  // The journal serialises each run as it finishes, while the workers run; results.json reuses
  // those lines instead of serialising every run again after the last one (bench/README.md).
  const journalLines = new Map<RunResult, Uint8Array>();
  req.onRun = (p) => {
    if (journal) journalLines.set(p.last, journal.append(p.last));
    progress.update(p);
  };
  // First Ctrl-C (or SIGTERM): start no new run, write what finished; a second one leaves at once.
  let stopping = false;
  const onSignal = () => {
    if (stopping) exitProcess(130);
    stopping = true;
    process.stderr.write('\nstepgauge: stopping after the runs in flight (press Ctrl-C again to quit now)\n');
  };
  // Only once the runs start: loading problem files and certifying their references happen before,
  // in this process, and until then Ctrl-C keeps its default meaning (quit at once; nothing has
  // been written yet), so no problem file can make those steps ignore it.
  const listenForSignals = () => {
    process.on('SIGINT', onSignal);
    process.on('SIGTERM', onSignal);
  };
  req.shouldStop = () => stopping;
  let results: ResultsFile;
  try {
    results = await runSweep(req);
  } catch (e) {
    // A sweep that failed before any run finished (a worker that could not start, say) leaves
    // nothing to resume.
    if (journal && journalLines.size === 0 && (req.finished?.length ?? 0) === 0) journal.remove();
    throw e;
  } finally {
    journal?.close();
    progress.stop();
    process.off('SIGINT', onSignal);
    process.off('SIGTERM', onSignal);
    stdout.restore();
  }
  results.command = commandLine();
  await writeSweepFolder(outDir, results, flags.report, (run) => journalLines.get(run), flags.summaryLevels === undefined ? undefined : parseLevels(flags.summaryLevels));
  journal?.remove();
  if (!flags.out && flags.resume === undefined) pointLatest(outDir);
  if (results.interrupted) {
    process.stderr.write(`stepgauge: interrupted; ${results.runs.length} finished runs written to ${outDir}; finish with: stepgauge run --resume ${outDir}\n`);
    setExit(130);
    return;
  }

  if (flags.json) process.stdout.write(resultsJson(results));
  else {
    log(summaryText(results));
    log(`\nwrote ${join(outDir, 'results.json')}, results.csv${flags.report ? ', report.html, report.md and plots/' : ''}`);
  }
  // Failed runs are results: the sweep finished and was written, so 0, unless asked for 3.
  const failed = results.runs.filter((r) => r.status !== 'ok').length;
  if (failed > 0 && flags.failOnFailedRuns) setExit(EXIT.runsFailed);
}
