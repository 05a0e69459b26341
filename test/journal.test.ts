// The sweep journal: one JSON line per finished run (JSON Lines, RFC 8259 per line), written in
// one write per event-loop turn, flushed on close, and read back to the same runs.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Journal, journalPath, readJournal } from '../src/sweep/journal.js';
import type { RunResult } from '../src/results/contract.js';

const run = (planIndex: number, message?: string): RunResult =>
  ({ problem: 'p', method: 'm', status: 'ok', planIndex, yFinal: [planIndex, 0.1], ...(message ? { message } : {}) }) as unknown as RunResult;

describe('sweep journal', () => {
  it('writes the runs of one turn of the event loop together, and answers each line as written', async () => {
    const out = join(mkdtempSync(join(tmpdir(), 'stepgauge-journal-')), 'sweep');
    const journal = new Journal(out, { planSha256: 'abc', request: { tolerances: [1e-6] } });
    const lines = [run(0), run(1, 'café × "quoted"'), run(2)].map((r) => journal.append(r));
    // Nothing but the header until the event loop turns.
    expect(readFileSync(journalPath(out), 'utf8').split('\n').filter(Boolean)).toHaveLength(1);
    await new Promise((resolve) => setImmediate(resolve));
    const text = readFileSync(journalPath(out), 'utf8');
    expect(text.split('\n').filter(Boolean)).toHaveLength(4);
    expect(Buffer.from(lines[1]!).toString('utf8')).toBe(JSON.stringify(run(1, 'café × "quoted"')));
    journal.append(run(3));
    journal.close();
    const back = readJournal(out)!;
    expect(back.header.planSha256).toBe('abc');
    expect(back.runs.map((r) => r.planIndex)).toEqual([0, 1, 2, 3]);
    expect(back.runs[1]!.message).toBe('café × "quoted"');
  });
});
