import { describe, expect, it } from 'vitest';
import { createGraphicalLassoState, graphicalLasso, graphicalLassoWarm } from '../../src/lib/stats/graphical-lasso';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { squareMatrixFromRows, type SquareMatrix } from '../../src/lib/stats/types';
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

describe('graphicalLasso screening and warm starts', () => {
  // Two blocks of the bfi correlations (items 0-4 and 10-14, agreeableness and extraversion in
  // psych::bfi), with every correlation across the blocks shrunk below the penalty: the
  // components of {|s_ij| > ρ} are the blocks of the solution (Witten, Friedman & Simon 2011).
  const reference = networkFixture.glasso.find((c) => c.name === 'bfi-correlation-rho-0.1')!;
  const chosen = [0, 1, 2, 3, 4, 10, 11, 12, 13, 14];
  const rho = 0.1;
  const rows = chosen.map((i, a) => chosen.map((j, b) => (a < 5) === (b < 5) ? reference.input[i][j] : 0.9 * rho * Math.sign(reference.input[i][j]) * Math.min(1, Math.abs(reference.input[i][j]) * 4)));
  const s = squareMatrixFromRows(rows);

  it('fits each component of |s_ij| > rho alone: zeros across blocks, each block as its own fit', () => {
    const whole = graphicalLasso(s, rho);
    expect(whole.converged).toBe(true);
    for (const [first, other] of [[0, 5], [5, 0]]) {
      const block = graphicalLasso(squareMatrixFromRows(rows.slice(first, first + 5).map((row) => row.slice(first, first + 5))), rho);
      for (let a = 0; a < 5; a++) {
        for (let b = 0; b < 5; b++) {
          expect(Math.abs(whole.precision.data[(first + a) * 10 + first + b] - block.precision.data[a * 5 + b])).toBeLessThan(1e-9);
          expect(whole.precision.data[(first + a) * 10 + other + b]).toBe(0);
          expect(whole.covariance.data[(first + a) * 10 + other + b]).toBe(0);
        }
      }
    }
    // Optimality across the blocks (Friedman, Hastie & Tibshirani 2008, eq. 2): |w_ij − s_ij| = |s_ij| ≤ ρ where θ_ij = 0.
    for (let i = 0; i < 5; i++) for (let j = 5; j < 10; j++) expect(Math.abs(rows[i][j])).toBeLessThanOrEqual(rho);
    // Identity: W Θ = I.
    for (let i = 0; i < 10; i++) {
      for (let j = 0; j < 10; j++) {
        let product = 0;
        for (let k = 0; k < 10; k++) product += whole.covariance.data[i * 10 + k] * whole.precision.data[k * 10 + j];
        expect(Math.abs(product - (i === j ? 1 : 0))).toBeLessThan(1e-8);
      }
    }
  });

  it('gives the cold-start answer from a warm state of a smaller or a larger penalty', () => {
    const input = squareMatrixFromRows(reference.input);
    for (const from of [0.02, 0.3]) {
      const state = createGraphicalLassoState(input, from, false);
      graphicalLassoWarm(input, from, state);
      const warm = graphicalLassoWarm(input, reference.rho, state);
      expect(warm.converged).toBe(true);
      // R 4.2.2 glasso 1.11: glasso::glasso(s, rho = 0.1, thr = 1e-12, maxit = 1e5)$wi
      expect(largestDifference(warm.precision, reference.tight.wi)).toBeLessThan(1e-9);
      expect(largestDifference(warm.covariance, reference.tight.w)).toBeLessThan(1e-9);
    }
  });
});

describe('graphicalLasso state and the kernel memory', () => {
  it('continues a warm state bit for bit when a larger fit grows the kernel memory in between', () => {
    const input = squareMatrixFromRows(networkFixture.glasso.find((c) => c.name === 'bfi-correlation-rho-0.1')!.input);
    const p = 150;
    const random = createSeededRandom(11);
    const loadings = Array.from({ length: p }, () => random.next());
    const large = new Float64Array(p * p);
    for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) large[a * p + b] = a === b ? 1 : 0.5 * loadings[a] * loadings[b];
    const fits = [false, true].map((interleave) => {
      const state = createGraphicalLassoState(input, 0.3, false);
      graphicalLassoWarm(input, 0.3, state);
      if (interleave) expect(graphicalLasso({ order: p, data: large }, 0.05).converged).toBe(true);
      const fit = graphicalLassoWarm(input, 0.1, state);
      // The state holds the fit's W (copied back from the kernel's memory).
      expect(Array.from(state.covariance)).toEqual(Array.from(fit.covariance.data));
      return fit;
    });
    for (const key of ['precision', 'covariance'] as const) {
      const [plain, interleaved] = fits.map((fit) => fit[key].data);
      for (let index = 0; index < plain.length; index++) expect(Object.is(plain[index], interleaved[index])).toBe(true);
    }
  });
});

describe('graphicalLasso on seeded random covariance matrices', () => {
  it('meets the optimality conditions from cold and warm starts, with and without a penalised diagonal', () => {
    // Identities (Friedman, Hastie & Tibshirani 2008, eq. 2): W Θ = I; w_ii = s_ii (+ ρ); w_ij − s_ij = ρ sign(θ_ij)
    // where θ_ij ≠ 0 and |w_ij − s_ij| ≤ ρ where θ_ij = 0. Factor-model data, 2 to 16 items.
    const random = createSeededRandom(20261203);
    for (let trial = 0; trial < 40; trial++) {
      const p = 2 + random.nextInt(15);
      const n = p + 2 + random.nextInt(40);
      const factors = 1 + random.nextInt(3);
      const loadings = Array.from({ length: p }, () => Array.from({ length: factors }, () => (random.next() - 0.3) * 1.5));
      const noise = Array.from({ length: p }, () => 0.2 + random.next());
      const rows = Array.from({ length: n }, () => {
        const f = Array.from({ length: factors }, () => random.nextNormal());
        return loadings.map((l, j) => l.reduce((sum, v, i) => sum + v * f[i], 0) + noise[j] * random.nextNormal());
      });
      const data = new Float64Array(p * p);
      for (let a = 0; a < p; a++) for (let b = a; b < p; b++) {
        let sum = 0;
        for (const row of rows) sum += row[a] * row[b];
        data[a * p + b] = sum / n;
        data[b * p + a] = sum / n;
      }
      const s: SquareMatrix = { order: p, data };
      const penalizeDiagonal = trial % 3 === 0;
      for (const share of [0.02, 0.1, 0.4]) {
        const rho = share * data[0];
        let fit = graphicalLasso(s, rho, { penalizeDiagonal });
        if (trial % 2 === 1) {
          const state = createGraphicalLassoState(s, rho * 5, penalizeDiagonal);
          graphicalLassoWarm(s, trial % 4 === 1 ? rho * 5 : rho / 5, state, { penalizeDiagonal });
          fit = graphicalLassoWarm(s, rho, state, { penalizeDiagonal });
        }
        expect(fit.converged).toBe(true);
        const w = fit.covariance.data;
        const theta = fit.precision.data;
        for (let i = 0; i < p; i++) {
          for (let j = 0; j < p; j++) {
            let product = 0;
            for (let k = 0; k < p; k++) product += w[i * p + k] * theta[k * p + j];
            expect(Math.abs(product - (i === j ? 1 : 0))).toBeLessThan(1e-7);
            const gap = w[i * p + j] - data[i * p + j];
            if (i === j) expect(Math.abs(gap - (penalizeDiagonal ? rho : 0))).toBeLessThan(1e-12);
            else if (theta[i * p + j] === 0) expect(Math.abs(gap)).toBeLessThanOrEqual(rho + 1e-8);
            else expect(Math.abs(gap - rho * Math.sign(theta[i * p + j]))).toBeLessThan(1e-7);
          }
        }
      }
    }
  });
});
