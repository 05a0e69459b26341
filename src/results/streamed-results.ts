// results.json and results.csv of a sweep whose runs were not kept (SweepRequest.streamRuns): the
// runs are read back from the journal in plan order one at a time, each written to both files as
// it is read, so writing a sweep of any size holds one run, not all of them. The bytes are those
// resultsJsonBytes and resultsCsv would write for the same runs (test/results-json.test.ts).
import { join } from 'node:path';
import type { ResultsFile, RunResult } from './contract.js';
import { resultsJsonPieces, type RunLines } from './json.js';
import { csvHeaderLine, csvRunLine } from './csv.js';
import { FileSink } from './file-sink.js';

/** The few fields of a run the printed summary reads (summaryText, the dispersion tables). */
export function summaryView(r: RunResult): RunResult {
  const view: RunResult = {
    problem: r.problem,
    method: r.method,
    setting: r.setting,
    status: r.status,
    error: r.error,
    drift: {},
    counts: r.counts,
    time: r.time,
    tFinal: r.tFinal,
    yFinal: [],
  };
  if (r.planIndex !== undefined) view.planIndex = r.planIndex;
  if (r.errorBelowReference !== undefined) view.errorBelowReference = r.errorBelowReference;
  if (r.unresolved !== undefined) view.unresolved = r.unresolved;
  if (r.countsReported !== undefined) view.countsReported = r.countsReported;
  if (r.settingIgnored !== undefined) view.settingIgnored = r.settingIgnored;
  return view;
}

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
          views.push(summaryView(revised ?? run));
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
