// Adapter for the `odex` npm package: a TypeScript port of E. Hairer & G. Wanner's ODEX, the
// Gragg-Bulirsch-Stoer extrapolation code of Solving ODEs I, sec. II.9. stepgauge does not step
// it: it calls odex once per segment between check times (so results land on them exactly) and
// reads odex's own counters, which it sums over segments.
import { createRequire } from 'node:module';
import { messageOf } from '../../core/errors.js';
import type { AdaptiveSetting, Method, Problem, Setting, SolveOptions, SolveResult, Status } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { adaptiveTolerances } from '../../core/setting.js';
import { checkOptions, checkProblem } from '../rules.js';
import { allFinite } from '../../core/vector.js';
import { stopTimes } from '../stop-times.js';

/** The parts of odex's Solver this adapter uses (odex 2.x, src/odex.ts). */
interface OdexSolver {
  absoluteTolerance: number | number[];
  relativeTolerance: number | number[];
  maxSteps: number;
  initialStepSize: number;
  maxExtrapolationColumns: number;
  denseOutput: boolean;
  solve(
    f: (x: number, y: number[]) => number[],
    x0: number,
    y0: number[],
    x1: number,
    solOut?: (nr: number, xOld: number, x: number, y: number[]) => boolean | void,
  ): { y: number[]; outcome: number; nStep: number; xEnd: number; nAccept: number; nReject: number; nEval: number };
}

const require = createRequire(import.meta.url);
const odexModule = require('odex') as { Solver: new (n: number) => OdexSolver; Outcome: Record<string, number> };

/** odex's Outcome enum values. */
const CONVERGED = 0;
const MAX_STEPS_EXCEEDED = 1;

const EPS = 2.220446049250313e-16;
/** Default number of extrapolation columns in odex; the highest order reached is 2 * KM. */
const KM = 9;

export const odexMethod: Method = {
  id: 'odex',
  name: 'ODEX, Gragg-Bulirsch-Stoer extrapolation (odex npm package)',
  family: 'external',
  order: 2 * KM,
  embeddedOrder: 2 * KM - 2,
  source:
    'E. Hairer, S. P. Norsett, G. Wanner, Solving Ordinary Differential Equations I, 2nd ed., Springer 1993, sec. II.9 (ODEX); npm package odex 2.x',
  adaptive: true,
  stiff: false,
  notes:
    `Variable order: column k of the extrapolation tableau has order 2k; order lists the maximum 2*${KM} ` +
    '(default 9 columns), the order in use changes from step to step. Counts are odex\'s own (nEval, nAccept, nReject), ' +
    'summed over the segments between check times; njev = nlu = 0. odex allocates arrays per evaluation.',
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    checkProblem(problem, 'odex');
    checkOptions(options, 'odex');
    const n = problem.dimension;
    adaptiveTolerances(setting, n, 'odex', { rtolMayBeZero: false });
    // odex takes atol as given (a number or one per component).
    const { rtol, atol } = setting as AdaptiveSetting;
    const counts = zeroCounts();
    const solver = new odexModule.Solver(n);
    solver.relativeTolerance = rtol;
    solver.absoluteTolerance = typeof atol === 'number' ? atol : [...atol];
    solver.maxExtrapolationColumns = KM;
    solver.denseOutput = false;

    const yBuf = new Float64Array(n);
    const dyBuf = new Float64Array(n);
    const f = (x: number, yArr: number[]): number[] => {
      for (let i = 0; i < n; i++) yBuf[i] = yArr[i]!;
      problem.f(x, yBuf, dyBuf);
      return Array.from(dyBuf);
    };

    const stops = stopTimes(options.checkTimes, problem.t0, problem.tEnd, 'odex');
    const yObs = new Float64Array(n);
    let y: number[] = [...problem.y0];
    let t = problem.t0;
    let h = options.initialStep ?? 1e-4 * Math.min(1, problem.tEnd - problem.t0);
    let stopReason: 'timeout' | 'diverged' | undefined;
    let firstSegment = true;
    yObs.set(y);
    const finish = (status: Status, message?: string): SolveResult => {
      const r: SolveResult = { status, tFinal: t, yFinal: Float64Array.from(y), counts };
      if (message !== undefined) r.message = message;
      return r;
    };

    for (const stop of stops) {
      if (stop <= t) continue;
      const budget = options.maxSteps - (counts.accepted + counts.rejected);
      if (budget <= 0) return finish('step-limit', `step limit ${options.maxSteps} reached at t=${t}`);
      // odex stops when its attempt counter reaches maxSteps, so allow one more than the budget.
      solver.maxSteps = budget + 1;
      solver.initialStepSize = Math.min(h, stop - t);
      let lastX = t;
      let lastY: number[] = y;
      const segStart = t;
      const callback = (nr: number, xOld: number, x: number, yArr: number[]): boolean | void => {
        if (nr === 1) {
          if (firstSegment) options.observer?.(segStart, yObs);
          return;
        }
        if (x > xOld) h = x - xOld;
        lastX = Math.abs(x - stop) <= 4 * EPS * Math.abs(stop) ? stop : x;
        lastY = yArr;
        for (let i = 0; i < n; i++) yObs[i] = yArr[i]!;
        if (!allFinite(yObs, n)) {
          stopReason = 'diverged';
          return false;
        }
        options.observer?.(lastX, yObs);
        if (options.deadline !== undefined && performance.now() > options.deadline) {
          stopReason = 'timeout';
          return false;
        }
      };
      let res: ReturnType<OdexSolver['solve']>;
      try {
        res = solver.solve(f, t, y, stop, callback);
      } catch (e) {
        return finish('error', `odex: ${messageOf(e)}`);
      }
      firstSegment = false;
      counts.nfev += res.nEval;
      counts.accepted += res.nAccept;
      counts.rejected += res.nReject;
      y = res.outcome === CONVERGED ? res.y : lastY;
      t = res.outcome === CONVERGED ? stop : lastX;
      if (res.outcome === MAX_STEPS_EXCEEDED) return finish('step-limit', `odex reported too many steps at t=${t}`);
      if (res.outcome !== CONVERGED) {
        if (stopReason === 'diverged') return finish('diverged', `non-finite state at t=${t}`);
        return finish('timeout', `deadline passed at t=${t}`);
      }
      if (!res.y.every(Number.isFinite)) return finish('diverged', `non-finite state at t=${t}`);
    }
    return finish('ok');
  },
};
