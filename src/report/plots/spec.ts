// A plot described as plain data, so the plot builders can be tested without drawing and the
// renderer is the only module that knows chart.js.
import type { Marker } from './palette.js';

/** The run behind a point, for the interactive report's tooltip. */
export interface PointMeta {
  method: string;
  setting: string;
  error: number | null;
  nfev: number;
  time: number | null;
  status: string;
}

export interface Point {
  x: number;
  y: number;
  meta?: PointMeta;
}

/** A method's style, or a neutral one (marker 'line') for reference lines that belong to no method. */
export interface SeriesStyle {
  color: string;
  marker: Marker | 'line';
}

export interface SeriesSpec {
  label: string;
  /** The method the series belongs to (absent for reference lines): panels group by it. */
  method?: string;
  points: Point[];
  style: SeriesStyle;
  /** Dashed line (reference slopes, mid settings). */
  dashed?: boolean;
  /** Draw markers at the points (false for reference lines and dense traces). */
  markers?: boolean;
  /** With markers, draw one only every `markerEvery` points so dense traces stay legible. */
  markerEvery?: number;
  /** Join points with a line. */
  line?: boolean;
  /** Marker radius in pixels, for a point that must stand out (a chosen setting). */
  markerRadius?: number;
}

export interface AxisSpec {
  title: string;
  kind: 'log' | 'linear';
  /** Linear axes only: span to show when it is wider than the drawn points (e.g. the whole run). */
  min?: number;
  max?: number;
}

export type PlotKind = 'work-time' | 'work-nfev' | 'convergence' | 'proportionality' | 'drift' | 'orbit-error';

export interface PlotSpec {
  kind: PlotKind;
  problem: string;
  /** File name under plots/, already safe for any file system. */
  file: string;
  title: string;
  /** Lines under the title: what was left out and why. */
  notes: string[];
  x: AxisSpec;
  y: AxisSpec;
  series: SeriesSpec[];
}

/** A plot that was not drawn, with the reason shown in its place. */
export interface OmittedPlot {
  kind: PlotKind;
  problem: string;
  title: string;
  note: string;
}

export type PlotOutcome = { drawn: PlotSpec } | { omitted: OmittedPlot };
