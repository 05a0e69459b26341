// Order conditions of the Runge-Kutta-Nystrom pairs for q'' = g(t, q), from HNW I, sec. II.14
// (Hairer, Norsett, Wanner, Solving ODEs I, 2nd ed.): the special Nystrom trees have a fat root;
// a fat vertex's sons are meagre; a meagre vertex is a leaf (the velocity) or has one fat son.
// With rho(t) the number of vertices and gamma(t) = rho(t) times the product of its sons' gamma
// (the density of the tree seen as a tree of the first-order system q' = v, v' = g), a pair is of
// order p when sum_i b'_i Phi_i(t) = 1/gamma(t) for rho(t) <= p and
// sum_i b_i Phi_i(t) = 1/((rho(t) + 1) gamma(t)) for rho(t) <= p - 1, where Phi_i multiplies, over
// the root's meagre sons, c_i for a leaf and sum_j a_ij Phi_j(u) for a son with fat son u.
// (The conditions as derived here from that book's tree rules; the counts of fat trees per order,
// 1, 1, 2, 3, 6, 10, 20, 36, 72, ..., are checked below as a sanity check of the generator, from
// the same derivation.)
import { describe, expect, it } from 'vitest';
import { DORMAND_EL_MIKKAWY_PRINCE_1210, DORMAND_EL_MIKKAWY_PRINCE_86, type NystromPair } from '../src/methods/explicit/nystrom/index.js';

interface Fat {
  readonly sons: readonly Meagre[];
  readonly key: string;
}
interface Meagre {
  readonly son: Fat | null;
  readonly key: string;
}

const rho = (t: Fat): number => 1 + t.sons.reduce((s, m) => s + (m.son ? 1 + rho(m.son) : 1), 0);
const gamma = (t: Fat): number => t.sons.reduce((g, m) => g * (m.son ? (1 + rho(m.son)) * gamma(m.son) : 1), rho(t));

const fatByOrder = new Map<number, Fat[]>();
const meagreByOrder = new Map<number, Meagre[]>();

function meagreTrees(order: number): Meagre[] {
  const known = meagreByOrder.get(order);
  if (known) return known;
  const out = order === 1 ? [{ son: null, key: 'm' }] : fatTrees(order - 1).map((f) => ({ son: f, key: `m(${f.key})` }));
  meagreByOrder.set(order, out);
  return out;
}

/** Multisets of meagre trees with `total` vertices in all, each of at most `max` vertices. */
function meagreMultisets(total: number, max: number): Meagre[][] {
  if (total === 0) return [[]];
  const out: Meagre[][] = [];
  for (let o = Math.min(total, max); o >= 1; o--) {
    const trees = meagreTrees(o);
    trees.forEach((m, idx) => {
      for (const rest of meagreMultisets(total - o, o)) {
        // Keep sons in a canonical order (by order, then index) so each multiset appears once.
        const first = rest[0];
        if (first && rho1(first) === o && trees.indexOf(first) < idx) continue;
        out.push([m, ...rest]);
      }
    });
  }
  return out;
}
const rho1 = (m: Meagre): number => (m.son ? 1 + rho(m.son) : 1);

function fatTrees(order: number): Fat[] {
  const known = fatByOrder.get(order);
  if (known) return known;
  const out = meagreMultisets(order - 1, order - 1).map((sons) => ({ sons, key: `f[${sons.map((s) => s.key).join(',')}]` }));
  fatByOrder.set(order, out);
  return out;
}

/** Phi_i(t) for every stage i, memoised per tree. */
function weights(pair: NystromPair) {
  const s = pair.c.length;
  const memo = new Map<string, Float64Array>();
  const aTimes = new Map<string, Float64Array>();
  const phi = (t: Fat): Float64Array => {
    const hit = memo.get(t.key);
    if (hit) return hit;
    const out = new Float64Array(s).fill(1);
    for (const m of t.sons) {
      const factor = m.son ? abar(m.son) : Float64Array.from(pair.c);
      for (let i = 0; i < s; i++) out[i]! *= factor[i]!;
    }
    memo.set(t.key, out);
    return out;
  };
  const abar = (u: Fat): Float64Array => {
    const hit = aTimes.get(u.key);
    if (hit) return hit;
    const pu = phi(u);
    const out = new Float64Array(s);
    for (let i = 0; i < s; i++) {
      const row = pair.a[i]!;
      let sum = 0;
      for (let j = 0; j < row.length; j++) sum += row[j]! * pu[j]!;
      out[i] = sum;
    }
    aTimes.set(u.key, out);
    return out;
  };
  return phi;
}

/** Largest |sum w_i Phi_i(t) * gamma' - 1| over the conditions of each order: the relative residual. */
function residuals(pair: NystromPair, bq: readonly number[], bv: readonly number[], upTo: number): { velocity: number[]; position: number[] } {
  const phi = weights(pair);
  const velocity: number[] = [];
  const position: number[] = [];
  for (let o = 1; o <= upTo; o++) {
    let rv = 0;
    let rq = 0;
    for (const t of fatTrees(o)) {
      const w = phi(t);
      const g = gamma(t);
      let sv = 0;
      let sq = 0;
      for (let i = 0; i < w.length; i++) {
        sv += bv[i]! * w[i]!;
        sq += bq[i]! * w[i]!;
      }
      rv = Math.max(rv, Math.abs(sv * g - 1));
      rq = Math.max(rq, Math.abs(sq * (o + 1) * g - 1));
    }
    velocity.push(rv);
    position.push(rq);
  }
  return { velocity, position };
}

describe('special Nystrom trees', () => {
  it('the generator gives each tree once (counts per order from the derivation above)', () => {
    // 1..10: the counts a separate enumeration (canonical forms in a set, in Python) gave while this
    // test was written; common practice, no source.
    expect([1, 2, 3, 4, 5, 6, 7, 8, 9, 10].map((o) => fatTrees(o).length)).toEqual([1, 1, 2, 3, 6, 10, 20, 36, 72, 137]);
    expect(fatTrees(5).every((t) => rho(t) === 5)).toBe(true);
    expect(new Set(fatTrees(8).map((t) => t.key)).size).toBe(36);
  });
});

describe.each([
  [DORMAND_EL_MIKKAWY_PRINCE_86, 1e-13],
  [DORMAND_EL_MIKKAWY_PRINCE_1210, 1e-11],
] as const)('$id', (pair, tol) => {
  const p = pair.order;
  const q = pair.embeddedOrder;
  const main = residuals(pair, pair.bPosition, pair.bVelocity, p + 1);
  const embedded = residuals(pair, pair.bPositionHat, pair.bVelocityHat, q + 1);

  it(`meets the order-${p} conditions (velocity to ${p}, position to ${p - 1}) to rounding`, () => {
    for (let o = 1; o <= p; o++) expect(main.velocity[o - 1]!).toBeLessThan(tol);
    for (let o = 1; o <= p - 1; o++) expect(main.position[o - 1]!).toBeLessThan(tol);
  });

  it(`is not of order ${p + 1}`, () => {
    expect(Math.max(main.velocity[p]!, main.position[p - 1]!)).toBeGreaterThan(1e-6);
  });

  it(`embedded solution: order ${q}, not ${q + 1}`, () => {
    for (let o = 1; o <= q; o++) expect(embedded.velocity[o - 1]!).toBeLessThan(tol);
    for (let o = 1; o <= q - 1; o++) expect(embedded.position[o - 1]!).toBeLessThan(tol);
    expect(Math.max(embedded.velocity[q]!, embedded.position[q - 1]!)).toBeGreaterThan(1e-6);
  });

  it('rows sum to c^2/2 (Q_i exact for constant g)', () => {
    pair.a.forEach((row, i) => {
      const sum = row.reduce((s, v) => s + v, 0);
      expect(Math.abs(sum - pair.c[i]! ** 2 / 2)).toBeLessThan(1e-14);
    });
  });
});
