// Tolerance proportionality of adaptive methods: achieved final error against requested rtol,
// beside the line error = rtol; the fitted log-log slope says how the error tracks the request.
import { errorUnitOf, timeUnitOf } from './context.js';
import { unitSuffix } from './axes.js';
import { sig3 } from '../format.js';
import { methodName, problemTitle, runsOf, type PlotContext } from './context.js';
import { fitLogLog } from './fit.js';
import { leftOutNote, selectPoints, type Measure } from './select.js';
import { atResolutionSeries, methodSeries } from './series.js';
import type { PlotOutcome, SeriesStyle } from './spec.js';

const RTOL: Measure = { label: 'rtol', get: (r) => ('rtol' in r.setting ? r.setting.rtol : null) };
const ERROR: Measure = { label: 'error.final', get: (r) => r.error.final, figure: 'final' };

/** Neutral grey for the identity line: it belongs to no method. */
export const IDENTITY_STYLE: SeriesStyle = { color: '#8c8c8c', marker: 'line' };

export function proportionalityPlots(ctx: PlotContext, problem: string): PlotOutcome[] {
  const runs = runsOf(ctx, problem).filter((r) => 'rtol' in r.setting);
  if (runs.length === 0) return [];
  const title = `${problemTitle(ctx, problem)}: tolerance proportionality (achieved error vs requested rtol)`;
  const sel = selectPoints(runs, RTOL, ERROR);
  if (sel.kept.length === 0) {
    return [{ omitted: { kind: 'proportionality', problem, title, note: `No plottable points. ${leftOutNote(sel)}` } }];
  }
  const series = methodSeries(ctx, sel.kept, (id, points) => {
    const fit = fitLogLog(points);
    return `${methodName(ctx, id)}: slope ${fit ? sig3(fit.slope) : 'n/a'}`;
  });
  const rtols = sel.kept.map((k) => k.point.x);
  const lo = Math.min(...rtols);
  const hi = Math.max(...rtols);
  series.push({
    label: 'achieved = requested (y = x)',
    points: [
      { x: lo, y: lo },
      { x: hi, y: hi },
    ],
    style: IDENTITY_STYLE,
    dashed: true,
    markers: false,
    line: true,
  });
  series.push(...atResolutionSeries(sel.atResolution));
  return [
    {
      drawn: {
        kind: 'proportionality',
        problem,
        file: `${ctx.slugs.get(problem)!}-proportionality.png`,
        title,
        notes: [leftOutNote(sel)],
        x: { title: 'requested relative tolerance (rtol) [relative]', kind: 'log' },
        y: { title: `achieved final error (error.final)${unitSuffix(errorUnitOf(ctx, problem))}`, kind: 'log' },
        series,
      },
    },
  ];
}
