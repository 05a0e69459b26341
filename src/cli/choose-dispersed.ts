// `stepgauge choose` on a dispersed problem: the setting that meets the target on a share of the
// samples (or on every one), with the samples that miss it named so each can be rerun alone.
import type { ControllerKind, Method, Problem } from '../core/types.js';
import { InputError } from '../core/errors.js';
import { DEFAULT_MAX_STEPS } from '../core/defaults.js';
import { parsePositiveInt } from './options.js';
import { sig3 } from '../report/format.js';
import { CAUTION_SHORT } from '../report/caution.js';
import { chooseOverSamples, type EnvelopeCandidate, type EnvelopeChoice } from '../sweep/choose-envelope.js';

interface Flags {
  measure: string;
  json?: boolean;
  maxSteps?: string;
  quantile?: string;
  controller?: ControllerKind;
}

/** "worst" (or absent) is every sample; otherwise a share in (0, 1]. */
export function parseQuantile(text: string | undefined): number {
  if (text === undefined || text.trim() === 'worst') return 1;
  const q = Number(text);
  if (text.trim() === '' || !Number.isFinite(q) || q <= 0 || q > 1) throw new InputError(`'${text}' is not a share in (0, 1] (e.g. 0.95) or 'worst'`, '--quantile');
  return q;
}

const SHOWN_FAILING = 8;

function settingText(c: EnvelopeCandidate): string {
  const s = c.setting;
  if (!s) return '—';
  return 'rtol' in s ? `rtol ${sig3(s.rtol)}` : `${s.steps} steps (h ${sig3(s.h)})`;
}

export function envelopeText(choice: EnvelopeChoice): string {
  const share = choice.quantile === 1 ? 'every sample (worst case)' : `${(choice.quantile * 100).toPrecision(3)}% of the samples`;
  const rows = [['rank', 'method', 'setting', `error at q`, 'worst', 'worst sample', 'samples over target', 'mean nfev', 'note']];
  choice.candidates.forEach((c, i) => {
    rows.push([
      c.met ? String(i + 1) : '—',
      c.method,
      settingText(c),
      sig3(c.quantileError),
      sig3(c.worstError),
      c.worstSample ?? '—',
      String(c.failing.length),
      sig3(c.meanNfev),
      c.note ?? '',
    ]);
  });
  const widths = rows[0]!.map((_, k) => Math.max(...rows.map((r) => r[k]!.length)));
  const lines = rows.map((r) => r.map((v, k) => v.padEnd(widths[k]!)).join('  ').trimEnd());
  const rec = choice.recommended;
  const verdict = rec
    ? [
        `recommended: ${rec.method} at ${settingText(rec)}; the error meets ${sig3(choice.target)} on ${choice.samples - rec.failing.length} of ${choice.samples} samples`,
        ...(rec.failing.length > 0 ? [`samples over the target there: ${rec.failing.slice(0, SHOWN_FAILING).join(', ')}${rec.failing.length > SHOWN_FAILING ? `, and ${rec.failing.length - SHOWN_FAILING} more` : ''}`] : []),
      ]
    : choice.refused
      ? [`refused: ${choice.refused}`]
      : ['no method met the target on that share of the samples; loosen the target, lower --quantile or add methods'];
  return [
    `${choice.of}: ${choice.samples} dispersion samples, target error ${sig3(choice.target)} (${choice.measure}) on ${share}, ranked by mean evaluations`,
    '',
    ...lines,
    '',
    ...verdict,
    'A dispersion covers only the distributions it was given; samples outside them are not evidence.',
    '',
    CAUTION_SHORT,
  ].join('\n');
}

export async function chooseDispersed(of: string, samples: Problem[], methods: Method[], target: number, flags: Flags, setExit: (code: number) => void): Promise<void> {
  if (flags.measure !== 'final' && flags.measure !== 'max') throw new InputError(`'${flags.measure}' is not final or max`, '--measure');
  const choice = chooseOverSamples(of, samples, methods, {
    target,
    measure: flags.measure,
    quantile: parseQuantile(flags.quantile),
    maxSteps: parsePositiveInt(flags.maxSteps ?? String(DEFAULT_MAX_STEPS), '--max-steps'),
    ...(flags.controller ? { controller: flags.controller } : {}),
  });
  process.stdout.write(flags.json ? `${JSON.stringify(choice, null, 2)}\n` : `${envelopeText(choice)}\n`);
  if (!choice.recommended) setExit(1);
}
