// Interactive charts for report.html and decision.html: chart.js's own browser build and the plot
// data are embedded in the page, so it works offline and archives as one file. Each chart shows
// a tooltip with the run behind a point (method, setting, error, evaluations, time, status), hides
// a method when its legend entry is clicked, and zooms to a dragged rectangle (double-click or the
// reset button restores the view). The PNGs stay for the Markdown report and archives.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import type { PlotSpec } from './plots/spec.js';

let library: string | null = null;

/** chart.js's minified browser build, from the installed package (read once). */
export function chartLibrary(): string {
  if (library === null) {
    const main = createRequire(import.meta.url).resolve('chart.js');
    library = readFileSync(join(dirname(main), 'chart.umd.min.js'), 'utf8');
  }
  return library;
}

/** Text safe inside a <script> element (no closing tag, no HTML comment opener). */
export function scriptSafe(text: string): string {
  return text.replace(/<\/(script)/gi, '<\\/$1').replace(/<!--/g, '<\\!--');
}

/** The data of one chart as the page's script reads it. */
export function clientPlot(spec: PlotSpec): unknown {
  return {
    title: spec.title,
    x: spec.x,
    y: spec.y,
    series: spec.series.map((s) => ({
      label: s.label,
      color: s.style.color,
      marker: s.style.marker,
      dashed: s.dashed ?? false,
      markers: s.markers ?? false,
      line: s.line ?? true,
      radius: s.markerRadius ?? null,
      points: s.points.map((p) => (p.meta ? { x: p.x, y: p.y, m: p.meta } : { x: p.x, y: p.y })),
    })),
  };
}

/** The page's chart code: builds each chart from the embedded data (plain ES5, no outside files). */
const CLIENT = `
(function () {
  var data = JSON.parse(document.getElementById('stepgauge-plots').textContent);
  var tip = document.createElement('div');
  tip.className = 'sg-tooltip';
  tip.setAttribute('role', 'status');
  tip.style.display = 'none';
  document.body.appendChild(tip);
  function num(v) { return v === null || v === undefined ? '—' : (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e5 ? String(Number(v.toPrecision(3))) : v.toExponential(2)); }
  function lines(ctx) {
    var raw = ctx.raw || {};
    var m = raw.m;
    if (!m) return [ctx.dataset.label, 'x ' + num(raw.x) + ', y ' + num(raw.y)];
    return [m.method, 'setting: ' + m.setting, 'error: ' + num(m.error), 'evaluations: ' + m.nfev, 'time: ' + (m.time === null ? '—' : num(m.time) + ' s'), 'status: ' + m.status];
  }
  function external(context) {
    var t = context.tooltip;
    if (!t || t.opacity === 0 || !t.dataPoints || t.dataPoints.length === 0) { tip.style.display = 'none'; return; }
    var rect = context.chart.canvas.getBoundingClientRect();
    tip.textContent = '';
    t.dataPoints.slice(0, 3).forEach(function (p, i) {
      if (i > 0) tip.appendChild(document.createElement('hr'));
      lines(p).forEach(function (l) { var d = document.createElement('div'); d.textContent = l; tip.appendChild(d); });
    });
    tip.style.display = 'block';
    tip.style.left = (window.scrollX + rect.left + t.caretX + 14) + 'px';
    tip.style.top = (window.scrollY + rect.top + t.caretY + 14) + 'px';
  }
  function axis(a) {
    var o = { type: a.kind === 'log' ? 'logarithmic' : 'linear', title: { display: true, text: a.title } };
    if (a.min !== undefined) o.min = a.min;
    if (a.max !== undefined) o.max = a.max;
    return o;
  }
  function zoomable(chart, reset) {
    var canvas = chart.canvas, start = null;
    var home = { x: [chart.options.scales.x.min, chart.options.scales.x.max], y: [chart.options.scales.y.min, chart.options.scales.y.max] };
    function restore() {
      chart.options.scales.x.min = home.x[0]; chart.options.scales.x.max = home.x[1];
      chart.options.scales.y.min = home.y[0]; chart.options.scales.y.max = home.y[1];
      chart.update('none');
    }
    canvas.addEventListener('mousedown', function (e) { if (e.button === 0) start = { x: e.offsetX, y: e.offsetY }; });
    canvas.addEventListener('mouseup', function (e) {
      if (!start) return;
      var a = start; start = null;
      var area = chart.chartArea;
      if (Math.abs(e.offsetX - a.x) < 8 || Math.abs(e.offsetY - a.y) < 8) return;
      if (a.x < area.left || a.x > area.right || a.y < area.top || a.y > area.bottom) return;
      var xs = chart.scales.x, ys = chart.scales.y;
      chart.options.scales.x.min = xs.getValueForPixel(Math.min(a.x, e.offsetX));
      chart.options.scales.x.max = xs.getValueForPixel(Math.max(a.x, e.offsetX));
      chart.options.scales.y.min = ys.getValueForPixel(Math.max(a.y, e.offsetY));
      chart.options.scales.y.max = ys.getValueForPixel(Math.min(a.y, e.offsetY));
      chart.update('none');
    });
    canvas.addEventListener('dblclick', restore);
    if (reset) reset.addEventListener('click', restore);
  }
  document.querySelectorAll('canvas[data-plot]').forEach(function (canvas) {
    var p = data[Number(canvas.getAttribute('data-plot'))];
    var chart = new Chart(canvas, {
      type: 'scatter',
      data: { datasets: p.series.map(function (s) {
        return { label: s.label, data: s.points, showLine: s.line, borderColor: s.color, backgroundColor: s.color,
          pointStyle: s.markers ? s.marker : 'line', pointRadius: s.markers ? (s.radius || 4) : 0, pointHoverRadius: s.markers ? (s.radius || 4) + 3 : 0,
          pointHitRadius: s.markers ? 6 : 0, borderWidth: s.dashed ? 1.5 : 2, borderDash: s.dashed ? [8, 5] : [], tension: 0, fill: false };
      }) },
      options: {
        animation: false, responsive: true, maintainAspectRatio: true, aspectRatio: 1.6,
        interaction: { mode: 'nearest', intersect: true },
        scales: { x: axis(p.x), y: axis(p.y) },
        plugins: {
          legend: { position: 'right', align: 'start', labels: { usePointStyle: true, boxWidth: 24 } },
          tooltip: { enabled: false, external: external },
          title: { display: false }
        }
      }
    });
    canvas.addEventListener('mouseleave', function () { tip.style.display = 'none'; });
    zoomable(chart, canvas.parentElement.querySelector('button.sg-reset'));
  });
})();
`;

export const INTERACTIVE_STYLE = `
.sg-chart { position: relative; max-width: 1200px; }
.sg-chart canvas { border: 1px solid #d9dde3; cursor: crosshair; }
.sg-reset { font-size: 12px; margin: 4px 0; }
.sg-tooltip { position: absolute; z-index: 10; pointer-events: none; background: #1d2430; color: #fff; font-size: 12px; line-height: 1.4; padding: 6px 8px; border-radius: 3px; max-width: 360px; }
.sg-tooltip hr { border: 0; border-top: 1px solid #5a6372; margin: 4px 0; }
`;

/** One chart's element: a canvas bound to the embedded data by index, and its reset button. */
export function chartElement(index: number, title: string): string {
  const t = title.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
  return `<div class="sg-chart"><button type="button" class="sg-reset">reset zoom</button><canvas data-plot="${index}" role="img" aria-label="${t}"></canvas></div>`;
}

/** The scripts to put at the end of <body>: the library, the data, and the chart code. */
export function chartScripts(specs: readonly PlotSpec[]): string {
  const json = JSON.stringify(specs.map(clientPlot)).replace(/</g, '\\u003c');
  return `<script>${scriptSafe(chartLibrary())}</script>
<script type="application/json" id="stepgauge-plots">${json}</script>
<script>${CLIENT}</script>`;
}
