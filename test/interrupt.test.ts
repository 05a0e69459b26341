// Ctrl-C during a sweep: the CLI stops scheduling, writes the finished runs flagged interrupted,
// exits 130, and `run --resume` completes the sweep without repeating finished runs.
// Runs the compiled CLI (npm test builds first) as a child process so a real signal arrives.
import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ResultsFile } from '../src/results/contract.js';

const bin = join(import.meta.dirname, '..', 'bin', 'stepgauge.js');

function runChild(args: string[], onJournalLines?: { path: string; lines: number }): Promise<number> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [bin, ...args], { stdio: ['ignore', 'ignore', 'pipe'] });
    let sent = false;
    const poll = onJournalLines
      ? setInterval(() => {
          if (sent || !existsSync(onJournalLines.path)) return;
          const n = readFileSync(onJournalLines.path, 'utf8').split('\n').filter(Boolean).length - 1;
          if (n >= onJournalLines.lines) {
            sent = true;
            child.kill('SIGINT');
          }
        }, 5)
      : undefined;
    child.on('error', reject);
    child.on('exit', (code) => {
      if (poll) clearInterval(poll);
      resolve(code ?? -1);
    });
  });
}

describe('interruption', () => {
  it('writes the finished runs on SIGINT, exits 130, and resumes to the same result as an uninterrupted sweep', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-int-'));
    // Every built-in method that applies, down to 1e-7. A sweep that completes exits 0, or 3 when
    // some runs failed (a low-order pair can pass the step limit); the resumed and the
    // uninterrupted sweep must agree on which.
    const args = ['run', '-p', 'van-der-pol,harmonic-oscillator', '-t', '1e-4..1e-7', '--no-timing', '--no-report', '-q', '--jobs', '1'];
    const out = join(dir, 'sweep');
    const code = await runChild([...args, '--out', out], { path: join(dir, '.sweep.journal.jsonl'), lines: 5 });
    expect(code).toBe(130);
    const partial = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
    expect(partial.interrupted).toBe(true);
    expect(partial.runs.length).toBeGreaterThanOrEqual(5);
    const planned = (partial.plan as { runs: number }).runs;
    expect(partial.runs.length).toBeLessThan(planned);
    expect(existsSync(join(dir, '.sweep.journal.jsonl'))).toBe(false);

    const completed = await runChild(['run', '--resume', out, '--no-report', '-q', '--jobs', '1']);
    expect(completed).toBe(0);
    const resumed = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
    expect(resumed.interrupted).toBeUndefined();
    expect(resumed.runs).toHaveLength(planned);
    // The runs finished before the interruption are kept as they were, not repeated (matched by
    // plan index: a sweep runs method by method, so they need not be the first in plan order).
    const byIndex = new Map(resumed.runs.map((r) => [r.planIndex, r]));
    for (const r of partial.runs) expect(byIndex.get(r.planIndex)).toEqual(r);

    const fresh = join(dir, 'fresh');
    expect(await runChild([...args, '--out', fresh])).toBe(completed);
    const whole = JSON.parse(readFileSync(join(fresh, 'results.json'), 'utf8')) as ResultsFile;
    expect(resumed.runs.map((r) => ({ ...r, time: undefined }))).toEqual(whole.runs.map((r) => ({ ...r, time: undefined })));
  });
});
