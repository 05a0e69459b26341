// Merging shards: refuses overlaps and mismatches naming the files; the merge of all shards
// equals the unsharded sweep in everything but time. SYNTHETIC runs (test/fixtures/gate).
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { mergeResults, type MergeInput } from '../src/results/merge.js';
import { mergeFiles } from '../src/results/merge-files.js';
import { resultsJson } from '../src/results/json.js';
import { readResultsFile } from '../src/results/read.js';
import { selectShard } from '../src/sweep/shard.js';
import type { ResultsFile, RunResult } from '../src/results/contract.js';
import { syntheticResults, syntheticRun, syntheticSweep } from './fixtures/gate/synthetic.js';

const PLAN = 'plan-sha-synthetic';

function shardFiles(runs: RunResult[], count: number, plan = PLAN): MergeInput[] {
  const whole = syntheticResults(runs);
  const withCost = runs.map((r) => ({ run: r, expectedCost: r.counts.nfev }));
  return Array.from({ length: count }, (_, k) => ({
    path: `shard-${k + 1}.json`,
    results: {
      ...whole,
      // Each shard machine times differently; merge must not care.
      createdAt: `2026-01-0${k + 1}T00:00:00.000Z`,
      environment: { ...whole.environment, calibrationSeconds: 0.01 * (k + 1) },
      runs: selectShard(withCost, k + 1, count).map((x) => ({ ...x.run, time: { medianSeconds: 0.001 * (k + 1), samples: 3 } })),
      shard: { index: k + 1, count, planSha256: plan },
    },
  }));
}

function withoutTime(f: ResultsFile) {
  return { ...f, createdAt: '', environment: {}, runs: f.runs.map((r) => ({ ...r, time: null })) };
}

describe('mergeResults', () => {
  it('merging all shards equals the unsharded sweep except time and environment', () => {
    const runs = syntheticSweep();
    const whole = syntheticResults(runs);
    for (const count of [1, 2, 3, 5]) {
      const files = shardFiles(runs, count).reverse(); // given in any order
      const merged = mergeResults(files);
      expect(withoutTime(merged)).toEqual(withoutTime(whole));
      expect(merged.shard).toBeUndefined();
      expect(merged.runs.map((r) => r.planIndex)).toEqual(runs.map((_, i) => i));
      expect(merged.createdAt).toBe(`2026-01-0${count}T00:00:00.000Z`);
    }
  });

  it('gives each run the calibration ratio of its own shard', () => {
    const merged = mergeResults(shardFiles(syntheticSweep(), 3));
    // Shard k ran at 0.001*k s with calibration 0.01*k s: every ratio is 0.1.
    for (const r of merged.runs) expect(r.time.calibrationRatio).toBeCloseTo(0.1, 12);
    expect((merged.environment.shards as unknown[]).length).toBe(3);
  });

  it('refuses a run present in two files, naming both', () => {
    const a = { path: 'a.json', results: syntheticResults([syntheticRun()]) };
    const b = { path: 'b.json', results: syntheticResults([syntheticRun()]) };
    expect(() => mergeResults([a, b])).toThrow(/run synthetic-osc\|synthetic-rk\|rtol=0\.000001,atol=1e-9 is in both a\.json and b\.json/);
  });

  it('refuses shards of different plans or counts, duplicates and missing shards', () => {
    const runs = syntheticSweep();
    const three = shardFiles(runs, 3);
    const otherPlan = shardFiles(runs, 3, 'another-plan');
    expect(() => mergeResults([three[0]!, otherPlan[1]!, three[2]!])).toThrow(/shard-2\.json is a shard of a different plan than shard-1\.json/);
    const two = shardFiles(runs, 2);
    expect(() => mergeResults([three[0]!, two[1]!])).toThrow(/shard-2\.json is shard 2\/2 but shard-1\.json is 1\/3/);
    expect(() => mergeResults([three[0]!, { ...three[0]!, path: 'copy.json' }, three[1]!, three[2]!])).toThrow(/shard 1\/3 given twice: shard-1\.json and copy\.json/);
    expect(() => mergeResults([three[0]!, three[2]!])).toThrow(/shard\(s\) 2\/3 missing/);
    const plain = { path: 'plain.json', results: syntheticResults([syntheticRun({ problem: 'elsewhere' })]) };
    expect(() => mergeResults([...three, plain])).toThrow(/not shards \(plain\.json\)/);
  });

  it('refuses conflicting problem definitions and other format versions', () => {
    const a = { path: 'a.json', results: syntheticResults([syntheticRun({ method: 'm1' })]) };
    const b = { path: 'b.json', results: syntheticResults([syntheticRun({ method: 'm2' })]) };
    b.results.problems[0]!.sha256 = 'sha-changed';
    expect(() => mergeResults([a, b])).toThrow(/problem synthetic-osc has different definitions in a\.json .* and b\.json/);
    const v2 = { path: 'v2.json', results: { ...a.results, version: 2 } as unknown as ResultsFile };
    expect(() => mergeResults([v2])).toThrow(/^v2\.json: is stepgauge-results version 2/);
  });

  it('keeps top-level extras, dropping each shard\'s own shard entry and joining lists', () => {
    const files = shardFiles(syntheticSweep(), 2);
    files.forEach((f, k) => {
      f.results.plan = { sha256: PLAN, runs: 18 };
      f.results.request = { tolerances: [1e-3], shard: { index: k + 1, count: 2 } };
      f.results.methods = [{ id: 'm-adaptive' }, { id: k === 0 ? 'm-fixed' : 'm-adaptive' }];
    });
    const merged = mergeResults(files);
    expect(merged.plan).toEqual({ sha256: PLAN, runs: 18 });
    expect(merged.request).toEqual({ tolerances: [1e-3] });
    expect(merged.methods).toEqual([{ id: 'm-adaptive' }, { id: 'm-fixed' }]);
  });

  it('joins separate sweeps in the order given and marks interrupted input', () => {
    const a = { path: 'a.json', results: syntheticResults([syntheticRun({ problem: 'zeta' })]) };
    const b = { path: 'b.json', results: syntheticResults([syntheticRun({ problem: 'alpha' })], { interrupted: true }) };
    const warnings: string[] = [];
    const merged = mergeResults([a, b], (w) => warnings.push(w));
    expect(merged.runs.map((r) => r.problem)).toEqual(['zeta', 'alpha']);
    expect(merged.problems.map((p) => p.id)).toEqual(['zeta', 'alpha']);
    expect(merged.interrupted).toBe(true);
    expect(warnings.join('\n')).toContain('b.json');
  });

  // `stepgauge merge` holds one file's runs at a time (results/merge-files.ts): the file it writes
  // must be, byte for byte, what the in-memory merge serialises.
  it.each([
    ['three shards', () => shardFiles(syntheticSweep(), 3).reverse()],
    ['two separate sweeps, one interrupted', () => [
      { path: 'a.json', results: syntheticResults([syntheticRun({ problem: 'zeta' })]) },
      { path: 'b.json', results: syntheticResults([syntheticRun({ problem: 'alpha' })], { interrupted: true }) },
    ]],
  ])('mergeFiles writes what mergeResults serialises (%s)', (_, make) => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-merge-files-'));
    try {
      const files = (make() as MergeInput[]).map((f) => {
        const path = join(dir, f.path);
        writeFileSync(path, resultsJson(f.results));
        return { path, results: readResultsFile(path) };
      });
      const out = join(dir, 'merged.json');
      const warned: string[] = [];
      const count = mergeFiles(files.map((f) => f.path), out, (w) => warned.push(w));
      const expected: string[] = [];
      const inMemory = mergeResults(files, (w) => expected.push(w));
      expect(readFileSync(out, 'utf8')).toBe(resultsJson(inMemory));
      expect(count).toBe(inMemory.runs.length);
      expect(warned).toEqual(expected);
      expect(readdirSync(dir).filter((n) => n.startsWith('.'))).toEqual([]); // no temporary left
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
