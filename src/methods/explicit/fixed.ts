// The one engine for fixed-step explicit Runge-Kutta methods: equal steps h = (tEnd - t0)/steps
// over the span with any compiled tableau, on work buffers kept between solves (../work-lease.ts).
// options.checkTimes does not apply: the grid is fixed by the setting, and moving a step would
// change the method.
import type { Counts, Problem, Setting, SolveOptions, SolveResult, Status } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { allFinite } from '../../core/vector.js';
import { budgetStop } from '../budget.js';
import { finish } from './finish.js';
import type { FixedKernelFactory, FixedStepKernel } from './kernels/unrolled.js';
import { IO_H, IO_SIZE, IO_T, type Tableau } from './tableau.js';
import { withLease, type WorkLease } from '../work-lease.js';
import { checkOptions, checkProblem } from '../rules.js';
import { fixedStepCount } from '../../core/setting.js';

export function solveFixed(
  tab: Tableau,
  methodId: string,
  problem: Problem,
  setting: Setting,
  options: SolveOptions,
  kernel?: FixedKernelFactory,
): SolveResult {
  checkProblem(problem, methodId);
  checkOptions(options, methodId);
  const steps = fixedStepCount(setting, methodId);
  const n = problem.dimension;
  const t0 = problem.t0;
  const tEnd = problem.tEnd;
  const h = (tEnd - t0) / steps;
  // The method's generated step when it has one (same arithmetic, straight-line code).
  const stepFn = kernel ? kernel(n) : null;
  return withLease(tab, n, (lease) => stepEqually(lease, tab, problem, options, steps, h, stepFn));
}

function stepEqually(
  lease: WorkLease,
  tab: Tableau,
  problem: Problem,
  options: SolveOptions,
  steps: number,
  h: number,
  stepFn: FixedStepKernel | null,
): SolveResult {
  const n = problem.dimension;
  const t0 = problem.t0;
  const tEnd = problem.tEnd;
  const f = problem.f;
  const s = tab.stages;
  const { c, aStart, aCol, aVal, bCol, bVal } = tab;
  const nb = bCol.length;
  const observer = options.observer;
  const deadline = options.deadline;
  const maxSteps = options.maxSteps;
  const io = lease.float64(IO_SIZE);
  const K = lease.float64(s * n);
  const kRow = lease.rows(K, s, n);
  const y = lease.copyOf(problem.y0);
  const yStage = lease.float64(n);
  const counts: Counts = zeroCounts();
  let status: Status = 'ok';
  let message: string | undefined;
  let t = t0;
  if (!allFinite(y, n)) return finish('diverged', 'y0 is not finite', t, y, counts, h);
  if (observer) observer(t, y);

  for (let step = 0; step < steps; step++) {
    const stop = budgetStop(step, maxSteps, deadline, t);
    if (stop !== null) {
      status = stop.status;
      message = stop.message;
      break;
    }
    if (stepFn !== null) {
      io[IO_T] = t;
      io[IO_H] = h;
      stepFn(f, io, y, yStage, K, kRow, n);
    } else {
      f(t, y, kRow[0]!);
      for (let i = 1; i < s; i++) {
        const p0 = aStart[i]!;
        const p1 = aStart[i + 1]!;
        for (let j = 0; j < n; j++) {
          let acc = 0;
          for (let p = p0; p < p1; p++) acc += aVal[p]! * K[aCol[p]! * n + j]!;
          yStage[j] = y[j]! + h * acc;
        }
        f(t + c[i]! * h, yStage, kRow[i]!);
      }
      for (let j = 0; j < n; j++) {
        let acc = 0;
        for (let p = 0; p < nb; p++) acc += bVal[p]! * K[bCol[p]! * n + j]!;
        y[j] = y[j]! + h * acc;
      }
    }
    counts.nfev += s;
    // t from the step index, not by summing h, so the last step lands exactly on tEnd.
    t = step + 1 === steps ? tEnd : t0 + (step + 1) * h;
    counts.accepted++;
    if (!allFinite(y, n)) {
      status = 'diverged';
      message = `state became non-finite at t=${t}`;
      break;
    }
    if (observer) observer(t, y);
  }
  return finish(status, message, t, y, counts, h);
}
