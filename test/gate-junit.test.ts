// JUnit XML: well-formed even with hostile names, one testcase per run, one failure per
// regression. SYNTHETIC results (test/fixtures/gate).
import { describe, expect, it } from 'vitest';
import { compareResults } from '../src/gate/compare.js';
import { junitXml, xmlAttr } from '../src/gate/junit.js';
import { syntheticResults, syntheticRun } from './fixtures/gate/synthetic.js';
import { all, parseXml } from './fixtures/gate/xml.js';

describe('junitXml', () => {
  it('escapes names and messages and stays well-formed', () => {
    const nasty = 'a&b<c>"d\'e\u0001f';
    const base = syntheticResults([syntheticRun({ problem: nasty, method: 'm]]>' }), syntheticRun({ problem: 'plain' })]);
    const cur = syntheticResults([
      syntheticRun({ problem: nasty, method: 'm]]>', error: { final: 1e-5, max: 1e-5 }, drift: { energy: 1e-5 } }),
      syntheticRun({ problem: 'plain' }),
    ]);
    const c = compareResults(base, cur);
    const xml = junitXml(c, { timestamp: '2026-01-01T00:00:00Z' });
    const doc = parseXml(xml);
    const cases = all(doc, 'testcase');
    expect(cases).toHaveLength(2);
    const hostile = cases.find((x) => x.attrs.classname !== 'plain')!;
    expect(hostile.attrs.classname).toBe('a&b<c>"d\'e\uFFFDf');
    expect(hostile.attrs.name).toBe('m]]> rtol=1e-6 atol=1e-9');
    // error.final x100, error.max x50, drift x1000: three failures.
    const failures = all(hostile, 'failure');
    expect(failures.map((f) => f.attrs.type)).toEqual(['error', 'error', 'drift']);
    expect(failures[0]!.attrs.message).toBe('error.final: 1e-7 -> 1e-5 (x100, limit x2)');
    expect(doc.attrs).toMatchObject({ tests: '2', failures: '1', errors: '0' });
  });

  it('keeps newlines in attributes as character references', () => {
    expect(xmlAttr('a\nb\t"')).toBe('a&#10;b&#9;&quot;');
  });
});
