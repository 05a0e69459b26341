// report.md: the report's content for a repository or a review ticket, with plots linked as
// relative files under plots/. All data is escaped.
import { CAUTION_TEXT, CAUTION_TITLE } from './caution.js';
import { escapeMarkdown as e } from './escape.js';
import { integer, settingLabel, sig3 } from './format.js';
import { decadeLabel } from './plots/axes.js';
import { referenceIndependence, type ReportModel } from './model.js';
import { levelsNote, type BestAtLevel } from './summary.js';
import { sectionColumns, tableRows } from './table.js';
import { interpolantNotes } from './interpolant-notes.js';

function row(cells: string[]): string {
  return `| ${cells.join(' | ')} |`;
}

function table(header: string[], rows: string[][], numeric: boolean[] = header.map(() => false)): string {
  return [row(header), row(numeric.map((n) => (n ? '---:' : '---'))), ...rows.map(row)].join('\n');
}

function best(b: BestAtLevel['byNfev'], what: 'nfev' | 'time', m: ReportModel): string {
  if (!b) return what === 'time' ? 'no timed run' : 'not reached';
  const name = m.methods.get(b.run.method)?.name ?? b.run.method;
  const figure = what === 'nfev' ? `${integer(b.run.counts.nfev)} evaluations` : `${sig3(b.run.time.medianSeconds)} s`;
  return `${e(name)} (${e(figure)}, ${e(settingLabel(b.run.setting))})`;
}

export function renderMarkdown(m: ReportModel): string {
  const s = m.summary;
  const out: string[] = [];
  out.push(`# ${e(m.title)}`, '');
  out.push(`stepgauge ${e(String(m.results.environment.stepgauge))}, results created ${e(m.results.createdAt)}. Every figure below is computed from the results file.`, '');
  out.push(`> **${e(CAUTION_TITLE)}.** ${e(CAUTION_TEXT)}`, '');
  out.push('## Summary', '');
  if (m.results.interrupted) out.push('**This sweep was interrupted: not all planned runs finished.**', '');
  if (m.results.shard) out.push(`**This file is shard ${m.results.shard.index} of ${m.results.shard.count} of a sweep, not the whole sweep.**`, '');
  const failures = s.failures.length === 0 ? 'none' : s.failures.map(([st, n]) => `${e(st)}: ${n}`).join(', ');
  out.push(`- problems: ${s.problems}`, `- methods: ${s.methods}`, `- runs: ${s.runs} (ok: ${s.ok})`, `- failed: ${s.runs - s.ok} (${failures})`, '');
  for (const f of s.findings) out.push(`**Finding:** ${e(f)}`, '');
  out.push('### Cheapest method reaching each error level', '');
  if (s.levels.length === 0) out.push('No ok run has a measured error, so there is no level to summarise.', '');
  else {
    const level = (l: number) => decadeLabel(l) ?? sig3(l);
    const header = ['problem', 'final error', 'fewest evaluations', 'least time'];
    const rows = s.best.flatMap((b) =>
      b.levels.map((l) => [e(m.sections.find((x) => x.id === b.problem)?.title ?? b.problem), `≤ ${level(l.level)}`, best(l.byNfev, 'nfev', m), best(l.byTime, 'time', m)]),
    );
    out.push(table(header, rows, [false, true, false, false]), '');
    out.push(`${levelsNote(s)} Among runs with status ok whose final error is at or below the level; ties go to the method listed first in the results file. Time is median wall time and carries timing noise; evaluation counts are exact.`, '');
  }

  out.push('## The request', '');
  if (m.commandLine) out.push('```sh', m.commandLine, '```', '');
  else out.push('The command line was not recorded.', '');
  out.push(table(['setting', 'value'], m.request.map(([k, v]) => [e(k), e(v)])), '');

  for (const sec of m.sections) {
    out.push(`## ${e(sec.title)} (\`${sec.id.replace(/`/g, "'")}\`)`, '');
    const ref = sec.record?.reference;
    out.push(
      ref
        ? `${ref.none ? `**Warning: ${e(ref.none)}; no error is measured.** ` : ''}Reference: ${e(String(ref.kind))}${ref.digits !== undefined ? `, ${e(String(ref.digits))} digits` : ''}${ref.source ? `; source: ${e(ref.source)}` : ''}. ${e(referenceIndependence(sec.record, sec.runs.map((r) => r.method)))}${sec.record!.stiff ? ' Stiff problem.' : ' Non-stiff problem.'} ${sec.runs.length} runs.`
        : `No problem record in the results file. ${sec.runs.length} runs.`,
      '',
    );
    if (typeof sec.record?.definition === 'string') {
      out.push(`Definition (SHA-256 \`${sec.record.sha256}\`):`, '', '```text', sec.record.definition.replace(/```/g, '`\u200b``'), '```', '');
    }
    for (const it of sec.plots) {
      if ('omitted' in it) out.push(`*${e(it.omitted.title)}:* ${e(it.omitted.note)}`, '');
      else out.push(`![${e(it.drawn.spec.title)}](plots/${it.drawn.spec.file})`, '', `${e(it.drawn.spec.notes.join(' '))}`, '');
    }
    out.push('### Runs', '');
    for (const note of interpolantNotes(sec.runs)) out.push(e(note), '');
    const columns = sectionColumns(sec.runs, m.methods);
    const rows = tableRows(sec.runs, m.methods, columns).map((cells) => cells.map((c) => e(c.text)));
    out.push(table(columns.map((c) => c.header), rows, columns.map((c) => c.numeric)), '');
  }

  out.push('## Environment fingerprint', '');
  out.push(table(['item', 'value'], m.environment.map(([k, v]) => [e(k), e(v)])), '');
  out.push('### Problems and their references', '');
  out.push(
    table(
      ['id', 'title', 'stiff', 'reference', 'digits', 'source', 'sha256 of definition'],
      m.results.problems.map((p) => [
        e(p.id),
        e(p.title),
        p.stiff ? 'yes' : 'no',
        e(String(p.reference?.kind)),
        p.reference?.digits === undefined ? '—' : e(String(p.reference.digits)),
        e(p.reference?.source ?? '(not given)'),
        e(p.sha256),
      ]),
    ),
    '',
  );
  return out.join('\n');
}
