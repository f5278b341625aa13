import { describe, expect, it } from 'vitest';
import { graphicalLasso } from '../../src/lib/stats/graphical-lasso';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import { largestDifference, networkFixture } from './local-dependence-fixtures';

describe('graphicalLasso', () => {
  it.each(networkFixture.glasso.map((c) => [c.name, c] as const))('matches glasso::glasso on %s', (_name, reference) => {
    const input = squareMatrixFromRows(reference.input);
    const before = Float64Array.from(input.data);
    const fit = graphicalLasso(input, reference.rho, { penalizeDiagonal: reference.penalizeDiagonal });
    expect(fit.converged).toBe(true);
    expect(fit.notices).toEqual([]);
    // R 4.2.2 glasso 1.11: glasso::glasso(s, rho, penalize.diagonal, thr = 1e-12, maxit = 1e5)$w and $wi
    expect(largestDifference(fit.covariance, reference.tight.w)).toBeLessThan(1e-9);
    expect(largestDifference(fit.precision, reference.tight.wi)).toBeLessThan(1e-9);
    // R 4.2.2 glasso 1.11: glasso::glasso(s, rho, penalize.diagonal)$wi, glasso's default thr = 1e-4 (its stopping error)
    expect(largestDifference(fit.precision, reference.default.wi)).toBeLessThan(1e-4);
    // Same zero pattern as R's (exact zeros from the soft threshold).
    const p = input.order;
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) expect(fit.precision.data[i * p + j] === 0).toBe(reference.tight.wi[i][j] === 0);
    expect(input.data).toEqual(before);
  });

  it('meets the optimality conditions of the penalised likelihood (Friedman, Hastie & Tibshirani 2008, eq. 2)', () => {
    // Identity: W = Θ⁻¹; w_ii = s_ii; w_ij − s_ij = ρ sign(θ_ij) where θ_ij ≠ 0, |w_ij − s_ij| ≤ ρ where θ_ij = 0.
    const reference = networkFixture.glasso.find((c) => c.name === 'bfi-correlation-rho-0.1')!;
    const s = squareMatrixFromRows(reference.input);
    const rho = 0.1;
    const fit = graphicalLasso(s, rho);
    const p = s.order;
    const w = fit.covariance.data;
    const theta = fit.precision.data;
    for (let i = 0; i < p; i++) {
      for (let j = 0; j < p; j++) {
        let product = 0;
        for (let k = 0; k < p; k++) product += w[i * p + k] * theta[k * p + j];
        expect(Math.abs(product - (i === j ? 1 : 0))).toBeLessThan(1e-8);
        const gap = w[i * p + j] - s.data[i * p + j];
        if (i === j) expect(Math.abs(gap)).toBeLessThan(1e-12);
        else if (theta[i * p + j] === 0) expect(Math.abs(gap)).toBeLessThanOrEqual(rho + 1e-9);
      }
    }
    // Sign condition where θ_ij ≠ 0: W − S = ρ·sign(Θ) (the subgradient of ρ‖Θ‖₁ at Θ).
    for (let i = 0; i < p; i++) {
      for (let j = 0; j < p; j++) {
        if (i === j || theta[i * p + j] === 0) continue;
        expect(Math.abs(w[i * p + j] - s.data[i * p + j] - rho * Math.sign(theta[i * p + j]))).toBeLessThan(1e-8);
      }
    }
  });

  it('with no penalty returns the plain inverse, and with a penalty above every |s_ij| a diagonal Θ', () => {
    const s = squareMatrixFromRows([
      [1, 0.5, 0.3],
      [0.5, 1, 0.2],
      [0.3, 0.2, 1],
    ]);
    const plain = graphicalLasso(s, 0);
    // Identity: S Θ = I.
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        let sum = 0;
        for (let k = 0; k < 3; k++) sum += s.data[i * 3 + k] * plain.precision.data[k * 3 + j];
        expect(Math.abs(sum - (i === j ? 1 : 0))).toBeLessThan(1e-9);
      }
    }
    const empty = graphicalLasso(s, 0.5);
    expect(empty.edges).toBe(0);
    expect(Array.from(empty.precision.data)).toEqual([1, 0, 0, 0, 1, 0, 0, 0, 1]);
  });

  it('rejects bad input with a message that says what is wrong', () => {
    const s = squareMatrixFromRows([
      [1, 0.5],
      [0.5, 1],
    ]);
    expect(() => graphicalLasso(s, -0.1)).toThrow(/penalty must be a finite number >= 0/);
    expect(() => graphicalLasso(s, Number.NaN)).toThrow(/penalty/);
    expect(() => graphicalLasso(squareMatrixFromRows([[1, 0.5], [0.4, 1]]), 0.1)).toThrow(/not symmetric/);
    expect(() => graphicalLasso(squareMatrixFromRows([[0, 0], [0, 1]]), 0.1)).toThrow(/variance of item 0 is zero/);
    expect(() => graphicalLasso(s, 0.1, { maxSweeps: 0 })).toThrow(/maxSweeps/);
  });

  it('reports non-convergence as a result when the sweep limit is hit', () => {
    const reference = networkFixture.glasso[0];
    const fit = graphicalLasso(squareMatrixFromRows(reference.input), reference.rho, { maxSweeps: 1 });
    expect(fit.converged).toBe(false);
    expect(fit.notices.map((n) => n.code)).toEqual(['not-converged']);
  });
});
