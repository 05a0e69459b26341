// Small multiples: a plot with more method series than a reader can tell apart is split into
// panels of at most MAX_SERIES methods, grouped by family (a family larger than that is split
// into balanced parts), each its own PNG with the same axes. Series that belong to no method
// (reference slopes, target lines) appear in every panel.
import { FAMILY_ORDER, type PlotContext } from './context.js';
import type { PlotOutcome, PlotSpec, SeriesSpec } from './spec.js';

/** Most method series in one panel: beyond about eight, colours and markers stop being told apart. */
export const MAX_SERIES = 8;


function familyOf(ctx: PlotContext, method: string): string {
  return ctx.methods.get(method)?.family ?? 'other';
}

/** Method ids in panels: by family in a fixed order, each family cut into balanced parts of at most MAX_SERIES. */
export function methodPanels(ctx: PlotContext, methods: readonly string[]): { name: string; methods: string[] }[] {
  const families = new Map<string, string[]>();
  for (const m of methods) {
    const f = familyOf(ctx, m);
    families.set(f, [...(families.get(f) ?? []), m]);
  }
  const order = [...families.keys()].sort((a, b) => (FAMILY_ORDER.indexOf(a) + 1 || 99) - (FAMILY_ORDER.indexOf(b) + 1 || 99) || (a < b ? -1 : 1));
  const panels: { name: string; methods: string[] }[] = [];
  for (const f of order) {
    const ids = families.get(f)!;
    const parts = Math.ceil(ids.length / MAX_SERIES);
    const size = Math.ceil(ids.length / parts);
    for (let k = 0; k < parts; k++) panels.push({ name: parts === 1 ? f : `${f} ${k + 1} of ${parts}`, methods: ids.slice(k * size, (k + 1) * size) });
  }
  return panels;
}

function slug(name: string): string {
  return name.replace(/[^a-z0-9]+/gi, '-').replace(/^-|-$/g, '').toLowerCase();
}

/** The plot as it is, or as panels when it has more than MAX_SERIES method series. */
export function splitPanels(ctx: PlotContext, spec: PlotSpec): PlotSpec[] {
  const methods = [...new Set(spec.series.map((s) => s.method).filter((m): m is string => m !== undefined))];
  if (methods.length <= MAX_SERIES) return [spec];
  const shared = spec.series.filter((s) => s.method === undefined);
  const stem = spec.file.replace(/\.png$/, '');
  return methodPanels(ctx, methods).map((panel) => {
    const own: SeriesSpec[] = spec.series.filter((s) => s.method !== undefined && panel.methods.includes(s.method));
    return { ...spec, file: `${stem}-${slug(panel.name)}.png`, title: `${spec.title} (${panel.name})`, series: [...own, ...shared] };
  });
}

export function splitOutcomes(ctx: PlotContext, outcomes: readonly PlotOutcome[]): PlotOutcome[] {
  return outcomes.flatMap((o): PlotOutcome[] => ('drawn' in o ? splitPanels(ctx, o.drawn).map((d) => ({ drawn: d })) : [o]));
}
