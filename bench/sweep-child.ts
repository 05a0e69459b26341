// One sweep in a fresh process; prints { jobs, runs, seconds, peakRssMB, cpuSeconds } as the last line.
// With `cli: true` the sweep is the command `stepgauge run --no-timing --no-report -q --jobs N`
// called as the launcher calls it, and its seconds count from this process's start, so they include
// starting Node and loading the CLI; with `defaults: true` it is `stepgauge run -q --jobs N`, the
// command with its defaults (every run timed, the report written); otherwise the library's
// runSweep is timed alone. Modules are
// loaded only once the mode is known, so the CLI mode loads what the command itself loads.
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** Kernel clock ticks per second for /proc times (USER_HZ, 100 on Linux: common practice, no source). */
const TICKS_PER_SECOND = 100;

/**
 * CPU seconds (user + system) used so far by this process and by its children that have ended and
 * been waited for: the sweep's worker processes, once the pool has been destroyed (tinypool's
 * destroy waits for each worker's exit, and Node reaps a child before reporting its exit). Linux
 * /proc only; null elsewhere.
 */
function processTreeCpuSeconds(): number | null {
  try {
    const stat = readFileSync('/proc/self/stat', 'utf8');
    // Fields after the command name, which is in parentheses and may contain spaces.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    // utime, stime, cutime, cstime are fields 14-17 of proc(5); fields[0] here is field 3.
    const ticks = [11, 12, 13, 14].reduce((sum, i) => sum + Number(fields[i]), 0);
    return ticks / TICKS_PER_SECOND;
  } catch {
    return null;
  }
}

const args = JSON.parse(process.argv[2] ?? '{}') as { jobs?: number; synthetic?: boolean; cli?: boolean; defaults?: boolean };
const jobs = args.jobs ?? 1;
// The CLI mode's CPU time counts from the process's start, like its seconds.
const cpuBefore = args.cli ? 0 : processTreeCpuSeconds();
const started = performance.now();
let runs = 0;
if (args.cli) {
  const out = mkdtempSync(join(tmpdir(), 'stepgauge-bench-cli-'));
  const { main } = await import('../src/cli/main.js');
  const lean = args.defaults ? [] : ['--no-timing', '--no-report'];
  const code = await main(['run', ...lean, '-q', '--jobs', String(jobs), '-o', join(out, 'sweep')]);
  // 3: the sweep finished with failed runs, which the catalogue has (bench/README.md); others are real failures.
  if (code !== 0 && code !== 3) throw new Error(`stepgauge run exited with ${code}`);
  runs = (JSON.parse(readFileSync(join(out, 'sweep', 'results.json'), 'utf8')) as { runs: unknown[] }).runs.length;
  rmSync(out, { recursive: true, force: true });
} else if (args.synthetic) {
  const { runSweep } = await import('../src/sweep/run.js');
  const tolerances = Array.from({ length: 1000 }, (_, k) => 1e-4 * (1 - k / 1100));
  const methods = ['bogacki-shampine-32', 'fehlberg-45', 'cash-karp-45', 'dormand-prince-54', 'tsitouras-54', 'verner-65', 'dormand-prince-853', 'radau-iia-5', 'bdf-variable', 'odex'];
  const results = await runSweep({ problem: 'harmonic-oscillator', method: methods.join(','), tolerances, jobs });
  runs = results.runs.length;
} else {
  const { runSweep } = await import('../src/sweep/run.js');
  const results = await runSweep({ jobs });
  runs = results.runs.length;
}
// The CLI mode counts from the process's start (process.uptime), the library mode from its call.
const seconds = args.cli ? process.uptime() : (performance.now() - started) / 1000;
const cpuAfter = processTreeCpuSeconds();
const cpuSeconds = cpuBefore !== null && cpuAfter !== null ? Math.round((cpuAfter - cpuBefore) * 100) / 100 : null;
// maxRSS is in kilobytes and covers this process only (workers are child processes).
const peakRssMB = process.resourceUsage().maxRSS / 1024;
console.log(JSON.stringify({ jobs, runs, seconds, peakRssMB, cpuSeconds }));
