// The readable summary printed after a sweep: one line per (problem, method).
import { isUnresolved, resolvedError, type ResultsFile, type RunResult } from '../results/contract.js';
import { sig3 } from '../report/format.js';
import { dispersionSummary, samplesOf } from '../report/dispersion-summary.js';
import { dispersionTables } from './envelope-text.js';

function pad(s: string, w: number): string {
  return s.length >= w ? s : s + ' '.repeat(w - s.length);
}

function table(rows: string[][]): string {
  const widths = rows[0]!.map((_, c) => Math.max(...rows.map((r) => r[c]!.length)));
  return rows.map((r) => r.map((v, c) => pad(v, widths[c]!)).join('  ').trimEnd()).join('\n');
}

function statusCounts(runs: RunResult[]): string {
  const counts = new Map<string, number>();
  for (const r of runs) if (r.status !== 'ok') counts.set(r.status, (counts.get(r.status) ?? 0) + 1);
  return [...counts].map(([s, n]) => `${n} ${s}`).join(', ');
}

/**
 * The run with the smallest final error the reference confirms; only when no run has one, the
 * smallest unconfirmed one (printed "(at ref.)"), so an error within reach of the reference's
 * resolution is never shown as a method's best beside a confirmed one.
 */
function bestRun(runs: readonly RunResult[]): RunResult | undefined {
  const smallest = (list: RunResult[]) => list.reduce<RunResult | undefined>((b, r) => (!b || r.error.final! < b.error.final! ? r : b), undefined);
  const measured = runs.filter((r) => r.status === 'ok' && r.error.final !== null);
  return smallest(measured.filter((r) => resolvedError(r, 'final') !== null)) ?? smallest(measured);
}

export function summaryText(results: ResultsFile): string {
  const lines: string[] = [];
  const byProblem = new Map<string, RunResult[]>();
  const samples = samplesOf(results);
  // Dispersion samples are summarised as distributions below, not one table each.
  for (const r of results.runs) if (!samples.has(r.problem)) byProblem.set(r.problem, [...(byProblem.get(r.problem) ?? []), r]);
  for (const [problem, runs] of byProblem) {
    lines.push('', `${problem}`);
    const rows: string[][] = [['method', 'runs', 'ok', 'best error', 'at setting', 'nfev there', 'time there', 'failures']];
    const byMethod = new Map<string, RunResult[]>();
    for (const r of runs) byMethod.set(r.method, [...(byMethod.get(r.method) ?? []), r]);
    for (const [method, mr] of byMethod) {
      const best = bestRun(mr);
      const setting = best ? ('rtol' in best.setting ? `rtol ${sig3(best.setting.rtol)}` : `${best.setting.steps} steps`) : '—';
      rows.push([
        method,
        String(mr.length),
        String(mr.filter((r) => r.status === 'ok').length),
        best ? sig3(best.error.final) + (isUnresolved(best, 'final') ? ' (at ref.)' : '') : '—',
        setting,
        best ? (best.countsReported === false ? 'not reported' : String(best.counts.nfev)) : '—',
        best && best.time.medianSeconds !== null ? `${sig3(best.time.medianSeconds * 1000)} ms` : '—',
        statusCounts(mr) || '—',
      ]);
    }
    lines.push(table(rows));
    for (const [method, mr] of byMethod) {
      const same = mr.filter((r) => r.settingIgnored);
      if (same.length > 0) lines.push(`finding: ${method} reported the same trajectory at ${same.length} settings; its setting changes nothing (see the runs' messages)`);
    }
  }
  if (samples.size > 0) lines.push(dispersionText(results));
  const failed = results.runs.filter((r) => r.status !== 'ok').length;
  lines.push('', `${results.runs.length} runs, ${failed} not ok${failed ? ` (${statusCounts(results.runs)})` : ''}.`);
  return lines.join('\n');
}

/** The dispersion tables of a sweep, one per dispersed problem (see `stepgauge envelope`). */
function dispersionText(results: ResultsFile): string {
  return [...dispersionTables(dispersionSummary(results)).values()].map((t) => `\n${t.join('\n')}`).join('\n');
}
