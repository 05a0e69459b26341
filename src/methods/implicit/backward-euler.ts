// Backward (implicit) Euler, y1 = y0 + h f(t1, y1): order 1, L-stable.
// Hairer & Wanner, Solving ODEs II, sec. IV.3 (as the 1-stage Radau IIA method). Fixed step.
import { makeJacobianSource } from '../../core/jacobian.js';
import type { Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { checkProblem, parseFixed } from './common.js';
import { driveFixed } from './fixed-step.js';
import { newtonBuffers, solveStage } from './theta-newton.js';

export const backwardEuler: Method = {
  id: 'backward-euler',
  name: 'Backward Euler',
  family: 'implicit',
  order: 1,
  source: 'E. Hairer, G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, sec. IV.3',
  adaptive: false,
  stiff: true,
  notes: 'Fixed step; Newton with the Jacobian at each step start, iterated to 1e-14 relative.',
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    checkProblem(problem);
    const { steps } = parseFixed(problem, setting, 'backward-euler');
    const n = problem.dimension;
    const counts = zeroCounts();
    const y = Float64Array.from(problem.y0);
    const fy = new Float64Array(n);
    const jac = makeJacobianSource(problem.f, problem.jacobian, n, counts);
    const buf = newtonBuffers(n);
    return driveFixed(problem, options, y, steps, (t, h) => {
      problem.f(t, y, fy);
      counts.nfev++;
      // Explicit Euler start value.
      for (let i = 0; i < n; i++) buf.z[i] = y[i]! + h * fy[i]!;
      const msg = solveStage(problem.f, jac, t, y, fy, t + h, h, y, buf, n, counts);
      if (msg === undefined) y.set(buf.z);
      return msg;
    }, counts);
  },
};
