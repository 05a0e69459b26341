// The one engine for fixed-step explicit Runge-Kutta methods: equal steps h = (tEnd - t0)/steps
// over the span (the shared driver, ../fixed-step.ts) with any compiled tableau, on work buffers
// kept between solves (../work-lease.ts).
// options.checkTimes does not apply: the grid is fixed by the setting, and moving a step would
// change the method.
import type { Counts, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { driveFixed } from '../fixed-step.js';
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
  // The method's generated step when it has one (same arithmetic, straight-line code).
  const stepFn = kernel ? kernel(n) : null;
  return withLease(tab, n, (lease) => stepEqually(lease, tab, problem, options, steps, stepFn));
}

function stepEqually(
  lease: WorkLease,
  tab: Tableau,
  problem: Problem,
  options: SolveOptions,
  steps: number,
  stepFn: FixedStepKernel | null,
): SolveResult {
  const n = problem.dimension;
  const f = problem.f;
  const s = tab.stages;
  const { c, aStart, aCol, aVal, bCol, bVal } = tab;
  const nb = bCol.length;
  const io = lease.float64(IO_SIZE);
  const K = lease.float64(s * n);
  const kRow = lease.rows(K, s, n);
  const y = lease.copyOf(problem.y0);
  const yStage = lease.float64(n);
  const counts: Counts = zeroCounts();
  return driveFixed(problem, options, y, steps, (t, h) => {
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
    return undefined;
  }, counts);
}
