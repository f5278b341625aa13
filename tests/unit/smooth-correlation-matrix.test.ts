import { describe, expect, it } from 'vitest';
import { conditionNumber } from '../../src/lib/stats/condition-number';
import { kaiserMeyerOlkin } from '../../src/lib/stats/kmo';
import { minimumTraceCommunalities, smoothCorrelationMatrix } from '../../src/lib/stats/smooth-correlation-matrix';
import { symmetricEigenvalues } from '../../src/lib/stats/symmetric-eigen';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import { varianceInflation } from '../../src/lib/stats/variance-inflation';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { createSeededRandom, type SeededRandom } from '../../src/lib/stats/seeded-random';
import type { SquareMatrix } from '../../src/lib/stats/types';
import { largestDifference, smoothFixture } from './local-dependence-fixtures';
import { minimumTraceCommunalitiesPlain } from './smooth-correlation-reference';

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

describe('the smoothing on the WebAssembly positive-definite kernels', () => {
  /**
   * An indefinite correlation matrix of the kind pairwise and polychoric estimates give: a
   * one-factor structure with loadings in [.3, .9], noise of `noise` on every correlation and a
   * near-duplicate pair (r = .97) whose correlations with the rest disagree. Moved by up to 5e-11
   * off symmetry (checkCorrelationMatrix allows 1e-10), so reading the wrong triangle shows.
   */
  function noisyCorrelation(random: SeededRandom, order: number, noise: number): SquareMatrix {
    const loadings = Array.from({ length: order }, () => 0.3 + 0.6 * random.next());
    const data = new Float64Array(order * order);
    for (let i = 0; i < order; i++) {
      data[i * order + i] = 1;
      for (let j = 0; j < i; j++) {
        const value = Math.max(-0.99, Math.min(0.99, loadings[i] * loadings[j] + noise * random.nextNormal()));
        data[i * order + j] = value;
        data[j * order + i] = value + 5e-11 * (random.next() - 0.5);
      }
    }
    if (order >= 3) {
      data[1] = 0.97;
      data[order] = 0.97;
      for (let j = 2; j < order; j++) {
        data[j * order] = data[j] = Math.max(-0.99, data[j] - 0.3);
        data[j * order + 1] = data[order + j] = Math.min(0.99, data[order + j] + 0.2);
      }
    }
    return { order, data };
  }

  /** Pairwise polychoric correlations of simulated 5-point answers with near-duplicate items and missing answers. */
  function pairwisePolychoric(random: SeededRandom, rows: number, columns: number): SquareMatrix {
    const data = new Float64Array(rows * columns);
    for (let i = 0; i < rows; i++) {
      const f = random.nextNormal();
      let previous = 0;
      for (let j = 0; j < columns; j++) {
        // every third item nearly copies the one before it
        const latent = j % 3 === 2 ? previous + 0.15 * random.nextNormal() : (0.4 + 0.05 * j) * f + random.nextNormal();
        previous = latent;
        const answer = Math.min(5, Math.max(1, Math.round(3 + 1.1 * latent)));
        data[j * rows + i] = random.next() < 0.15 ? Number.NaN : answer;
      }
    }
    return correlationMatrix({ rows, columns, data }, { method: 'polychoric', missing: 'pairwise', repair: 'none' }).matrix;
  }

  function expectSameBits(actual: ArrayLike<number>, expected: ArrayLike<number>, label: string): void {
    expect(actual.length, label).toBe(expected.length);
    for (let index = 0; index < expected.length; index++) {
      if (!Object.is(actual[index], expected[index])) expect.fail(`${label}: element ${index} is ${actual[index]}, the plain loops give ${expected[index]}`);
    }
  }

  const random = createSeededRandom(41);
  const matrices: { label: string; matrix: SquareMatrix }[] = [
    ...smoothFixture.cases.map((reference) => ({ label: reference.name, matrix: squareMatrixFromRows(reference.correlation) })),
    ...[3, 4, 5, 7, 8, 9, 12, 16, 17, 23, 31, 41, 48, 57, 64, 83].map((order) => ({ label: `noisy one-factor, order ${order}`, matrix: noisyCorrelation(random, order, 0.08) })),
    ...[
      { rows: 150, columns: 12 },
      { rows: 220, columns: 21 },
    ].map(({ rows, columns }) => ({ label: `pairwise polychoric ${rows} x ${columns}`, matrix: pairwisePolychoric(random, rows, columns) })),
  ].filter(({ matrix }) => symmetricEigenvalues(matrix)[matrix.order - 1] < 0);

  it('has indefinite matrices of many orders to compare on', () => {
    expect(matrices.length).toBeGreaterThanOrEqual(18);
  });

  it.each(matrices.map((entry) => [entry.label, entry.matrix] as const))(
    'gives bit for bit the communalities and Newton steps of the plain loops on %s',
    (label, matrix) => {
      const fast = minimumTraceCommunalities(matrix);
      const plain = minimumTraceCommunalitiesPlain(matrix);
      expectSameBits(fast.communalities, plain.communalities, label);
      expect(Object.is(fast.trace, plain.trace), label).toBe(true);
      expect(fast.newtonSteps, label).toBe(plain.newtonSteps);
      expect(fast.converged, label).toBe(plain.converged);
      // The scaling around the MTFA is unchanged code: the same communalities give the same matrix.
      expectSameBits(smoothCorrelationMatrix(matrix).communalities as Float64Array, plain.communalities, label);
    },
  );
});
