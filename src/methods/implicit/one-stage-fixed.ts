// The one-stage implicit collocation methods with equal steps: the stage z solves
// z = y0 + theta h f(t0 + theta h, z) by Newton, and y1 = y0 + (z - y0) / theta.
// theta = 1 is backward Euler (y1 = z), theta = 1/2 the implicit midpoint rule (y1 = 2 z - y0);
// Hairer & Wanner, Solving ODEs II, sec. IV.3.
import { makeJacobianSource } from '../../core/jacobian.js';
import { jacobianStructure } from '../../core/jacobian-structure.js';
import type { Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { zeroCounts } from '../../core/types.js';
import { fixedStepCount } from '../../core/setting.js';
import { checkOptions, checkProblem } from '../rules.js';
import { driveFixed } from '../fixed-step.js';
import { stageNewton } from './theta-newton.js';
import { withLease } from '../work-lease.js';

export type OneStageMeta = Omit<Method, 'solve' | 'family' | 'adaptive' | 'stiff'>;

export function oneStageFixedMethod(meta: OneStageMeta, theta: 1 | 0.5): Method {
  // Owner of this method's kept work buffers (work-lease.ts).
  const owner = {};
  return {
    ...meta,
    family: 'implicit',
    adaptive: false,
    stiff: true,
    solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
      checkProblem(problem, meta.id);
      checkOptions(options, meta.id);
      const steps = fixedStepCount(setting, meta.id);
      const n = problem.dimension;
      const counts = zeroCounts();
      return withLease(owner, n, (lease) => {
        const y = lease.copyOf(problem.y0);
        const fy = lease.float64(n);
        const jac = makeJacobianSource(problem.f, problem.jacobian, n, counts, (length) => lease.float64(length), jacobianStructure(problem, n));
        const stage = stageNewton(problem.f, jac, n, counts, lease);
        return driveFixed(problem, options, y, steps, (t, h) => {
          problem.f(t, y, fy);
          counts.nfev++;
          // Explicit Euler start value for the stage.
          const th = theta * h;
          for (let i = 0; i < n; i++) stage.z[i] = y[i]! + th * fy[i]!;
          const msg = stage.solve(t, y, fy, t + th, th, y);
          if (msg === undefined) {
            if (theta === 1) y.set(stage.z);
            else for (let i = 0; i < n; i++) y[i] = 2 * stage.z[i]! - y[i]!;
          }
          return msg;
        }, counts);
      });
    },
  };
}
