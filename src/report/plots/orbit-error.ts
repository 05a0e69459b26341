// Orbit error parts along the span, one plot per (problem, part): radial, in-track, cross-track
// magnitudes of each method's tightest ok run (solid) and a middle one (dashed), from the trace
// in the results. The in-track plot is the one that grows (a phase error accumulates), the
// others stay near the size of one orbit's error.
import { timeAxis } from './axes.js';
import type { RunResult } from '../../results/contract.js';
import { problemTitle, runsOf, type PlotContext } from './context.js';
import { pickSettings, traceSeries } from './drift.js';
import type { Point, PlotOutcome, SeriesSpec } from './spec.js';

const PARTS = [
  ['inTrack', 'in-track'],
  ['radial', 'radial'],
  ['crossTrack', 'cross-track'],
] as const;

export function orbitErrorPlots(ctx: PlotContext, problem: string): PlotOutcome[] {
  const runs = runsOf(ctx, problem).filter((r) => r.orbitError);
  if (runs.length === 0) return [];
  const unit = runs[0]!.orbitError!.unit;
  const out: PlotOutcome[] = [];
  PARTS.forEach(([key, name]) => {
    const title = `${problemTitle(ctx, problem)}: ${name} position error over time`;
    const series: SeriesSpec[] = [];
    let tMin = Infinity;
    let tMax = -Infinity;
    let tPositive = Infinity;
    for (const id of ctx.methodIds) {
      const eligible = runs.filter((r: RunResult) => r.method === id && r.status === 'ok' && r.orbitError?.trace);
      const pick = pickSettings(eligible);
      if (!pick) continue;
      const chosen: [RunResult, boolean][] = [[pick.tightest, false]];
      if (pick.mid) chosen.push([pick.mid, true]);
      for (const [run, dashed] of chosen) {
        const tr = run.orbitError!.trace!;
        const values = tr[key];
        const points: Point[] = [];
        for (let i = 0; i < Math.min(tr.t.length, values.length); i++) {
          const v = Math.abs(values[i]!);
          if (Number.isFinite(tr.t[i]!) && Number.isFinite(v) && v > 0) {
            points.push({ x: tr.t[i]!, y: v });
            tMin = Math.min(tMin, tr.t[i]!);
            if (tr.t[i]! > 0) tPositive = Math.min(tPositive, tr.t[i]!);
            tMax = Math.max(tMax, tr.t[i]!);
          }
        }
        if (points.length === 0) continue;
        series.push(traceSeries(ctx, id, run, dashed, points));
      }
    }
    const notes = [
      'Solid: tightest setting with status ok; dashed: a middle setting.',
      'Parts of the position error in the reference orbit\'s frame: radial along r, cross-track along r x v, in-track completing the triad.',
    ];
    if (series.length === 0) {
      out.push({ omitted: { kind: 'orbit-error', problem, title, note: 'No run with an orbit-error trace finished ok.' } });
      return;
    }
    out.push({
      drawn: {
        kind: 'orbit-error',
        problem,
        file: `${ctx.slugs.get(problem)!}-orbit-${name}.png`,
        title,
        notes,
        x: timeAxis(ctx, problem, tMin, tMax, tPositive),
        y: { title: `|${name} error| (${unit})`, kind: 'log' },
        series,
      },
    });
  });
  return out;
}
