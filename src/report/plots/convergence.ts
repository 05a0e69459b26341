// Convergence of fixed-step methods: final error against step size h, with a dashed line of the
// published order through each method's points and the fitted (observed) order in the legend.
import { errorUnitOf, timeUnitOf } from './context.js';
import { unitSuffix } from './axes.js';
import { sig3 } from '../format.js';
import { methodName, problemTitle, runsOf, type PlotContext } from './context.js';
import { fitLogLog } from './fit.js';
import { observedOrder } from '../../results/observed-order.js';
import { leftOutNote, selectPoints, type Measure } from './select.js';
import { atResolutionSeries, byMethod, pointMeta } from './series.js';
import type { PlotOutcome, SeriesSpec } from './spec.js';

const H: Measure = { label: 'h', get: (r) => ('h' in r.setting ? r.setting.h : null) };
const ERROR: Measure = { label: 'error.final', get: (r) => r.error.final, figure: 'final' };

/** The order shown: only from the asymptotic range (measure/observed-order.ts), else why not. */
/** The legend's short form, and the full reason (for the notes) when no order is claimed. */
function orderText(points: readonly { x: number; y: number }[]): { label: string; reason?: string } {
  const o = observedOrder(points.map((p) => ({ h: p.x, error: p.y })));
  if (o.order !== null) return { label: `observed order ${sig3(o.order)} (${o.points} finest h)` };
  return { label: 'observed order: not in the asymptotic range', reason: o.reason };
}

export function convergencePlots(ctx: PlotContext, problem: string): PlotOutcome[] {
  const runs = runsOf(ctx, problem).filter((r) => 'steps' in r.setting);
  if (runs.length === 0) return [];
  const title = `${problemTitle(ctx, problem)}: convergence of fixed-step methods (final error vs h)`;
  const sel = selectPoints(runs, H, ERROR);
  if (sel.kept.length === 0) {
    return [{ omitted: { kind: 'convergence', problem, title, note: `No plottable points. ${leftOutNote(sel)}` } }];
  }
  const series: SeriesSpec[] = [];
  const reasons: string[] = [];
  for (const [id, group] of byMethod(ctx, sel.kept)) {
    const points = group.map((g) => g.point);
    const style = ctx.styles.get(id)!;
    const fit = fitLogLog(points);
    const order = ctx.methods.get(id)?.order ?? null;
    const observedOrderText = orderText(points);
    const observed = observedOrderText.label;
    if (observedOrderText.reason) reasons.push(`${methodName(ctx, id)}: ${observedOrderText.reason}.`);
    series.push({ label: `${methodName(ctx, id)}: ${observed}`, method: id, points: group.map((g) => ({ ...g.point, meta: pointMeta(g.run) })), style, markers: true, line: true });
    if (order !== null && fit) {
      // Through the centroid of the method's own points, so slope differences are visible at once.
      const hs = points.map((p) => p.x);
      const ends = [Math.min(...hs), Math.max(...hs)];
      series.push({
        label: `${methodName(ctx, id)}: published order ${order} (slope)`,
        method: id,
        points: ends.map((h) => ({ x: h, y: 10 ** (fit.meanLogY + order * (Math.log10(h) - fit.meanLogX)) })),
        style,
        dashed: true,
        markers: false,
        line: true,
      });
    }
  }
  series.push(...atResolutionSeries(sel.atResolution));
  const notes = [leftOutNote(sel), ...reasons];
  const unknown = [...byMethod(ctx, sel.kept).keys()].filter((id) => ctx.methods.get(id)?.order == null);
  if (unknown.length > 0) notes.push(`No published order in the results file for: ${unknown.map((id) => methodName(ctx, id)).join(', ')}.`);
  return [
    {
      drawn: {
        kind: 'convergence',
        problem,
        file: `${ctx.slugs.get(problem)!}-convergence.png`,
        title,
        notes,
        x: { title: `step size h${unitSuffix(timeUnitOf(ctx, problem))}`, kind: 'log' },
        y: { title: `final error (error.final)${unitSuffix(errorUnitOf(ctx, problem))}`, kind: 'log' },
        series,
      },
    },
  ];
}
