// Invariant drift along the span, one plot per (problem, invariant): each method at its tightest
// ok setting (solid) and at a middle one (dashed), from the sampled trace in the results.
import type { RunResult } from '../../results/contract.js';
import { sig3, tightness } from '../format.js';
import { timeAxis } from './axes.js';
import { methodName, problemTitle, runsOf, type PlotContext } from './context.js';
import { orderedReasons } from './select.js';
import type { Point, PlotOutcome, SeriesSpec } from './spec.js';

/** Markers on dense traces only every so many samples, enough to tell methods apart. */
const MARKER_TARGET = 12;

/** Invariant names in first-appearance order over traces and final drift values. */
export function invariantNames(runs: readonly RunResult[]): string[] {
  const names: string[] = [];
  const add = (n: string) => {
    if (!names.includes(n)) names.push(n);
  };
  for (const r of runs) {
    for (const n of Object.keys(r.drift ?? {})) add(n);
    for (const n of Object.keys(r.trace?.drift ?? {})) add(n);
  }
  return names;
}

/** Tightest and middle run among the eligible runs of one method (the middle only if distinct). */
export function pickSettings(runs: readonly RunResult[]): { tightest: RunResult; mid: RunResult | null } | null {
  if (runs.length === 0) return null;
  const sorted = runs.slice().sort((a, b) => tightness(a.setting) - tightness(b.setting));
  const tightest = sorted[sorted.length - 1]!;
  const mid = sorted.length >= 2 ? sorted[Math.floor((sorted.length - 1) / 2)]! : null;
  return { tightest, mid: mid === tightest ? null : mid };
}

/** One method's trace over time: solid for its tightest run, dashed for a middle one. */
export function traceSeries(ctx: PlotContext, id: string, run: RunResult, dashed: boolean, points: Point[]): SeriesSpec {
  const s = run.setting;
  const short = 'rtol' in s ? `rtol ${sig3(s.rtol)}` : `${s.steps} steps`;
  return {
    label: `${methodName(ctx, id)}${dashed ? ', middle' : ''} (${short})`,
    method: id,
    points,
    style: ctx.styles.get(id)!,
    dashed,
    markers: true,
    markerEvery: Math.max(1, Math.ceil(points.length / MARKER_TARGET)),
    line: true,
  };
}

export function driftPlots(ctx: PlotContext, problem: string): PlotOutcome[] {
  const runs = runsOf(ctx, problem);
  const names = invariantNames(runs);
  const out: PlotOutcome[] = [];
  names.forEach((inv, index) => {
    const title = `${problemTitle(ctx, problem)}: drift of invariant "${inv}" over time`;
    const leftOut = new Map<string, number>();
    let zeroSamples = 0;
    let totalSamples = 0;
    let tMin = Infinity;
    let tMax = -Infinity;
    let tPositive = Infinity;
    const series: SeriesSpec[] = [];
    for (const id of ctx.methodIds) {
      const mine = runs.filter((r) => r.method === id);
      if (mine.length === 0) continue;
      const eligible: RunResult[] = [];
      for (const r of mine) {
        if (r.status !== 'ok') leftOut.set(r.status, (leftOut.get(r.status) ?? 0) + 1);
        else if (!r.trace || !Array.isArray(r.trace.drift?.[inv])) leftOut.set('no trace', (leftOut.get('no trace') ?? 0) + 1);
        else eligible.push(r);
      }
      const pick = pickSettings(eligible);
      if (!pick) continue;
      // One setting per method, the tightest that ended ok: more lines hide each other.
      const chosen: [RunResult, boolean][] = [[pick.tightest, false]];
      for (const [run, dashed] of chosen) {
        const t = run.trace!.t;
        const d = run.trace!.drift[inv]!;
        const points: Point[] = [];
        for (let i = 0; i < Math.min(t.length, d.length); i++) {
          totalSamples++;
          if (Number.isFinite(t[i]!)) {
            tMin = Math.min(tMin, t[i]!);
            if (t[i]! > 0) tPositive = Math.min(tPositive, t[i]!);
            tMax = Math.max(tMax, t[i]!);
          }
          const v = d[i]!;
          // Drift is exactly 0 at t0 by definition and can be 0 later; a log axis cannot show 0.
          if (Number.isFinite(t[i]!) && Number.isFinite(v) && v > 0) points.push({ x: t[i]!, y: v });
          else zeroSamples++;
        }
        if (points.length === 0) continue;
        series.push(traceSeries(ctx, id, run, dashed, points));
      }
    }
    const notLeftOut = runs.length - [...leftOut.values()].reduce((a, b) => a + b, 0);
    const notes = [
      'Each method at its tightest setting with status ok.',
      notLeftOut === runs.length
        ? `All ${runs.length} runs eligible.`
        : `Not eligible: ${runs.length - notLeftOut} of ${runs.length} runs (${orderedReasons(leftOut)
            .map(([k, v]) => `${k}: ${v}`)
            .join('; ')}).`,
    ];
    if (zeroSamples > 0) notes.push(`${zeroSamples} of ${totalSamples} trace samples are zero or not finite (not drawable on a log axis; t0 is always 0).`);
    if (series.length === 0) {
      out.push({ omitted: { kind: 'drift', problem, title, note: `No drawable drift samples. ${notes.slice(1).join(' ')}` } });
      return;
    }
    out.push({
      drawn: {
        kind: 'drift',
        problem,
        file: `${ctx.slugs.get(problem)!}-drift-${index + 1}.png`,
        title,
        notes,
        x: timeAxis(ctx, problem, tMin, tMax, tPositive),
        y: { title: `relative drift |I(t) - I(0)| / |I(0)| of ${inv}`, kind: 'log' },
        series,
      },
    });
  });
  return out;
}
