// Compiled expressions against mathjs `evaluate` of the same text (an independent evaluator),
// the symbolic Jacobian against centred finite differences, and the separable split.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { evaluate } from 'mathjs';
import { describe, expect, test } from 'vitest';
import { loadProblemFile } from '../src/problems/load-file.js';

const dir = mkdtempSync(join(tmpdir(), 'sg-user-compile-'));

/** Small deterministic generator (Park-Miller minimal standard), so failures reproduce. */
function random(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 48271) % 2147483647;
    return s / 2147483647;
  };
}

// Every whitelisted function and operator, with arguments kept where mathjs gives real numbers.
const PARAMETERS = { a: 0.7, b: '2 * a + 1', w: 1.3 };
const DEFINITIONS: Record<string, string> = {
  r: 'hypot(p, q) + 1',
  s: 'sin(w * t) * cos(p) - tan(q / 3)',
  u: 'asin(p / (1 + abs(p))) + acos(q / (2 + abs(q))) + atan(p * q) + atan2(q, p + 3)',
  h: 'sinh(p / 4) + cosh(q / 4) - tanh(p * q)',
  l: 'exp(-p^2) + log(r) + log10(r + 2) + log(r + 1, 3) + sqrt(r) + cbrt(p - q)',
  m: 'min(p, q, 0.5) + max(p, -q) + pow(r, 1.5) + floor(3 * p) + ceil(q) + sign(p - q)',
  c: '(p > q ? p - q : q - p) + (p <= 0.2) * 3 + (p < q < 1) - (q >= p and p != 0.25) + (not (p == q)) + (p > 0 or q > 0)',
};
const EQUATIONS = {
  p: 'r * s - u / b + h',
  q: '-a * l + m / 7 + c',
  z: '-(p^3) + +q - z * 2 ^ -1 + 1e-3 * pi + e',
};

function fileText(): string {
  return JSON.stringify({
    id: 'all-functions', title: 'All functions', states: ['p', 'q', 'z'],
    parameters: PARAMETERS, definitions: DEFINITIONS, equations: EQUATIONS,
    initial: { p: 0.1, q: 0.2, z: 0 }, span: [0, 1],
  });
}

function mathjsRhs(t: number, y: readonly number[]): number[] {
  const scope: Record<string, unknown> = { t, p: y[0], q: y[1], z: y[2], a: 0.7 };
  scope['b'] = evaluate(PARAMETERS.b, scope);
  scope['w'] = 1.3;
  for (const [k, v] of Object.entries(DEFINITIONS)) scope[k] = Number(evaluate(v, scope));
  return Object.values(EQUATIONS).map((e) => Number(evaluate(e, scope)));
}

describe('compiled right-hand side', () => {
  test('matches mathjs evaluate on 200 random states to 1e-15 relative', async () => {
    const path = join(dir, 'all.json');
    writeFileSync(path, fileText());
    const p = await loadProblemFile(path);
    const rnd = random(12345);
    const dy = new Float64Array(3);
    let worst = 0;
    for (let k = 0; k < 200; k++) {
      const y = [2 * rnd() - 1, 2 * rnd() - 1, 4 * rnd() - 2];
      const t = 5 * rnd();
      p.f(t, Float64Array.from(y), dy);
      const want = mathjsRhs(t, y);
      for (let i = 0; i < 3; i++) {
        worst = Math.max(worst, Math.abs(dy[i]! - want[i]!) / Math.max(1, Math.abs(want[i]!)));
      }
    }
    expect(worst).toBeLessThanOrEqual(1e-15);
  });

  test('symbolic Jacobian matches centred finite differences (crane and a coupled model)', async () => {
    const crane = await loadProblemFile('examples/crane-payload-swing.yaml');
    expect(crane.jacobianSource).toBe('symbolic');
    const path = join(dir, 'coupled.yaml');
    writeFileSync(path, [
      'id: coupled', 'title: Coupled', 'states: [x, y, z]', 'parameters: { k: 1.7 }',
      'definitions: { r2: x^2 + y^2, g: exp(-r2) }',
      'equations:', '  x: -k * y * g + tan(z / 4)', '  y: x * g - sqrt(1 + z^2) * sin(t)', '  z: tanh(x * y) - log(1 + r2) * cbrt(2 + z)',
      'initial: { x: 1, y: 0, z: 0.5 }', 'span: [0, 1]',
    ].join('\n'));
    const coupled = await loadProblemFile(path);
    expect(coupled.jacobianSource).toBe('symbolic');
    const rnd = random(777);
    for (const p of [crane, coupled]) {
      const n = p.dimension;
      const jac = new Float64Array(n * n);
      const fp = new Float64Array(n);
      const fm = new Float64Array(n);
      for (let trial = 0; trial < 20; trial++) {
        const y = Float64Array.from({ length: n }, () => 2 * rnd() - 1);
        const t = rnd();
        p.jacobian!(t, y, jac);
        for (let j = 0; j < n; j++) {
          // Centred differences: truncation error O(h^2 f''') ~ 1e-10 at h = 1e-5, rounding ~1e-11.
          const h = 1e-5;
          const yp = Float64Array.from(y); yp[j]! += h;
          const ym = Float64Array.from(y); ym[j]! -= h;
          p.f(t, yp, fp);
          p.f(t, ym, fm);
          for (let i = 0; i < n; i++) {
            const fd = (fp[i]! - fm[i]!) / (2 * h);
            expect(Math.abs(jac[i * n + j]! - fd)).toBeLessThan(1e-8 * Math.max(1, Math.abs(fd)));
          }
        }
      }
    }
  });

  test('crane: invariant, output and Jacobian entries by hand', async () => {
    const p = await loadProblemFile('examples/crane-payload-swing.yaml');
    // Hand-derived: E = omega^2/2 - (g/L) cos(theta); at theta = 0.6, omega = 0 that is -(g/L) cos 0.6.
    const w2 = 9.80665 / 12;
    expect(p.invariants[0]!.name).toBe('energy');
    expect(p.invariants[0]!.fn(0, Float64Array.of(0.6, 0))).toBe(-w2 * Math.cos(0.6));
    const out = new Float64Array(1);
    p.outputs!.fn(0, Float64Array.of(0.6, 0), out);
    expect(out[0]).toBe(12 * Math.sin(0.6));
    const jac = new Float64Array(4);
    p.jacobian!(0, Float64Array.of(0.3, -0.2), jac);
    // d(omega)/d(theta) = -(g/L) cos(theta), d(theta')/d(omega) = 1, the rest 0.
    expect(jac[0]).toBe(0);
    expect(jac[1]).toBe(1);
    expect(jac[2]).toBeCloseTo(-w2 * Math.cos(0.3), 15);
    expect(jac[3]).toBe(0);
    expect(p.y0).toEqual([0.6, 0]);
    expect([p.t0, p.tEnd]).toEqual([0, 120]);
    expect(p.checkTimes).toEqual([30, 60, 120]);
    expect(p.reference).toEqual({ kind: 'certified', points: [] });
  });

  test('a function mathjs cannot differentiate leaves the Jacobian to finite differences, with the reason', async () => {
    const p = await loadProblemFile('examples/reservoir-cascade.yaml');
    // rain = max(0, ...) depends on t only, so the Jacobian is still symbolic here.
    expect(p.jacobianSource).toBe('symbolic');
    const path = join(dir, 'kink.yaml');
    writeFileSync(path, 'id: kink\ntitle: Kink\nstates: [x]\nequations: { x: "-min(x, 1)" }\ninitial: { x: 2 }\nspan: [0, 1]\n');
    const q = await loadProblemFile(path);
    expect(q.jacobianSource).toBe('finite-difference');
    expect(q.jacobian).toBeUndefined();
    expect(q.jacobianNote).toMatch(/could not differentiate the equation of x by x/);
  });
});

describe('separable split', () => {
  test('crane: theta is the position, omega the velocity', async () => {
    const p = await loadProblemFile('examples/crane-payload-swing.yaml');
    // theta' = omega: the second-order form Runge-Kutta-Nystrom methods need, found from the text.
    expect(p.separable).toEqual({ positions: [0], velocities: [1], secondOrder: true });
    expect(p.separableReason).toBeUndefined();
  });
  test('damped model: refused with the equation that breaks it', async () => {
    const path = join(dir, 'damped.yaml');
    writeFileSync(path, 'id: damped\ntitle: Damped\nstates: [x, v]\nequations: { x: v, v: -4 * x - 0.1 * v }\ninitial: { x: 1, v: 0 }\nspan: [0, 1]\n');
    const p = await loadProblemFile(path);
    expect(p.separable).toBeUndefined();
    expect(p.separableReason).toBe('the derivative of v depends on v itself (damping or self-coupling), so it can be neither a position nor a velocity');
  });
  test('odd coupling cycle is named', async () => {
    const path = join(dir, 'odd.yaml');
    writeFileSync(path, 'id: odd\ntitle: Odd\nstates: [a, b, c]\nequations: { a: b, b: c, c: a }\ninitial: { a: 1, b: 0, c: 0 }\nspan: [0, 1]\n');
    const p = await loadProblemFile(path);
    expect(p.separableReason).toMatch(/odd cycle/);
  });
  test('forced oscillator: the time-dependent equation is the velocity, whatever the listing order', async () => {
    const path = join(dir, 'forced.yaml');
    writeFileSync(path, 'id: forced\ntitle: Forced\nstates: [v, x]\nequations: { v: -x + cos(t), x: v }\ninitial: { x: 1, v: 0 }\nspan: [0, 1]\n');
    const p = await loadProblemFile(path);
    expect(p.separable).toEqual({ positions: [1], velocities: [0], secondOrder: true });
  });
  test('second-order form: velocities are paired with the positions whose rates they are', async () => {
    const path = join(dir, 'pairs.yaml');
    writeFileSync(path, 'id: pairs\ntitle: Pairs\nstates: [x, y, vy, vx]\nequations: { x: (vx), y: vy, vx: -x, vy: -y }\ninitial: { x: 1, y: 0, vx: 0, vy: 1 }\nspan: [0, 1]\n');
    const p = await loadProblemFile(path);
    expect(p.separable).toEqual({ positions: [0, 1], velocities: [3, 2], secondOrder: true });
  });
  test('a position whose rate is not just a velocity: separable, not second-order', async () => {
    const path = join(dir, 'scaled.yaml');
    writeFileSync(path, 'id: scaled\ntitle: Scaled\nstates: [x, v]\nequations: { x: 2 * v, v: -x }\ninitial: { x: 1, v: 0 }\nspan: [0, 1]\n');
    const p = await loadProblemFile(path);
    expect(p.separable).toEqual({ positions: [0], velocities: [1] });
  });
});

describe('references from the file', () => {
  test('exact expressions of t compile to the reference; at-points are sorted', async () => {
    const path = join(dir, 'exact.yaml');
    writeFileSync(path, [
      'id: decay', 'title: Decay', 'states: [x, v]', 'parameters: { k: 2 }',
      'equations: { x: v, v: -k^2 * x }', 'initial: { x: 1, v: 0 }', 'span: [0, 3]',
      'reference:', '  exact: { x: cos(k * t), v: -k * sin(k * t) }', '  source: hand-solved harmonic oscillator',
    ].join('\n'));
    const p = await loadProblemFile(path);
    expect(p.reference.kind).toBe('exact');
    const out = new Float64Array(2);
    p.reference.exact!(1.25, out);
    expect(Array.from(out)).toEqual([Math.cos(2 * 1.25), -2 * Math.sin(2 * 1.25)]);
    const pathAt = join(dir, 'at.yaml');
    writeFileSync(pathAt, [
      'id: decay', 'title: Decay', 'states: [x]', 'equations: { x: -x }', 'initial: { x: 1 }', 'span: [0, 3]',
      'reference:', '  at: [ { t: 3, x: 0.049787068367863944 }, { t: 1, x: 0.36787944117144233 } ]', '  digits: 15',
    ].join('\n'));
    const q = await loadProblemFile(pathAt);
    expect(q.reference.kind).toBe('published');
    expect(q.reference.points!.map((r) => r.t)).toEqual([1, 3]);
    expect(q.reference.digits).toBe(15);
    expect(q.reference.source).toMatch(/names no source/);
  });
  test('definition is canonical: key order and formatting do not change it', async () => {
    const a = join(dir, 'order-a.yaml');
    const b = join(dir, 'order-b.json');
    writeFileSync(a, 'id: o\ntitle: O\nstates: [x]\nequations: { x: -x }\ninitial: { x: 1 }\nspan: [0, 1]\n');
    writeFileSync(b, JSON.stringify({ span: [0, 1], initial: { x: 1 }, equations: { x: '-x' }, states: ['x'], title: 'O', id: 'o' }, null, 4));
    const [pa, pb] = await Promise.all([loadProblemFile(a), loadProblemFile(b)]);
    expect(pa.definition).toBe(pb.definition);
    expect(pa.definition).toBe('{"equations":{"x":"-x"},"id":"o","initial":{"x":1},"span":[0,1],"states":["x"],"title":"O"}');
  });
});
