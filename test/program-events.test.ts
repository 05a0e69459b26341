// Event times reported by an external program (issue 28, item 4): the optional `events` member of
// the program response, compared with the reference crossings like a built-in method's. The
// fixture (test/fixtures/programs/event-times.mjs) reports the oscillator q = cos(2 pi t), whose
// zero crossings are analytic: q falls through 0 at t = 1/4 + k and rises at t = 3/4 + k
// (textbook cosine zeros), each moved by the program's --shift.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runSweep } from '../src/sweep/run.js';
import type { RunResult } from '../src/results/contract.js';
import { PROGRAM_REPORTED } from '../src/measure/run-one.js';

const FIXTURE = resolve('test/fixtures/programs/event-times.mjs');
const tmp = mkdtempSync(join(tmpdir(), 'sg-program-events-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const PROBLEM = join(tmp, 'oscillator-events.yaml');
writeFileSync(
  PROBLEM,
  `id: oscillator-events
title: Oscillator with zero crossings
source: q' = p, p' = -w^2 q, exact q = cos(w t)
states: [q, p]
parameters: { w: 2 * pi }
equations: { q: p, p: -w^2 * q }
initial: { q: 1, p: 0 }
span: [0, 3]
events:
  q-down: { expression: q, direction: falling }
  q-up: { expression: q, direction: rising }
reference:
  exact: { q: cos(w * t), p: -w * sin(w * t) }
  source: analytic
error: { measure: states, scale: absolute }
stiff: false
`,
);

function program(mode: string, shift = 0): string {
  const path = join(tmp, `events-${mode}-${shift}.yaml`);
  writeFileSync(path, `id: events-${mode}\nname: event-times fixture (${mode})\nprogram: [node, ${FIXTURE}, --mode, ${mode}, --shift, "${shift}"]\nsettings: steps\nprotocol: once\ntimeout: 30\n`);
  return path;
}

const MODES: [string, number][] = [
  ['ok', 0.01],
  ['only-down', 0],
  ['drop-one', 0],
  ['add-one', 0],
  ['not-object', 0],
  ['unknown', 0],
  ['not-number', 0],
  ['outside', 0],
  ['backwards', 0],
];
const runs = new Map<string, RunResult>();

// One sweep over every variant of the fixture (a sweep's set-up costs more than these runs).
beforeAll(async () => {
  const method = MODES.map(([mode, shift]) => program(mode, shift)).join(',');
  const results = await runSweep({ problem: PROBLEM, method, steps: [40], jobs: 1, timing: { budgetSeconds: 0.05, minSamples: 1 } });
  for (const r of results.runs) runs.set(r.method.replace(/^events-/, ''), r);
}, 120_000);

function run(mode: string): RunResult {
  const r = runs.get(mode);
  if (!r) throw new Error(`no run of mode ${mode}`);
  return r;
}

const DOWN = [0.25, 1.25, 2.25];
const UP = [0.75, 1.75, 2.75];

describe('event times reported by a program', () => {
  it('are compared with the analytic crossings: time error, missed and extra', () => {
    const r = run('ok');
    expect(r.status).toBe('ok');
    const down = r.events!['q-down']!;
    expect(down.locatedBy).toBe(PROGRAM_REPORTED);
    expect(down.times).toEqual(DOWN.map((t) => t + 0.01));
    down.reference!.forEach((t, k) => expect(t).toBeCloseTo(DOWN[k]!, 12));
    down.timeErrors!.forEach((e) => expect(e!).toBeCloseTo(0.01, 12));
    expect(down.maxTimeError!).toBeCloseTo(0.01, 12);
    expect([down.missed, down.extra]).toEqual([0, 0]);
    expect(r.events!['q-up']!.maxTimeError!).toBeCloseTo(0.01, 12);
  });

  it('an event the program leaves out is located by stepgauge on its reported states, and says so', () => {
    const r = run('only-down');
    expect(r.events!['q-down']!.locatedBy).toBe(PROGRAM_REPORTED);
    const up = r.events!['q-up']!;
    expect(up.locatedBy).toContain('Hermite');
    // 41 exact states, 0.075 s apart: the degree-5 Hermite places each rising zero within 1e-6 s.
    up.times.forEach((t, k) => expect(Math.abs(t - UP[k]!)).toBeLessThan(1e-6));
  });

  it('a dropped crossing is missed, an added one extra', () => {
    const dropped = (run('drop-one')).events!['q-down']!;
    expect([dropped.missed, dropped.extra]).toEqual([1, 0]);
    expect(dropped.timeErrors![1]).toBeNull();
    const added = (run('add-one')).events!['q-down']!;
    expect([added.missed, added.extra]).toEqual([0, 1]);
  });

  it.each([
    ['not-object', 'malformed output: events must be an object mapping each event name to a list of crossing times'],
    ['unknown', "malformed output: events.q-sideways: the problem declares no event 'q-sideways' (its events are q-down, q-up)"],
    ['not-number', 'malformed output: events.q-down[0] is not a finite number'],
    ['outside', 'malformed output: events.q-down[3] = 4 lies outside the span [0, 3]'],
    ['backwards', 'malformed output: events.q-down goes back (events.q-down[1] = 1.25 after 2.25)'],
  ])('a bad events member (%s) fails the run with a clear message', (mode, message) => {
    const r = run(mode);
    expect(r.status).toBe('error');
    expect(r.message).toBe(message);
  });
});
