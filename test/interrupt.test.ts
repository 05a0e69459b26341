// Ctrl-C during a sweep: the CLI stops scheduling, writes the finished runs flagged interrupted,
// exits 130, and `run --resume` completes the sweep without repeating finished runs.
// Runs the compiled CLI (npm test builds first) as a child process so a real signal arrives.
import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ResultsFile } from '../src/results/contract.js';

const bin = join(import.meta.dirname, '..', 'bin', 'stepgauge.js');

/** Runs the CLI; with `onJournalLines`, sends `signal` (SIGINT by default) once the journal holds that many runs. Answers the exit code, or -1 when a signal ended the process. */
function runChild(args: string[], onJournalLines?: { path: string; lines: number; signal?: NodeJS.Signals }): Promise<number> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [bin, ...args], { stdio: ['ignore', 'ignore', 'pipe'] });
    let sent = false;
    const poll = onJournalLines
      ? setInterval(() => {
          if (sent || !existsSync(onJournalLines.path)) return;
          const n = readFileSync(onJournalLines.path, 'utf8').split('\n').filter(Boolean).length - 1;
          if (n >= onJournalLines.lines) {
            sent = true;
            child.kill(onJournalLines.signal ?? 'SIGINT');
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

  // The "Done when": a sweep stopped at five different points, by SIGKILL (no chance to
  // write anything but the journal; its lock is left behind) and by SIGINT (writes the finished
  // runs as an interrupted results.json), each time resumed, ends equal to the uninterrupted
  // sweep run for run: statuses, messages, errors, counts, states (everything but time). Not the
  // whole catalogue, whose sweep takes minutes on a loaded 2-core machine: six problems (stiff
  // and non-stiff, a file-free catalogue slice) with every built-in method that applies, at two
  // tolerances and two step counts, about 200 runs, resumed alternately on one and on two workers.
  it('five interruptions (SIGINT and SIGKILL alternating), each resumed, equal the uninterrupted sweep run for run', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-int5-'));
    const plan = ['-p', 'harmonic-oscillator,kepler-circular,van-der-pol,van-der-pol-stiff,robertson,linear-oscillator-chain', '-t', '1e-3,1e-6', '-s', '200,400', '--no-timing', '--no-report', '-q'];
    const out = join(dir, 'sweep');
    const journal = { path: join(dir, '.sweep.journal.jsonl') };
    // [signal, runs in the journal when it is sent, workers of that leg]
    const stops: [NodeJS.Signals, number, string][] = [
      ['SIGKILL', 6, '1'],
      ['SIGINT', 20, '2'],
      ['SIGKILL', 45, '1'],
      ['SIGINT', 70, '2'],
      ['SIGKILL', 100, '1'],
    ];
    const seen: number[] = [];
    for (const [k, [signal, lines, jobs]] of stops.entries()) {
      const args = k === 0 ? ['run', ...plan, '--jobs', jobs, '--out', out] : ['run', '--resume', out, '--no-report', '-q', '--jobs', jobs];
      const code = await runChild(args, { ...journal, lines, signal });
      expect(code, `leg ${k + 1}`).toBe(signal === 'SIGINT' ? 130 : -1);
      if (signal === 'SIGKILL') {
        // Killed: the journal and the lock stay; the lock's process is gone, so the resume takes it over.
        expect(existsSync(journal.path)).toBe(true);
        expect(existsSync(join(dir, '.sweep.lock'))).toBe(true);
        seen.push(readFileSync(journal.path, 'utf8').split('\n').filter(Boolean).length - 1);
      } else {
        const partial = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
        expect(partial.interrupted).toBe(true);
        seen.push(partial.runs.length);
      }
    }
    // Five different points, each later than the one before.
    for (let k = 1; k < seen.length; k++) expect(seen[k]!).toBeGreaterThan(seen[k - 1]!);
    const completed = await runChild(['run', '--resume', out, '--no-report', '-q', '--jobs', '2']);
    expect([0, 3]).toContain(completed);
    const resumed = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
    expect(resumed.interrupted).toBeUndefined();
    expect(readdirSync(dir)).toEqual(['sweep']); // no journal, lock or temporary left

    const fresh = join(dir, 'fresh');
    expect(await runChild(['run', ...plan, '--jobs', '1', '--out', fresh])).toBe(completed);
    const whole = JSON.parse(readFileSync(join(fresh, 'results.json'), 'utf8')) as ResultsFile;
    expect(whole.runs.length).toBeGreaterThan(seen.at(-1)! + 20);
    expect(resumed.runs.map((r) => r.planIndex)).toEqual(whole.runs.map((_, i) => i));
    expect(resumed.runs.map((r) => ({ ...r, time: undefined }))).toEqual(whole.runs.map((r) => ({ ...r, time: undefined })));
  }, 600_000);
});
