// Gate inside a team's own test suite (package subpath `stepgauge/vitest`). It needs no test
// framework import: failures are node:assert AssertionErrors, which vitest, node:test and others
// report as ordinary assertion failures with the message shown.
import { AssertionError } from 'node:assert';
import { RESULTS_FORMAT, runKey, type ResultsFile, type RunResult } from '../results/contract.js';
import { readBaselineFile, type Baseline } from './baseline.js';
import { compareResults, type CompareOptions, type Comparison } from './compare.js';
import { regressionsText, thresholdsText } from './report-text.js';

export type CurrentInput = RunResult | RunResult[] | ResultsFile;
/** A baseline object, a full results file used as baseline, or the path of a baseline file. */
export type BaselineInput = Baseline | ResultsFile | string;

export interface GateOptions extends CompareOptions {}

function isResultsFile(x: CurrentInput): x is ResultsFile {
  return !Array.isArray(x) && (x as ResultsFile).format === RESULTS_FORMAT;
}

/**
 * Compares current runs with a baseline. Given a whole results file, every baseline run must be
 * present (unless allowMissing). Given one run or a list, only those runs are checked, and each
 * must have a baseline run: a run with nothing to compare against fails rather than passing
 * silently.
 */
export function compareToBaseline(current: CurrentInput, baseline: BaselineInput, options: GateOptions = {}): Comparison {
  const base: Baseline | ResultsFile = typeof baseline === 'string' ? readBaselineFile(baseline) : baseline;
  const label = typeof baseline === 'string' ? baseline : 'baseline';
  if (isResultsFile(current)) return compareResults(base, current, { ...options, labels: { baseline: label, current: 'results', ...options.labels } });
  const runs = Array.isArray(current) ? current : [current];
  const wanted = new Set(runs.map(runKey));
  const baseRuns = (base.runs as Baseline['runs']).filter((r) => wanted.has(runKey(r)));
  const subset: Baseline = {
    format: 'stepgauge-baseline',
    version: 1,
    source: { createdAt: '', stepgauge: '' },
    problems: base.problems.map((p) => ({ id: p.id, sha256: p.sha256 })),
    runs: baseRuns,
  };
  const calibration = 'environment' in base ? base.environment.calibrationSeconds : base.calibrationSeconds;
  if (calibration !== undefined) subset.calibrationSeconds = calibration;
  // Loose runs carry no file-level calibration; --time then relies on each run's calibrationRatio.
  const cur: Baseline = { format: 'stepgauge-baseline', version: 1, source: subset.source, problems: [], runs };
  const comparison = compareResults(subset, cur, { ...options, labels: { baseline: label, current: 'runs', ...options.labels } });
  for (const r of comparison.runs) {
    if (r.state !== 'new') continue;
    const f = {
      key: r.key,
      problem: r.problem,
      method: r.method,
      setting: r.setting,
      kind: 'missing' as const,
      metric: 'baseline',
      old: null,
      new: 'present',
      factor: null,
      limit: 'present',
      text: 'baseline: no baseline run with this problem, method and setting',
    };
    r.regressions.push(f);
    comparison.regressions.push(f);
  }
  comparison.summary.regressions = comparison.regressions.length;
  comparison.ok = comparison.regressions.length === 0;
  return comparison;
}

/** Like compareToBaseline, but throws an AssertionError listing every regression. */
export function expectWithinBaseline(current: CurrentInput, baseline: BaselineInput, options: GateOptions = {}): Comparison {
  const c = compareToBaseline(current, baseline, options);
  if (!c.ok) {
    const message = `${c.regressions.length} regression(s) against the baseline (${thresholdsText(c)}):\n${regressionsText(c)}`;
    throw new AssertionError({ message });
  }
  return c;
}

export type { Baseline, Comparison, CompareOptions };
