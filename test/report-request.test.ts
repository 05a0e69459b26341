// The run report shows what was asked (command line, every setting), each problem's definition,
// where its reference came from and whether it is independent of the methods measured, and a
// summary whose error levels come from the errors reached: a model in metres gets a table too.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.js';
import { derivedLevels, summarize } from '../src/report/summary.js';
import type { ResultsFile } from '../src/results/contract.js';

describe('summary levels', () => {
  it('derives decades from the errors reached: the smallest (rounded up), the largest (rounded down) and one between', () => {
    // 3e-9 -> 1e-8; 0.2 -> 1e-1; between: 1e-4 or 1e-5 (rounded half-way in decades).
    expect(derivedLevels([3e-9, 0.2, 5e-5])).toEqual([1e-1, 1e-4, 1e-8]);
    // Errors in metres: 0.4 m to 300 m.
    expect(derivedLevels([300, 12, 0.4])).toEqual([100, 10, 1]);
    expect(derivedLevels([5e-7, 7e-7])).toEqual([1e-6]);
    expect(derivedLevels([])).toEqual([]);
  });

  it('gives a model in metres (a 400 km circular orbit) a non-empty summary table', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sg-metres-'));
    const cache = join(dir, 'cache');
    const problem = join(dir, 'leo.yaml');
    // Two-body orbit in SI units: mu of the Earth (IERS Conventions 2010, GM = 3.986004418e14 m^3/s^2),
    // radius 6778 km, circular speed sqrt(mu / r); half a period (about 46 minutes).
    writeFileSync(
      problem,
      [
        'id: leo-metres', 'title: Low circular orbit in metres', 'states: [x, y, vx, vy]',
        'parameters: { mu: 3.986004418e14, r0: 6778000 }',
        'definitions: { r3: (x^2 + y^2)^(3/2) }',
        'equations: { x: vx, y: vy, vx: -mu * x / r3, vy: -mu * y / r3 }',
        'initial: { x: r0, y: 0, vx: 0, vy: sqrt(mu / r0) }',
        'span: [0, 2770]',
        'outputs: { px: x, py: y }',
        'units: { time: s, states: { x: m, y: m, vx: m/s, vy: m/s }, outputs: { px: m, py: m } }',
        'error: { measure: outputs, scale: absolute }',
      ].join('\n'),
    );
    const before = process.env.STEPGAUGE_CACHE;
    process.env.STEPGAUGE_CACHE = cache;
    try {
      const out = join(dir, 'o');
      const r = await runCli(['run', '-p', problem, '-m', 'rk4', '-s', '20,40,80,160', '--no-timing', '-q', '--out', out]);
      expect(r.code, r.stderr).toBe(0);
      const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
      const errors = results.runs.map((x) => x.error.final!);
      // Metres: with so few rk4 steps the final position is off by more than 1e-3 m in every run.
      expect(Math.min(...errors)).toBeGreaterThan(1e-3);
      const s = summarize(results);
      expect(s.best[0]!.levels.length).toBeGreaterThan(0);
      for (const l of s.best[0]!.levels) {
        // Direct scan: the fewest evaluations among runs at or below the level.
        const hit = results.runs.filter((x) => x.error.final! <= l.level);
        expect(hit.length).toBeGreaterThan(0);
        expect(l.byNfev!.run.counts.nfev).toBe(Math.min(...hit.map((x) => x.counts.nfev)));
      }
      const md = readFileSync(join(out, 'report.md'), 'utf8');
      expect(md).toMatch(/\| Low circular orbit in metres \| ≤ 10/);
      // The request and the model are in the report.
      expect(md).toContain(`stepgauge run -p ${problem} -m rk4 -s 20,40,80,160 --no-timing -q --out ${out}`);
      expect(md).toContain('| equal-step counts (fixed-step methods) | 20, 40, 80, 160 |');
      // The definition text as hashed (canonical JSON of the file's fields).
      expect(md).toContain('"equations":{"vx":"-mu * x / r3"');
      expect(md).toContain('Certified by dormand-prince-853 and odex, none of which is measured here: independent of every method run.');
      // Units on every axis: the error is in metres (both outputs are), t in seconds.
      expect(results.problems[0]!.errorUnit).toBe('m');
      const { plotContext } = await import('../src/report/plots/context.js');
      const { planPlots } = await import('../src/report/plots/index.js');
      const ctx = plotContext(results);
      const drawn = planPlots(ctx, 'leo-metres').flatMap((o) => ('drawn' in o ? [o.drawn] : []));
      expect(drawn.length).toBeGreaterThan(0);
      for (const spec of drawn) {
        for (const axis of [spec.x, spec.y]) expect(axis.title, `${spec.file}: ${axis.title}`).toMatch(/\[[^\]]+\]/);
        if (spec.kind !== 'drift') expect(`${spec.x.title} ${spec.y.title}`).toContain('[m]');
      }
      // A user target replaces the derived levels.
      const t = await runCli(['report', join(out, 'results.json'), '--summary-levels', '50']);
      expect(t.code, t.stderr).toBe(0);
      expect(readFileSync(join(out, 'report.md'), 'utf8')).toContain('Error levels as given (--summary-levels).');
    } finally {
      if (before === undefined) delete process.env.STEPGAUGE_CACHE;
      else process.env.STEPGAUGE_CACHE = before;
    }
  });
});
