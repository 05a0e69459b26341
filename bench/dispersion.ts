// Dispersion at scale: a 100,000-run sweep (12,500 samples of kepler-circular, two methods, four
// tolerances each) run whole and as 8 shards of 12,500 runs, then the shards merged. Reports the
// peak resident memory of each command's process tree (sampled from /proc, like bench/sweep.ts)
// and the merge's wall time, against the targets of bench/README.md ("Reading the targets").
// Each command is the real CLI in a fresh process: `node bin/stepgauge.js ...`.
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { watchTreeRss } from './sweep.js';

const here = dirname(fileURLToPath(import.meta.url));
const cli = join(here, '..', '..', 'bin', 'stepgauge.js');
const SAMPLES = Number(process.env.STEPGAUGE_BENCH_DISPERSION_SAMPLES ?? 12_500);
const SHARDS = 8;
const SAMPLE_MS = 100;

export interface DispersionBenchRow {
  name: string;
  runs: number | null;
  seconds: number;
  peakTreeRssMB: number;
}

function command(name: string, args: string[], runs: number | null, env: NodeJS.ProcessEnv = process.env): Promise<DispersionBenchRow> {
  return new Promise((resolve, reject) => {
    const started = performance.now();
    const proc = spawn(process.execPath, [cli, ...args], { stdio: ['ignore', 'ignore', 'inherit'], env });
    const rss = watchTreeRss(proc, SAMPLE_MS);
    proc.on('error', reject);
    proc.on('close', (code) => {
      const peakKB = rss.stop();
      // 3: some runs failed (an older exit rule for a finished sweep); the sweep still counts.
      if (code !== 0 && code !== 3) return reject(new Error(`${name}: stepgauge exited with ${code}`));
      resolve({ name, runs, seconds: Math.round((performance.now() - started) / 10) / 100, peakTreeRssMB: Math.round(peakKB / 1024) });
    });
  });
}

export async function runDispersionBench(): Promise<DispersionBenchRow[]> {
  const dir = mkdtempSync(join(tmpdir(), 'stepgauge-bench-dispersion-'));
  try {
    const file = join(dir, 'orbit.yaml');
    writeFileSync(file, `base: kepler-circular\ndispersion:\n  samples: ${SAMPLES}\n  seed: 11\n  initial:\n    x: { normal: 0.001 }\n    vy: { normal: 0.002 }\n`);
    const sweep = ['run', '-p', file, '-m', 'dormand-prince-54,tsitouras-54', '-t', '1e-4..1e-7', '--no-timing', '--no-report', '-q', '--jobs', '2'];
    const runs = SAMPLES * 8;
    const rows: DispersionBenchRow[] = [];
    rows.push(await command(`dispersion sweep, ${runs} runs, --jobs 2`, [...sweep, '-o', join(dir, 'whole')], runs));
    const shardFiles: string[] = [];
    for (let k = 1; k <= SHARDS; k++) {
      rows.push(await command(`shard ${k}/${SHARDS}`, [...sweep, '--shard', `${k}/${SHARDS}`, '-o', join(dir, `shard-${k}`)], runs / SHARDS));
      shardFiles.push(join(dir, `shard-${k}`, 'results.json'));
    }
    rows.push(await command(`merge of ${SHARDS} shards`, ['merge', ...shardFiles, '--out', join(dir, 'merged.json')], runs));
    return rows;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  console.log(JSON.stringify(await runDispersionBench(), null, 2));
}
