// Stiff benchmark: Robertson (catalogue problem) to t = 1e11 with every adaptive implicit method
// at rtol 1e-8 and 1e-6 (atol 1e-20, so the control is relative in every component), timed with
// tinybench. Prints median time, exact counts and the largest relative error per component
// against the Test Set for IVP Solvers ROBER values. Run after build: node dist/bench/stiff.js
import { Bench } from 'tinybench';
import { pathToFileURL } from 'node:url';
import { robertson } from '../problems/robertson.js';
import type { Counts, Method } from '../src/core/types.js';
import { medianMarginPercent } from '../src/measure/timing.js';
import { untilSure } from './floor.js';
import { implicitMethods } from '../src/methods/implicit/index.js';

/** Test Set for IVP Solvers (Mazzia & Magherini), ROBER at t = 1e11. */
const ROBER_1E11 = [0.2083340149701255e-7, 0.8333360770334713e-13, 0.9999999791665050];

export interface StiffBenchRow {
  method: string;
  rtol: number;
  atol: number;
  status: string;
  medianMs: number;
  samples: number;
  /** Median absolute deviation of the samples, ms. */
  madMs: number;
  /** 95% relative margin of error of the median, percent. */
  rmePercent: number;
  counts: Counts;
  maxRelError: number;
}

/** Times a stiff row's budget may double while its median is uncertain (untilSure). */
const MAX_DOUBLINGS = 3;

function timeStiff(m: Method, setting: { rtol: number; atol: number }, timeMs: number): { medianMs: number; samples: number; madMs: number; rmePercent: number } {
  const bench = new Bench({ time: timeMs, warmup: true });
  bench.add(`${m.id} rtol=${setting.rtol}`, () => {
    m.solve(robertson, setting, { maxSteps: 1_000_000 });
  });
  bench.runSync();
  const r = bench.tasks[0]!.result;
  if (r.state !== 'completed') throw new Error(`${m.id}: benchmark task did not complete (${r.state})`);
  const lat = r.latency;
  return { medianMs: lat.p50, samples: lat.samplesCount, madMs: lat.mad, rmePercent: medianMarginPercent(lat.p50, lat.mad, lat.samplesCount) };
}

export function runStiffBench(rtols: readonly number[] = [1e-8, 1e-6], timeMs = 300): StiffBenchRow[] {
  const rows: StiffBenchRow[] = [];
  const atol = 1e-20;
  for (const m of implicitMethods.filter((x) => x.adaptive)) {
    for (const rtol of rtols) {
      const setting = { rtol, atol };
      const res = m.solve(robertson, setting, { maxSteps: 1_000_000 });
      let maxRelError = 0;
      for (let i = 0; i < 3; i++) {
        maxRelError = Math.max(maxRelError, Math.abs(res.yFinal[i]! - ROBER_1E11[i]!) / Math.abs(ROBER_1E11[i]!));
      }
      const { result: t } = untilSure((budget) => timeStiff(m, setting, budget), (x) => x, timeMs, MAX_DOUBLINGS);
      rows.push({
        method: m.id,
        rtol,
        atol,
        status: res.status,
        medianMs: t.medianMs,
        samples: t.samples,
        madMs: t.madMs,
        rmePercent: t.rmePercent,
        counts: res.counts,
        maxRelError,
      });
    }
  }
  return rows;
}

function main(): void {
  const rows = runStiffBench();
  const head = ['method', 'rtol', 'status', 'median ms', 'samples', 'rme %', 'nfev', 'njev', 'nlu', 'acc', 'rej', 'max rel err'];
  console.log(head.join('\t'));
  for (const r of rows) {
    const c = r.counts;
    console.log(
      [r.method, r.rtol, r.status, r.medianMs.toPrecision(3), r.samples, r.rmePercent.toFixed(2), c.nfev, c.njev, c.nlu, c.accepted, c.rejected, r.maxRelError.toPrecision(3)].join('\t'),
    );
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) main();
