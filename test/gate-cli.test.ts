// check / baseline / merge through the CLI entry in-process: exit codes, report text, JSON,
// JUnit structure, atomic outputs. Inputs are SYNTHETIC results files (test/fixtures/gate).
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../src/cli/main.js';
import { syntheticResults, syntheticRun, syntheticSweep } from './fixtures/gate/synthetic.js';
import { all, parseXml } from './fixtures/gate/xml.js';
import { selectShard } from '../src/sweep/shard.js';

let dir: string;
const p = (name: string) => join(dir, name);
const put = (name: string, value: unknown) => writeFileSync(p(name), typeof value === 'string' ? value : JSON.stringify(value));

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((s) => ((out += String(s)), true));
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((s) => ((err += String(s)), true));
  try {
    const code = await main(argv);
    return { code, out, err };
  } finally {
    o.mockRestore();
    e.mockRestore();
  }
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'stepgauge-gate-'));
  const good = syntheticResults([
    syntheticRun(),
    syntheticRun({ method: 'synthetic-fixed', setting: { steps: 200, h: 0.05 }, drift: {}, counts: { nfev: 800, njev: 0, nlu: 0, accepted: 200, rejected: 0 } }),
    syntheticRun({ problem: 'synthetic-stiff', method: 'synthetic-implicit', counts: { nfev: 500, njev: 20, nlu: 30, accepted: 50, rejected: 2 } }),
  ]);
  put('good.json', good);
  const bad = structuredClone(good);
  bad.runs[0]!.error = { final: 5e-7, max: 2e-7 }; // x5 on error.final
  bad.runs[0]!.counts.nfev = 1200; // +20%
  bad.runs[1]!.status = 'diverged';
  bad.runs[2]!.drift = { energy: 1e-8 };
  put('bad.json', bad);
  const better = structuredClone(good);
  better.runs[0]!.error = { final: 1e-9, max: 2e-7 };
  put('better.json', better);
  put('broken.json', '{"format": "stepgauge-results", "version": 1, "createdAt": 5}');
  put('foreign.json', { format: 'something-else', version: 3 });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('stepgauge baseline', () => {
  it('writes a sorted, byte-stable baseline without traces or yFinal', async () => {
    const r = await run('baseline', p('good.json'), '--out', p('base.json'));
    expect(r.code).toBe(0);
    expect(r.out).toContain('3 runs over 2 problems');
    const text = readFileSync(p('base.json'), 'utf8');
    const b = JSON.parse(text);
    expect(Object.keys(b)).toEqual(['format', 'version', 'source', 'problems', 'configuration', 'runs']);
    expect(Object.keys(b.runs[0])).toEqual(['problem', 'method', 'setting', 'status', 'error', 'drift', 'counts']);
    expect(b.runs.map((x: { method: string }) => x.method)).toEqual(['synthetic-fixed', 'synthetic-rk', 'synthetic-implicit']);
    expect(text).not.toContain('yFinal');
    expect(text).not.toContain('trace');
    // Stable under read -> write: a baseline of the baseline is the same bytes.
    const again = await run('check', '--baseline', p('base.json'), p('good.json'));
    expect(again.code).toBe(0);
  });

  it('keeps calibrated times only with --keep-time', async () => {
    expect((await run('baseline', p('good.json'), '--out', p('base-t.json'), '--keep-time')).code).toBe(0);
    const b = JSON.parse(readFileSync(p('base-t.json'), 'utf8'));
    expect(b.calibrationSeconds).toBe(0.01);
    expect(b.runs[1].time).toEqual({ medianSeconds: 0.002, calibrationRatio: 0.2 });
  });

  it('refuses a shard or an interrupted sweep (exit 2)', async () => {
    put('shard.json', syntheticResults([syntheticRun()], { shard: { index: 1, count: 2, planSha256: 'x' } }));
    const r = await run('baseline', p('shard.json'), '--out', p('never.json'));
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/shard\.json: is shard 1\/2; merge all shards/);
  });
});

describe('stepgauge check', () => {
  it('exits 0 when nothing regressed', async () => {
    const r = await run('check', '--baseline', p('base.json'), p('good.json'));
    expect(r.code).toBe(0);
    expect(r.out).toContain('PASS: no regressions.');
  });

  it('exits 0 on improvements and reports them', async () => {
    const r = await run('check', '--baseline', p('base.json'), p('better.json'));
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Improvements:[\s\S]*error\.final: 1e-7 -> 1e-9 \(x0\.01, limit x2\)/);
  });

  it('exits 1 naming each regression with old value, new value and factor', async () => {
    const r = await run('check', '--baseline', p('base.json'), p('bad.json'));
    expect(r.code).toBe(1);
    expect(r.out).toContain('error.final: 1e-7 -> 5e-7 (x5, limit x2)');
    expect(r.out).toContain('counts.nfev: 1000 -> 1200 (+20%, limit +10%)');
    expect(r.out).toContain('status: ok -> diverged');
    expect(r.out).toContain('FAIL: 3 regression(s).');
    // Same regressions pass with looser thresholds except the status change.
    const loose = await run('check', '--baseline', p('base.json'), p('bad.json'), '--error-factor', '10', '--work-fraction', '0.5', '--json');
    expect(loose.code).toBe(1);
    const c = JSON.parse(loose.out);
    expect(c.regressions.map((f: { metric: string }) => f.metric)).toEqual(['status']);
    expect(c.options).toMatchObject({ errorFactor: 10, workFraction: 0.5, driftFactor: 2 });
  });

  it('writes JUnit XML: one testcase per run, one failure per regression', async () => {
    const r = await run('check', '--baseline', p('base.json'), p('bad.json'), '--junit', p('out/junit.xml'));
    expect(r.code).toBe(1);
    const doc = parseXml(readFileSync(p('out/junit.xml'), 'utf8'));
    expect(doc.name).toBe('testsuites');
    expect(doc.attrs).toMatchObject({ tests: '3', failures: '2' });
    const cases = all(doc, 'testcase');
    expect(cases.map((c) => [c.attrs.classname, c.attrs.name])).toEqual([
      ['synthetic-osc', 'synthetic-fixed steps=200'],
      ['synthetic-osc', 'synthetic-rk rtol=1e-6 atol=1e-9'],
      ['synthetic-stiff', 'synthetic-implicit rtol=1e-6 atol=1e-9'],
    ]);
    expect(cases.map((c) => all(c, 'failure').length)).toEqual([1, 2, 0]);
    const f = all(cases[1]!, 'failure')[0]!;
    expect(f.attrs.message).toBe('error.final: 1e-7 -> 5e-7 (x5, limit x2)');
    expect(f.text).toContain('old: 1e-7');
    expect(all(doc, 'testsuite').map((s) => s.attrs.name)).toEqual(['synthetic-osc', 'synthetic-stiff']);
    expect(readdirSync(p('out'))).toEqual(['junit.xml']); // no temporary left behind
  });

  it('fails a missing run unless --allow-missing', async () => {
    const fewer = syntheticResults([syntheticRun()]);
    put('fewer.json', fewer);
    const r = await run('check', '--baseline', p('base.json'), p('fewer.json'));
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/synthetic-fixed {2}steps=200\n {4}run: in the baseline, missing/);
    const a = await run('check', '--baseline', p('base.json'), p('fewer.json'), '--allow-missing', '--junit', p('skip.xml'));
    expect(a.code).toBe(0);
    expect(all(parseXml(readFileSync(p('skip.xml'), 'utf8')), 'skipped')).toHaveLength(2);
  });

  it('accepts a full results file as the baseline', async () => {
    expect((await run('check', '--baseline', p('good.json'), p('bad.json'))).code).toBe(1);
    expect((await run('check', '--baseline', p('good.json'), p('good.json'))).code).toBe(0);
  });

  it('compares time only with --time, and exits 2 without calibration', async () => {
    const slow = syntheticResults([syntheticRun({ time: { medianSeconds: 0.02, samples: 5 } })]);
    put('slow.json', slow);
    expect((await run('check', '--baseline', p('base-t.json'), p('slow.json'), '--allow-missing')).code).toBe(0);
    const t = await run('check', '--baseline', p('base-t.json'), p('slow.json'), '--allow-missing', '--time', '3');
    expect(t.code).toBe(1);
    expect(t.out).toContain('time: 0.2 -> 2 calibration units (x10, limit x3)');
    const n = await run('check', '--baseline', p('base.json'), p('slow.json'), '--allow-missing', '--time', '3');
    expect(n.code).toBe(2);
    expect(n.err).toMatch(/base\.json: no calibration timing .*--keep-time/);
  });

  it('exits 2 on unreadable or malformed input, naming file and field', async () => {
    const missing = await run('check', '--baseline', p('nope.json'), p('good.json'));
    expect(missing.code).toBe(2);
    expect(missing.err).toMatch(/nope\.json: cannot read baseline file \(ENOENT\)/);
    const broken = await run('check', '--baseline', p('base.json'), p('broken.json'));
    expect(broken.code).toBe(2);
    expect(broken.err).toMatch(/broken\.json: field "createdAt" is number 5, expected a string/);
    const foreign = await run('check', '--baseline', p('foreign.json'), p('good.json'));
    expect(foreign.code).toBe(2);
    expect(foreign.err).toMatch(/reads stepgauge-baseline version 1 or stepgauge-results version 1/);
    const flag = await run('check', '--baseline', p('base.json'), p('good.json'), '--error-factor', 'two');
    expect(flag.code).toBe(2);
    expect(flag.err).toMatch(/--error-factor: expected a number/);
    expect((await run('check', p('good.json'))).code).toBe(2); // --baseline is required
  });
});

describe('stepgauge merge', () => {
  it('merges shards into the unsharded order and refuses overlaps (exit 2)', async () => {
    const runs = syntheticSweep();
    const costed = runs.map((r) => ({ ...r, expectedCost: r.counts.nfev }));
    const paths: string[] = [];
    for (let k = 1; k <= 3; k++) {
      const part = selectShard(costed, k, 3).map(({ expectedCost: _c, ...r }) => r);
      put(`s${k}.json`, syntheticResults(part, { shard: { index: k, count: 3, planSha256: 'plan' }, problems: syntheticResults(runs).problems }));
      paths.push(p(`s${k}.json`));
    }
    const r = await run('merge', paths[2]!, paths[0]!, paths[1]!, '--out', p('all.json'));
    expect(r.code).toBe(0);
    expect(r.out).toContain(`${runs.length} runs from 3 file(s)`);
    const merged = JSON.parse(readFileSync(p('all.json'), 'utf8'));
    expect(merged.runs.map((x: { planIndex: number }) => x.planIndex)).toEqual(runs.map((_, i) => i));
    const twice = await run('merge', paths[0]!, paths[0]!, '--out', p('x.json'));
    expect(twice.code).toBe(2);
    expect(twice.err).toMatch(/given twice/);
  });
});
