// Renders a decision record (decision-record.ts) as Markdown and as one self-contained HTML file
// (the plot embedded as a data URI, no outside resources), and describes its work-precision plot.
import type { RunSetting } from '../results/contract.js';
import { CAUTION_TITLE } from './caution.js';
import type { DecisionCandidate, DecisionRecord } from './decision-record.js';
import { escapeHtml as h, escapeMarkdown as md } from './escape.js';
import { integer, settingLabel, sig3 } from './format.js';
import { styleAt } from './plots/palette.js';
import { chartElement, chartScripts, INTERACTIVE_STYLE } from './interactive.js';
import type { PlotSpec, SeriesSpec } from './plots/spec.js';

/** At most this many methods are drawn (the best ranked that met the target), so the plot stays legible. */
const PLOT_METHODS = 8;
const TARGET_COLOR = '#a3224f';

function settingText(s: RunSetting | null): string {
  return s ? settingLabel(s) : '—';
}

function timeText(c: DecisionCandidate): string {
  const t = c.time;
  if (!t || t.medianSeconds === null) return '—';
  const ms = sig3(t.medianSeconds * 1000);
  return t.marginPercent === null ? `${ms} ms` : `${ms} ms ± ${sig3(t.marginPercent)}%`;
}

function rankText(c: DecisionCandidate): string {
  if (c.rank === null) return '—';
  return c.tiedWith.length > 0 ? `${c.rank}=` : String(c.rank);
}

interface Row {
  cells: string[];
  failed: boolean;
}

const HEAD = ['rank', 'method', 'setting', 'achieved error', 'margin', 'nfev', 'njev', 'nlu', 'accepted', 'rejected', 'time (median ± 95% margin)', 'fragile', 'notes'];

function rows(r: DecisionRecord): Row[] {
  return r.candidates.map((c) => ({
    failed: !c.met,
    cells: [
      rankText(c),
      c.method,
      c.met ? settingText(c.setting) : c.setting ? `(best tried) ${settingText(c.setting)}` : '—',
      sig3(c.achieved),
      c.margin === null ? '—' : `${c.margin.toPrecision(3)}x`,
      integer(c.counts?.nfev),
      integer(c.counts?.njev),
      integer(c.counts?.nlu),
      integer(c.counts?.accepted),
      integer(c.counts?.rejected),
      timeText(c),
      c.fragile === null ? '—' : c.fragile ? 'yes' : 'no',
      [...(c.tiedWith.length > 0 ? [`tied ${r.question.cost === 'time' ? 'in time' : 'in evaluations'} with ${c.tiedWith.join(', ')}`] : []), ...c.notes].join('; '),
    ],
  }));
}

function questionLines(r: DecisionRecord): [string, string][] {
  const q = r.question;
  return [
    ['problem', `${r.model.title} (${q.problem})`],
    ['target', `error (${q.measure === 'final' ? 'at the end of the span' : q.measure === 'max' ? 'worst over the check times' : q.measure}) at most ${sig3(q.target)} ${q.unit ? q.unit : "in the problem's error scale"}`],
    ['safety factor', `${q.safety}: each candidate had to reach ${sig3(q.required)}. ${r.safetyNote}`],
    ['ranked by', q.cost === 'time' ? 'median wall time; times that overlap within their 95% margins are tied and ordered by function evaluations' : 'function evaluations (exact)'],
    ['step limit', `${q.maxSteps} steps per run (accepted + rejected)`],
    ['step-size controller (explicit pairs)', q.controller ?? 'standard'],
  ];
}

function referenceLines(r: DecisionRecord): [string, string][] {
  const ref = r.reference;
  const out: [string, string][] = [
    ['kind', ref.kind],
    ['source', ref.source ?? '(not given)'],
    ['trust', ref.trust],
    ['certifying methods', ref.certifyingMethods.length > 0 ? ref.certifyingMethods.join(', ') : 'none (not a certified reference)'],
  ];
  if (ref.unavailable) out.push(['unavailable', ref.unavailable]);
  return out;
}

function recommendationText(r: DecisionRecord): string {
  const rec = r.recommendation;
  if (!rec) return 'No recommendation: no method met the target.';
  return `Recommended: ${rec.method} at ${settingLabel(rec.setting)}${rec.fragile ? ' (fragile)' : ''}.`;
}

export function decisionMarkdown(r: DecisionRecord, plotFile?: string): string {
  const kv = (lines: [string, string][]) => ['| | |', '| --- | --- |', ...lines.map(([k, v]) => `| ${md(k)} | ${md(v)} |`)].join('\n');
  const table = [
    `| ${HEAD.join(' | ')} |`,
    `| ${HEAD.map(() => '---').join(' | ')} |`,
    ...rows(r).map((row) => `| ${row.cells.map(md).join(' | ')} |`),
  ].join('\n');
  const env = Object.entries(r.environment).map(([k, v]) => [k, typeof v === 'string' ? v : JSON.stringify(v)] as [string, string]);
  return [
    `# Decision record: ${md(r.model.title)} (${md(r.question.problem)})`,
    '',
    `> **${CAUTION_TITLE}.** ${md(r.caution)}`,
    '',
    `**${md(recommendationText(r))}**`,
    '',
    md(r.why),
    '',
    '## The question',
    '',
    kv(questionLines(r)),
    '',
    '## The model',
    '',
    `SHA-256 of the definition below: \`${r.model.sha256}\`. Source: ${md(r.model.source)}.`,
    '',
    '```text',
    r.model.definition.replace(/```/g, '`\u200b``'),
    '```',
    '',
    '## The reference',
    '',
    kv(referenceLines(r)),
    '',
    '## Candidates',
    '',
    table,
    '',
    ...(plotFile ? [`![work against precision, target and chosen point](${plotFile})`, ''] : []),
    'Margin is target / achieved error. "Fragile" means the error is not monotone across the neighbouring settings (half and double the tolerance, or 10% fewer and more steps).',
    '',
    '## Environment and command',
    '',
    '```sh',
    r.commandLine,
    '```',
    '',
    kv(env),
    '',
    `Written ${r.createdAt} by stepgauge ${md(String(r.environment.stepgauge))}.`,
    '',
  ].join('\n');
}

const STYLE = `
body { margin: 0; color: #1d2430; font: 15px/1.5 system-ui, "DejaVu Sans", "Liberation Sans", sans-serif; }
main { max-width: 1240px; margin: 0 auto; padding: 24px 28px 64px; }
h1 { font-size: 24px; } h2 { font-size: 19px; margin-top: 32px; border-top: 3px solid #1b4f8a; padding-top: 10px; }
.caution { border: 2px solid #8a4b00; background: #fff6e5; padding: 12px 16px; }
.caution strong { color: #8a4b00; }
.verdict { font-size: 18px; font-weight: 600; }
.scroll { overflow-x: auto; }
table { border-collapse: collapse; font-size: 13px; margin: 8px 0 16px; }
th, td { border-bottom: 1px solid #d9dde3; padding: 4px 8px; text-align: left; vertical-align: top; }
th { background: #f4f6f8; white-space: nowrap; }
td { white-space: nowrap; } td.notes { white-space: normal; min-width: 16em; }
tr.failed td { color: #a3224f; }
pre { background: #f4f6f8; padding: 10px; overflow-x: auto; font-size: 12px; }
img { max-width: 100%; height: auto; border: 1px solid #d9dde3; }
`;

export function decisionHtml(r: DecisionRecord, plotPng?: Buffer): string {
  const kv = (lines: [string, string][]) => `<table>${lines.map(([k, v]) => `<tr><th>${h(k)}</th><td class="notes">${h(v)}</td></tr>`).join('')}</table>`;
  const head = `<tr>${HEAD.map((c) => `<th>${h(c)}</th>`).join('')}</tr>`;
  const body = rows(r)
    .map((row) => `<tr${row.failed ? ' class="failed"' : ''}>${row.cells.map((c, i) => `<td${i === row.cells.length - 1 ? ' class="notes"' : ''}>${h(c)}</td>`).join('')}</tr>`)
    .join('\n');
  const env = Object.entries(r.environment).map(([k, v]) => [k, typeof v === 'string' ? v : JSON.stringify(v)] as [string, string]);
  const spec = plotPng ? decisionPlotSpec(r) : null;
  const plot = plotPng && spec
    ? `<figure>${chartElement(0, spec.title)}<figcaption>Every setting the search tried, per method (error against function evaluations); the dashed lines mark the target and target / safety; the star marks the recommended setting. Hover a point for its run; click a legend entry to hide a method; drag to zoom, double-click to reset.</figcaption><details><summary>Static image</summary><img alt="work against precision with the target line and the chosen point" src="data:image/png;base64,${plotPng.toString('base64')}"></details></figure>`
    : '';
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Decision record: ${h(r.question.problem)}</title><style>${STYLE}${INTERACTIVE_STYLE}</style></head>
<body><main>
<h1>Decision record: ${h(r.model.title)} (<code>${h(r.question.problem)}</code>)</h1>
<div class="caution" id="caution"><strong>${h(CAUTION_TITLE)}.</strong> ${h(r.caution)}</div>
<p class="verdict" id="recommendation">${h(recommendationText(r))}</p>
<p id="why">${h(r.why)}</p>
<h2>The question</h2>${kv(questionLines(r))}
<h2>The model</h2><p>SHA-256 of the definition below: <code>${h(r.model.sha256)}</code>. Source: ${h(r.model.source)}.</p>
<pre id="definition">${h(r.model.definition)}</pre>
<h2>The reference</h2>${kv(referenceLines(r))}
<h2>Candidates</h2><div class="scroll"><table id="candidates"><thead>${head}</thead><tbody>${body}</tbody></table></div>
<p>Margin is target / achieved error. “Fragile” means the error is not monotone across the neighbouring settings (half and double the tolerance, or 10% fewer and more steps).</p>
${plot}
<h2>Environment and command</h2><pre id="command">${h(r.commandLine)}</pre>${kv(env)}
<p>Written ${h(r.createdAt)}.</p>
</main>${spec ? chartScripts([spec]) : ''}</body></html>
`;
}

/** Error against evaluations for every setting tried, the target lines and the chosen point. */
export function decisionPlotSpec(r: DecisionRecord): PlotSpec | null {
  const drawn = r.candidates.filter((c) => c.met).slice(0, PLOT_METHODS);
  const series: SeriesSpec[] = [];
  const all = r.candidates.map((c) => c.method);
  for (const c of drawn) {
    const points = c.tried
      .filter((t) => t.status === 'ok' && t.error !== null && t.error > 0 && t.nfev > 0)
      .map((t) => ({ x: t.error!, y: t.nfev, meta: { method: c.method, setting: settingLabel(t.setting), error: t.error, nfev: t.nfev, time: null, status: t.status } }))
      .sort((a, b) => a.y - b.y);
    if (points.length === 0) continue;
    series.push({ label: c.method, points, style: styleAt(all.indexOf(c.method)), markers: true, line: true });
  }
  if (series.length === 0) return null;
  const ys = series.flatMap((s) => s.points.map((p) => p.y));
  const lo = Math.min(...ys);
  const hi = Math.max(...ys);
  const q = r.question;
  series.push({ label: `target ${sig3(q.target)}`, points: [{ x: q.target, y: lo }, { x: q.target, y: hi }], style: { color: TARGET_COLOR, marker: 'line' }, dashed: true, line: true });
  if (q.safety !== 1) {
    series.push({ label: `target / safety ${sig3(q.required)}`, points: [{ x: q.required, y: lo }, { x: q.required, y: hi }], style: { color: '#505050', marker: 'line' }, dashed: true, line: true });
  }
  const rec = r.candidates.find((c) => c.method === r.recommendation?.method);
  if (rec && rec.achieved !== null && rec.achieved > 0 && rec.counts) {
    series.push({ label: `chosen: ${rec.method}`, points: [{ x: rec.achieved, y: rec.counts.nfev }], style: { color: TARGET_COLOR, marker: 'star' }, markers: true, line: false, markerRadius: 12 });
  }
  const left = r.candidates.filter((c) => c.met).length - drawn.length;
  return {
    kind: 'work-nfev',
    problem: q.problem,
    file: 'decision-plot.png',
    title: `${r.model.title}: settings tried, error (${q.measure}) vs function evaluations`,
    notes: [left > 0 ? `The ${drawn.length} best-ranked methods that met the target are drawn; ${left} more are in the table.` : 'Every method that met the target is drawn.'],
    x: { title: `error (${q.measure}) ${q.unit ? `[${q.unit}]` : "in the problem's error scale"}`, kind: 'log' },
    y: { title: 'right-hand-side evaluations (counts.nfev)', kind: 'log' },
    series,
  };
}
