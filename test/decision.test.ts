// `choose --out DIR`: the decision record (decision.json, decision.md, decision.html), its
// ranking rule (times tied within their 95% margins go to fewer evaluations) and its fragility
// check (error not monotone at the neighbouring settings).
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';
import { measureRun } from '../src/measure/run-one.js';
import { findMethod } from '../src/methods/registry.js';
import { isMonotone } from '../src/sweep/choose-neighbours.js';
import { rankCandidates } from '../src/sweep/choose-rank.js';
import type { Candidate } from '../src/sweep/choose.js';
import type { DecisionRecord } from '../src/report/decision-record.js';

const tmp = () => mkdtempSync(join(tmpdir(), 'sg-decision-'));

describe('choose -p kepler-eccentric --target 1e-8 --out d', () => {
  it('writes decision.json, decision.md and a self-contained decision.html that agree with a fresh solve', async () => {
    const d = join(tmp(), 'd');
    const r = await runCli(['choose', '-p', 'kepler-eccentric', '--target', '1e-8', '-m', 'dormand-prince-853,rk4,euler', '--cost', 'nfev', '--out', d]);
    expect(r.code, r.stderr).toBe(0);
    for (const f of ['decision.json', 'decision.md', 'decision.html']) expect(existsSync(join(d, f)), f).toBe(true);
    const rec = JSON.parse(readFileSync(join(d, 'decision.json'), 'utf8')) as DecisionRecord;
    expect(rec.format).toBe('stepgauge-decision');
    expect(rec.question).toMatchObject({ problem: 'kepler-eccentric', target: 1e-8, measure: 'final', cost: 'nfev', safety: 2, required: 5e-9 });
    // The hash is of the definition text the record carries (node:crypto, not the project's helper).
    expect(rec.model.sha256).toBe(createHash('sha256').update(rec.model.definition, 'utf8').digest('hex'));
    expect(rec.model.definition).toBe(keplerEccentric.definition);
    // kepler-eccentric's reference is the analytic orbit: exact, made by no method.
    expect(rec.reference.kind).toBe('exact');
    expect(rec.reference.certifyingMethods).toEqual([]);
    expect(rec.commandLine).toBe(`stepgauge choose -p kepler-eccentric --target 1e-8 -m dormand-prince-853,rk4,euler --cost nfev --out ${d}`);
    expect(rec.environment.node).toBe(process.version);
    expect(rec.caution).toMatch(/not a certification/);
    // The recommendation leaves the asked-for headroom: a fresh solve at its setting against the
    // exact orbit (Kepler's equation) has error at most target / safety.
    const chosen = rec.recommendation!;
    expect(chosen.method).toBe('dormand-prince-853');
    const setting = chosen.setting as { rtol: number; atol: number };
    const again = measureRun(keplerEccentric, findMethod('dormand-prince-853')!, { rtol: setting.rtol, atol: setting.atol }, { maxSteps: 100_000 });
    expect(again.error.final).toBeLessThanOrEqual(5e-9);
    expect(chosen.margin).toBeCloseTo(1e-8 / again.error.final!, 10);
    // Every candidate is in the record; euler (order 1) cannot reach 5e-9 within 100000 steps.
    expect(rec.candidates.map((c) => c.method).sort()).toEqual(['dormand-prince-853', 'euler', 'rk4']);
    const euler = rec.candidates.find((c) => c.method === 'euler')!;
    expect(euler.met).toBe(false);
    expect(euler.rank).toBeNull();
    const dp = rec.candidates.find((c) => c.method === 'dormand-prince-853')!;
    expect(dp.fragile).not.toBeNull();
    expect(dp.neighbours.map((n) => n.side)).toEqual(['looser', 'tighter']);
    expect((dp.neighbours[0]!.setting as { rtol: number }).rtol).toBeCloseTo(2 * setting.rtol, 20);
    const md = readFileSync(join(d, 'decision.md'), 'utf8');
    expect(md).toContain(rec.model.sha256);
    expect(md).toMatch(/\| 1 \| dormand-prince-853 \|/);
    const html = readFileSync(join(d, 'decision.html'), 'utf8');
    // Offline: nothing is fetched from elsewhere; the plot is a data URI.
    expect(html).not.toMatch(/(src|href)="(https?:)?\/\//);
    expect(html).toMatch(/src="data:image\/png;base64,/);
    expect(html).toContain('id="recommendation"');
  });

  it('names the certifying methods of a certified reference', async () => {
    const dir = tmp();
    const problem = join(dir, 'decay.yaml');
    // Exponential decay without a reference: stepgauge certifies one (README, "Problem files").
    writeFileSync(problem, 'id: decay\ntitle: decay\nstates: [x]\nequations: { x: -x }\ninitial: { x: 1 }\nspan: [0, 2]\nerror: { measure: states, scale: absolute }\n');
    const d = join(dir, 'out');
    const r = await runCli(['choose', '-p', problem, '--target', '1e-6', '-m', 'dormand-prince-54', '--cost', 'nfev', '--out', d]);
    expect(r.code, r.stderr).toBe(0);
    const rec = JSON.parse(readFileSync(join(d, 'decision.json'), 'utf8')) as DecisionRecord;
    expect(rec.reference.kind).toBe('certified');
    // The methods the README names for non-stiff problems (dormand-prince-853, once with a bounded step, and odex).
    expect(rec.reference.certifyingMethods).toEqual(['dormand-prince-853', 'odex']);
    expect(rec.reference.trust).toMatch(/agree to \d+ digits/);
  });

  it('with --controller deadband: records the controller, and its choice holds in a fresh solve under it', async () => {
    const d = join(tmp(), 'd');
    const r = await runCli(['choose', '-p', 'kepler-eccentric', '--target', '1e-8', '-m', 'dormand-prince-54', '--cost', 'nfev', '--controller', 'deadband', '--out', d]);
    expect(r.code, r.stderr).toBe(0);
    const rec = JSON.parse(readFileSync(join(d, 'decision.json'), 'utf8')) as DecisionRecord;
    expect(rec.question.controller).toBe('deadband');
    expect(readFileSync(join(d, 'decision.md'), 'utf8')).toMatch(/step-size controller \(explicit pairs\) \| deadband/);
    const chosen = rec.recommendation!;
    const setting = chosen.setting as { rtol: number; atol: number };
    // Against the exact orbit (Kepler's equation), under the same controller.
    const again = measureRun(keplerEccentric, findMethod('dormand-prince-54')!, setting, { maxSteps: 100_000, controller: 'deadband' });
    expect(again.error.final).toBeLessThanOrEqual(5e-9);
    expect(rec.candidates.find((c) => c.method === 'dormand-prince-54')!.counts).toEqual(again.counts);
    const standard = measureRun(keplerEccentric, findMethod('dormand-prince-54')!, setting, { maxSteps: 100_000 });
    expect(standard.counts).not.toEqual(again.counts);
    expect((await runCli(['choose', '-p', 'kepler-eccentric', '--target', '1e-8', '--controller', 'fuzzy'])).stderr).toMatch(/--controller.*standard, pi, deadband/);
    // Said, not silently ignored, when no candidate steps with a controller of this kind.
    const implicit = await runCli(['choose', '-p', 'robertson', '--target', '1e-4', '-m', 'radau-iia-5', '--cost', 'nfev', '--controller', 'pi']);
    expect(implicit.code).toBe(0);
    expect(implicit.stderr).toMatch(/note: --controller applies to the explicit embedded pairs, and none is a candidate \(radau-iia-5\)/);
  });

  it('refuses --safety below 1 and an --out that is a file, writing nothing', async () => {
    expect((await runCli(['choose', '-p', 'kepler-eccentric', '--target', '1e-8', '--safety', '0.5'])).code).toBe(2);
    const dir = tmp();
    const file = join(dir, 'f');
    writeFileSync(file, 'x');
    const r = await runCli(['choose', '-p', 'kepler-eccentric', '--target', '1e-8', '--out', file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--out/);
    // A folder with someone else's files is never replaced.
    const theirs = join(dir, 'theirs');
    mkdirSync(theirs);
    writeFileSync(join(theirs, 'notes.txt'), 'mine');
    const t = await runCli(['choose', '-p', 'kepler-eccentric', '--target', '1e-8', '--out', theirs]);
    expect(t.code).toBe(2);
    expect(readFileSync(join(theirs, 'notes.txt'), 'utf8')).toBe('mine');
  });
});

describe('fragility and ties', () => {
  it('calls error monotone only when it falls from the looser through the chosen to the tighter setting', () => {
    expect(isMonotone(4e-9, 2e-9, 1e-9)).toBe(true);
    expect(isMonotone(null, 2e-9, 1e-9)).toBe(true); // looser failed: more error, consistent
    expect(isMonotone(4e-9, 2e-9, 3e-9)).toBe(false);
    expect(isMonotone(1e-9, 2e-9, 1e-9)).toBe(false);
    expect(isMonotone(4e-9, 2e-9, null)).toBe(false);
  });

  it('ties times that overlap within their 95% margins and orders the tie by evaluations', () => {
    // Invented candidates (a scenario for the ranking rule only).
    const c = (method: string, t: number, rme: number, nfev: number): Candidate => ({
      method, family: 'embedded-explicit', met: true, achieved: 1e-9, margin: 2, cost: t, trials: 1, timeMarginPercent: rme,
      run: { counts: { nfev, njev: 0, nlu: 0, accepted: 0, rejected: 0 } } as Candidate['run'],
    });
    const ranked = rankCandidates([c('a', 1.0e-3, 5, 9000), c('b', 1.04e-3, 3, 5000), c('c', 2e-3, 2, 100)], 'time');
    // a: [0.95, 1.05] ms, b: [1.009, 1.071] ms overlap; c does not.
    expect(ranked.map((x) => [x.method, x.rank])).toEqual([['b', 1], ['a', 1], ['c', 3]]);
    expect(ranked[0]!.tiedWith).toEqual(['a']);
  });
});
