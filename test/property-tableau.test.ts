// Property: any explicit Runge-Kutta tableau that satisfies the order conditions of order p
// integrates, with the fixed-step engine, problems whose exact solution is a polynomial of
// degree <= p exactly (to rounding), whatever the step count and span.
//
// Families (both from the order conditions, e.g. J. C. Butcher, Numerical Methods for Ordinary
// Differential Equations, 3rd ed. (2016), sec. 32, and Hairer, Norsett and Wanner, Solving ODEs I,
// sec. II.1):
//   2 stages, order 2 (one parameter alpha): c2 = a21 = alpha, b2 = 1/(2 alpha), b1 = 1 - b2.
//   3 stages, order 3 (c2, c3 free, c2 != c3, c2 != 0, c3 != 0, c2 != 2/3): the conditions
//     b.1 = 1, b.c = 1/2, b.c^2 = 1/3, b.A.c = 1/6 solve to (solved here by hand)
//     b2 = (c3/2 - 1/3) / (c2 (c3 - c2)),  b3 = (1/3 - c2/2) / (c3 (c3 - c2)),  b1 = 1 - b2 - b3,
//     a32 = 1 / (6 b3 c2),  a31 = c3 - a32,  a21 = c2.
// Why the test problems are integrated exactly: for y' = A y + g(t) with A nilpotent and g a
// polynomial, every term of the local error beyond order p is a product A^j g^(m) (or A^j y) of
// total order j + m + 1 > p; these vanish when the exact solution has degree <= p.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fixedStepMethod, type TableauData } from '../src/methods/explicit/index.js';
import { defineProblem } from '../src/authoring/define-problem.js';
import type { Method, Rhs } from '../src/core/types.js';

function rk2(alpha: number): TableauData {
  const b2 = 1 / (2 * alpha);
  return { a: [[], [alpha]], b: [1 - b2, b2], c: [0, alpha], order: 2 };
}

function rk3(c2: number, c3: number): TableauData {
  const b2 = (c3 / 2 - 1 / 3) / (c2 * (c3 - c2));
  const b3 = (1 / 3 - c2 / 2) / (c3 * (c3 - c2));
  const a32 = 1 / (6 * b3 * c2);
  return { a: [[], [c2], [c3 - a32, a32]], b: [1 - b2 - b3, b2, b3], c: [0, c2, c3], order: 3 };
}

function methodOf(data: TableauData): Method {
  return fixedStepMethod({ id: 'random-tableau', name: 'Random tableau', source: 'order conditions, see the header' }, data);
}

/** The order conditions up to order 3, as residuals (checks the generators themselves). */
function orderResiduals(d: TableauData): number[] {
  const s = d.b.length;
  const A = (i: number, j: number) => (j < i ? (d.a[i]![j] ?? 0) : 0);
  const sum = (g: (i: number) => number) => Array.from({ length: s }, (_, i) => g(i)).reduce((x, y) => x + y, 0);
  const Ac = (i: number) => sum((j) => A(i, j) * d.c[j]!);
  const rowSums = Array.from({ length: s }, (_, i) => sum((j) => A(i, j)) - d.c[i]!);
  const r = [sum((i) => d.b[i]!) - 1, sum((i) => d.b[i]! * d.c[i]!) - 1 / 2, ...rowSums];
  if (d.order >= 3) r.push(sum((i) => d.b[i]! * d.c[i]! ** 2) - 1 / 3, sum((i) => d.b[i]! * Ac(i)) - 1 / 6);
  return r;
}

/** Polynomials as coefficient lists (c[k] multiplies t^k). */
const evalPoly = (c: readonly number[], t: number) => c.reduceRight((s, ck) => s * t + ck, 0);
/** Antiderivative vanishing at t0, plus the constant y0. */
function integrate(c: readonly number[], t0: number, y0: number): number[] {
  const out = [0, ...c.map((ck, k) => ck / (k + 1))];
  out[0] = y0 - evalPoly(out, t0);
  return out;
}

/**
 * Chain z1' = g(t), z_j' = z_{j-1} (j = 2..m): linear, nilpotent, driven by the polynomial g.
 * Returns the problem and the exact final state; every z_j is a polynomial of degree deg(g) + j.
 */
function chainProblem(g: readonly number[], z0: readonly number[], t0: number, tEnd: number) {
  const m = z0.length;
  const f: Rhs = (t, y, dy) => {
    dy[0] = evalPoly(g, t);
    for (let j = 1; j < m; j++) dy[j] = y[j - 1]!;
  };
  const polys: number[][] = [];
  let prev = g;
  for (let j = 0; j < m; j++) {
    prev = integrate(prev, t0, z0[j]!);
    polys.push(prev);
  }
  const problem = defineProblem({ id: 'poly-chain', title: 'Polynomial chain', source: 'hand-built test problem', y0: z0, span: [t0, tEnd], f });
  const exact = polys.map((p) => evalPoly(p, tEnd));
  // Rounding scale: the largest term of any exact polynomial at the ends of the span.
  const scale = Math.max(1, ...polys.flatMap((p) => p.map((ck, k) => Math.abs(ck) * Math.max(Math.abs(t0), Math.abs(tEnd)) ** k)));
  return { problem, exact, scale };
}

const coefficient = fc.double({ min: -3, max: 3, noNaN: true });
const spanArb = fc.tuple(fc.double({ min: -2, max: 2, noNaN: true }), fc.double({ min: 0.1, max: 3, noNaN: true }));
const stepsArb = fc.integer({ min: 1, max: 40 });
const alphaArb = fc.double({ min: 0.05, max: 1.5, noNaN: true });
// c2, c3 kept apart from each other, from 0 and from 2/3, so the family's formulas are well conditioned.
const c23Arb = fc
  .tuple(fc.double({ min: 0.1, max: 1.2, noNaN: true }), fc.double({ min: 0.1, max: 1.2, noNaN: true }))
  .filter(([c2, c3]) => Math.abs(c3 - c2) > 0.1 && Math.abs(c2 - 2 / 3) > 0.1);

function solveFinal(m: Method, problem: ReturnType<typeof chainProblem>['problem'], steps: number): Float64Array {
  const r = m.solve(problem, { steps }, { maxSteps: 1e6 });
  expect(r.status).toBe('ok');
  expect(r.counts.accepted).toBe(steps);
  expect(r.counts.nfev).toBe(steps * m.order); // s = p stages for both families, one evaluation each
  return r.yFinal;
}

const TOL = 1e-12; // relative to the rounding scale: ~40 steps x a few ulp of the largest term

describe('random 2-stage order-2 tableaux (one-parameter family)', () => {
  it('satisfy the order conditions to rounding', () => {
    fc.assert(fc.property(alphaArb, (alpha) => orderResiduals(rk2(alpha)).every((r) => Math.abs(r) < 1e-15 / alpha)));
  });
  it("y' = linear polynomial in t (quadrature, degree p - 1) is integrated exactly", () => {
    fc.assert(
      fc.property(alphaArb, fc.tuple(coefficient, coefficient), coefficient, spanArb, stepsArb, (alpha, g, y0, [t0, len], steps) => {
        const { problem, exact, scale } = chainProblem(g, [y0], t0, t0 + len);
        const y = solveFinal(methodOf(rk2(alpha)), problem, steps);
        expect(Math.abs(y[0]! - exact[0]!)).toBeLessThanOrEqual(TOL * scale);
      }),
      { numRuns: 150 },
    );
  });
  it("the chain z1' = c, z2' = z1 (degree 2) is integrated exactly; one degree more is not", () => {
    fc.assert(
      fc.property(alphaArb, coefficient, fc.tuple(coefficient, coefficient), spanArb, stepsArb, (alpha, c, z0, [t0, len], steps) => {
        const m = methodOf(rk2(alpha));
        const { problem, exact, scale } = chainProblem([c], z0, t0, t0 + len);
        const y = solveFinal(m, problem, steps);
        for (let j = 0; j < 2; j++) expect(Math.abs(y[j]! - exact[j]!)).toBeLessThanOrEqual(TOL * scale);
      }),
      { numRuns: 150 },
    );
    // Control: z1' = t, z2' = z1 makes z2 = t^3/6 (degree 3), beyond order 2. By hand for
    // alpha = 1/2 (the midpoint rule), one step from 0 on [0, 1]: k1 = (0, 0), the stage at
    // t = 1/2 sees z = (0, 0), k2 = (1/2, 0), so z = (1/2, 0) against the exact (1/2, 1/6).
    const { problem, exact } = chainProblem([0, 1], [0, 0], 0, 1);
    const y = solveFinal(methodOf(rk2(0.5)), problem, 1);
    expect(y[0]).toBe(0.5);
    expect(exact[1]).toBeCloseTo(1 / 6, 15);
    expect(y[1]).toBe(0);
  });
});

describe('random 3-stage order-3 tableaux (two-parameter family)', () => {
  it('satisfy the order conditions to rounding', () => {
    fc.assert(fc.property(c23Arb, ([c2, c3]) => orderResiduals(rk3(c2, c3)).every((r) => Math.abs(r) < 1e-13)));
  });
  it("y' = quadratic in t (quadrature, degree p - 1) is integrated exactly", () => {
    fc.assert(
      fc.property(c23Arb, fc.tuple(coefficient, coefficient, coefficient), coefficient, spanArb, stepsArb, ([c2, c3], g, y0, [t0, len], steps) => {
        const { problem, exact, scale } = chainProblem(g, [y0], t0, t0 + len);
        const y = solveFinal(methodOf(rk3(c2, c3)), problem, steps);
        expect(Math.abs(y[0]! - exact[0]!)).toBeLessThanOrEqual(TOL * scale);
      }),
      { numRuns: 150 },
    );
  });
  it("t^k-driven chains with degree k + m <= 3 (z1' = a t^k, z_j' = z_{j-1}) are integrated exactly", () => {
    const shape = fc.constantFrom([0, 3], [1, 2], [2, 1], [0, 2], [1, 1]); // [k, chain length m]
    fc.assert(
      fc.property(c23Arb, shape, coefficient, fc.array(coefficient, { minLength: 3, maxLength: 3 }), spanArb, stepsArb, ([c2, c3], [k, m], a, z0, [t0, len], steps) => {
        const g = Array.from({ length: k! + 1 }, (_, i) => (i === k ? a : 0));
        const { problem, exact, scale } = chainProblem(g, z0.slice(0, m), t0, t0 + len);
        const y = solveFinal(methodOf(rk3(c2, c3)), problem, steps);
        for (let j = 0; j < m!; j++) expect(Math.abs(y[j]! - exact[j]!)).toBeLessThanOrEqual(TOL * scale);
      }),
      { numRuns: 200 },
    );
  });
  it('a degree-4 solution is beyond order 3: the error does not vanish', () => {
    // z1' = 1, z2' = z1, z3' = z2, z4' = z3 from 0 on [0, 1] in one step: z4 = 1/24 exactly
    // (hand-solved), while a 3-stage method's stability polynomial stops at z^3/6, so z4 = 0.
    fc.assert(
      fc.property(c23Arb, ([c2, c3]) => {
        const { problem, exact } = chainProblem([1], [0, 0, 0, 0], 0, 1);
        const y = solveFinal(methodOf(rk3(c2, c3)), problem, 1);
        expect(exact[3]).toBeCloseTo(1 / 24, 15);
        expect(Math.abs(y[3]! - 1 / 24)).toBeGreaterThan(0.04);
      }),
      { numRuns: 30 },
    );
  });
});
