// Stiff benchmark: Robertson (catalogue problem) to t = 1e11 with every adaptive implicit method
// at rtol 1e-8 and 1e-6 (atol 1e-20, so the control is relative in every component), timed with
// tinybench. Prints median time, exact counts and the largest relative error per component
// against the Test Set for IVP Solvers ROBER values. Run after build: node dist/bench/stiff.js
import { Bench } from 'tinybench';
import { pathToFileURL } from 'node:url';
import { robertson } from '../problems/robertson.js';
import type { Counts } from '../src/core/types.js';
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
  counts: Counts;
  maxRelError: number;
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
      const bench = new Bench({ time: timeMs, warmup: true });
      bench.add(`${m.id} rtol=${rtol}`, () => {
        m.solve(robertson, setting, { maxSteps: 1_000_000 });
      });
      bench.runSync();
      const r = bench.tasks[0]!.result as { latency?: { p50: number; samples?: unknown }; state: string };
      const lat = r.latency;
      rows.push({
        method: m.id,
        rtol,
        atol,
        status: res.status,
        medianMs: lat ? lat.p50 : NaN,
        samples: lat && Array.isArray(lat.samples) ? lat.samples.length : 0,
        counts: res.counts,
        maxRelError,
      });
    }
  }
  return rows;
}

function main(): void {
  const rows = runStiffBench();
  const head = ['method', 'rtol', 'status', 'median ms', 'nfev', 'njev', 'nlu', 'acc', 'rej', 'max rel err'];
  console.log(head.join('\t'));
  for (const r of rows) {
    const c = r.counts;
    console.log(
      [r.method, r.rtol, r.status, r.medianMs.toPrecision(3), c.nfev, c.njev, c.nlu, c.accepted, c.rejected, r.maxRelError.toPrecision(3)].join('\t'),
    );
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) main();
