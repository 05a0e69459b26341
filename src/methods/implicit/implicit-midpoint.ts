// Implicit midpoint rule, y1 = y0 + h f(t0 + h/2, (y0 + y1)/2): order 2, A-stable, symmetric.
// Hairer, Lubich & Wanner, Geometric Numerical Integration, sec. II.1; Hairer & Wanner, Solving
// ODEs II, sec. IV.3 (1-stage Gauss method). Fixed step. Solved for z = (y0 + y1)/2 from
// z = y0 + (h/2) f(t0 + h/2, z), then y1 = 2 z - y0.
import { makeJacobianSource } from '../../core/jacobian.js';
import type { Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { checkProblem, parseFixed } from './common.js';
import { driveFixed } from './fixed-step.js';
import { newtonBuffers, solveStage } from './theta-newton.js';

export const implicitMidpoint: Method = {
  id: 'implicit-midpoint',
  name: 'Implicit midpoint rule',
  family: 'implicit',
  order: 2,
  source: 'E. Hairer, C. Lubich, G. Wanner, Geometric Numerical Integration, 2nd ed., Springer 2006, sec. II.1',
  adaptive: false,
  stiff: true,
  notes: 'Fixed step; Newton with the Jacobian at each step start, iterated to 1e-14 relative. Not L-stable.',
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    checkProblem(problem);
    const { steps } = parseFixed(problem, setting, 'implicit-midpoint');
    const n = problem.dimension;
    const counts = zeroCounts();
    const y = Float64Array.from(problem.y0);
    const fy = new Float64Array(n);
    const jac = makeJacobianSource(problem.f, problem.jacobian, n, counts);
    const buf = newtonBuffers(n);
    return driveFixed(problem, options, y, steps, (t, h) => {
      problem.f(t, y, fy);
      counts.nfev++;
      for (let i = 0; i < n; i++) buf.z[i] = y[i]! + 0.5 * h * fy[i]!;
      const msg = solveStage(problem.f, jac, t, y, fy, t + 0.5 * h, 0.5 * h, y, buf, n, counts);
      if (msg === undefined) for (let i = 0; i < n; i++) y[i] = 2 * buf.z[i]! - y[i]!;
      return msg;
    }, counts);
  },
};
