import { describe, expect, it } from 'vitest';
import { conditionNumber } from '../../src/lib/stats/condition-number';
import { kaiserMeyerOlkin } from '../../src/lib/stats/kmo';
import { minimumTraceCommunalities, smoothCorrelationMatrix } from '../../src/lib/stats/smooth-correlation-matrix';
import { symmetricEigenvalues } from '../../src/lib/stats/symmetric-eigen';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import { varianceInflation } from '../../src/lib/stats/variance-inflation';
import { largestDifference, smoothFixture } from './local-dependence-fixtures';

function largestVif(matrix: ReturnType<typeof squareMatrixFromRows>): number {
  return Math.max(...varianceInflation(matrix).items.map((item) => item.vif ?? Number.POSITIVE_INFINITY));
}

describe('minimumTraceCommunalities', () => {
  it.each(smoothFixture.cases.map((c) => [c.name, c] as const))('matches the MTFA communalities of a general SDP solver (CSDP) on %s', (_name, reference) => {
    const result = minimumTraceCommunalities(squareMatrixFromRows(reference.correlation));
    expect(result.converged).toBe(true);
    // R 4.2.2 Rcsdp 0.1.57.4: mtfa(R) in scripts/reference/smooth-correlation.R. The minimum trace agrees to 1e-7;
    // single communalities only to about 1e-5, because at the optimum R − I + diag(h) has several
    // eigenvalues at zero (the optimum is flat along some directions) and csdp's answer is itself
    // infeasible by about 1e-8 (its smallest eigenvalue there is −9e-9; ours is ≥ 0).
    const rTrace = reference.mtfa.communalities.reduce((sum, h) => sum + h, 0);
    expect(Math.abs(result.trace - rTrace)).toBeLessThan(1e-6);
    reference.mtfa.communalities.forEach((h, i) => expect(Math.abs(result.communalities[i] - h)).toBeLessThan(2e-5));
  });

  it('leaves R − I + diag(h) positive semidefinite with a zero eigenvalue (the trace cannot be lowered)', () => {
    const reference = smoothFixture.cases[0];
    const r = squareMatrixFromRows(reference.correlation);
    const { communalities } = minimumTraceCommunalities(r);
    const p = r.order;
    const m = Float64Array.from(r.data);
    for (let i = 0; i < p; i++) m[i * p + i] = communalities[i];
    const values = symmetricEigenvalues({ order: p, data: m });
    expect(values[p - 1]).toBeGreaterThan(-1e-9);
    expect(values[p - 1]).toBeLessThan(1e-6);
  });
});

describe('smoothCorrelationMatrix', () => {
  it.each(smoothFixture.cases.map((c) => [c.name, c] as const))("matches Bentler & Yuan's scaling computed in R on %s", (_name, reference) => {
    const input = squareMatrixFromRows(reference.correlation);
    const before = Float64Array.from(input.data);
    const result = smoothCorrelationMatrix(input);
    expect(result.smoothed).toBe(true);
    expect(result.method).toBe('bentler-yuan');
    // R 4.2.2 Rcsdp 0.1.57.4: bentlerYuan(R, mtfa(R), k = 0.98) in scripts/reference/smooth-correlation.R
    // (to 5e-6: the scaling inherits the communalities' 1e-5 agreement above)
    expect(largestDifference(result.matrix, reference.bentlerYuan.matrix)).toBeLessThan(5e-6);
    expect(result.scaledItems).toEqual(reference.mtfa.communalities.flatMap((h, i) => (h >= 1 ? [i] : [])));
    // ... min(eigen(bentlerYuan(...))$values), and the construction's floor holds
    expect(Math.abs(result.smallestEigenvalueAfter - reference.bentlerYuan.figures.smallestEigenvalue)).toBeLessThan(5e-6);
    expect(result.smallestEigenvalueAfter).toBeGreaterThanOrEqual((result.guaranteedFloor as number) - 1e-9);
    expect(result.notices.map((n) => n.code)).toEqual(['matrix-smoothed']);
    expect(input.data).toEqual(before);
  });

  it('keeps VIF, KMO and the condition number of the near-duplicate wave in line with the Pearson audit, where psych::cor.smooth explodes', () => {
    const reference = smoothFixture.cases.find((c) => c.name === 'simulated-near-duplicate-pairwise-polychoric')!;
    const smoothed = smoothCorrelationMatrix(squareMatrixFromRows(reference.correlation)).matrix;
    const vif = largestVif(smoothed);
    const kmo = kaiserMeyerOlkin(smoothed).overall as number;
    const condition = conditionNumber(smoothed).value as number;
    // R 4.2.2 psych 2.2.9: max(diag(solve(S))), KMO(S)$MSA, sqrt(max(eigen)/min(eigen)) for S = bentlerYuan(...)
    expect(Math.abs(vif - (reference.bentlerYuan.figures.largestVif as number))).toBeLessThan(1e-3);
    expect(Math.abs(kmo - (reference.bentlerYuan.figures.kmo as number))).toBeLessThan(1e-6);
    expect(Math.abs(condition - (reference.bentlerYuan.figures.conditionNumber as number))).toBeLessThan(1e-4);
    // The criterion against the same data's pairwise Pearson audit (R: cor(x, use = 'pairwise')):
    // largest VIF within 5×, KMO within .15, condition number of the same order.
    const pearson = reference.pearson!.figures;
    expect(vif / (pearson.largestVif as number)).toBeLessThan(5);
    expect((pearson.largestVif as number) / vif).toBeLessThan(5);
    expect(Math.abs(kmo - (pearson.kmo as number))).toBeLessThan(0.15);
    expect(condition / (pearson.conditionNumber as number)).toBeLessThan(3);
    // psych::cor.smooth on the same matrix (R 4.2.2 psych 2.2.9): a VIF of about 5e9 and a KMO of .12.
    expect(reference.corSmooth.figures.largestVif as number).toBeGreaterThan(1e8);
  });

  it('returns a positive-definite or exactly singular matrix unchanged', () => {
    const positive = squareMatrixFromRows([
      [1, 0.6, 0.5],
      [0.6, 1, 0.4],
      [0.5, 0.4, 1],
    ]);
    const unchanged = smoothCorrelationMatrix(positive);
    expect(unchanged.smoothed).toBe(false);
    expect(unchanged.matrix.data).toEqual(positive.data);
    // An exact copy (items 0 and 1) stays an exact dependency: it is not smoothed into a finite VIF.
    const copy = squareMatrixFromRows([
      [1, 1, 0.5],
      [1, 1, 0.5],
      [0.5, 0.5, 1],
    ]);
    const singular = smoothCorrelationMatrix(copy);
    expect(singular.smoothed).toBe(false);
    expect(varianceInflation(singular.matrix).exactDependencies.length).toBe(1);
  });

  it('rejects bad input', () => {
    expect(() => smoothCorrelationMatrix(squareMatrixFromRows([[1, 0.5], [0.5, 1]]), { scalingConstant: 1 })).toThrow(/scalingConstant/);
    expect(() => smoothCorrelationMatrix(squareMatrixFromRows([[1, 0.5], [0.4, 1]]))).toThrow(/not symmetric/);
  });
});
