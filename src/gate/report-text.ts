// The human-readable check report: every regression with its old value, new value and factor,
// grouped by run so a reviewer sees at once which runs moved.
import type { Comparison, RunComparison } from './compare.js';
import { num3, settingText } from './format.js';

function runHeading(r: Pick<RunComparison, 'problem' | 'method' | 'setting'>): string {
  return `${r.problem}  ${r.method}  ${settingText(r.setting)}`;
}

export function thresholdsText(c: Comparison): string {
  const o = c.options;
  return [
    `error x${o.errorFactor}`,
    `drift x${o.driftFactor}`,
    `work +${num3(o.workFraction * 100)}%`,
    `floor ${num3(o.floor)}`,
    o.timeFactor === null ? 'time not compared' : `calibrated time x${o.timeFactor}`,
    o.allowMissing ? 'missing runs allowed' : 'missing runs fail',
  ].join(', ');
}

/** Only the regressions, one block per run (used in assertion messages). */
export function regressionsText(c: Comparison): string {
  const lines: string[] = [];
  for (const r of c.runs) {
    if (r.regressions.length === 0) continue;
    lines.push(`  ${runHeading(r)}`);
    for (const f of r.regressions) lines.push(`    ${f.text}`);
  }
  return lines.join('\n');
}

export function formatComparison(c: Comparison, options: { verbose?: boolean } = {}): string {
  const s = c.summary;
  const out: string[] = [];
  // A different configuration is said first: it decides how every other line is to be read.
  if (c.configuration.length > 0) {
    out.push(
      `Configuration differs from the baseline: ${c.configuration.join('; ')}. ` +
        (s.notComparable > 0
          ? `${s.notComparable} run(s) it touches were not compared (not like for like)${c.options.allowMissing ? '' : ' and fail the check; make a new baseline with this configuration, or pass --allow-missing'}.`
          : 'No run it touches was compared differently.'),
    );
  }
  out.push(
    `Compared ${s.compared} of ${s.baselineRuns} baseline runs (${s.missing} missing, ${s.added} new): ` +
      `${s.regressions} regression(s), ${s.improvements} improvement(s).`,
  );
  out.push(`Thresholds: ${thresholdsText(c)}.`);
  if (c.regressions.length > 0) {
    out.push('', 'Regressions:', regressionsText(c));
  }
  if (c.improvements.length > 0) {
    out.push('', 'Improvements:');
    for (const r of c.runs) {
      if (r.improvements.length === 0) continue;
      out.push(`  ${runHeading(r)}`);
      for (const f of r.improvements) out.push(`    ${f.text}`);
    }
  }
  const noted = c.runs.filter((r) => r.notes.length > 0 && (options.verbose || r.state !== 'new'));
  if (noted.length > 0) {
    out.push('', 'Notes:');
    for (const r of noted) for (const n of r.notes) out.push(`  ${runHeading(r)}: ${n}`);
  }
  if (!options.verbose && s.added > 0) out.push('', `${s.added} run(s) not in the baseline were not checked (update the baseline to gate them).`);
  if (c.warnings.length > 0) {
    out.push('', 'Warnings:');
    for (const w of c.warnings) out.push(`  ${w}`);
  }
  out.push('', c.ok ? 'PASS: no regressions.' : `FAIL: ${s.regressions} regression(s).`);
  return `${out.join('\n')}\n`;
}
