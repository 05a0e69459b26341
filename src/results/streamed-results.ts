// results.json and results.csv of a sweep whose runs were not kept (SweepRequest.streamRuns): the
// runs are read back from the journal in plan order one at a time, each written to both files as
// it is read, so writing a sweep of any size holds one run, not all of them. The bytes are those
// resultsJsonBytes and resultsCsv would write for the same runs (test/results-json.test.ts).
import { join } from 'node:path';
import type { ResultsFile, RunResult } from './contract.js';
import { resultsJsonPieces, type RunLines } from './json.js';
import { csvHeaderLine, csvRunLine } from './csv.js';
import { FileSink } from './file-sink.js';

/**
 * The few fields of a run the printed summary reads (summaryText, the dispersion tables), with
 * repeated values shared: a view is kept for every run of a sweep of any size. `shared` maps a
 * value's text to the one copy kept.
 */
export function summaryView(r: RunResult, shared: Map<string, unknown> = new Map()): RunResult {
  const one = <T>(value: T, key = typeof value === 'string' ? value : JSON.stringify(value)): T => {
    const kept = shared.get(key);
    if (kept !== undefined) return kept as T;
    shared.set(key, value);
    return value;
  };
  const view: RunResult = {
    problem: one(r.problem),
    method: one(r.method),
    setting: one(r.setting),
    status: r.status,
    error: { final: r.error.final, max: r.error.max },
    drift: EMPTY_DRIFT,
    // Only nfev is read; the other counts are in the files.
    counts: { nfev: r.counts.nfev } as RunResult['counts'],
    time: one(r.time),
    tFinal: r.tFinal,
    yFinal: EMPTY_STATE,
  };
  if (r.planIndex !== undefined) view.planIndex = r.planIndex;
  if (r.errorBelowReference !== undefined) view.errorBelowReference = r.errorBelowReference;
  if (r.unresolved !== undefined) view.unresolved = one(r.unresolved);
  if (r.countsReported !== undefined) view.countsReported = r.countsReported;
  if (r.settingIgnored !== undefined) view.settingIgnored = r.settingIgnored;
  return view;
}

const EMPTY_DRIFT: RunResult['drift'] = {};
const EMPTY_STATE: number[] = [];

/**
 * Runs kept on disk: their lines in plan order, and `revise`, which answers a changed copy of a run
 * to write instead (a finding made after the run was journaled), or undefined.
 */
export interface StreamedRuns {
  lines: RunLines;
  revise?: (run: RunResult) => RunResult | undefined;
}

/**
 * Writes results.json and results.csv into `dir`: `results` without its runs, then the runs.
 * Answers each run's summaryView, in plan order.
 */
export function writeStreamedResults(dir: string, results: ResultsFile, runs: StreamedRuns): RunResult[] {
  const views: RunResult[] = [];
  const shared = new Map<string, unknown>();
  const csv = new FileSink(join(dir, 'results.csv'));
  const json = new FileSink(join(dir, 'results.json'));
  try {
    csv.write(csvHeaderLine());
    const tapped: RunLines = {
      count: runs.lines.count,
      *lines() {
        for (const line of runs.lines.lines()) {
          const run = JSON.parse(Buffer.from(line.buffer, line.byteOffset, line.byteLength).toString('utf8')) as RunResult;
          const revised = runs.revise?.(run);
          csv.write(csvRunLine(revised ?? run));
          views.push(summaryView(revised ?? run, shared));
          yield revised ? Buffer.from(JSON.stringify(revised)) : line;
        }
      },
    };
    for (const piece of resultsJsonPieces({ ...results, runs: [] }, undefined, tapped)) json.write(piece);
  } finally {
    json.close();
    csv.close();
  }
  return views;
}
