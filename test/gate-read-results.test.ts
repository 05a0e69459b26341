// The shared results reader: says which format/version it reads, names file and field.
// SYNTHETIC results (test/fixtures/gate).
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseResultsText, readResultsFile, READABLE_RESULTS } from '../src/results/read.js';
import { syntheticResults, syntheticRun } from './fixtures/gate/synthetic.js';
import { InputError } from '../src/core/errors.js';

const good = () => JSON.parse(JSON.stringify(syntheticResults([syntheticRun(), syntheticRun({ setting: { steps: 10, h: 1 } })])));

describe('readResultsFile', () => {
  it('reads a valid file and keeps extra fields', () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-read-'));
    const value = { ...good(), extraTopLevel: 42 };
    writeFileSync(join(dir, 'r.json'), JSON.stringify(value));
    const r = readResultsFile(join(dir, 'r.json'));
    expect(r.runs).toHaveLength(2);
    expect(r.runs[1]!.counts.nfev).toBe(1000);
    expect(r.extraTopLevel).toBe(42);
    expect(() => readResultsFile(join(dir, 'missing.json'))).toThrow(/missing\.json: cannot read results file \(ENOENT\)/);
  });

  it('reads a null drift back as NaN', () => {
    const v = good();
    v.runs[0].drift.energy = null;
    expect(Number.isNaN(parseResultsText(JSON.stringify(v), 'r.json').runs[0]!.drift.energy)).toBe(true);
  });

  it.each([
    [(v: any) => (v.format = 'other'), /r\.json: field "format" is "other", not a stepgauge results file; this reader reads stepgauge-results version 1/],
    [(v: any) => (v.version = 2), /r\.json: field "version" is 2 \(written by a newer stepgauge\); this reader reads stepgauge-results version 1 only/],
    [(v: any) => (v.runs[1].counts.nfev = '12'), /r\.json: field "runs\[1\]\.counts\.nfev" is string "12", expected a number/],
    [(v: any) => (v.runs[0].status = 'fine'), /field "runs\[0\]\.status" is "fine", expected one of ok, diverged/],
    [(v: any) => delete v.runs[0].error, /field "runs\[0\]\.error" is missing, expected an object/],
    [(v: any) => (v.runs[0].setting = { tol: 1 }), /field "runs\[0\]\.setting" has neither rtol\/atol nor steps\/h/],
    [(v: any) => (v.problems[0].reference.kind = 'guess'), /field "problems\[0\]\.reference\.kind"/],
    [(v: any) => (v.shard = { index: 3, count: 2, planSha256: 'x' }), /field "shard\.index" is 3, larger than shard\.count 2/],
  ])('rejects malformed input naming the field (%#)', (mutate, message) => {
    const v = good();
    mutate(v);
    expect(() => parseResultsText(JSON.stringify(v), 'r.json')).toThrow(message);
    expect(() => parseResultsText(JSON.stringify(v), 'r.json')).toThrow(InputError);
  });

  it('says what it can read', () => {
    expect(READABLE_RESULTS).toBe('stepgauge-results version 1');
    expect(() => parseResultsText('{', 'r.json')).toThrow(/r\.json: not valid JSON .*expected stepgauge-results version 1/);
  });
});
