// A setting that changes nothing is a finding: when an external program reports exactly the same
// trajectory at different settings, it most likely never reads its tolerance or step argument
// (a silent wrapper bug). Such runs are marked and say so in their message.
import type { RunResult } from '../results/contract.js';

function settingText(r: RunResult): string {
  const s = r.setting;
  return 'rtol' in s ? `rtol ${s.rtol}` : `${s.steps} steps`;
}

/**
 * The runs, with every run whose reported output (outputSha256) another setting of the same
 * problem and method reproduced exactly replaced by a marked copy (a copy, so lines already
 * serialised for the unchanged runs stay valid).
 */
export function markUnchangedSettings(runs: readonly RunResult[]): RunResult[] {
  const groups = new Map<string, RunResult[]>();
  for (const r of runs) {
    if (r.outputSha256 === undefined || r.status !== 'ok') continue;
    const key = `${r.problem}\u0000${r.method}\u0000${r.outputSha256}`;
    const list = groups.get(key);
    if (list) list.push(r);
    else groups.set(key, [r]);
  }
  const marked = new Map<RunResult, RunResult>();
  for (const same of groups.values()) {
    if (same.length < 2) continue;
    const what = 'rtol' in same[0]!.setting ? 'tolerance' : 'step count';
    const settings = same.map(settingText).join(', ');
    const note = `the program reported exactly the same trajectory at ${settings}: changing the setting changed nothing (does it read its ${what}?)`;
    for (const r of same) marked.set(r, { ...r, settingIgnored: true, message: r.message ? `${r.message}; ${note}` : note });
  }
  return marked.size === 0 ? [...runs] : runs.map((r) => marked.get(r) ?? r);
}
