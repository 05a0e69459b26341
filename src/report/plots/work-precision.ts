// Work against precision per problem: final error against median wall time, and against exact
// right-hand-side evaluations (the second holds without timing noise).
import { errorUnitOf, timeUnitOf } from './context.js';
import { unitSuffix } from './axes.js';
import { problemTitle, runsOf, type PlotContext } from './context.js';
import { leftOutNote, selectPoints, type Measure } from './select.js';
import { atResolutionSeries, methodSeries } from './series.js';
import type { PlotOutcome } from './spec.js';

const ERROR: Measure = { label: 'error.final', get: (r) => r.error.final, figure: 'final' };
const TIME: Measure = { label: 'time.medianSeconds', get: (r) => r.time.medianSeconds };
// A program that reports no counts has no point on the evaluation plot (its 0 is not a figure).
const NFEV: Measure = { label: 'counts.nfev', get: (r) => (r.countsReported === false ? null : r.counts.nfev) };

export function workPrecisionPlots(ctx: PlotContext, problem: string): PlotOutcome[] {
  const runs = runsOf(ctx, problem);
  const slug = ctx.slugs.get(problem)!;
  const name = problemTitle(ctx, problem);
  const out: PlotOutcome[] = [];

  const timeTitle = `${name}: final error vs median wall time`;
  if (runs.length > 0 && runs.every((r) => r.time.medianSeconds === null)) {
    out.push({
      omitted: {
        kind: 'work-time',
        problem,
        title: timeTitle,
        note: 'Timing was skipped for this sweep (every time.medianSeconds is null), so the wall-time plot is omitted; the evaluation-count plot holds the same comparison without timing noise.',
      },
    });
  } else {
    const sel = selectPoints(runs, ERROR, TIME);
    out.push(
      sel.kept.length === 0
        ? { omitted: { kind: 'work-time', problem, title: timeTitle, note: `No plottable points. ${leftOutNote(sel)}` } }
        : {
            drawn: {
              kind: 'work-time',
              problem,
              file: `${slug}-work-time.png`,
              title: timeTitle,
              notes: [leftOutNote(sel)],
              x: { title: `final error (error.final)${unitSuffix(errorUnitOf(ctx, problem))}`, kind: 'log' },
              y: { title: 'median wall time per solve [s]', kind: 'log' },
              series: [...methodSeries(ctx, sel.kept), ...atResolutionSeries(sel.atResolution)],
            },
          },
    );
  }

  const nfevTitle = `${name}: final error vs right-hand-side evaluations`;
  const sel = selectPoints(runs, ERROR, NFEV);
  out.push(
    sel.kept.length === 0
      ? { omitted: { kind: 'work-nfev', problem, title: nfevTitle, note: `No plottable points. ${leftOutNote(sel)}` } }
      : {
          drawn: {
            kind: 'work-nfev',
            problem,
            file: `${slug}-work-nfev.png`,
            title: nfevTitle,
            notes: [leftOutNote(sel)],
            x: { title: `final error (error.final)${unitSuffix(errorUnitOf(ctx, problem))}`, kind: 'log' },
            y: { title: 'right-hand-side evaluations (counts.nfev) [count]', kind: 'log' },
            series: [...methodSeries(ctx, sel.kept), ...atResolutionSeries(sel.atResolution)],
          },
        },
  );
  return out;
}
