// The crane example end to end: every explicit and symplectic method runs, the reference is
// certified with its digits of trust, and the energy drift is bounded for the symplectic methods
// but grows steadily for rk4 (Hairer, Lubich and Wanner, Geometric Numerical Integration, ch. IX:
// symplectic methods have bounded energy error on exponentially long times; non-symplectic
// one-step methods drift linearly).
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './helpers/cli.js';
import type { ResultsFile, RunResult } from '../src/results/contract.js';

const crane = join(import.meta.dirname, '..', 'examples', 'crane-payload-swing.yaml');

function growth(run: RunResult): number {
  const { t, drift } = run.trace!;
  const e = drift.energy!;
  const half = t.findIndex((x) => x > 60);
  return Math.max(...e) / Math.max(...e.slice(0, half));
}

describe('crane payload swing', () => {
  it('certifies its reference and shows bounded symplectic drift against growing rk4 drift', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-crane-'));
    const methods = 'euler,midpoint,rk4,rk4-38,bogacki-shampine-32,fehlberg-45,cash-karp-45,dormand-prince-54,tsitouras-54,verner-65,dormand-prince-853,stormer-verlet,yoshida-4';
    process.env.STEPGAUGE_CACHE = join(dir, 'cache');
    const r = await runCli(['run', '-p', crane, '-m', methods, '-t', '1e-4..1e-8', '-s', '800,1600', '--no-timing', '--no-report', '-q', '--jobs', '1', '--out', join(dir, 'out')]);
    delete process.env.STEPGAUGE_CACHE;
    expect(r.code, r.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(dir, 'out', 'results.json'), 'utf8')) as ResultsFile;
    expect(results.problems[0]!.reference.kind).toBe('certified');
    expect(results.problems[0]!.reference.digits).toBeGreaterThanOrEqual(9);
    expect(results.runs.every((x) => x.status === 'ok')).toBe(true);
    expect(new Set(results.runs.map((x) => x.method)).size).toBe(13);
    for (const m of ['stormer-verlet', 'yoshida-4']) {
      const run = results.runs.find((x) => x.method === m && 'steps' in x.setting && x.setting.steps === 800)!;
      expect(growth(run)).toBeLessThan(1.3);
    }
    const rk4 = results.runs.find((x) => x.method === 'rk4' && 'steps' in x.setting && x.setting.steps === 800)!;
    // Linear drift: the worst drift over [0, 120] is about twice that over [0, 60].
    expect(growth(rk4)).toBeGreaterThan(1.8);
    expect(growth(rk4)).toBeLessThan(2.2);
  });
});
