// A method module: Heun's second-order method (the explicit trapezoidal rule) with equal steps,
//   k1 = f(t, y),  k2 = f(t + h, y + h k1),  y_next = y + h (k1 + k2) / 2.
// Source: K. Heun, "Neue Methoden zur approximativen Integration der Differentialgleichungen
// einer unabhaengigen Veraenderlichen", Z. Math. Phys. 45 (1900) 23-38 (citation from memory).
//
// Run it with:  stepgauge run --method ./examples/my-heun.ts --problem <id> --steps 100,200,400
import { defineMethod, zeroCounts } from 'stepgauge';
import type { Problem, Setting, SolveOptions, SolveResult } from 'stepgauge';

export default defineMethod({
  id: 'heun-2',
  name: 'Heun (explicit trapezoidal rule)',
  family: 'fixed-step',
  order: 2,
  source: 'K. Heun, Z. Math. Phys. 45 (1900) 23-38',
  adaptive: false,
  stiff: false,
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    if (!('steps' in setting)) throw new Error('heun-2 is fixed-step: give { steps }');
    const n = problem.dimension;
    const steps = setting.steps;
    const h = (problem.tEnd - problem.t0) / steps;
    const y = Float64Array.from(problem.y0);
    const k1 = new Float64Array(n);
    const k2 = new Float64Array(n);
    const trial = new Float64Array(n);
    const counts = zeroCounts();
    options.observer?.(problem.t0, y);
    let t = problem.t0;
    for (let i = 0; i < steps; i++) {
      if (counts.accepted >= options.maxSteps) return { status: 'step-limit', tFinal: t, yFinal: y, counts, h };
      if (options.deadline !== undefined && performance.now() > options.deadline) return { status: 'timeout', tFinal: t, yFinal: y, counts, h };
      // Landing on tEnd exactly avoids an accumulated rounding of t0 + steps * h.
      const tNext = i === steps - 1 ? problem.tEnd : problem.t0 + (i + 1) * h;
      problem.f(t, y, k1);
      for (let j = 0; j < n; j++) trial[j] = y[j]! + h * k1[j]!;
      problem.f(tNext, trial, k2);
      counts.nfev += 2;
      let finite = true;
      for (let j = 0; j < n; j++) {
        y[j] = y[j]! + 0.5 * h * (k1[j]! + k2[j]!);
        if (!Number.isFinite(y[j]!)) finite = false;
      }
      counts.accepted++;
      t = tNext;
      if (!finite) return { status: 'diverged', message: `non-finite state at t = ${t}`, tFinal: t, yFinal: y, counts, h };
      options.observer?.(t, y);
    }
    return { status: 'ok', tFinal: t, yFinal: y, counts, h };
  },
});
