// Input signals of a linear model. Structured terms (constants, polynomials in t, exponentials,
// sinusoids with an exponential envelope) are each the output of a small linear system w' = G w,
// u = h . w, their own generator, so the model augmented with them is autonomous and linear and
// its exact solution is one matrix exponential. Expression terms of t have no generator.
import { constantValue, emitField } from '../equations/constants.js';
import { compileFunction } from '../expression/compile.js';
import { makeScope } from '../equations/names.js';
import type { Site } from '../file/fail.js';
import type { FieldPath } from '../file/read-structured.js';
import type { SignalSpec, SignalTerm } from '../file/schema.js';

/** w' = G w, u = h . w, w(t0) = w0; G is size x size row-major. */
export interface Generator {
  readonly size: number;
  readonly G: Float64Array;
  readonly h: readonly number[];
  readonly w0: readonly number[];
}

export interface Signal {
  readonly value: (t: number) => number;
  /** Absent when a term is an arbitrary expression of t. */
  readonly generator?: Generator;
  /** True for a constant signal (no dependence on t). */
  readonly constant: boolean;
}

interface Term {
  readonly value: (t: number) => number;
  readonly generator?: Generator;
  readonly constant: boolean;
}

function constantTerm(c: number): Term {
  return { value: () => c, constant: true, generator: { size: 1, G: new Float64Array(1), h: [1], w0: [c] } };
}

/** w = (p, p', ..., p^(d)) so w_k' = w_{k+1}; w0_k = p^(k)(t0). */
function polyTerm(c: readonly number[], t0: number): Term {
  const d = c.length - 1;
  const size = d + 1;
  const G = new Float64Array(size * size);
  for (let k = 0; k < d; k++) G[k * size + k + 1] = 1;
  const w0: number[] = [];
  let coeffs = [...c];
  for (let k = 0; k <= d; k++) {
    w0.push(horner(coeffs, t0));
    coeffs = coeffs.slice(1).map((a, j) => a * (j + 1));
  }
  const h = Array.from({ length: size }, (_, k) => (k === 0 ? 1 : 0));
  return { value: (t) => horner(c, t), constant: d === 0, generator: { size, G, h, w0 } };
}

function horner(c: readonly number[], t: number): number {
  let s = 0;
  for (let k = c.length - 1; k >= 0; k--) s = s * t + c[k]!;
  return s;
}

function expTerm(a: number, r: number, t0: number): Term {
  return { value: (t) => a * Math.exp(r * t), constant: r === 0, generator: { size: 1, G: Float64Array.of(r), h: [1], w0: [a * Math.exp(r * t0)] } };
}

/**
 * w = a e^{g t} (sin(om t + ph), cos(om t + ph)): w1' = g w1 + om w2, w2' = -om w1 + g w2.
 * The sine reads w1, the cosine w2.
 */
function waveTerm(kind: 'sin' | 'cos', a: number, om: number, ph: number, g: number, t0: number): Term {
  const G = Float64Array.of(g, om, -om, g);
  const env0 = g === 0 ? a : a * Math.exp(g * t0);
  const w0 = [env0 * Math.sin(om * t0 + ph), env0 * Math.cos(om * t0 + ph)];
  const h = kind === 'sin' ? [1, 0] : [0, 1];
  const trig = kind === 'sin' ? Math.sin : Math.cos;
  const value = g === 0 ? (t: number) => a * trig(om * t + ph) : (t: number) => a * Math.exp(g * t) * trig(om * t + ph);
  return { value, constant: false, generator: { size: 2, G, h, w0 } };
}

function readTerm(site: Site, path: FieldPath, term: SignalTerm, parameters: ReadonlyMap<string, number>, t0: number): Term {
  const num = (p: FieldPath, v: string | number | undefined, fallback: number): number => (v === undefined ? fallback : constantValue(site, p, v, parameters));
  if (typeof term === 'number') return constantTerm(num(path, term, 0));
  if (typeof term === 'string') {
    const { js } = emitField(site, path, term, makeScope({ time: true, parameters }));
    return { value: compileFunction<(t: number) => number>(['t'], `return ${js};`), constant: false };
  }
  if ('constant' in term) return constantTerm(num([...path, 'constant'], term.constant, 0));
  if ('poly' in term) return polyTerm(term.poly.map((c, k) => num([...path, 'poly', k], c, 0)), t0);
  if ('exp' in term) {
    const p = [...path, 'exp'];
    return expTerm(num([...p, 'amplitude'], term.exp.amplitude, 1), num([...p, 'rate'], term.exp.rate, 0), t0);
  }
  const kind = 'sin' in term ? 'sin' : 'cos';
  const w = 'sin' in term ? term.sin : term.cos;
  const p = [...path, kind];
  return waveTerm(kind, num([...p, 'amplitude'], w.amplitude, 1), num([...p, 'omega'], w.omega, 0), num([...p, 'phase'], w.phase, 0), num([...p, 'growth'], w.growth, 0), t0);
}

export function readSignal(site: Site, path: FieldPath, spec: SignalSpec, parameters: ReadonlyMap<string, number>, t0: number): Signal {
  const terms = Array.isArray(spec) ? spec.map((s, k) => readTerm(site, [...path, k], s, parameters, t0)) : [readTerm(site, path, spec, parameters, t0)];
  const constant = terms.every((t) => t.constant);
  if (terms.length === 1) return terms[0]!;
  const fns = terms.map((t) => t.value);
  const value = (t: number): number => {
    let s = 0;
    for (let k = 0; k < fns.length; k++) s += fns[k]!(t);
    return s;
  };
  if (!terms.every((t) => t.generator)) return { value, constant };
  return { value, constant, generator: blockGenerator(terms.map((t) => t.generator!)) };
}

/** Block-diagonal generator whose output is the sum of the blocks' outputs. */
export function blockGenerator(parts: readonly Generator[]): Generator {
  const size = parts.reduce((s, g) => s + g.size, 0);
  const G = new Float64Array(size * size);
  const h: number[] = [];
  const w0: number[] = [];
  let at = 0;
  for (const g of parts) {
    for (let i = 0; i < g.size; i++) for (let j = 0; j < g.size; j++) G[(at + i) * size + at + j] = g.G[i * g.size + j]!;
    h.push(...g.h);
    w0.push(...g.w0);
    at += g.size;
  }
  return { size, G, h, w0 };
}
