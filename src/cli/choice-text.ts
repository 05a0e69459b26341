// The ranked table `stepgauge choose` prints: one row per method, the recommendation and why.
import type { Candidate, Choice } from '../sweep/choose.js';
import { sig3 } from '../report/format.js';
import { CAUTION_SHORT } from '../report/caution.js';
import { marginText } from '../sweep/acceptance.js';

function settingText(c: Candidate): string {
  const s = c.run?.setting;
  if (!s) return '—';
  if ('rtol' in s) return `rtol ${sig3(s.rtol)}`;
  if (c.rateHz != null) return `${sig3(c.rateHz)} Hz (h ${sig3(s.h)}, ${s.steps} steps)`;
  return `${s.steps} steps (h ${sig3(s.h)})`;
}

/** One step's cost at a fixed rate: the most evaluations any step took, and the mean time. */
function stepCostText(c: Candidate): string {
  const sc = c.stepCost;
  if (!sc) return '';
  const time = sc.meanSeconds !== null ? `, ${sig3(sc.meanSeconds * 1e6)} us mean` : '';
  return `one step: at most ${sc.worstNfev} evaluations${time}`;
}

function timeText(c: Candidate): string {
  const t = c.run?.time.medianSeconds;
  if (t == null) return '—';
  const m = c.timeMarginPercent;
  return m == null ? `${sig3(t * 1000)} ms` : `${sig3(t * 1000)} ms ±${sig3(m)}%`;
}

/** A candidate's count, or "not reported" for a program that reports no work. */
function countText(c: Candidate, key: 'nfev' | 'njev' | 'nlu'): string {
  if (!c.run) return '—';
  return c.run.countsReported === false ? 'not reported' : String(c.run.counts[key]);
}

export function choiceText(choice: Choice): string {
  const rows = [['rank', 'method', 'setting', 'achieved error', 'margin', 'nfev', 'njev', 'nlu', 'time', 'note']];
  for (const c of choice.candidates) {
    const notes = [...(c.tiedWith && c.tiedWith.length > 0 ? [`tied ${choice.cost === 'time' ? 'in time' : 'in evaluations'} with ${c.tiedWith.join(', ')}`] : []), ...(c.note ? [c.note] : [])];
    rows.push([
      c.rank == null ? '—' : `${c.rank}${c.tiedWith && c.tiedWith.length > 0 ? '=' : ''}`,
      c.method,
      c.met ? settingText(c) : '—',
      sig3(c.achieved),
      c.margin === null ? '—' : `${c.margin.toPrecision(3)}x`,
      countText(c, 'nfev'),
      countText(c, 'njev'),
      countText(c, 'nlu'),
      timeText(c),
      [...notes, stepCostText(c)].filter(Boolean).join('; '),
    ]);
  }
  const widths = rows[0]!.map((_, k) => Math.max(...rows.map((r) => r[k]!.length)));
  const lines = rows.map((r) => r.map((v, k) => v.padEnd(widths[k]!)).join('  ').trimEnd());
  const safety = choice.safety === 1 ? '' : `, safety ${choice.safety} (error at most ${sig3(choice.required)})`;
  const head = `${choice.problem}: target error ${sig3(choice.target)} (${choice.measure})${safety}, ranked by ${choice.cost}`;
  const rec = choice.recommended;
  if (choice.refused) return [head, '', `warning: ${choice.refused}; choose refuses to recommend a setting`, '', CAUTION_SHORT].join('\n');
  const verdict = rec
    ? `recommended: ${rec.method} at ${settingText(rec)}${rec.neighbours?.fragile ? ' (fragile)' : ''}; confirmed error ${sig3(rec.achieved)}, ${marginText(rec.achieved, choice.target)}`
    : 'no method met the target on this problem with an error the reference confirms';
  return [head, '', ...lines, '', verdict, `why: ${choice.why}`, '', CAUTION_SHORT].join('\n');
}
