// Text and choice for `stepgauge envelope`: per nominal problem, the distribution table and, with a
// target, per method the swept setting of fewest mean evaluations whose quantile error meets it.
import { resolvedError, type ResultsFile, type RunResult } from '../results/contract.js';
import type { DispersionRow, DispersionSummary } from '../report/dispersion-summary.js';
import { sig3 } from '../report/format.js';
import { CAUTION_SHORT } from '../report/caution.js';

export interface SweptEnvelopeChoice {
  of: string;
  target: number;
  /** The cheapest row meeting the target at the quantile, over all methods. */
  recommended: DispersionRow | null;
  /** Per method: its cheapest row meeting the target, or null. */
  perMethod: { method: string; row: DispersionRow | null }[];
  /** Samples over the target at the recommended setting. */
  failing: string[];
}

function settingText(s: RunResult['setting']): string {
  return 'rtol' in s ? `rtol ${sig3(s.rtol)}` : `${s.steps} steps`;
}

export function envelopeFromSummary(summary: DispersionSummary, results: Pick<ResultsFile, 'runs' | 'problems'>, target: number): SweptEnvelopeChoice[] {
  const byOf = new Map<string, DispersionRow[]>();
  for (const r of summary.rows) byOf.set(r.of, [...(byOf.get(r.of) ?? []), r]);
  const out: SweptEnvelopeChoice[] = [];
  for (const [of, rows] of byOf) {
    const methods = [...new Set(rows.map((r) => r.method))];
    const perMethod = methods.map((method) => {
      // Judged as choose judges: only errors the samples' references confirm meet a target.
      const met = rows.filter((r) => r.method === method && r.confirmedQuantile <= target).sort((a, b) => a.meanNfev - b.meanNfev);
      return { method, row: met[0] ?? null };
    });
    const recommended = perMethod.map((m) => m.row).filter((r): r is DispersionRow => r !== null).sort((a, b) => a.meanNfev - b.meanNfev)[0] ?? null;
    const failing: string[] = [];
    if (recommended) {
      const sampleIds = new Set(results.problems.filter((p) => (p as { dispersion?: { of?: string } }).dispersion?.of === of).map((p) => p.id));
      const key = JSON.stringify(recommended.setting);
      for (const r of results.runs) {
        if (!sampleIds.has(r.problem) || r.method !== recommended.method || JSON.stringify(r.setting) !== key) continue;
        const e = resolvedError(r, summary.measure);
        if (!(e !== null && e <= target)) failing.push(r.problem);
      }
    }
    out.push({ of, target, recommended, perMethod, failing });
  }
  return out;
}

/** Name of the quantile column: q95, q99.9, or worst. */
function quantileName(q: number): string {
  return q === 1 ? 'worst' : `q${(q * 100).toPrecision(3).replace(/\.?0+$/, '')}`;
}

/** One table per nominal problem: the error's distribution over samples for each swept setting. */
export function dispersionTables(summary: DispersionSummary): Map<string, string[]> {
  const byOf = new Map<string, DispersionRow[]>();
  for (const r of summary.rows) byOf.set(r.of, [...(byOf.get(r.of) ?? []), r]);
  const out = new Map<string, string[]>();
  for (const [of, rows] of byOf) {
    const t = [['method', 'setting', 'samples', 'failed', 'median', quantileName(summary.q), 'worst', 'worst sample', 'mean nfev']];
    for (const r of rows) t.push([r.method, settingText(r.setting), String(r.samples), String(r.failed), sig3(r.median), sig3(r.quantile), sig3(r.worst.error), r.worst.problem, sig3(r.meanNfev)]);
    const widths = t[0]!.map((_, k) => Math.max(...t.map((row) => row[k]!.length)));
    out.set(of, [`${of}: ${Math.max(...rows.map((r) => r.samples))} samples, ${summary.measure} error`, ...t.map((row) => row.map((v, k) => v.padEnd(widths[k]!)).join('  ').trimEnd())]);
  }
  return out;
}

export function envelopeSummaryText(summary: DispersionSummary, choices?: SweptEnvelopeChoice[]): string {
  const lines: string[] = [];
  const qName = quantileName(summary.q);
  for (const [of, table] of dispersionTables(summary)) {
    lines.push(...table);
    const c = choices?.find((x) => x.of === of);
    if (c) {
      lines.push('');
      if (c.recommended) {
        lines.push(`cheapest swept setting meeting ${sig3(c.target)} at ${qName}: ${c.recommended.method} at ${settingText(c.recommended.setting)} (mean nfev ${sig3(c.recommended.meanNfev)})`);
        if (c.failing.length > 0) lines.push(`samples over the target there (rerun one alone to study it): ${c.failing.slice(0, 8).join(', ')}${c.failing.length > 8 ? `, and ${c.failing.length - 8} more` : ''}`);
      } else lines.push(`no swept setting meets ${sig3(c.target)} at ${qName}; sweep tighter settings or loosen the target`);
      lines.push('Only the swept settings are candidates; `stepgauge choose --quantile` searches between them.');
    }
    lines.push('');
  }
  lines.push('A dispersion covers only the distributions it was given; samples outside them are not evidence.', CAUTION_SHORT);
  return lines.join('\n');
}
