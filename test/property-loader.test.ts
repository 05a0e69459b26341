// Properties of the problem-file loader, with fast-check:
//  1. random valid files (small linear combinations of sin/cos/exp terms of the states and t,
//     random parameters, spans and check times) load, and the compiled f equals mathjs
//     `evaluate` of the same expression text (an independent evaluator) within 1e-14 relative;
//  2. random text, and random mutations of valid files, either load or fail with InputError -
//     never another exception, never a hang (each case is bounded by the test timeout);
//  3. the limits that keep loading bounded: long sums and polynomials load (the symbolic Jacobian
//     without exponential simplification), trees deeper than the limit are refused by name.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { evaluate } from 'mathjs';
import { afterAll, describe, expect, it } from 'vitest';
import { loadProblemFile } from '../src/problems/load-file.js';
import { MAX_EXPRESSION_DEPTH } from '../src/problems/expression/parse.js';

const dir = mkdtempSync(join(tmpdir(), 'sg-property-loader-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
let counter = 0;
function write(ext: string, text: string): string {
  const path = join(dir, `case-${counter++}.${ext}`);
  writeFileSync(path, text);
  return path;
}

const STATE_NAMES = ['x', 'y', 'z'];
const PARAM_NAMES = ['a', 'b', 'c'];

/** A term: coefficient * kind(inner), inner = a scaled state, a parameter times a state, or t. */
interface Term {
  coef: number;
  kind: 'lin' | 'sin' | 'cos' | 'exp';
  arg: { kind: 'state'; i: number; scale: number } | { kind: 'param'; p: number; i: number } | { kind: 't'; scale: number };
}

const coef = fc.double({ min: -10, max: 10, noNaN: true, noDefaultInfinity: true });
const small = fc.double({ min: -2, max: 2, noNaN: true, noDefaultInfinity: true });

function termArb(n: number, np: number): fc.Arbitrary<Term> {
  const args: fc.Arbitrary<Term['arg']>[] = [
    fc.record({ kind: fc.constant('state' as const), i: fc.integer({ min: 0, max: n - 1 }), scale: small }),
    fc.record({ kind: fc.constant('t' as const), scale: small }),
  ];
  if (np > 0) args.push(fc.record({ kind: fc.constant('param' as const), p: fc.integer({ min: 0, max: np - 1 }), i: fc.integer({ min: 0, max: n - 1 }) }));
  return fc.record({ coef, kind: fc.constantFrom('lin' as const, 'sin' as const, 'cos' as const, 'exp' as const), arg: fc.oneof(...args) });
}

/** Numbers written so that YAML and mathjs both read them back exactly. */
const lit = (v: number) => (Object.is(v, -0) ? '0' : String(v));

function argText(a: Term['arg']): string {
  if (a.kind === 'state') return `${lit(a.scale)} * ${STATE_NAMES[a.i]}`;
  if (a.kind === 'param') return `${PARAM_NAMES[a.p]} * ${STATE_NAMES[a.i]}`;
  return `${lit(a.scale)} * t`;
}

function termText(t: Term): string {
  const inner = argText(t.arg);
  const body = t.kind === 'lin' ? `(${inner})` : `${t.kind}(${inner})`;
  return `(${lit(t.coef)}) * ${body}`;
}

const modelArb = fc
  .record({ n: fc.integer({ min: 1, max: 3 }), np: fc.integer({ min: 0, max: 3 }) })
  .chain(({ n, np }) =>
    fc.record({
      n: fc.constant(n),
      params: fc.array(coef, { minLength: np, maxLength: np }),
      equations: fc.array(fc.array(termArb(n, np), { minLength: 1, maxLength: 4 }), { minLength: n, maxLength: n }),
      initial: fc.array(small, { minLength: n, maxLength: n }),
      t0: fc.double({ min: -5, max: 5, noNaN: true }),
      length: fc.double({ min: 0.01, max: 100, noNaN: true }),
      checks: fc.array(fc.double({ min: 0.01, max: 1, noNaN: true }), { maxLength: 3 }),
      json: fc.boolean(),
    }),
  );

type Model = typeof modelArb extends fc.Arbitrary<infer M> ? M : never;

function modelFile(m: Model): { text: string; ext: string; equations: string[]; t0: number; tEnd: number; checkTimes: number[] } {
  const states = STATE_NAMES.slice(0, m.n);
  const equations = m.equations.map((terms) => terms.map(termText).join(' + '));
  const t0 = m.t0 + 0; // -0 is written (JSON and YAML alike) and read back as 0
  const tEnd = t0 + m.length;
  // Check times strictly inside (t0, tEnd], as the loader requires; drop any that round onto t0.
  const checkTimes = m.checks.map((f) => t0 + f * m.length).filter((t) => t > t0 && t <= tEnd);
  const spec = {
    id: 'random-model',
    title: 'Random model',
    states,
    ...(m.params.length ? { parameters: Object.fromEntries(m.params.map((v, k) => [PARAM_NAMES[k]!, v])) } : {}),
    equations: Object.fromEntries(states.map((s, i) => [s, equations[i]!])),
    initial: Object.fromEntries(states.map((s, i) => [s, m.initial[i]!])),
    span: [t0, tEnd],
    ...(checkTimes.length ? { checkTimes } : {}),
  };
  if (m.json) return { text: JSON.stringify(spec, null, 2), ext: 'json', equations, t0, tEnd, checkTimes };
  // YAML by hand: flow mappings with quoted expressions, numbers via String (exact round trip).
  const lines = [
    'id: random-model',
    'title: Random model',
    `states: [${states.join(', ')}]`,
    ...(m.params.length ? [`parameters: { ${m.params.map((v, k) => `${PARAM_NAMES[k]}: ${lit(v)}`).join(', ')} }`] : []),
    'equations:',
    ...states.map((s, i) => `  ${s}: "${equations[i]}"`),
    `initial: { ${states.map((s, i) => `${s}: ${lit(m.initial[i]!)}`).join(', ')} }`,
    `span: [${lit(t0)}, ${lit(tEnd)}]`,
    ...(checkTimes.length ? [`checkTimes: [${checkTimes.map(lit).join(', ')}]`] : []),
  ];
  return { text: `${lines.join('\n')}\n`, ext: 'yaml', equations, t0, tEnd, checkTimes };
}

describe('random valid files round-trip through the loader', () => {
  it('compiled f equals mathjs evaluate of the same text within 1e-14 relative; y0, span and check times are kept', async () => {
    await fc.assert(
      fc.asyncProperty(modelArb, fc.array(fc.tuple(small, fc.array(small, { minLength: 3, maxLength: 3 })), { minLength: 3, maxLength: 3 }), async (m, points) => {
        const file = modelFile(m);
        const p = await loadProblemFile(write(file.ext, file.text));
        expect(p.dimension).toBe(m.n);
        expect(p.y0).toEqual(m.initial.map((v) => v + 0));
        expect([p.t0, p.tEnd]).toEqual([file.t0, file.tEnd]);
        expect(p.checkTimes).toEqual([...new Set(file.checkTimes)].sort((x, y) => x - y));
        const dy = new Float64Array(m.n);
        for (const [t, ys] of points) {
          const y = ys.slice(0, m.n);
          p.f(t, Float64Array.from(y), dy);
          const scope: Record<string, number> = { t };
          m.params.forEach((v, k) => (scope[PARAM_NAMES[k]!] = v));
          y.forEach((v, i) => (scope[STATE_NAMES[i]!] = v));
          file.equations.forEach((text, i) => {
            const want = Number(evaluate(text, { ...scope }));
            expect(Math.abs(dy[i]! - want)).toBeLessThanOrEqual(1e-14 * Math.max(1, Math.abs(want)));
          });
        }
      }),
      { numRuns: 120 },
    );
  });
});

/** Loads and returns 'ok', or the name of what was thrown (expected: only 'InputError'). */
async function outcome(ext: string, text: string): Promise<string> {
  try {
    await loadProblemFile(write(ext, text));
    return 'ok';
  } catch (e) {
    if (e instanceof Error && e.name === 'InputError') return 'InputError';
    return `${(e as Error)?.name ?? typeof e}: ${(e as Error)?.message ?? String(e)}`;
  }
}

const VALID_YAML = `id: spring
title: Spring
states: [x, v]
parameters: { k: 4, c: 0.1 }
definitions:
  force: -k * x - c * v
equations:
  x: v
  v: force + 0.5 * sin(1.3 * t)
initial: { x: 1, v: 0 }
span: [0, 10]
checkTimes: [2.5, 5, 10]
invariants: { energy: v^2 / 2 + k * x^2 / 2 }
outputs: { position: x }
error: { measure: states, scale: relative, floor: 1e-6 }
reference:
  at:
    - { t: 10, x: 0.1, v: 0.2 }
`;
const VALID_LINEAR = `id: chain
title: Chain
states: [q, p]
parameters: { w: 2 }
linear:
  A: [[0, 1], [-w^2, -0.1]]
  B: [[0], [1]]
  C: [[1, 0]]
inputs:
  - [{ sin: { omega: 1.5, amplitude: 2 } }, { poly: [1, 0.5] }, { exp: { rate: -0.3 } }]
initial: [1, 0]
span: [0, 5]
checkTimes: [1, 2]
`;

/** A random edit of a text: delete, insert, replace or duplicate a slice. */
const editArb = fc.record({
  kind: fc.constantFrom('delete', 'insert', 'replace', 'duplicate', 'swap-lines'),
  at: fc.nat(),
  len: fc.integer({ min: 1, max: 12 }),
  text: fc.oneof(
    fc.string({ maxLength: 8 }),
    fc.constantFrom('[', ']', '{', '}', ':', ',', '-', '"', "'", '\n', '  ', '\t', '#', '&a', '*a', '!!str', '1e999', '.nan', 'NaN', '0/0', '(', ')', '^', 'x', 't', 'import(', 'constructor', '\uFEFF', '\r\n', '\u0000'),
  ),
});

function applyEdits(text: string, edits: readonly fc.RecordValue<{ kind: string; at: number; len: number; text: string }>[]): string {
  let s = text;
  for (const e of edits) {
    const at = s.length ? e.at % s.length : 0;
    if (e.kind === 'delete') s = s.slice(0, at) + s.slice(at + e.len);
    else if (e.kind === 'insert') s = s.slice(0, at) + e.text + s.slice(at);
    else if (e.kind === 'replace') s = s.slice(0, at) + e.text + s.slice(at + e.len);
    else if (e.kind === 'duplicate') s = s.slice(0, at + e.len) + s.slice(at, at + e.len) + s.slice(at + e.len);
    else {
      const lines = s.split('\n');
      const i = at % lines.length;
      const j = (at + e.len) % lines.length;
      [lines[i], lines[j]] = [lines[j]!, lines[i]!];
      s = lines.join('\n');
    }
  }
  return s;
}

describe('garbage never throws anything but InputError', () => {
  it('the seeds themselves are valid', async () => {
    expect(await outcome('yaml', VALID_YAML)).toBe('ok');
    expect(await outcome('yaml', VALID_LINEAR)).toBe('ok');
    expect(await outcome('json', JSON.stringify({ id: 'j', title: 'J', states: ['x'], equations: { x: '-x' }, initial: { x: 1 }, span: [0, 1] }))).toBe('ok');
  });
  it('random unicode text as .yaml and .json', async () => {
    await fc.assert(
      fc.asyncProperty(fc.string({ unit: 'binary', maxLength: 300 }), fc.constantFrom('yaml', 'json'), async (text, ext) => {
        expect(await outcome(ext, text)).toMatch(/^(ok|InputError)$/);
      }),
      { numRuns: 300 },
    );
  });
  it('random mutations of valid equation, linear and JSON files', async () => {
    const seeds: [string, string][] = [
      ['yaml', VALID_YAML],
      ['yaml', VALID_LINEAR],
      ['json', JSON.stringify({ id: 'j', title: 'J', states: ['x', 'y'], parameters: { k: 2 }, equations: { x: 'y', y: '-k * x' }, initial: { x: 1, y: 0 }, span: [0, 3] }, null, 2)],
    ];
    let loaded = 0;
    let refused = 0;
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: seeds.length - 1 }), fc.array(editArb, { minLength: 1, maxLength: 4 }), async (k, edits) => {
        const [ext, seed] = seeds[k]!;
        const result = await outcome(ext, applyEdits(seed, edits));
        expect(result).toMatch(/^(ok|InputError)$/);
        if (result === 'ok') loaded++;
        else refused++;
      }),
      { numRuns: 600 },
    );
    // Both outcomes occur, so the mutations neither all break nor all miss the files.
    expect(loaded).toBeGreaterThan(10);
    expect(refused).toBeGreaterThan(10);
  });
  it('random expression text in an equation', async () => {
    const token = fc.constantFrom('x', 'v', 't', 'k', 'pi', 'e', '1', '2.5', '1e308', '+', '-', '*', '/', '^', '(', ')', ',', 'sin(', 'log(', 'max(', 'a.b', '[1]', '"s"', '!', '?', ':', '==', 'and', 'mod', ' ', '=', ';', '{', '}');
    await fc.assert(
      fc.asyncProperty(fc.array(token, { minLength: 1, maxLength: 30 }), async (tokens) => {
        const expr = tokens.join('');
        const text = `id: s\ntitle: S\nstates: [x, v]\nparameters: { k: 4 }\nequations:\n  x: v\n  v: ${JSON.stringify(expr)}\ninitial: { x: 1, v: 0 }\nspan: [0, 1]\n`;
        expect(await outcome('yaml', text)).toMatch(/^(ok|InputError)$/);
      }),
      { numRuns: 400 },
    );
  });
});

describe('limits that keep loading bounded', () => {
  const file = (expr: string) => `id: big\ntitle: Big\nstates: [x, v]\nequations:\n  x: v\n  v: ${JSON.stringify(expr)}\ninitial: { x: 1, v: 0 }\nspan: [0, 1]\n`;
  it('a 20-term polynomial loads with a symbolic Jacobian equal to its derivative (was minutes of mathjs simplify)', async () => {
    const coeffs = Array.from({ length: 20 }, (_, k) => (k + 1) / 8);
    const p = await loadProblemFile(write('yaml', file(coeffs.map((c, k) => `${c} * x^${k}`).join(' + '))));
    expect(p.jacobianSource).toBe('symbolic');
    const jac = new Float64Array(4);
    p.jacobian!(0, Float64Array.of(0.7, 0), jac);
    // d/dx sum c_k x^k = sum k c_k x^(k-1), by hand.
    const want = coeffs.reduce((s, c, k) => s + (k ? k * c * 0.7 ** (k - 1) : 0), 0);
    expect(Math.abs(jac[2]! - want)).toBeLessThanOrEqual(1e-14 * want);
    expect([jac[0], jac[1], jac[3]]).toEqual([0, 1, 0]);
  }, 20_000);
  it('a product of 10 sines loads (was over 5 s of simplify) and its Jacobian entry is right', async () => {
    const p = await loadProblemFile(write('yaml', file(Array(10).fill('sin(x)').join(' * '))));
    const jac = new Float64Array(4);
    p.jacobian!(0, Float64Array.of(0.4, 0), jac);
    // d/dx sin(x)^10 = 10 sin(x)^9 cos(x), by hand.
    expect(Math.abs(jac[2]! - 10 * Math.sin(0.4) ** 9 * Math.cos(0.4))).toBeLessThanOrEqual(1e-15);
  }, 20_000);
  it(`a sum of ${MAX_EXPRESSION_DEPTH - 1} terms loads; one of ${MAX_EXPRESSION_DEPTH + 1} is refused, naming the field and the depth`, async () => {
    const ok = await loadProblemFile(write('yaml', file(Array(MAX_EXPRESSION_DEPTH - 1).fill('x').join(' + '))));
    const dy = new Float64Array(2);
    ok.f(0, Float64Array.of(2, 0), dy);
    expect(dy[1]).toBe(2 * (MAX_EXPRESSION_DEPTH - 1));
    const path = write('yaml', file(Array(MAX_EXPRESSION_DEPTH + 1).fill('x').join(' + ')));
    await expect(loadProblemFile(path)).rejects.toThrow(new RegExp(`${path.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}:6:6: equations\\.v: \`x \\+ x.*\\.\\.\\.\` is nested ${MAX_EXPRESSION_DEPTH + 1} levels deep \\(at most ${MAX_EXPRESSION_DEPTH}`));
  }, 20_000);
  it('a long product whose derivative would be huge falls back to finite differences, with the reason', async () => {
    const p = await loadProblemFile(write('yaml', file(Array(250).fill('sin(x)').join('*'))));
    expect(p.jacobianSource).toBe('finite-difference');
    expect(p.jacobianNote).toMatch(/the derivative of v's equation by x has \d+ terms and operations \(more than 20000\)/);
  }, 20_000);
  it('a long chain of long definitions loads (they are followed as a graph, never inlined) with the right sum and Jacobian', async () => {
    const defs = Array.from({ length: 40 }, (_, i) => `  d${i}: ${JSON.stringify(`${i ? `d${i - 1} + ` : ''}${Array(250).fill('x').join('+')}`)}`);
    const path = write('yaml', `id: deep\ntitle: Deep\nstates: [x, v]\ndefinitions:\n${defs.join('\n')}\nequations:\n  x: v\n  v: d39\ninitial: { x: 1, v: 0 }\nspan: [0, 1]\n`);
    const p = await loadProblemFile(path);
    const dy = new Float64Array(2);
    p.f(0, Float64Array.of(1, 0), dy);
    // d39 = 40 * 250 x, by hand.
    expect(dy[1]).toBe(40 * 250);
    expect(p.jacobianSource).toBe('symbolic');
    const jac = new Float64Array(4);
    p.jacobian!(0, Float64Array.of(1, 0), jac);
    expect([...jac]).toEqual([0, 1, 40 * 250, 0]);
  }, 20_000);
});
