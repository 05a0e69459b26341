// report.html: one self-contained file (plots as data URIs, inline styles, one small inline
// script for sorting tables), so an auditor can archive a single file. All data is escaped.
import { CAUTION_TEXT, CAUTION_TITLE } from './caution.js';
import { escapeHtml as h } from './escape.js';
import { integer, settingLabel, sig3 } from './format.js';
import { decadeLabel } from './plots/axes.js';
import type { PlotSpec } from './plots/spec.js';
import { chartElement, chartScripts, INTERACTIVE_STYLE } from './interactive.js';
import { referenceIndependence, type ProblemSection, type ReportModel } from './model.js';
import { levelsNote, type BestAtLevel } from './summary.js';
import { sectionColumns, tableRows } from './table.js';
import { interpolantNotes } from './interpolant-notes.js';

const STYLE = `
:root { --ink:#1d2430; --muted:#5a6372; --line:#d9dde3; --band:#f4f6f8; --accent:#1b4f8a; --warn:#8a4b00; --warnbg:#fff6e5; --bad:#a3224f; }
* { box-sizing: border-box; }
body { margin: 0; color: var(--ink); font: 15px/1.5 system-ui, "DejaVu Sans", "Liberation Sans", sans-serif; background: #fff; }
main { max-width: 1240px; margin: 0 auto; padding: 24px 28px 64px; }
h1 { font-size: 26px; margin: 0 0 4px; }
h2 { font-size: 21px; margin: 40px 0 8px; padding-top: 12px; border-top: 3px solid var(--accent); }
h3 { font-size: 16px; margin: 24px 0 8px; }
.sub { color: var(--muted); margin: 0 0 16px; }
.caution { border: 2px solid var(--warn); background: var(--warnbg); padding: 12px 16px; margin: 16px 0 24px; }
.caution strong { display: block; color: var(--warn); font-size: 16px; margin-bottom: 4px; }
.flag { color: var(--bad); font-weight: 600; }
.facts { display: grid; grid-template-columns: repeat(auto-fit, minmax(150px, 1fr)); gap: 8px; margin: 12px 0; }
.fact { background: var(--band); padding: 8px 12px; }
.fact b { display: block; font-size: 22px; }
figure { margin: 20px 0; }
figure img { display: block; width: 100%; max-width: 1200px; height: auto; border: 1px solid var(--line); }
figcaption { color: var(--muted); font-size: 13px; margin-top: 4px; }
.omitted { border-left: 4px solid var(--line); padding: 6px 12px; color: var(--muted); }
/* Wide tables scroll inside the page instead of pushing it sideways. */
.scroll { overflow-x: auto; max-width: 100%; }
table { border-collapse: collapse; font-size: 13px; margin: 8px 0 16px; }
th, td { border-bottom: 1px solid var(--line); padding: 4px 8px; text-align: left; vertical-align: top; }
th { background: var(--band); font-weight: 600; white-space: nowrap; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
table.sortable th { cursor: pointer; user-select: none; }
table.sortable th[aria-sort="ascending"]::after { content: " \\25B2"; }
table.sortable th[aria-sort="descending"]::after { content: " \\25BC"; }
tr.failed td { color: var(--bad); }
code, .mono { font-family: "DejaVu Sans Mono", "Liberation Mono", monospace; font-size: 12px; word-break: break-all; }
nav ul { columns: 2; margin: 4px 0; }
`;

// Sort keys live in data-sort; empty keys (no value) stay at the bottom in both directions.
const SORT_SCRIPT = `
(function () {
  function sortBy(table, th, col) {
    var dir = th.getAttribute('aria-sort') === 'ascending' ? 'descending' : 'ascending';
    table.querySelectorAll('thead th').forEach(function (x) { x.removeAttribute('aria-sort'); });
    th.setAttribute('aria-sort', dir);
    var numeric = th.getAttribute('data-type') === 'number';
    var body = table.tBodies[0];
    var rows = Array.prototype.slice.call(body.rows);
    rows.sort(function (a, b) {
      var x = a.cells[col].getAttribute('data-sort'), y = b.cells[col].getAttribute('data-sort');
      var xe = x === null || x === '', ye = y === null || y === '';
      if (xe || ye) return xe === ye ? 0 : (xe ? 1 : -1);
      var c = numeric ? Number(x) - Number(y) : x.localeCompare(y);
      return dir === 'ascending' ? c : -c;
    });
    rows.forEach(function (r) { body.appendChild(r); });
  }
  document.querySelectorAll('table.sortable').forEach(function (table) {
    table.querySelectorAll('thead th').forEach(function (th, col) {
      th.tabIndex = 0;
      th.addEventListener('click', function () { sortBy(table, th, col); });
      th.addEventListener('keydown', function (e) {
        if (e.key === 'Enter' || e.key === ' ') { e.preventDefault(); sortBy(table, th, col); }
      });
    });
  });
})();
`;

function bestCell(b: BestAtLevel['byNfev'], what: 'nfev' | 'time', m: ReportModel): string {
  if (!b) return what === 'time' ? '<td>no timed run</td>' : '<td>not reached</td>';
  const name = m.methods.get(b.run.method)?.name ?? b.run.method;
  const figure = what === 'nfev' ? `${integer(b.run.counts.nfev)} evaluations` : `${sig3(b.run.time.medianSeconds)} s`;
  return `<td>${h(name)}<br><span class="sub">${h(figure)}, ${h(settingLabel(b.run.setting))}</span></td>`;
}

function summaryHtml(m: ReportModel): string {
  const s = m.summary;
  const failures = s.failures.length === 0 ? 'none' : s.failures.map(([st, n]) => `${h(st)}: ${n}`).join(', ');
  const flags: string[] = [];
  for (const f of s.findings) flags.push(`<p class="flag">Finding: ${h(f)}</p>`);
  if (m.results.interrupted) flags.push('<p class="flag">This sweep was interrupted: not all planned runs finished.</p>');
  if (m.results.shard) {
    const sh = m.results.shard;
    flags.push(`<p class="flag">This file is shard ${sh.index} of ${sh.count} of a sweep, not the whole sweep.</p>`);
  }
  let best = '<p>No ok run has a measured error, so there is no level to summarise.</p>';
  if (s.levels.length > 0) {
    const rows = s.best
      .flatMap((b) => {
        const title = m.sections.find((x) => x.id === b.problem)?.title ?? b.problem;
        return b.levels.map(
          (l, i) =>
            `<tr>${i === 0 ? `<td rowspan="${b.levels.length}">${h(title)}</td>` : ''}<td class="num">≤ ${h(decadeLabel(l.level) ?? sig3(l.level))}</td>${bestCell(l.byNfev, 'nfev', m)}${bestCell(l.byTime, 'time', m)}</tr>`,
        );
      })
      .join('\n');
    best = `<div class="scroll"><table id="summary-levels"><thead><tr><th>problem</th><th class="num">final error</th><th>fewest evaluations</th><th>least time</th></tr></thead><tbody>${rows}</tbody></table></div>
<p class="sub">${h(levelsNote(s))} Among runs with status ok whose final error is at or below the level; ties go to the method listed first in the results file. Time is median wall time and carries timing noise; evaluation counts are exact.</p>`;
  }
  return `<section id="summary"><h2>Summary</h2>${flags.join('')}
<div class="facts"><div class="fact"><b>${s.problems}</b>problems</div><div class="fact"><b>${s.methods}</b>methods</div><div class="fact"><b>${s.runs}</b>runs</div><div class="fact"><b>${s.ok}</b>ok</div><div class="fact"><b>${s.runs - s.ok}</b>failed (${failures})</div></div>
<h3>Cheapest method reaching each error level</h3>${best}</section>`;
}

function requestHtml(m: ReportModel): string {
  const rows = m.request.map(([k, v]) => `<tr><th>${h(k)}</th><td>${h(v)}</td></tr>`).join('');
  const cmd = m.commandLine ? `<pre class="mono" id="command-line">${h(m.commandLine)}</pre>` : '<p class="sub">The command line was not recorded.</p>';
  return `<section id="request"><h2>The request</h2>${cmd}<table><tbody>${rows}</tbody></table></section>`;
}

function environmentHtml(m: ReportModel): string {
  const env = m.environment.map(([k, v]) => `<tr><th>${h(k)}</th><td>${h(v)}</td></tr>`).join('');
  const probs = m.results.problems
    .map((p) => {
      const ref = p.reference ?? { kind: '?' };
      return `<tr><td><code>${h(p.id)}</code></td><td>${h(p.title)}</td><td>${p.stiff ? 'yes' : 'no'}</td><td>${h(String(ref.kind))}</td><td class="num">${ref.digits === undefined ? '—' : h(String(ref.digits))}</td><td>${h(ref.source ?? '(not given)')}</td><td class="mono">${h(p.sha256)}</td></tr>`;
    })
    .join('\n');
  return `<section id="environment"><h2>Environment fingerprint</h2>
<table><tbody>${env}</tbody></table>
<h3>Problems and their references</h3>
<div class="scroll"><table><thead><tr><th>id</th><th>title</th><th>stiff</th><th>reference</th><th class="num">digits</th><th>source</th><th>sha256 of definition</th></tr></thead><tbody>${probs}</tbody></table></div></section>`;
}

function sectionHtml(sec: ProblemSection, m: ReportModel, charts: PlotSpec[]): string {
  const ref = sec.record?.reference;
  const refLine = ref
    ? `${ref.none ? `<strong>Warning: ${h(ref.none)}; no error is measured.</strong> ` : ''}Reference: ${h(String(ref.kind))}${ref.digits !== undefined ? `, ${h(String(ref.digits))} digits` : ''}${ref.source ? `; source: ${h(ref.source)}` : ''}. ${h(referenceIndependence(sec.record, sec.runs.map((r) => r.method)))}`
    : 'No problem record in the results file.';
  const def = typeof sec.record?.definition === 'string'
    ? `<details class="definition"><summary>Definition (its SHA-256 is ${h(sec.record.sha256)})</summary><pre class="mono">${h(sec.record.definition)}</pre></details>`
    : '';
  const figs = sec.plots
    .map((it) => {
      if ('omitted' in it) return `<p class="omitted"><b>${h(it.omitted.title)}</b><br>${h(it.omitted.note)}</p>`;
      const { spec, png } = it.drawn;
      const index = charts.push(spec) - 1;
      return `<figure>${chartElement(index, spec.title)}<figcaption>${h(spec.title)}. ${spec.notes.map(h).join(' ')} Hover a point for its run; click a legend entry to hide that series; drag a rectangle to zoom, double-click to reset.</figcaption><details><summary>Static image (as in report.md)</summary><img src="data:image/png;base64,${png.toString('base64')}" width="1200" height="800" alt="${h(spec.title)}"></details></figure>`;
    })
    .join('\n');
  const columns = sectionColumns(sec.runs, m.methods);
  const head = columns.map((c) => `<th${c.numeric ? ' class="num" data-type="number"' : ' data-type="text"'}>${h(c.header)}</th>`).join('');
  const rows = tableRows(sec.runs, m.methods, columns)
    .map((cells, i) => {
      const failed = sec.runs[i]!.status !== 'ok';
      const tds = cells
        .map((cell, j) => `<td${columns[j]!.numeric ? ' class="num"' : ''} data-sort="${cell.sort === null ? '' : h(String(cell.sort))}">${h(cell.text)}</td>`)
        .join('');
      return `<tr${failed ? ' class="failed"' : ''}>${tds}</tr>`;
    })
    .join('\n');
  return `<section id="p-${h(sec.slug)}"><h2>${h(sec.title)} <code>${h(sec.id)}</code></h2>
<p class="sub">${refLine}${sec.record ? ` ${sec.record.stiff ? 'Stiff problem.' : 'Non-stiff problem.'}` : ''} ${sec.runs.length} runs.</p>
${def}
${figs}
<h3>Runs</h3>
<p class="sub">Click a column header to sort. Measured values to 3 significant digits, work counts exact; results.json keeps full precision.</p>
${interpolantNotes(sec.runs).map((n) => `<p class="sub">${h(n)}</p>`).join('\n')}
<div class="scroll"><table class="sortable"><thead><tr>${head}</tr></thead><tbody>
${rows}
</tbody></table></div></section>`;
}

export function renderHtml(m: ReportModel): string {
  // Every drawn plot becomes an interactive chart; its data goes into one embedded JSON block.
  const charts: PlotSpec[] = [];
  const sections = m.sections.map((s) => sectionHtml(s, m, charts)).join('\n');
  const toc = m.sections.map((s) => `<li><a href="#p-${h(s.slug)}">${h(s.title)}</a></li>`).join('');
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${h(m.title)}</title><style>${STYLE}${INTERACTIVE_STYLE}</style></head>
<body><main>
<h1>${h(m.title)}</h1>
<p class="sub">stepgauge ${h(String(m.results.environment.stepgauge))}, results created ${h(m.results.createdAt)}. Every figure below is computed from the results file.</p>
<div class="caution" role="note"><strong>${h(CAUTION_TITLE)}</strong>${h(CAUTION_TEXT)}</div>
<nav><a href="#request">The request</a> · <b>Problems</b><ul>${toc}</ul><a href="#environment">Environment fingerprint</a></nav>
${summaryHtml(m)}
${requestHtml(m)}
${sections}
${environmentHtml(m)}
</main>
<script>${SORT_SCRIPT}</script>
${chartScripts(charts)}
</body></html>
`;
}
