// The step of a Runge-Kutta-Nystrom pair as generated straight-line code, in the StageKernel shape
// of the embedded engine, so the pairs share its controller, landing and budget. The problem's f
// is called on full states: stage states carry the step's starting velocities (g must not depend
// on them) and only the velocity rows of f's output, the accelerations, are read back. Every
// stage keeps f's whole output in its row of K, so the engine's FSAL copy works unchanged.
// Up to NYSTROM_UNROLL_MAX_N states the component loop is written out with the state's index
// pairs as literals and every entry read once into a local; above it the kernel loops over the
// pairs. Both spell the same expressions, so they give the same bits (tested).
import { InputError } from '../../../core/errors.js';
import { numberLiteral } from '../../source-literal.js';
import { piecesSource } from '../kernels/unrolled.js';
import { IO_ERR, IO_H, IO_NONFINITE, IO_RTOL, IO_T, IO_T_NEW, type StageKernel } from '../tableau.js';
import { nystromFsal, type NystromPair } from './pair.js';

/** Largest state size whose pair loop is written out. */
export const NYSTROM_UNROLL_MAX_N = 16;

const lit = (v: number): string => numberLiteral(v, 'Nystrom coefficient');

/** How one position/velocity pair's entries are spelled in the generated text. */
interface PairNames {
  readonly p: string;
  readonly v: string;
  readonly q: string;
  readonly vel: string;
  readonly qn: string;
  readonly vn: string;
  g(i: number): string;
  /** A statement declaring stage i's acceleration after its call (written-out form only). */
  read(i: number): string | null;
}

function writtenNames(k: number, p: number, v: number, n: number): PairNames {
  return {
    p: String(p), v: String(v), q: `q_${k}`, vel: `v_${k}`, qn: `qn_${k}`, vn: `vn_${k}`,
    g: (i) => `g${i}_${k}`,
    read: (i) => `const g${i}_${k} = K[${i * n + v}];`,
  };
}

const loopNames: PairNames = {
  p: 'pk', v: 'vk', q: 'y[pk]', vel: 'y[vk]', qn: 'yNew[pk]', vn: 'yNew[vk]',
  g: (i) => (i === 0 ? 'K[vk]' : `K[o${i} + vk]`),
  read: () => null,
};

/** sum_j w_j g_j over the nonzero weights, or null when all are zero. */
function combination(w: readonly number[], x: PairNames): string | null {
  const terms: string[] = [];
  w.forEach((v, j) => {
    if (v !== 0) terms.push(`${lit(v)} * ${x.g(j)}`);
  });
  return terms.length > 0 ? terms.join(' + ') : null;
}

// Each stage waits for the one before, and that chain is what a step costs: q + c h v + h^2
// (older terms) is formed first, so only one product (h^2 a_i,i-1 as one factor) and one
// addition lie between the newest stage and the next call (bench/README, fifth pass).
function stagePosition(p: NystromPair, i: number, x: PairNames): string {
  const row = p.a[i]!;
  const newest = row.length === i ? row[i - 1]! : 0;
  const sum = combination(newest === 0 ? row : row.slice(0, i - 1), x);
  const drift = `${x.q} + ${lit(p.c[i]!)} * h * ${x.vel}${sum === null ? '' : ` + hh * (${sum})`}`;
  return `ys[${x.p}] = ${newest === 0 ? drift : `${drift} + hh * ${lit(newest)} * ${x.g(i - 1)}`};`;
}

function newState(p: NystromPair, x: PairNames, written: boolean): string[] {
  const bq = combination(p.bPosition, x);
  const bv = combination(p.bVelocity, x);
  const qn = `${x.q} + h * ${x.vel}${bq === null ? '' : ` + hh * (${bq})`}`;
  const vn = bv === null ? x.vel : `${x.vel} + h * (${bv})`;
  if (!written) return [`${x.qn} = ${qn};`, `${x.vn} = ${vn};`];
  return [`const ${x.qn} = ${qn}; yNew[${x.p}] = ${x.qn};`, `const ${x.vn} = ${vn}; yNew[${x.v}] = ${x.vn};`];
}

function errorTerms(p: NystromPair, x: PairNames, fsalStage: number | null): string[] {
  const diff = (b: readonly number[], hat: readonly number[]) => b.map((v, j) => v - hat[j]!);
  const eq = combination(diff(p.bPosition, p.bPositionHat), x);
  const ev = combination(diff(p.bVelocity, p.bVelocityHat), x);
  const scale = (idx: string, a: string, b: string) =>
    `const ya = Math.abs(${a}); const yb = Math.abs(${b}); const sk = atol[${idx}] + rtol * (ya > yb ? ya : yb);`;
  // v - v is 0 for finite v and NaN otherwise: the finiteness check rides along with the norm.
  const position = eq === null ? '' : `${scale(x.p, x.q, x.qn)} const r = (hh * (${eq})) / sk; sum += r * r;`;
  const velocity = ev === null ? '' : `${scale(x.v, x.vel, x.vn)} const r = (h * (${ev})) / sk; sum += r * r;`;
  const lastBad = fsalStage === null ? '' : ` bad += ${x.g(fsalStage)} - ${x.g(fsalStage)};`;
  return [`{ ${position} bad += ${x.qn} - ${x.qn}; }`, `{ ${velocity} bad += ${x.vn} - ${x.vn};${lastBad} }`];
}

/**
 * The generated source. With `layout` (positions and velocities of a state of at most
 * NYSTROM_UNROLL_MAX_N entries) the pairs are written out; without it the kernel loops over the
 * index arrays P and V it is built with.
 */
export function nystromSource(p: NystromPair, layout?: { positions: readonly number[]; velocities: readonly number[] }): string {
  const s = p.c.length;
  const fsal = nystromFsal(p);
  const last = s - 1;
  const lastFromA = fsal ? last - 1 : last;
  const written = layout !== undefined;
  const n = written ? layout.positions.length + layout.velocities.length : 0;
  if (written && n > NYSTROM_UNROLL_MAX_N) throw new InputError(`${p.id}: written-out Nystrom kernels exist up to ${NYSTROM_UNROLL_MAX_N} states, got ${n}`);
  const each = (line: (x: PairNames) => string[]): string[] => {
    if (!written) return [`for (let k = 0; k < m; k++) { const pk = P[k]; const vk = V[k]; ${line(loopNames).join(' ')} }`];
    return layout.positions.flatMap((pos, k) => line(writtenNames(k, pos, layout.velocities[k]!, n)));
  };
  const head = [`const t = io[${IO_T}]; const tNew = io[${IO_T_NEW}]; const h = io[${IO_H}]; const hh = h * h; const rtol = io[${IO_RTOL}];`];
  if (!written) {
    head.push('const m = P.length;');
    for (let i = 1; i < s; i++) head.push(`const o${i} = ${i} * n;`);
  }
  const stageTime = (c: number) => (c === 1 ? 'tNew' : c === 0 ? 't' : `t + ${lit(c)} * h`);
  const segments: string[][] = [];
  for (let i = 1; i <= lastFromA; i++) {
    const seg = i === 1 ? each((x) => [`ys[${x.v}] = ${x.vel};`]) : [];
    seg.push(...each((x) => [stagePosition(p, i, x)]));
    seg.push(`f(${stageTime(p.c[i]!)}, ys, kRow[${i}]);`);
    seg.push(...each((x) => (x.read(i) === null ? [] : [x.read(i)!])));
    segments.push(seg);
  }
  const end = each((x) => newState(p, x, written));
  if (fsal) {
    end.push(`f(tNew, yNew, kRow[${last}]);`);
    end.push(...each((x) => (x.read(last) === null ? [] : [x.read(last)!])));
  }
  end.push('let sum = 0; let bad = 0;');
  end.push(...each((x) => errorTerms(p, x, fsal ? last : null)));
  end.push(`io[${IO_NONFINITE}] = bad;`, `io[${IO_ERR}] = Math.sqrt(sum / n);`);
  segments.push(end);
  const name = `nystrom_${p.id.replace(/[^A-Za-z0-9_]/g, '_')}${written ? `_n${n}` : ''}`;
  return piecesSource(name, 'f, io, y, yNew, ys, K, kRow, atol, n', head, segments, written ? (body) => localsOf(body, layout, n) : undefined);
}

/**
 * The reads a written-out piece needs at its top: the step's start (q, v), and accelerations
 * and new states filled in an earlier piece; each entry is read from its buffer once.
 */
function localsOf(body: readonly string[], layout: { positions: readonly number[]; velocities: readonly number[] }, n: number): string[] {
  const text = body.join('\n');
  const declared = new Set([...text.matchAll(/const ((?:g\d+|q|v|qn|vn)_\d+) = /g)].map((m) => m[1]!));
  const used = new Set([...text.matchAll(/\b((?:g\d+|q|v|qn|vn)_\d+)\b/g)].map((m) => m[1]!));
  const top: string[] = [];
  for (const name of [...used].sort()) {
    if (declared.has(name)) continue;
    const m = /^(g(\d+)|q|v|qn|vn)_(\d+)$/.exec(name)!;
    const k = Number(m[3]);
    const pos = layout.positions[k]!;
    const vel = layout.velocities[k]!;
    const from = m[2] !== undefined ? `K[${Number(m[2]) * n + vel}]` : m[1] === 'q' ? `y[${pos}]` : m[1] === 'v' ? `y[${vel}]` : m[1] === 'qn' ? `yNew[${pos}]` : `yNew[${vel}]`;
    top.push(`const ${name} = ${from};`);
  }
  return [...top, ...body];
}

/** Kernels of one pair, built on first use per index layout and reused after. */
export function nystromKernels(p: NystromPair): (positions: Int32Array, velocities: Int32Array) => StageKernel {
  const built = new Map<string, StageKernel>();
  return (positions, velocities) => {
    const n = positions.length + velocities.length;
    const key = `${positions.join(',')}|${velocities.join(',')}`;
    let kernel = built.get(key);
    if (!kernel) {
      // The source holds only the pair's finite numeric literals and integer indices, never input text.
      const layout = { positions: Array.from(positions), velocities: Array.from(velocities) };
      const source = n <= NYSTROM_UNROLL_MAX_N ? nystromSource(p, layout) : nystromSource(p);
      kernel = new Function('P', 'V', source)(positions.slice(), velocities.slice()) as StageKernel;
      built.set(key, kernel);
    }
    return kernel;
  };
}
