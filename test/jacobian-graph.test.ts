// The symbolic Jacobian follows definitions as a graph (chain rule per definition, each partial
// built once). Outside checks: centred finite differences of the compiled right-hand side, and
// mathjs `derivative` + `evaluate` of the equation with its definitions written out by hand.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { derivative, parse } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { loadProblemFile } from '../src/problems/load-file.js';
import type { UserProblem } from '../src/problems/user-problem.js';

const dir = mkdtempSync(join(tmpdir(), 'sg-jacobian-graph-'));

/** The chain of issue 22: each link uses the previous one twice. */
function chainFile(links: number): string {
  const defs = ['  a1: x * y - 0.6'];
  for (let k = 2; k <= links; k++) defs.push(`  a${k}: a${k - 1} * a${k - 1} + sin(a${k - 1})`);
  const path = join(dir, `chain-${links}.yaml`);
  writeFileSync(path, `id: chain\ntitle: Chain\nstates: [x, y]\ndefinitions:\n${defs.join('\n')}\nequations:\n  x: a${links} - y\n  y: x * a${links} + cos(a${links - 1})\ninitial: { x: 0.3, y: 0.2 }\nspan: [0, 1]\n`);
  return path;
}

/** Centred differences of p.f; truncation O(h^2 f''') and rounding O(eps |f| / h). */
function finiteDifferences(p: UserProblem, t: number, y: Float64Array, h: number): Float64Array {
  const n = p.dimension;
  const jac = new Float64Array(n * n);
  const fp = new Float64Array(n);
  const fm = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const yp = Float64Array.from(y);
    const ym = Float64Array.from(y);
    yp[j]! += h;
    ym[j]! -= h;
    p.f(t, yp, fp);
    p.f(t, ym, fm);
    for (let i = 0; i < n; i++) jac[i * n + j] = (fp[i]! - fm[i]!) / (2 * h);
  }
  return jac;
}

describe('Jacobian through definitions as a graph', () => {
  // x y - 0.6 stays in (-0.8, 0) at these states, where the chain a -> a^2 + sin(a) stays bounded.
  it('a 40-link chain (each link uses the previous twice) loads with a symbolic Jacobian that agrees with finite differences', async () => {
    const p = await loadProblemFile(chainFile(40));
    expect(p.jacobianSource).toBe('symbolic');
    const jac = new Float64Array(4);
    for (const [x, y] of [[0.3, 0.2], [-0.4, 0.2], [1.1, 0.05], [0.7, -0.3]] as const) {
      const state = Float64Array.of(x, y);
      p.jacobian!(0, state, jac);
      // The outside check: centred differences at h = 1e-6 (error ~1e-12 h^2-truncation plus
      // ~1e-10 rounding for entries of order 1 here), so 1e-7 relative is a safe bound.
      const fd = finiteDifferences(p, 0, state, 1e-6);
      for (let i = 0; i < 4; i++) expect(Math.abs(jac[i]! - fd[i]!)).toBeLessThanOrEqual(1e-7 * Math.max(1, Math.abs(fd[i]!)));
    }
  });

  it('a short chain equals mathjs derivative of the equation written out in full, to a few ulps', async () => {
    const links = 6;
    const p = await loadProblemFile(chainFile(links));
    // The same equation with every definition substituted by hand (size 2^links, fine for 6).
    const text = new Map<string, string>([['a1', '(x * y - 0.6)']]);
    for (let k = 2; k <= links; k++) {
      const a = text.get(`a${k - 1}`)!;
      text.set(`a${k}`, `(${a} * ${a} + sin(${a}))`);
    }
    const rowY = parse(`x * ${text.get(`a${links}`)} + cos(${text.get(`a${links - 1}`)})`);
    const dx = derivative(rowY, 'x', { simplify: false }).compile();
    const dy = derivative(rowY, 'y', { simplify: false }).compile();
    const jac = new Float64Array(4);
    for (const [x, y] of [[0.3, 0.2], [-0.4, 0.2], [1.1, 0.05]] as const) {
      p.jacobian!(0, Float64Array.of(x, y), jac);
      const want = [dx.evaluate({ x, y }) as number, dy.evaluate({ x, y }) as number];
      for (let j = 0; j < 2; j++) expect(Math.abs(jac[2 + j]! - want[j]!)).toBeLessThanOrEqual(64 * Number.EPSILON * Math.max(1, Math.abs(want[j]!)));
    }
  });

  it('the generated Jacobian grows linearly with the chain (twice the links, about twice the code)', async () => {
    const size = async (links: number) => String((await loadProblemFile(chainFile(links))).jacobian).length;
    const [s40, s80, s160] = [await size(40), await size(80), await size(160)];
    // Inlined, each link would double the code; through the graph each adds the same few lines.
    expect(s160 - s80).toBeLessThanOrEqual(2.2 * (s80 - s40));
    expect(s160 / s80).toBeLessThan(2.2);
  });

  it('dependencies through definitions decide the separable split without inlining', async () => {
    const path = join(dir, 'kepler-chain.yaml');
    writeFileSync(path, [
      'id: kc', 'title: KC', 'states: [x, y, vx, vy]',
      'definitions: { r2: x^2 + y^2, r: sqrt(r2), r3: r2 * r, ax: -x / r3, ay: -y / r3 }',
      'equations: { x: vx, y: vy, vx: ax, vy: ay }', 'initial: { x: 1, y: 0, vx: 0, vy: 1 }', 'span: [0, 1]',
    ].join('\n'));
    const p = await loadProblemFile(path);
    expect(p.separable).toEqual({ positions: [0, 1], velocities: [2, 3], secondOrder: true });
    const jac = new Float64Array(16);
    const state = Float64Array.of(0.8, 0.5, 0.1, -0.2);
    p.jacobian!(0, state, jac);
    // Hand-derived: d(-x/r^3)/dx = (2x^2 - y^2) / r^5, d(-x/r^3)/dy = 3xy / r^5.
    const r5 = Math.hypot(0.8, 0.5) ** 5;
    expect(jac[8]).toBeCloseTo((2 * 0.64 - 0.25) / r5, 14);
    expect(jac[9]).toBeCloseTo((3 * 0.8 * 0.5) / r5, 14);
    expect([jac[2], jac[7], jac[10], jac[11]]).toEqual([1, 1, 0, 0]);
  });

  it('a model whose derivatives would be too much work is left to finite differences before any is taken, with the reason', async () => {
    // 40 definitions, each a product of 200 sines of the previous: the estimate is about
    // 40 * (4 * 200^2) = 6.4e6, past the bound, so no derivative is taken at all.
    const defs = Array.from({ length: 40 }, (_, k) => `  b${k}: ${JSON.stringify(Array(200).fill(`sin(${k ? `b${k - 1}` : 'x'})`).join(' * '))}`);
    const path = join(dir, 'heavy.yaml');
    writeFileSync(path, `id: heavy\ntitle: Heavy\nstates: [x]\ndefinitions:\n${defs.join('\n')}\nequations: { x: b39 }\ninitial: { x: 1 }\nspan: [0, 1]\n`);
    const p = await loadProblemFile(path);
    expect(p.jacobianSource).toBe('finite-difference');
    expect(p.jacobianNote).toMatch(/^differentiating the model would take about \d+ node operations \(more than 4000000\); finite differences are cheaper$/);
  });
});
