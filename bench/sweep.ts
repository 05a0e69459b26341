// Sweep benchmark: the whole catalogue without timing at --jobs 1 and --jobs 2 (wall time, peak
// resident memory), and a synthetic 10,000-run sweep for memory. Each measurement runs in a
// fresh child process so peak memory belongs to that sweep alone.
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const here = dirname(fileURLToPath(import.meta.url));
const child = join(here, 'sweep-child.js');

export interface SweepBenchRow {
  name: string;
  jobs: number;
  runs: number;
  seconds: number;
  peakRssMB: number;
}

function measure(name: string, args: Record<string, unknown>): SweepBenchRow {
  const out = execFileSync(process.execPath, [child, JSON.stringify(args)], { encoding: 'utf8', maxBuffer: 1 << 26 });
  const row = JSON.parse(out.trim().split('\n').at(-1)!) as Omit<SweepBenchRow, 'name'>;
  return { name, ...row };
}

export function runSweepBench(): SweepBenchRow[] {
  const rows: SweepBenchRow[] = [];
  rows.push(measure('catalogue, default settings, no timing', { jobs: 1 }));
  rows.push(measure('catalogue, default settings, no timing', { jobs: 2 }));
  rows.push(measure('synthetic 10,000 runs (oscillator, 10 methods x 1,000 tolerances)', { jobs: 2, synthetic: true }));
  return rows;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const rows = runSweepBench();
  console.table(rows);
  const [one, two] = rows;
  console.log(`speed-up jobs 2 / jobs 1: ${(one!.seconds / two!.seconds).toFixed(2)}x`);
}
