// heat-2d (problems/heat-2d.ts): the discrete sine modes are eigenvectors of the 5-point
// Laplacian with eigenvalues -(4/h^2)(sin^2(p pi h/2) + sin^2(q pi h/2)) (LeVeque, Finite
// Difference Methods for ODEs and PDEs, 2007, sec. 3.4, from memory; checked here on the grid
// through the problem's own right-hand side), and the sparse solve of the 400-state catalogue problem
// against the exact formula.
import { describe, expect, it } from 'vitest';
import { SparseJacobian, jacobianStructure } from '../src/core/jacobian-structure.js';
import { findMethod } from '../src/methods/registry.js';
import { findProblem } from '../problems/index.js';
import { heatEigenvalue, heatMode, heatRhs } from '../problems/heat-2d.js';

const p = findProblem('heat-2d')!;

describe('heat-2d', () => {
  it.each([
    [1, 1],
    [2, 3],
    [7, 29],
    [30, 30],
  ])('f(v_%i%i) = kappa lambda v to rounding on the 30 x 30 grid', (pp, q) => {
    const m = 30;
    const v = heatMode(m, pp, q);
    const dy = new Float64Array(m * m);
    heatRhs(m)(0, v, dy);
    const rate = heatEigenvalue(m, pp, q) / 50; // kappa = 1/50
    // Rounding: 5 terms of size kappa (m+1)^2 = 19.2 each, a few eps apiece (common practice, no source).
    for (let k = 0; k < m * m; k++) expect(Math.abs(dy[k]! - rate * v[k]!)).toBeLessThan(1e-12);
  });

  it('the largest eigenvalue is -8 kappa/h^2 in the limit: lambda_30,30 within 0.3% of it, lambda_11 near -2 pi^2', () => {
    // Continuous Laplacian on the unit square: lowest eigenvalue -2 pi^2 (separation of variables).
    expect(Math.abs(heatEigenvalue(30, 1, 1) + 2 * Math.PI ** 2)).toBeLessThan(0.02);
    expect(Math.abs(heatEigenvalue(30, 30, 30) / (8 * 31 * 31) + 1)).toBeLessThan(3e-3);
  });

  it('solves with the sparse structure; hairer-wanner-rodas4 at 1e-8 ends within 1e-8 of the exact state', () => {
    expect(jacobianStructure(p, p.dimension)).toBeInstanceOf(SparseJacobian);
    const r = findMethod('hairer-wanner-rodas4')!.solve(p, { rtol: 1e-8, atol: 1e-8 }, { maxSteps: 100_000, checkTimes: [] });
    expect(r.status).toBe('ok');
    const exact = new Float64Array(p.dimension);
    p.reference.exact!(p.tEnd, exact);
    let worst = 0;
    for (let i = 0; i < p.dimension; i++) worst = Math.max(worst, Math.abs(r.yFinal[i]! - exact[i]!));
    expect(worst).toBeLessThan(1e-8);
    expect(worst).toBeGreaterThan(1e-12); // a real integration error, above the reference's resolution (16 eps)
  });
});
