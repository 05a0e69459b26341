// Peers benchmark: odex (npm, run in this process through its adapter) against our adaptive
// methods on kepler-eccentric (10 periods) at matched achieved final error. For each method the
// loosest rtol meeting the target is found by the same decade-grid-plus-bisection search
// `stepgauge choose` uses (rtol 1e-2 down to 1e-15; cost = nfev, so the search itself never
// times anything); the chosen setting is then timed with tinybench like any timed run (check
// times on, no observer).
import type { RunResult } from '../src/results/contract.js';
import type { Method, Setting } from '../src/core/types.js';
import { DEFAULT_TIMING } from '../src/measure/timing.js';
import { explicitMethods } from '../src/methods/explicit/index.js';
import { findMethod } from '../src/methods/registry.js';
import { chooseMethod } from '../src/sweep/choose.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';
import { floorRow, type FloorTimer } from './floor.js';

export const PEER_TARGETS = [1e-6, 1e-8, 1e-10];
const MAX_STEPS = 10_000_000;

function finalError(run: RunResult): number | null {
  return run.status === 'ok' ? run.error.final : null;
}

/** A method matched to a final-error target and timed there (both peer benchmarks' rows). */
export interface MatchedRow {
  target: number;
  method: string;
  met: boolean;
  rtol: number | null;
  achieved: number | null;
  nfev: number | null;
  medianMs: number | null;
  nsPerEval: number | null;
  note?: string;
}

export interface PeerRow extends MatchedRow {
  /** odex time / this method's time at the same target (null for odex itself or when unmet). */
  speedupVsOdex: number | null;
  samples: number;
  /** 95% relative margin of error of the median, percent (null when not timed). */
  rmePercent: number | null;
  /** Timing budget the row used, ms (null when not timed). */
  budgetMs: number | null;
}

function contenders(): Method[] {
  const ours = explicitMethods.filter((m) => m.adaptive);
  const odex = findMethod('odex');
  return odex ? [...ours, odex] : ours;
}

export async function runPeersBench(
  timeMs = 1000,
  timer: FloorTimer = floorRow,
  targets: readonly number[] = PEER_TARGETS,
): Promise<PeerRow[]> {
  const p = keplerEccentric;
  const methods = contenders();
  const rows: PeerRow[] = [];
  for (const target of targets) {
    const choice = await chooseMethod(p, methods, {
      target,
      measure: 'final',
      cost: 'nfev',
      timing: DEFAULT_TIMING,
      maxSteps: MAX_STEPS,
    });
    const batch: PeerRow[] = [];
    for (const c of choice.candidates) {
      const m = methods.find((x) => x.id === c.method)!;
      const run = c.met ? c.run : null;
      const s = run?.setting;
      if (!run || !s || !('rtol' in s)) {
        batch.push({
          target, method: c.method, met: false, rtol: null, achieved: c.achieved, nfev: null, medianMs: null,
          nsPerEval: null, speedupVsOdex: null, samples: 0, rmePercent: null, budgetMs: null, note: c.note ?? 'not met',
        });
        continue;
      }
      const setting: Setting = { rtol: s.rtol, atol: s.atol };
      const t = timer(p, m, setting, timeMs);
      const nfev = run.counts.nfev;
      batch.push({
        target, method: c.method, met: true, rtol: s.rtol, achieved: finalError(run), nfev, medianMs: t.solveMs,
        nsPerEval: (t.solveMs * 1e6) / nfev, speedupVsOdex: null, samples: t.samples, rmePercent: t.solveRmePercent, budgetMs: t.budgetMs,
      });
    }
    const odex = batch.find((r) => r.method === 'odex' && r.medianMs !== null);
    for (const r of batch) {
      if (odex && r !== odex && r.medianMs !== null) r.speedupVsOdex = odex.medianMs! / r.medianMs;
    }
    batch.sort((a, b) => (a.medianMs ?? Infinity) - (b.medianMs ?? Infinity));
    rows.push(...batch);
  }
  return rows;
}
