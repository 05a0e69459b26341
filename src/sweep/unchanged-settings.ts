// A setting that changes nothing is a finding: when an external program reports exactly the same
// trajectory at different settings, it most likely never reads its tolerance or step argument
// (a silent wrapper bug). Such runs are marked and say so in their message.
import type { RunResult } from '../results/contract.js';

function settingText(r: Pick<RunResult, 'setting'>): string {
  const s = r.setting;
  return 'rtol' in s ? `rtol ${s.rtol}` : `${s.steps} steps`;
}

/** What the unchanged-setting check reads of a run. */
export type OutputRun = Pick<RunResult, 'problem' | 'method' | 'setting' | 'status' | 'outputSha256'>;

/**
 * The runs whose reported output (outputSha256) another setting of the same problem and method
 * reproduced exactly, each with the note its message gets.
 */
export function unchangedSettingNotes<T extends OutputRun>(runs: readonly T[]): Map<T, string> {
  const groups = new Map<string, T[]>();
  for (const r of runs) {
    if (r.outputSha256 === undefined || r.status !== 'ok') continue;
    const key = `${r.problem}\u0000${r.method}\u0000${r.outputSha256}`;
    const list = groups.get(key);
    if (list) list.push(r);
    else groups.set(key, [r]);
  }
  const notes = new Map<T, string>();
  for (const same of groups.values()) {
    if (same.length < 2) continue;
    const what = 'rtol' in same[0]!.setting ? 'tolerance' : 'step count';
    const settings = same.map((r) => settingText(r)).join(', ');
    const note = `the program reported exactly the same trajectory at ${settings}: changing the setting changed nothing (does it read its ${what}?)`;
    for (const r of same) notes.set(r, note);
  }
  return notes;
}

/** A marked copy of the run (a copy, so lines already serialised for it stay valid). */
export function markedUnchanged(r: RunResult, note: string): RunResult {
  return { ...r, settingIgnored: true, message: r.message ? `${r.message}; ${note}` : note };
}

/**
 * The runs, with every run whose reported output another setting of the same problem and method
 * reproduced exactly replaced by a marked copy. The runs must be in plan order (the note lists the
 * settings in that order).
 */
export function markUnchangedSettings(runs: readonly RunResult[]): RunResult[] {
  const notes = unchangedSettingNotes(runs);
  return notes.size === 0 ? [...runs] : runs.map((r) => (notes.has(r) ? markedUnchanged(r, notes.get(r)!) : r));
}

/** What the unchanged-setting check needs of a run with a reported output, kept as the runs come. */
export function outputRun(r: RunResult): (OutputRun & { planIndex: number }) | null {
  if (r.outputSha256 === undefined) return null;
  return { problem: r.problem, method: r.method, setting: r.setting, status: r.status, outputSha256: r.outputSha256, planIndex: r.planIndex ?? -1 };
}

/**
 * The `revise` of streamed runs (results/streamed-results.ts): a marked copy of each run whose
 * setting changed nothing among `outputs` (see outputRun), as markUnchangedSettings marks them.
 */
export function unchangedReviser(outputs: readonly (OutputRun & { planIndex: number })[]): (run: RunResult) => RunResult | undefined {
  const notes = new Map<number, string>();
  for (const [r, note] of unchangedSettingNotes([...outputs].sort((a, b) => a.planIndex - b.planIndex))) notes.set(r.planIndex, note);
  return (run) => {
    const note = notes.get(run.planIndex ?? -1);
    return note === undefined ? undefined : markedUnchanged(run, note);
  };
}
