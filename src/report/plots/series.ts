// Grouping selected points into one series per method, in palette order, each ordered from
// loosest to tightest setting so the joining line follows the sweep.
import type { RunResult } from '../../results/contract.js';
import { settingLabel, tightness } from '../format.js';
import { methodName, type PlotContext } from './context.js';
import type { Point, PointMeta, SeriesSpec } from './spec.js';

export function byMethod(
  ctx: PlotContext,
  kept: readonly { run: RunResult; point: Point }[],
): Map<string, { run: RunResult; point: Point }[]> {
  const groups = new Map<string, { run: RunResult; point: Point }[]>();
  for (const id of ctx.methodIds) {
    const g = kept.filter((k) => k.run.method === id);
    if (g.length > 0) groups.set(id, g.slice().sort((a, b) => tightness(a.run.setting) - tightness(b.run.setting)));
  }
  return groups;
}

/** What the interactive report's tooltip says about the run behind a point. */
export function pointMeta(run: RunResult): PointMeta {
  return { method: run.method, setting: settingLabel(run.setting), error: run.error.final, nfev: run.counts.nfev, time: run.time.medianSeconds, status: run.status };
}

export function methodSeries(
  ctx: PlotContext,
  kept: readonly { run: RunResult; point: Point }[],
  label: (id: string, points: Point[]) => string = (id) => methodName(ctx, id),
): SeriesSpec[] {
  const out: SeriesSpec[] = [];
  for (const [id, g] of byMethod(ctx, kept)) {
    const points = g.map((k) => ({ ...k.point, meta: pointMeta(k.run) }));
    out.push({ label: label(id, points), method: id, points, style: ctx.styles.get(id)!, markers: true, line: true });
  }
  return out;
}

/** Points whose error the reference cannot confirm: one grey series of crosses, never joined. */
export function atResolutionSeries(atResolution: readonly { point: Point }[]): SeriesSpec[] {
  if (atResolution.length === 0) return [];
  return [
    {
      label: "at the reference's resolution (not a confirmed error)",
      points: atResolution.map((k) => k.point),
      style: { color: '#9a9a9a', marker: 'crossRot' },
      markers: true,
      line: false,
    },
  ];
}
