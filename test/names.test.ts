// Names and flags: ids match whatever the case, close misspellings get suggestions, published
// aliases name the same method (checked against SciPy's coefficients and the papers), -t errors
// show the accepted forms, --atol, notes for flags no run uses, and effective tolerances.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.js';
import { closestNames, editDistance } from '../src/core/names.js';
import { METHOD_ALIASES } from '../src/methods/aliases.js';
import { resolveMethods } from '../src/sweep/resolve.js';
import { DORMAND_PRINCE_54 } from '../src/methods/explicit/tableaus/dormand-prince-54.js';
import { DORMAND_PRINCE_853, DOP853_B } from '../src/methods/explicit/tableaus/dormand-prince-853.js';
import { RADAU5_C } from '../src/methods/implicit/radau-iia-5-tableau.js';
import { RODAS4 } from '../src/methods/implicit/rodas4.js';
import { TR_BDF2 } from '../src/methods/implicit/tr-bdf2.js';
import type { ResultsFile } from '../src/results/contract.js';

const tmp = () => mkdtempSync(join(tmpdir(), 'sg-names-'));

describe('ids and suggestions', () => {
  it('measures edit distance as Levenshtein defined it', () => {
    // kitten -> sitting: 3 edits (the textbook example, common practice, no source).
    expect(editDistance('kitten', 'sitting')).toBe(3);
    expect(closestNames('kepler-eccentrc', ['kepler-circular', 'kepler-eccentric', 'robertson'])).toEqual(['kepler-eccentric']);
  });

  it('suggests the close id for a misspelt problem and matches ids whatever the case', async () => {
    const r = await runCli(['run', '-p', 'kepler-eccentrc']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("did you mean 'kepler-eccentric'?");
    const out = join(tmp(), 'o');
    const ok = await runCli(['run', '-p', 'Kepler-Eccentric', '-m', 'DOPRI5', '-t', '1e-6', '--no-timing', '--no-report', '-q', '--out', out]);
    expect(ok.code, ok.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
    expect(results.runs.map((x) => [x.problem, x.method])).toEqual([['kepler-eccentric', 'dormand-prince-54']]);
  });
});

/** SciPy's own coefficient arrays (scipy.integrate.RK45, DOP853, Radau), or null without SciPy. */
function scipyCoefficients(): { rk45: { C: number[]; B: number[]; A: number[][] }; dop853: { C: number[]; B: number[] }; radauC: number[] } | null {
  const code = [
    'import json, scipy.integrate as si, scipy.integrate._ivp.radau as r',
    "print(json.dumps({'rk45': {'C': si.RK45.C.tolist(), 'B': si.RK45.B.tolist(), 'A': si.RK45.A.tolist()}, 'dop853': {'C': si.DOP853.C[:12].tolist(), 'B': si.DOP853.B.tolist()}, 'radauC': r.C.tolist()}))",
  ].join('\n');
  const p = spawnSync('python3', ['-c', code], { encoding: 'utf8' });
  return p.status === 0 ? JSON.parse(p.stdout) : null;
}
const scipy = scipyCoefficients();
if (!scipy) console.warn('names.test: python3 with SciPy not found; the alias checks against SciPy are skipped (apt-get install python3-scipy)');

describe('published aliases name the same methods', () => {
  it('resolves each alias to its method', async () => {
    for (const [alias, id] of Object.entries(METHOD_ALIASES)) {
      expect((await resolveMethods(alias.toUpperCase())).items.map((m) => m.id), alias).toEqual([id]);
    }
  });

  it.skipIf(!scipy)('dopri5 and rk45 have the coefficients of SciPy RK45 (Dormand-Prince 5(4)), dop853 those of SciPy DOP853, radau5 the nodes of SciPy Radau', () => {
    const close = (a: readonly number[], b: readonly number[]) => {
      expect(a.length).toBe(b.length);
      a.forEach((v, i) => expect(Math.abs(v - b[i]!)).toBeLessThan(1e-15));
    };
    // SciPy lists the six stages of the step; the seventh (FSAL) stage only feeds the estimate.
    close(DORMAND_PRINCE_54.c.slice(0, 6), scipy!.rk45.C);
    close(DORMAND_PRINCE_54.b.slice(0, 6), scipy!.rk45.B);
    scipy!.rk45.A.forEach((row, i) => close(DORMAND_PRINCE_54.a[i]!.concat(new Array(5 - i).fill(0)).slice(0, 5), row));
    close(DORMAND_PRINCE_853.c, scipy!.dop853.C);
    close(DOP853_B, scipy!.dop853.B);
    close(RADAU5_C, scipy!.radauC);
  });

  it('rodas4 is RODAS4 (gamma = 0.25, Hairer and Wanner II sec. IV.7) and tr-bdf2 has gamma = 2 - sqrt 2 (Bank et al. 1985; Hosea and Shampine 1996)', () => {
    expect(RODAS4.gamma).toBe(0.25);
    expect(TR_BDF2.c[1]).toBeCloseTo(2 - Math.SQRT2, 15);
  });
});

describe('flags', () => {
  it('shows the accepted forms of -t, including the .. range, on a syntax error', async () => {
    const r = await runCli(['run', '-t', '1e-3:1e-8']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('1e-3..1e-12');
    expect(r.stderr).toContain('1e-4,1e-8');
  });

  it('--atol takes one value or one per state, and says when the count is wrong', async () => {
    const out = join(tmp(), 'a');
    const r = await runCli(['run', '-p', 'kepler-eccentric', '-m', 'dormand-prince-54', '-t', '1e-6', '--atol', '1e-9,1e-9,1e-8,1e-8', '--no-timing', '--no-report', '-q', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
    expect(results.runs[0]!.setting).toEqual({ rtol: 1e-6, atol: [1e-9, 1e-9, 1e-8, 1e-8] });
    const bad = await runCli(['run', '-p', 'kepler-eccentric', '-m', 'dormand-prince-54', '--atol', '1e-9,1e-9', '--out', join(tmp(), 'b')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('--atol: 2 values given but kepler-eccentric has 4 states');
  });

  it('notes a flag that no planned run uses', async () => {
    const r = await runCli(['run', '-p', 'harmonic-oscillator', '-m', 'rk4', '-s', '10', '-t', '1e-6', '--controller', 'pi', '--no-timing', '--no-report', '--out', join(tmp(), 'n')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toContain('note: -t/--tolerances applies to adaptive methods, and none is planned');
    expect(r.stderr).toContain('note: --controller applies to the explicit embedded pairs');
  });

  it("records the tolerance Radau IIA controls to: 0.1 rtol^(2/3), as in the authors' RADAU5 (Hairer and Wanner II, sec. IV.8)", async () => {
    const out = join(tmp(), 'r');
    const r = await runCli(['run', '-p', 'robertson', '-m', 'radau5', '-t', '1e-6', '--no-timing', '--no-report', '-q', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
    const run = results.runs[0]!;
    const s = run.setting as { rtol: number; atol: number };
    // 0.1 * (1e-6)^(2/3) = 1e-5; atol keeps its ratio to rtol.
    expect(run.effectiveTolerance!.rtol).toBeCloseTo(1e-5, 18);
    expect(run.effectiveTolerance!.atol as number).toBeCloseTo((s.atol * 1e-5) / 1e-6, 25);
    const csv = readFileSync(join(out, 'results.csv'), 'utf8').split('\n');
    expect(csv[0]!.split(',')).toContain('effective_rtol');
  });
});
