// The stiffness ratio of a problem along its reference trajectory: at the start and at every
// time where the reference gives the state (check times for analytic references, the tabulated
// points otherwise).
import type { Problem } from '../core/types.js';
import { stiffnessRatio } from './stiffness.js';

export function problemStiffnessRatio(problem: Problem): number | null {
  const times: number[] = [problem.t0];
  const states: number[][] = [[...problem.y0]];
  const ref = problem.reference;
  if (ref.exact) {
    const out = new Float64Array(problem.dimension);
    for (const t of [...problem.checkTimes, problem.tEnd]) {
      ref.exact(t, out);
      times.push(t);
      states.push(Array.from(out));
    }
  } else {
    for (const p of ref.points ?? []) {
      times.push(p.t);
      states.push([...p.y]);
    }
  }
  try {
    const { max } = stiffnessRatio(problem, times, states);
    return Number.isFinite(max) ? max : null;
  } catch {
    return null;
  }
}
