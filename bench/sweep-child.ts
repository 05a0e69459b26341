// One sweep in a fresh process; prints { jobs, runs, seconds, peakRssMB } as the last line.
import { runSweep } from '../src/sweep/run.js';

const args = JSON.parse(process.argv[2] ?? '{}') as { jobs?: number; synthetic?: boolean };
const jobs = args.jobs ?? 1;
const started = performance.now();
let runs = 0;
if (args.synthetic) {
  const tolerances = Array.from({ length: 1000 }, (_, k) => 1e-4 * (1 - k / 1100));
  const methods = ['bogacki-shampine-32', 'fehlberg-45', 'cash-karp-45', 'dormand-prince-54', 'tsitouras-54', 'verner-65', 'dormand-prince-853', 'radau-iia-5', 'bdf-variable', 'odex'];
  const results = await runSweep({ problem: 'harmonic-oscillator', method: methods.join(','), tolerances, jobs });
  runs = results.runs.length;
} else {
  const results = await runSweep({ jobs });
  runs = results.runs.length;
}
const seconds = (performance.now() - started) / 1000;
// maxRSS is in kilobytes and covers worker threads, which share the process.
const peakRssMB = process.resourceUsage().maxRSS / 1024;
console.log(JSON.stringify({ jobs, runs, seconds, peakRssMB }));
