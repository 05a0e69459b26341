// One colour and one marker per method, the same in every plot of a report. Colours were picked
// to stay apart in lightness as well as hue, so pairs that collapse under red-green or blue-yellow
// colour blindness still differ in value; the marker is a second, colour-free cue.
import type { ResultsFile } from '../../results/contract.js';

export const PALETTE: readonly string[] = [
  '#1b4f8a', // ink blue (dark)
  '#e08a1e', // saffron (light)
  '#0f8f7e', // sea green (mid)
  '#b0305c', // garnet (mid-dark)
  '#7a5cc7', // lavender violet (mid)
  '#6b5a2a', // bark brown (dark)
  '#5fb2e8', // glacier blue (light)
  '#3a3a3a', // graphite (dark)
];

/** chart.js point styles, ordered so neighbours in the palette also differ in shape. */
export const MARKERS = ['circle', 'rect', 'triangle', 'rectRot', 'star', 'crossRot', 'rectRounded', 'cross'] as const;
export type Marker = (typeof MARKERS)[number];

export interface MethodStyle {
  color: string;
  marker: Marker;
}

/**
 * Methods in the order the results file names them: `methods` first (when the sweep wrote it),
 * then any method that only appears in `runs`, by first appearance.
 */
export function methodOrder(results: Pick<ResultsFile, 'runs'> & { methods?: unknown }): string[] {
  const seen = new Set<string>();
  const order: string[] = [];
  const add = (id: string) => {
    if (!seen.has(id)) {
      seen.add(id);
      order.push(id);
    }
  };
  if (Array.isArray(results.methods)) {
    for (const m of results.methods) {
      if (m && typeof m === 'object' && typeof (m as { id?: unknown }).id === 'string') add((m as { id: string }).id);
    }
  }
  for (const r of results.runs) add(r.method);
  return order;
}

/** Style of the i-th method; past the palette, the marker shifts so (colour, marker) pairs stay unique. */
export function styleAt(i: number): MethodStyle {
  const round = Math.floor(i / PALETTE.length);
  return {
    color: PALETTE[i % PALETTE.length]!,
    marker: MARKERS[(i + round) % MARKERS.length]!,
  };
}

export function assignStyles(results: Pick<ResultsFile, 'runs'> & { methods?: unknown }): Map<string, MethodStyle> {
  const styles = new Map<string, MethodStyle>();
  methodOrder(results).forEach((id, i) => styles.set(id, styleAt(i)));
  return styles;
}
