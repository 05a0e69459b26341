// The chosen setting's neighbours: half and double the tolerance (adaptive) or 10% fewer and more
// equal steps (fixed-step). Error that does not fall as the setting tightens across them marks the
// choice fragile: the boundary the search found is then an accident of where it looked.
import type { Method, Problem, Setting } from '../core/types.js';
import type { RunResult, RunSetting } from '../results/contract.js';
import { isAdaptiveSetting } from '../core/types.js';
import { measureRun, type RunOptions } from '../measure/run-one.js';
import { absoluteTolerance, type AtolOverride } from '../core/tolerance.js';

/** Factor between the chosen tolerance and its neighbours. */
const TOLERANCE_FACTOR = 2;
/** Relative change of the step count for the fixed-step neighbours. */
const STEP_FRACTION = 0.1;

export interface NeighbourPoint {
  /** 'tighter' (half the tolerance, 10% more steps) or 'looser'. */
  side: 'tighter' | 'looser';
  setting: RunSetting;
  status: RunResult['status'];
  error: number | null;
}

export interface NeighbourCheck {
  tighter: NeighbourPoint;
  looser: NeighbourPoint;
  /** Error at the chosen setting (the confirmed run, passed in: solves are deterministic). */
  chosenError: number | null;
  /** True when the error is not monotone across looser, chosen, tighter. */
  fragile: boolean;
  summary: string;
}

function neighbourSettings(problem: Problem, s: Setting, atol?: AtolOverride): { tighter: Setting; looser: Setting } {
  if (isAdaptiveSetting(s)) {
    const t = s.rtol / TOLERANCE_FACTOR;
    const l = s.rtol * TOLERANCE_FACTOR;
    return { tighter: { rtol: t, atol: absoluteTolerance(problem, t, atol) }, looser: { rtol: l, atol: absoluteTolerance(problem, l, atol) } };
  }
  const more = Math.max(s.steps + 1, Math.round(s.steps * (1 + STEP_FRACTION)));
  const fewer = Math.max(1, Math.min(s.steps - 1, Math.round(s.steps * (1 - STEP_FRACTION))));
  return { tighter: { steps: more }, looser: { steps: fewer } };
}

/** Whether error falls (or stays) from the looser neighbour through the chosen setting to the tighter one. */
export function isMonotone(looser: number | null, chosen: number | null, tighter: number | null): boolean {
  if (chosen === null || tighter === null) return false; // the tighter side failing is not monotone
  if (tighter > chosen) return false;
  if (looser === null) return true; // the looser side failing (more error) is consistent
  return chosen <= looser;
}

function text(p: NeighbourPoint): string {
  const s = p.setting;
  const at = 'rtol' in s ? `rtol ${s.rtol.toExponential(2)}` : `${s.steps} steps`;
  return `${at}: ${p.error === null ? p.status : p.error.toExponential(2)}`;
}

export function checkNeighbours(
  problem: Problem,
  method: Method,
  chosen: Setting,
  base: RunResult,
  options: RunOptions & { atol?: AtolOverride },
  errorOf: (run: RunResult) => number | null,
): NeighbourCheck {
  const near = neighbourSettings(problem, chosen, options.atol);
  const point = (side: 'tighter' | 'looser', s: Setting): NeighbourPoint => {
    const run = measureRun(problem, method, s, options);
    return { side, setting: run.setting, status: run.status, error: errorOf(run) };
  };
  const tighter = point('tighter', near.tighter);
  const looser = point('looser', near.looser);
  const chosenError = errorOf(base);
  const fragile = !isMonotone(looser.error, chosenError, tighter.error);
  const summary = `${fragile ? 'error not monotone' : 'error monotone'} across the neighbours (${text(looser)}; chosen ${chosenError === null ? base.status : chosenError.toExponential(2)}; ${text(tighter)})`;
  return { tighter, looser, chosenError, fragile, summary };
}
