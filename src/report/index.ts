// Public surface of the report layer: writeReport draws every plot and writes report.html and
// report.md into a folder the caller owns (and later renames into place).
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { ResultsFile } from '../results/contract.js';
import { renderHtml } from './html.js';
import { renderMarkdown } from './markdown.js';
import { buildModel } from './model.js';
import { withDispersionsCollapsed } from './dispersion-view.js';
import { plotContext, renderAllPlots } from './plots/index.js';

export const DEFAULT_REPORT_TITLE = 'stepgauge report';

/**
 * Writes plots/*.png, report.html and report.md into outDir. Returns the written files as paths
 * relative to outDir, because the caller renames the folder afterwards.
 */
export async function writeReport(full: ResultsFile, outDir: string, options: { title?: string; levels?: readonly number[] } = {}): Promise<{ files: string[] }> {
  const results = withDispersionsCollapsed(full);
  const ctx = plotContext(results);
  const plots = renderAllPlots(results, ctx);
  const model = buildModel(ctx, plots, options.title ?? DEFAULT_REPORT_TITLE, options.levels);
  const files: string[] = [];
  await mkdir(join(outDir, 'plots'), { recursive: true });
  for (const p of plots) {
    for (const it of p.items) {
      if (!('drawn' in it)) continue;
      const rel = `plots/${it.drawn.spec.file}`;
      await writeFile(join(outDir, rel), it.drawn.png);
      files.push(rel);
    }
  }
  await writeFile(join(outDir, 'report.html'), renderHtml(model));
  files.push('report.html');
  await writeFile(join(outDir, 'report.md'), renderMarkdown(model));
  files.push('report.md');
  return { files };
}

export { renderHtml } from './html.js';
export { renderMarkdown } from './markdown.js';
export { buildModel, type ReportModel } from './model.js';
export { summarize, derivedLevels, type Summary } from './summary.js';
export { escapeHtml, escapeMarkdown } from './escape.js';
export { CAUTION_TEXT } from './caution.js';
export { plotContext, renderAllPlots, renderPlot, PLOT_WIDTH, PLOT_HEIGHT } from './plots/index.js';
