// All plots of a report, per problem in a fixed order, and their PNG rendering.
import type { ResultsFile } from '../../results/contract.js';
import { plotContext, type PlotContext } from './context.js';
import { convergencePlots } from './convergence.js';
import { driftPlots } from './drift.js';
import { orbitErrorPlots } from './orbit-error.js';
import { proportionalityPlots } from './proportionality.js';
import { renderPlot } from './render.js';
import type { OmittedPlot, PlotOutcome, PlotSpec } from './spec.js';
import { workPrecisionPlots } from './work-precision.js';
import { splitOutcomes } from './groups.js';

export interface RenderedPlot {
  spec: PlotSpec;
  png: Buffer;
}

export interface ProblemPlots {
  problem: string;
  /** Drawn and omitted plots in section order. */
  items: ({ drawn: RenderedPlot } | { omitted: OmittedPlot })[];
}

export function planPlots(ctx: PlotContext, problem: string): PlotOutcome[] {
  return splitOutcomes(ctx, [
    ...workPrecisionPlots(ctx, problem),
    ...convergencePlots(ctx, problem),
    ...proportionalityPlots(ctx, problem),
    ...driftPlots(ctx, problem),
    ...orbitErrorPlots(ctx, problem),
  ]);
}

export function renderAllPlots(results: ResultsFile, ctx: PlotContext = plotContext(results)): ProblemPlots[] {
  return ctx.problemIds.map((problem) => ({
    problem,
    items: planPlots(ctx, problem).map((o) => ('drawn' in o ? { drawn: { spec: o.drawn, png: renderPlot(o.drawn) } } : o)),
  }));
}

export { plotContext } from './context.js';
export type { PlotContext } from './context.js';
export { renderPlot, plotLayout, PLOT_WIDTH, PLOT_HEIGHT } from './render.js';
export type { PlotSpec, OmittedPlot, PlotOutcome, SeriesSpec } from './spec.js';
