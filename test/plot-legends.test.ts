// Legibility of every plot of a catalogue sweep: each drawn series has its legend entry, every
// entry lies inside the picture and outside the data area (so it is neither cut off nor drawn over
// data) and below the title, panels hold at most MAX_SERIES methods, and each method keeps one colour and marker in
// every plot. Checked on chart.js's own layout boxes (render.ts, plotLayout).
import { describe, expect, it } from 'vitest';
import { plotContext } from '../src/report/plots/context.js';
import { planPlots } from '../src/report/plots/index.js';
import { plotLayout } from '../src/report/plots/render.js';
import { MAX_SERIES } from '../src/report/plots/groups.js';
import type { PlotSpec } from '../src/report/plots/spec.js';
import { runSweep } from '../src/sweep/run.js';

describe('plots of the catalogue sweep', () => {
  it('show every drawn series in a legend that fits beside the data area, one look per method', async () => {
    const results = await runSweep({ tolerances: [1e-5], steps: [200], timing: null, jobs: 1 });
    const ctx = plotContext(results);
    const specs: PlotSpec[] = ctx.problemIds.flatMap((p) => planPlots(ctx, p).flatMap((o) => ('drawn' in o ? [o.drawn] : [])));
    expect(specs.length).toBeGreaterThan(20);
    // More than MAX_SERIES methods ran on some problem, so some plots were split into panels.
    expect(specs.some((s) => /\(embedded-explicit/.test(s.title))).toBe(true);
    const styleOf = new Map<string, string>();
    for (const spec of specs) {
      const methods = new Set(spec.series.map((s) => s.method).filter(Boolean));
      expect(methods.size, spec.file).toBeLessThanOrEqual(MAX_SERIES);
      const layout = plotLayout(spec);
      expect(layout.legend.map((l) => l.text), spec.file).toEqual(layout.datasets);
      const a = layout.chartArea;
      for (const box of layout.legend) {
        expect(box.left, `${spec.file}: ${box.text}`).toBeGreaterThanOrEqual(0);
        expect(box.top, `${spec.file}: ${box.text}`).toBeGreaterThanOrEqual(0);
        expect(box.left + box.width, `${spec.file}: ${box.text}`).toBeLessThanOrEqual(layout.width);
        expect(box.top + box.height, `${spec.file}: ${box.text}`).toBeLessThanOrEqual(layout.height);
        const overlaps = box.left < a.right && box.left + box.width > a.left && box.top < a.bottom && box.top + box.height > a.top;
        expect(overlaps, `${spec.file}: legend entry ${box.text} over the data area`).toBe(false);
        // Below the title, which wraps onto a second line on long problem titles.
        expect(box.top, `${spec.file}: legend entry ${box.text} over the title`).toBeGreaterThanOrEqual(layout.titleBottom);
      }
      for (const s of spec.series) {
        if (!s.method) continue;
        const style = `${s.style.color} ${s.style.marker}`;
        expect(styleOf.get(s.method) ?? style, `${s.method} in ${spec.file}`).toBe(style);
        styleOf.set(s.method, style);
      }
      // Within one plot no two methods share a colour and marker.
      const looks = [...methods].map((m) => { const st = spec.series.find((s) => s.method === m)!.style; return `${st.color} ${st.marker}`; });
      expect(new Set(looks).size, spec.file).toBe(looks.length);
      expect(spec.x.title.length).toBeGreaterThan(0);
      expect(spec.y.title.length).toBeGreaterThan(0);
    }
    // Robertson's drift spans t up to 1e11: a logarithmic time axis.
    const robertson = specs.find((s) => s.kind === 'drift' && s.problem === 'robertson');
    expect(robertson?.x.kind).toBe('log');
  }, 240_000);
});
