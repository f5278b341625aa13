import { describe, expect, it } from 'vitest';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { usableItems } from '../../src/lib/stats/usable-items';
import { centeredCrossProducts } from '../../src/lib/stats/cross-products';
import { selectRespondents } from '../../src/lib/stats/types';
import { completeRows } from '../../src/lib/stats/complete-rows';
import { symmetricEigenvalues } from '../../src/lib/stats/symmetric-eigen';
import { itemMatrixFromColumns, selectItems, type ItemMatrix } from '../../src/lib/stats/types';
import { correlationDataset, correlationDatasets, datasetMatrix, hasNaN, largestDifference } from './correlation-fixtures';

/** A copy of the matrix's data, to prove the call did not modify it. */
function snapshot(matrix: ItemMatrix): Float64Array {
  return Float64Array.from(matrix.data);
}

describe('correlationMatrix: Pearson and Spearman against R', () => {
  it('matches cor() under pairwise and listwise deletion to 1e-9, with R’s pair counts', () => {
    for (const dataset of correlationDatasets()) {
      const matrix = datasetMatrix(dataset);
      const before = snapshot(matrix);
      for (const method of ['pearson', 'spearman'] as const) {
        const pairwise = correlationMatrix(matrix, { method, missing: 'pairwise' });
        const listwise = correlationMatrix(matrix, { method, missing: 'listwise' });
        // R 4.2.2: cor(x, use = "pairwise.complete.obs", method = method); compared before any
        // repair (R does not repair).
        const expectedPairwise = method === 'pearson' ? dataset.pearsonPairwise : dataset.spearmanPairwise;
        expect(largestDifference((pairwise.unrepaired ?? pairwise.matrix).data, expectedPairwise), `${dataset.name} ${method}`).toBeLessThan(1e-9);
        // R 4.2.2: cor(x, use = "complete.obs", method = method)
        const expectedListwise = method === 'pearson' ? dataset.pearsonListwise : dataset.spearmanListwise;
        expect(largestDifference(listwise.matrix.data, expectedListwise), `${dataset.name} ${method} listwise`).toBeLessThan(1e-9);
        // R 4.2.2: crossprod(!is.na(x)) and nrow(na.omit(x))
        expect(Array.from(pairwise.n.data)).toEqual(dataset.pairCounts.flat());
        expect(listwise.n.data.every((n) => n === dataset.completeRows)).toBe(true);
        expect(listwise.rowsUsed).toBe(dataset.completeRows);
        expect(pairwise.rowsUsed).toBe(dataset.rows);
        expect(pairwise.undefinedPairs).toEqual([]);
      }
      expect(matrix.data).toEqual(before);
    }
  });
});

describe('correlationMatrix: polychoric against R', () => {
  it('matches psych::polychoric (global thresholds, no correction) to 0.005 and an exact ML fit to 1e-6', () => {
    for (const name of ['bfi', 'ordinal5', 'ordinal7']) {
      const dataset = correlationDataset(name);
      const matrix = datasetMatrix(dataset);
      const pairwise = correlationMatrix(matrix, { method: 'polychoric', missing: 'pairwise' });
      const raw = (pairwise.unrepaired ?? pairwise.matrix).data;
      // R 4.2.2, psych 2.2.9: polychoric(x, smooth = FALSE, global = TRUE, correct = 0)$rho
      expect(largestDifference(raw, dataset.polychoricPairwise!.rho), name).toBeLessThan(0.005);
      expect(largestDifference(raw, dataset.polychoricPairwise!.rho), name).toBeLessThan(1e-4); // psych's optimize() stops at ~1e-4
      if (dataset.polychoricPrecise !== undefined) {
        // R 4.2.2: two_step_rho() of scripts/reference/correlation.R (TVPACK cells, optimize tol 1e-10)
        expect(largestDifference(raw, dataset.polychoricPrecise), name).toBeLessThan(1e-6);
      }
      // R 4.2.2, psych 2.2.9: polychoric(...)$tau, thresholds from all answers of each item
      pairwise.thresholds!.forEach((row, j) => row.forEach((t, k) => expect(Math.abs(t - dataset.polychoricPairwise!.tau[j][k])).toBeLessThan(1e-12)));
      expect(Array.from(pairwise.n.data)).toEqual(dataset.pairCounts.flat());
      const listwise = correlationMatrix(matrix, { method: 'polychoric', missing: 'listwise' });
      // R 4.2.2, psych 2.2.9: polychoric(x[complete.cases(x), ], smooth = FALSE, global = TRUE, correct = 0)$rho
      expect(largestDifference((listwise.unrepaired ?? listwise.matrix).data, dataset.polychoricListwise!.rho), name).toBeLessThan(0.005);
      expect(listwise.correctedPairs).toEqual([]);
    }
  });
});

describe('correlationMatrix: edge cases never give NaN', () => {
  const base = [1, 2, 3, 4, 5, 2, 3, 4, 1, 5, 3, 2];
  const other = [2, 2, 3, 5, 4, 1, 3, 5, 2, 4, 4, 1];

  it('enters a constant or all-missing item’s pairs as 0 and reports them', () => {
    const matrix = itemMatrixFromColumns([base, Array(12).fill(3), other, Array(12).fill(NaN)]);
    for (const method of ['pearson', 'spearman', 'polychoric'] as const) {
      for (const missing of ['pairwise', 'listwise'] as const) {
        const result = correlationMatrix(matrix, { method, missing });
        expect(hasNaN(result.matrix.data), `${method} ${missing}`).toBe(false);
        expect(result.matrix.data[0 * 4 + 0]).toBe(1);
        if (missing === 'pairwise') {
          expect(result.undefinedPairs).toEqual([[0, 1], [0, 3], [1, 2], [1, 3], [2, 3]]);
          expect(result.matrix.data[0 * 4 + 1]).toBe(0);
          expect(result.matrix.data[0 * 4 + 2]).not.toBe(0);
          expect(result.n.data[3 * 4 + 3]).toBe(0);
        } else {
          expect(result.rowsUsed).toBe(0); // the all-missing item leaves no complete row
          expect(result.undefinedPairs.length).toBe(6);
        }
        expect(result.notices.some((notice) => notice.code === 'correlation-undefined')).toBe(true);
      }
    }
  });

  it('handles two items, and an exact duplicate gives exactly 1 in every method', () => {
    const matrix = itemMatrixFromColumns([base, base]);
    for (const method of ['pearson', 'spearman', 'polychoric'] as const) {
      const result = correlationMatrix(matrix, { method, missing: 'pairwise' });
      expect(result.matrix.order).toBe(2);
      expect(result.matrix.data[1], method).toBe(1);
      expect(result.notices).toEqual([]);
    }
  });

  it('reports too few complete rows under listwise deletion', () => {
    const matrix = itemMatrixFromColumns([[1, 2, NaN, 4], [3, 1, 2, NaN]]);
    const result = correlationMatrix(matrix, { method: 'pearson', missing: 'listwise' });
    expect(result.rowsUsed).toBe(2);
    expect(result.undefinedPairs).toEqual([[0, 1]]);
    expect(Array.from(result.matrix.data)).toEqual([1, 0, 0, 1]);
  });

  it('corrects and reports a polychoric pair whose empty cells put the maximum on the boundary', () => {
    // Staircase table 20 5 0 / 0 30 6 / 0 0 25 (see correlation-polychoric-edge.json).
    const x: number[] = [];
    const y: number[] = [];
    const counts = [[20, 5, 0], [0, 30, 6], [0, 0, 25]];
    counts.forEach((row, i) => row.forEach((count, j) => { for (let c = 0; c < count; c++) { x.push(i + 1); y.push(j + 1); } }));
    const result = correlationMatrix(itemMatrixFromColumns([x, y]), { method: 'polychoric', missing: 'pairwise' });
    expect(result.correctedPairs).toEqual([[0, 1]]);
    expect(result.notices.map((notice) => notice.code)).toContain('zero-cell-correction');
    // R 4.2.2: two_step_rho(corrected staircase) = 0.92698264213 (correlation-polychoric-edge.json)
    expect(result.matrix.data[1]).toBeCloseTo(0.92698264213, 6);
  });

  it('refuses items with too many categories for polychoric, and bad options', () => {
    const continuous = itemMatrixFromColumns([Array.from({ length: 30 }, (_, i) => i * 0.37), Array.from({ length: 30 }, (_, i) => (i * 7) % 30)]);
    expect(() => correlationMatrix(continuous, { method: 'polychoric', missing: 'pairwise' })).toThrow(/correlationMatrix: item 0: .*more than 15 distinct values/);
    expect(() => correlationMatrix(continuous, { method: 'kendall' as never, missing: 'pairwise' })).toThrow(/method must be pearson, spearman or polychoric/);
    expect(() => correlationMatrix(continuous, { method: 'pearson', missing: 'everything' as never })).toThrow(/missing must be pairwise or listwise/);
    expect(() => correlationMatrix(itemMatrixFromColumns([[1, Infinity, 2]]), { method: 'pearson', missing: 'pairwise' })).toThrow(/infinite value/);
  });
});

describe('correlationMatrix: indefinite pairwise matrices', () => {
  // Items 0 and 1 agree on rows 0-5, items 1 and 2 agree on rows 6-11, items 0 and 2 are
  // opposed on rows 12-17: no single data set has all three pairwise correlations.
  const up = [1, 2, 3, 4, 5, 6];
  const nan = Array(6).fill(NaN);
  const matrix = itemMatrixFromColumns([
    [...up, ...nan, ...up],
    [...up, ...up, ...nan],
    [...nan, ...up, ...up.map((v) => 7 - v)],
  ]);

  it('repairs it to the nearest correlation matrix and says so', () => {
    const result = correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise' });
    expect(result.indefinite).toBe(true);
    expect(result.repaired).toBe(true);
    expect(result.smallestEigenvalue as number).toBeLessThan(-0.5);
    expect(Array.from(result.unrepaired!.data)).toEqual([1, 1, -1, 1, 1, 1, -1, 1, 1]);
    expect(symmetricEigenvalues(result.matrix)[2]).toBeGreaterThan(0);
    expect(result.notices.map((notice) => notice.code)).toContain('matrix-repaired');
    expect(hasNaN(result.matrix.data)).toBe(false);
  });

  it('only reports it when asked not to repair', () => {
    const result = correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise', repair: 'none' });
    expect(result.indefinite).toBe(true);
    expect(result.repaired).toBe(false);
    expect(result.matrix.data[2]).toBe(-1);
    expect(result.notices.map((notice) => notice.code)).toContain('matrix-indefinite');
  });
});

describe('correlationMatrix: invariances', () => {
  const dataset = correlationDataset('ordinal5');
  const matrix = datasetMatrix(dataset);

  it('permuting the items permutes the matrix', () => {
    const order = [3, 0, 7, 5, 1, 6, 2, 4];
    for (const method of ['pearson', 'spearman', 'polychoric'] as const) {
      const full = correlationMatrix(matrix, { method, missing: 'pairwise' });
      const permuted = correlationMatrix(selectItems(matrix, order), { method, missing: 'pairwise' });
      const source = (full.unrepaired ?? full.matrix).data;
      const target = (permuted.unrepaired ?? permuted.matrix).data;
      order.forEach((a, i) => order.forEach((b, j) => expect(target[i * 8 + j]).toBeCloseTo(source[a * 8 + b], 10)));
    }
  });

  it('reverse-keying an item flips the signs of its correlations only', () => {
    const reversed = Float64Array.from(matrix.data);
    for (let i = 0; i < matrix.rows; i++) reversed[2 * matrix.rows + i] = 6 - reversed[2 * matrix.rows + i];
    for (const method of ['pearson', 'spearman', 'polychoric'] as const) {
      const a = correlationMatrix(matrix, { method, missing: 'listwise' }).matrix.data;
      const b = correlationMatrix({ ...matrix, data: reversed }, { method, missing: 'listwise' }).matrix.data;
      for (let i = 0; i < 8; i++) {
        for (let j = 0; j < 8; j++) {
          const sign = (i === 2) !== (j === 2) ? -1 : 1;
          expect(b[i * 8 + j]).toBeCloseTo(sign * a[i * 8 + j], 9);
        }
      }
    }
  });
});

describe('usableItems', () => {
  it('refuses constant items and items with fewer than 2 answers, one notice each', () => {
    const matrix = itemMatrixFromColumns([
      [1, 2, 3, 4],
      [2, 2, NaN, 2],
      [NaN, NaN, NaN, NaN],
      [NaN, 5, NaN, NaN],
      [4, 3, 4, 3],
    ]);
    const before = snapshot(matrix);
    const result = usableItems(matrix);
    expect(result.usable).toEqual([0, 4]);
    expect(result.refused).toEqual([1, 2, 3]);
    expect(result.notices.map((notice) => [notice.code, notice.items[0]])).toEqual([
      ['constant-item', 1],
      ['too-few-values', 2],
      ['too-few-values', 3],
    ]);
    expect(matrix.data).toEqual(before);
  });
});

describe('correlationMatrix with cross-products from the caller', () => {
  it('gives bit for bit the same result as its own pass, for complete data and under listwise deletion', () => {
    // Identity: the cross-products handed in are those the function would compute itself.
    for (const dataset of correlationDatasets()) {
      const matrix = datasetMatrix(dataset);
      const complete = completeRows(matrix);
      if (complete.length < 3) continue;
      const rows = selectRespondents(matrix, complete);
      const crossProducts = centeredCrossProducts(rows);
      const own = correlationMatrix(matrix, { method: 'pearson', missing: 'listwise' });
      const given = correlationMatrix(matrix, { method: 'pearson', missing: 'listwise', crossProducts });
      expect(Array.from(given.matrix.data), dataset.name).toEqual(Array.from(own.matrix.data));
      expect(Array.from(given.n.data)).toEqual(Array.from(own.n.data));
      expect(given.rowsUsed).toBe(own.rowsUsed);
      expect(given.undefinedPairs).toEqual(own.undefinedPairs);
      const pairwiseOwn = correlationMatrix(rows, { method: 'pearson', missing: 'pairwise' });
      const pairwiseGiven = correlationMatrix(rows, { method: 'pearson', missing: 'pairwise', crossProducts });
      expect(Array.from(pairwiseGiven.matrix.data)).toEqual(Array.from(pairwiseOwn.matrix.data));
    }
  });

  it('takes the rows and columns of the varying items when an item is constant over the complete rows', () => {
    const matrix = itemMatrixFromColumns([[1, 2, 3, 4, 5, 6], [2, 2, 2, 2, 2, 2], [6, 4, 5, 1, 3, 2], [1, 1, 2, 3, 5, 8]]);
    const own = correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise' });
    const given = correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise', crossProducts: centeredCrossProducts(matrix) });
    expect(Array.from(given.matrix.data)).toEqual(Array.from(own.matrix.data));
    expect(given.undefinedPairs).toEqual(own.undefinedPairs);
    expect(own.undefinedPairs.length).toBe(3);
  });

  it('uses the cross-products it is given rather than passing over the data again', () => {
    const matrix = itemMatrixFromColumns([[1, 2, 3, 4, 5], [2, 1, 4, 3, 5]]);
    const own = centeredCrossProducts(matrix);
    // Hand-worked: Σ(x − 3)(y − 3) = 8, Σ(x − 3)² = Σ(y − 3)² = 10, r = 0.8; halving the
    // off-diagonal sum gives 0.4, which only the given cross-products can produce.
    const halved = { ...own, centered: { order: 2, data: Float64Array.from([10, 4, 4, 10]) } };
    expect(correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise' }).matrix.data[1]).toBeCloseTo(0.8, 15);
    expect(correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise', crossProducts: halved }).matrix.data[1]).toBeCloseTo(0.4, 15);
  });

  it('refuses cross-products for Spearman, for pairwise deletion with missing answers, or of other rows', () => {
    const matrix = itemMatrixFromColumns([[1, 2, 3, 4, 5], [2, 1, 4, 3, 5], [5, 3, NaN, 1, 2]]);
    const complete = selectRespondents(matrix, completeRows(matrix));
    const crossProducts = centeredCrossProducts(complete);
    expect(() => correlationMatrix(complete, { method: 'spearman', missing: 'pairwise', crossProducts })).toThrow(/Pearson only/);
    expect(() => correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise', crossProducts })).toThrow(/pairwise deletion with missing/);
    expect(() => correlationMatrix(matrix, { method: 'pearson', missing: 'listwise', crossProducts: centeredCrossProducts(complete) })).not.toThrow();
    expect(() => correlationMatrix(complete, { method: 'pearson', missing: 'listwise', crossProducts: centeredCrossProducts(selectRespondents(complete, [0, 1, 2])) })).toThrow(/cover 3 rows/);
  });
});
