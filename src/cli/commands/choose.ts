// `stepgauge choose`: which method and setting meets an accuracy target at the least cost, and
// (with --out) a decision record a reviewer can file: decision.json, decision.md, decision.html.
import type { Command } from 'commander';
import type { RegisterCommand } from './register.js';
import { InputError } from '../../core/errors.js';
import { CONTROLLER_HELP, parseAtol, parseController, parsePositive, parsePositiveInt, parsePositiveList } from '../options.js';
import { DEFAULT_MAX_STEPS, DEFAULT_SAFETY, DEFAULT_TIMING } from '../../core/defaults.js';
import { choiceText } from '../choice-text.js';
import { checkWritableTarget } from '../output-folder.js';
import { commandLine } from '../command-line.js';

interface ChooseFlags {
  problem?: string;
  method?: string;
  target?: string;
  measure: string;
  cost: string;
  json?: boolean;
  maxSteps: string;
  quantile?: string;
  rates?: string;
  stepSizes?: string;
  atol?: string;
  safety: string;
  controller: string;
  out?: string;
}

export const registerChoose: RegisterCommand = (program, setExit) => {
  program
    .command('choose')
    .description('find, per method, the loosest tolerance or fewest equal steps that meet an error target, and rank them by cost')
    .requiredOption('-p, --problem <id|file>', 'one problem id or problem file')
    .requiredOption('--target <error>', 'largest acceptable error in the problem\'s error scale, e.g. 1e-8')
    .option('-m, --method <list>', 'methods to consider (default: all that apply)')
    .option('--measure <which>', 'final (at the end of the span) or max (over check times) in the problem\'s error scale; for orbit problems position, radial, in-track, cross-track (at the end, in the problem\'s position unit) or the same with -max (largest along the run); event-time (worst event timing error; a missed or extra crossing never meets the target)', 'final')
    .option('--cost <what>', 'time (median wall time) or nfev (function evaluations, free of timing noise)', 'time')
    .option('--safety <factor>', 'ask for error at most target / factor (2 keeps the doubled-tolerance neighbour inside the target; 1 is the bare boundary)', String(DEFAULT_SAFETY))
    .option('--atol <list>', 'absolute tolerance with every rtol tried: one value, or one per state (default: rtol, scaled where the problem says so)')
    .option('--max-steps <n>', 'step limit per run', String(DEFAULT_MAX_STEPS))
    .option('--controller <kind>', CONTROLLER_HELP, 'standard')
    .option('--rates <list>', 'fixed-step candidates as rates in Hz (time in seconds), e.g. 0.05,0.1,0.2; the answer is the lowest rate that meets the target')
    .option('--step-sizes <list>', 'fixed-step candidates as step sizes in the problem\'s time unit, e.g. 5,10,20')
    .option('-o, --out <dir>', 'write the decision record there: decision.json, decision.md, decision.html (one self-contained file)')
    .option('--json', 'print the ranked table as JSON')
    .option('--quantile <q>', "for a dispersed problem: share of the samples that must meet the target, in (0, 1], or 'worst' (every sample; the default)")
    .action(async (flags: ChooseFlags, cmd: Command) => {
      const target = parsePositive(flags.target ?? '', '--target');
      const { ERROR_MEASURES, isErrorMeasure } = await import('../../measure/run-measures.js');
      if (!isErrorMeasure(flags.measure)) throw new InputError(`'${flags.measure}' is not one of ${ERROR_MEASURES.join(', ')}`, '--measure');
      const safety = parsePositive(flags.safety, '--safety');
      if (safety < 1) throw new InputError(`'${flags.safety}' must be at least 1 (1 asks for the target itself)`, '--safety');
      if (flags.cost !== 'time' && flags.cost !== 'nfev') throw new InputError(`'${flags.cost}' is not time or nfev`, '--cost');
      const maxSteps = parsePositiveInt(flags.maxSteps, '--max-steps');
      const controller = parseController(flags.controller);
      // Only a new or empty folder, or one stepgauge wrote, is replaced (src/results/ownership.ts).
      if (flags.out !== undefined) checkWritableTarget(flags.out);
      const { resolveMethods, resolveProblems } = await import('../../sweep/resolve.js');
      const { chooseMethod } = await import('../../sweep/choose.js');
      const rates = flags.rates !== undefined ? parsePositiveList(flags.rates, '--rates') : undefined;
      const stepSizes = flags.stepSizes !== undefined ? parsePositiveList(flags.stepSizes, '--step-sizes') : undefined;
      const problems = await resolveProblems(flags.problem);
      const methods = await resolveMethods(flags.method);
      if (cmd.getOptionValueSource('controller') === 'cli' && !methods.items.some((m) => m.family === 'embedded-explicit')) {
        process.stderr.write(`stepgauge: note: --controller applies to the explicit embedded pairs, and none is a candidate (${methods.items.map((m) => m.id).join(', ')})\n`);
      }
      const of = problems.items[0]?.dispersion?.of;
      if (of !== undefined && problems.items.every((p) => p.dispersion?.of === of)) {
        if (flags.out !== undefined) throw new InputError('a decision record is written for one problem, not for a dispersion (use --json for the dispersed choice)', '--out');
        const { chooseDispersed } = await import('../choose-dispersed.js');
        await chooseDispersed(of, problems.items, methods.items, target, { ...flags, controller }, setExit);
        return;
      }
      if (flags.quantile !== undefined) throw new InputError('applies to a dispersed problem only (a problem file with a dispersion block)', '--quantile');
      if (problems.items.length !== 1) throw new InputError('choose takes exactly one problem', '--problem');
      const problem = problems.items[0]!;
      const { fixedCandidates } = await import('../../sweep/fixed-rates.js');
      const candidates = rates || stepSizes ? fixedCandidates(problem, { rates, stepSizes }) : undefined;
      const choice = await chooseMethod(problem, methods.items, {
        target,
        safety,
        measure: flags.measure,
        cost: flags.cost,
        timing: DEFAULT_TIMING,
        maxSteps,
        controller,
        ...(candidates ? { fixedCandidates: candidates } : {}),
        ...(flags.atol === undefined ? {} : { atol: parseAtol(flags.atol) }),
      });
      if (flags.out !== undefined) {
        const { writeDecisionFolder } = await import('../decision-folder.js');
        await writeDecisionFolder(flags.out, choice, problem, { commandLine: commandLine(), maxSteps, controller });
      }
      if (flags.json) process.stdout.write(`${JSON.stringify(choice, (_k, v) => (k(_k) ? undefined : v), 2)}\n`);
      else process.stdout.write(`${choiceText(choice)}\n`);
      if (flags.out !== undefined) process.stderr.write(`wrote decision.json, decision.md and decision.html to ${flags.out}\n`);
      if (!choice.recommended) setExit(1);
    });
};

/** Trajectory traces are bulky and say nothing about the choice. */
function k(key: string): boolean {
  return key === 'trace';
}
