// PlotSpec -> PNG bytes: chart.js drawing on an @napi-rs/canvas surface. The only module that
// knows chart.js. Fixed size, pixel ratio 1, no animation and a fixed font keep re-renders of the
// same spec byte-identical.
import { createCanvas, type Canvas } from '@napi-rs/canvas';
import {
  Chart,
  Legend,
  LinearScale,
  LineElement,
  LogarithmicScale,
  PointElement,
  ScatterController,
  SubTitle,
  Title,
  type ChartConfiguration,
  type Plugin,
  type Scale,
  type ScriptableContext,
} from 'chart.js';
import { decade, decadeLabel, decadeRange, decadeTicks } from './axes.js';
import { plotFont } from './fonts.js';
import type { AxisSpec, PlotSpec, SeriesSpec } from './spec.js';

export const PLOT_WIDTH = 1200;
export const PLOT_HEIGHT = 800;
/** Widest the legend may grow, so the data area keeps most of the picture. */
const LEGEND_MAX_WIDTH = 540;

const TEXT = '#1e1e1e';
const MUTED = '#505050';
const GRID = '#e4e4e4';
const MARKER_RADIUS = 5;

let registered = false;
function register(): void {
  if (registered) return;
  Chart.register(ScatterController, LineElement, PointElement, LogarithmicScale, LinearScale, Legend, Title, SubTitle);
  registered = true;
}

/** Paints the canvas white first: PNGs otherwise come out transparent and unreadable in dark viewers. */
const whiteBackground: Plugin<'scatter'> = {
  id: 'stepgaugeWhiteBackground',
  beforeDraw(chart) {
    const { ctx, width, height } = chart;
    ctx.save();
    ctx.globalCompositeOperation = 'destination-over';
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, width, height);
    ctx.restore();
  },
};

/** chart.js does not wrap titles; long problem titles would run off the image. */
export function wrapText(text: string, width: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(' ')) {
    if (line !== '' && line.length + 1 + word.length > width) {
      lines.push(line);
      line = word;
    } else {
      line = line === '' ? word : `${line} ${word}`;
    }
  }
  if (line !== '') lines.push(line);
  return lines;
}

function axisOptions(axis: AxisSpec, values: number[], family: string): Record<string, unknown> {
  const title = { display: true, text: axis.title, color: TEXT, font: { family, size: 15 } };
  const grid = { color: GRID };
  if (axis.kind === 'linear') {
    const finite = values.filter(Number.isFinite);
    return {
      type: 'linear',
      min: axis.min ?? Math.min(...finite),
      max: axis.max ?? Math.max(...finite),
      title,
      grid,
      ticks: { color: TEXT, font: { family, size: 13 }, maxRotation: 0 },
    };
  }
  const range = decadeRange(values) ?? { lo: 0, hi: 1 };
  const ticks = decadeTicks(range);
  return {
    type: 'logarithmic',
    min: decade(range.lo),
    max: decade(range.hi),
    title,
    grid,
    // Replace chart.js's 1-2-5 ticks with decades only; their labels become powers of ten.
    afterBuildTicks: (scale: Scale) => {
      scale.ticks = ticks.map((value) => ({ value }));
    },
    ticks: {
      color: TEXT,
      font: { family, size: 14 },
      autoSkip: false,
      maxRotation: 0,
      callback: (value: number | string) => decadeLabel(Number(value)) ?? '',
    },
  };
}

function dataset(s: SeriesSpec): Record<string, unknown> {
  const every = s.markerEvery ?? 1;
  const radius = !s.markers
    ? 0
    : every <= 1
      ? (s.markerRadius ?? MARKER_RADIUS)
      : (c: ScriptableContext<'scatter'>) => (c.dataIndex % every === 0 ? MARKER_RADIUS : 0);
  return {
    label: s.label,
    data: s.points.map((p) => ({ x: p.x, y: p.y })),
    showLine: s.line ?? true,
    borderColor: s.style.color,
    backgroundColor: s.style.color,
    pointBackgroundColor: s.style.color,
    pointBorderColor: s.style.color,
    // Reference lines show as a line sample in the legend, method series by their marker.
    pointStyle: s.markers ? s.style.marker : 'line',
    pointRadius: radius,
    pointHoverRadius: 0,
    borderWidth: s.dashed ? 1.75 : 2.25,
    borderDash: s.dashed ? [9, 6] : [],
    fill: false,
    tension: 0,
    // Markers on a decade boundary would be cut in half by the chart area edge.
    clip: MARKER_RADIUS + 3,
  };
}

export function chartConfig(spec: PlotSpec): ChartConfiguration<'scatter'> {
  const { family } = plotFont();
  const xs = spec.series.flatMap((s) => s.points.map((p) => p.x));
  const ys = spec.series.flatMap((s) => s.points.map((p) => p.y));
  return {
    type: 'scatter',
    data: { datasets: spec.series.map(dataset) as never },
    options: {
      animation: false,
      responsive: false,
      maintainAspectRatio: false,
      devicePixelRatio: 1,
      events: [],
      layout: { padding: { left: 16, right: 28, top: 12, bottom: 12 } },
      scales: { x: axisOptions(spec.x, xs, family), y: axisOptions(spec.y, ys, family) } as never,
      plugins: {
        title: {
          display: true,
          text: wrapText(spec.title, 100),
          color: TEXT,
          font: { family, size: 19, weight: 'bold' },
          padding: { top: 6, bottom: 4 },
        },
        subtitle: {
          display: spec.notes.length > 0,
          text: spec.notes.flatMap((n) => wrapText(n, 140)),
          color: MUTED,
          font: { family, size: 13 },
          padding: { bottom: 10 },
        },
        // At the right, beside the data area (never over it); panels hold at most about eight
        // methods (groups.ts), so every entry fits the height.
        legend: {
          display: true,
          position: 'right',
          // Beside the data area only: a full-height legend shared the top rows with a wrapped title.
          fullSize: false,
          align: 'start',
          maxWidth: LEGEND_MAX_WIDTH,
          labels: { color: TEXT, font: { family, size: 12 }, usePointStyle: true, boxHeight: 8, boxWidth: 26, padding: 10 },
        },
        tooltip: { enabled: false },
      },
    },
    plugins: [whiteBackground],
  };
}

// One drawing surface for every plot of a process: each surface holds PLOT_WIDTH x PLOT_HEIGHT x 4
// bytes outside V8's heap, which the collector does not count, so a new one per plot piled up
// until the process ended (bench/README.md). chart.js clears the surface before it draws.
let surface: Canvas | undefined;

function sharedSurface(): Canvas {
  surface ??= createCanvas(PLOT_WIDTH, PLOT_HEIGHT);
  return surface;
}

/** The PNG bytes of one plot, PLOT_WIDTH x PLOT_HEIGHT. */
export function renderPlot(spec: PlotSpec): Buffer {
  register();
  const canvas = sharedSurface();
  const chart = new Chart(canvas as unknown as HTMLCanvasElement, chartConfig(spec));
  try {
    return canvas.toBuffer('image/png');
  } finally {
    chart.destroy();
  }
}

/** Where chart.js put the legend entries and the data area for a spec (for tests of legibility). */
export interface PlotLayout {
  width: number;
  height: number;
  chartArea: { left: number; top: number; right: number; bottom: number };
  datasets: string[];
  legend: { text: string; left: number; top: number; width: number; height: number }[];
  /** Bottom edge of the title block (0 without a title). */
  titleBottom: number;
}

export function plotLayout(spec: PlotSpec): PlotLayout {
  register();
  const canvas = sharedSurface();
  const chart = new Chart(canvas as unknown as HTMLCanvasElement, chartConfig(spec));
  try {
    const items = chart.legend?.legendItems ?? [];
    const boxes = (chart.legend as unknown as { legendHitBoxes?: { left: number; top: number; width: number; height: number }[] }).legendHitBoxes ?? [];
    const a = chart.chartArea;
    return {
      width: PLOT_WIDTH,
      height: PLOT_HEIGHT,
      chartArea: { left: a.left, top: a.top, right: a.right, bottom: a.bottom },
      datasets: spec.series.map((s) => s.label),
      legend: items.map((it, i) => ({ text: it.text, ...(boxes[i] ?? { left: NaN, top: NaN, width: NaN, height: NaN }) })),
      titleBottom: (chart as unknown as { titleBlock?: { bottom: number } }).titleBlock?.bottom ?? 0,
    };
  } finally {
    chart.destroy();
  }
}
