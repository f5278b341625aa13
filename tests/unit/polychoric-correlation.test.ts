import { describe, expect, it } from 'vitest';
import { codeOrdinalItem, countPolychoricTable } from '../../src/lib/stats/polychoric-coding';
import { polychoricCorrelation, POLYCHORIC_LIMITS } from '../../src/lib/stats/polychoric-correlation';
import { createPolychoricWorkspace, fitPolychoricTable, polychoricLikelihood, polychoricLogLikelihoodOfGrid } from '../../src/lib/stats/polychoric-likelihood';
import { correlationDataset, datasetColumn, readCorrelationFixture, type Provenance } from './correlation-fixtures';

interface EdgeFixture {
  provenance: Provenance;
  staircase: { table: number[][]; x: number[]; y: number[]; correctedRho: number; psychUncorrectedRho: number; thresholdsX: number[]; thresholdsY: number[] };
  emptyRow: { x: number[]; y: (number | null)[]; table: number[][]; rho: number; thresholdsX: number[]; thresholdsY: number[] };
}
const edge = readCorrelationFixture<EdgeFixture>('correlation-polychoric-edge.json');

describe('polychoricCorrelation', () => {
  it('matches an independent two-step ML fit in R to 1e-6, and psych::polychoric to 0.005', () => {
    for (const name of ['ordinal5', 'ordinal7']) {
      const dataset = correlationDataset(name);
      for (let i = 0; i < dataset.columns; i++) {
        for (let j = i + 1; j < dataset.columns; j++) {
          const x = Object.freeze(datasetColumn(dataset, i));
          const y = Object.freeze(datasetColumn(dataset, j));
          const result = polychoricCorrelation(x, y);
          expect(result.status).toBe('estimated');
          // R 4.2.2: two_step_rho() in scripts/reference/correlation.R (mvtnorm TVPACK cells, optimize tol 1e-10)
          expect(Math.abs((result.rho as number) - (dataset.polychoricPrecise as number[][])[i][j]), `${name} ${i},${j}`).toBeLessThan(1e-6);
          // R 4.2.2, psych 2.2.9: polychoric(x, smooth = FALSE, global = TRUE, correct = 0)$rho
          expect(Math.abs((result.rho as number) - (dataset.polychoricPairwise as { rho: number[][] }).rho[i][j])).toBeLessThan(0.005);
          expect(result.n).toBe(dataset.pairCounts[i][j]);
          expect(result.standardError).toBeGreaterThan(0);
        }
      }
    }
  });

  it('takes thresholds from all of an item’s answers, as psych’s global thresholds (to 1e-12)', () => {
    const dataset = correlationDataset('ordinal7');
    const tau = (dataset.polychoricPairwise as { tau: number[][] }).tau;
    for (let i = 0; i < dataset.columns; i++) {
      const partner = (i + 1) % dataset.columns;
      const result = polychoricCorrelation(datasetColumn(dataset, i), datasetColumn(dataset, partner));
      // R 4.2.2, psych 2.2.9: polychoric(x, global = TRUE)$tau[i, ]
      result.thresholdsX.forEach((threshold, k) => expect(Math.abs(threshold - tau[i][k])).toBeLessThan(1e-12));
    }
  });

  it('corrects the empty cells only when they push the maximum onto the boundary', () => {
    const { x, y, correctedRho, psychUncorrectedRho } = edge.staircase;
    const result = polychoricCorrelation(x, y);
    expect(result.status).toBe('zero-cell-corrected');
    // R 4.2.2: two_step_rho(staircase table with 0 cells set to 0.5, thresholds of x and y)
    expect(Math.abs((result.rho as number) - correctedRho)).toBeLessThan(1e-6);
    // Uncorrected, the likelihood still rises at 1 − 1e-9: psych (optimize on (−1, 1)) stops at
    // R 4.2.2, psych 2.2.9: polychoric(cbind(x, y), global = TRUE, correct = 0) = 0.99994
    expect(psychUncorrectedRho).toBeGreaterThan(0.9999);
    const itemX = codeOrdinalItem(x);
    const itemY = codeOrdinalItem(y);
    const work = createPolychoricWorkspace(3);
    countPolychoricTable(itemX.codes, 3, itemY.codes, 3, x.length, work.table);
    const fit = fitPolychoricTable(work.table, itemX.thresholds, itemY.thresholds, 0.5, work, 1e-10, 200, 1e-9, 1e-12);
    expect(fit.boundary).toBe(1);
  });

  it('handles an empty row of the table (a category seen only where the partner is missing)', () => {
    const { x, y, rho, thresholdsX } = edge.emptyRow;
    const result = polychoricCorrelation(x, y.map((v) => (v === null ? NaN : v)));
    expect(result.status).toBe('estimated');
    // R 4.2.2: two_step_rho(pair table with an empty 4th row, thresholds of x from all its answers)
    expect(Math.abs((result.rho as number) - rho)).toBeLessThan(1e-6);
    expect(result.thresholdsX.length).toBe(3);
    result.thresholdsX.forEach((t, k) => expect(t).toBeCloseTo(thresholdsX[k], 12));
  });

  it('gives exactly ±1 for an exact duplicate or a monotone recoding, without correction', () => {
    const x = [1, 2, 3, 4, 5, 1, 2, 3, 4, 5, 3, 3, 2, 4];
    const duplicate = polychoricCorrelation(x, x);
    expect(duplicate.rho).toBe(1);
    expect(duplicate.status).toBe('perfect-association');
    expect(duplicate.standardError).toBeNull();
    const coarse = x.map((v) => (v <= 2 ? 1 : v === 3 ? 2 : 3));
    expect(polychoricCorrelation(x, coarse).rho).toBe(1);
    expect(polychoricCorrelation(x, x.map((v) => 6 - v)).rho).toBe(-1);
  });

  it('flips the sign when an item is reverse-keyed, thresholds mirrored', () => {
    const dataset = correlationDataset('ordinal5');
    const x = datasetColumn(dataset, 0);
    const y = datasetColumn(dataset, 1);
    const reversed = y.map((v) => 6 - v);
    const straight = polychoricCorrelation(x, y);
    const flipped = polychoricCorrelation(x, reversed);
    expect(flipped.rho as number).toBeCloseTo(-(straight.rho as number), 9);
    flipped.thresholdsY.forEach((t, k) => expect(t).toBeCloseTo(-straight.thresholdsY[straight.thresholdsY.length - 1 - k], 12));
  });

  it('reports undefined pairs instead of NaN', () => {
    expect(polychoricCorrelation([1, 1, 1, 1], [1, 2, 3, 2])).toMatchObject({ rho: null, status: 'undefined', undefinedReason: 'no-variation' });
    expect(polychoricCorrelation([1, 2, NaN, NaN], [NaN, 1, 2, 3])).toMatchObject({ rho: null, undefinedReason: 'too-few-rows' });
    // Both items vary overall, but one is constant where both are answered.
    expect(polychoricCorrelation([1, 1, 1, 2, 2], [1, 2, 3, NaN, NaN]).undefinedReason).toBe('no-variation');
  });

  it('has an analytic gradient and curvature that agree with finite differences, and SE = 1/√(−ℓ″)', () => {
    const dataset = correlationDataset('ordinal7');
    const itemX = codeOrdinalItem(datasetColumn(dataset, 0));
    const itemY = codeOrdinalItem(datasetColumn(dataset, 2));
    const work = createPolychoricWorkspace(7);
    countPolychoricTable(itemX.codes, 7, itemY.codes, 7, dataset.rows, work.table);
    const at = (rho: number): number[] => {
      polychoricLikelihood(rho, work.table, itemX.thresholds, itemY.thresholds, work);
      return Array.from(work.derivatives);
    };
    const step = 1e-6;
    for (const rho of [-0.4, 0.1, 0.55]) {
      const [, gradient, curvature, valid] = at(rho);
      expect(valid).toBe(1);
      expect(Math.abs((at(rho + step)[0] - at(rho - step)[0]) / (2 * step) - gradient)).toBeLessThan(1e-4 * Math.max(1, Math.abs(gradient)));
      expect(Math.abs((at(rho + step)[1] - at(rho - step)[1]) / (2 * step) - curvature)).toBeLessThan(1e-4 * Math.abs(curvature));
    }
    const result = polychoricCorrelation(datasetColumn(dataset, 0), datasetColumn(dataset, 2));
    const [, gradient, curvature] = at(result.rho as number);
    expect(Math.abs(gradient)).toBeLessThan(1e-6);
    expect(result.standardError).toBeCloseTo(1 / Math.sqrt(-curvature), 12);
  });

  it('counts the same table with and without the integer tallies, for any number of respondents', () => {
    const dataset = correlationDataset('ordinal7');
    const itemX = codeOrdinalItem(datasetColumn(dataset, 1));
    const itemY = codeOrdinalItem(datasetColumn(dataset, 4).map((value, i) => (i % 11 === 3 ? NaN : value)));
    const categoriesX = itemX.categories.length;
    const categoriesY = itemY.categories.length;
    const work = createPolychoricWorkspace(7);
    const direct = new Float64Array(work.table.length);
    // Every remainder of four, and fewer respondents than four.
    for (const respondents of [dataset.rows, dataset.rows - 1, dataset.rows - 2, dataset.rows - 3, 3, 0]) {
      const n = countPolychoricTable(itemX.codes, categoriesX, itemY.codes, categoriesY, respondents, work.table, work.tally);
      const directN = countPolychoricTable(itemX.codes, categoriesX, itemY.codes, categoriesY, respondents, direct);
      expect(n).toBe(directN);
      expect(Array.from(work.table.subarray(0, (categoriesX + 1) * (categoriesY + 1)))).toEqual(Array.from(direct.subarray(0, (categoriesX + 1) * (categoriesY + 1))));
    }
    // Counted by hand: the pair-complete respondents.
    let complete = 0;
    for (let i = 0; i < dataset.rows; i++) if (itemX.codes[i] < categoriesX && itemY.codes[i] < categoriesY) complete++;
    expect(countPolychoricTable(itemX.codes, categoriesX, itemY.codes, categoriesY, dataset.rows, work.table, work.tally)).toBe(complete);
    expect(complete).toBeLessThan(dataset.rows);
    // A tally too small for the table is not used.
    expect(countPolychoricTable(itemX.codes, categoriesX, itemY.codes, categoriesY, dataset.rows, work.table, new Int32Array(3))).toBe(complete);
  });

  it('gives, from the grid an evaluation leaves, the very ℓ that evaluation writes', () => {
    const dataset = correlationDataset('ordinal5');
    const itemX = codeOrdinalItem(datasetColumn(dataset, 0));
    const itemY = codeOrdinalItem(datasetColumn(dataset, 3));
    const work = createPolychoricWorkspace(5);
    countPolychoricTable(itemX.codes, itemX.categories.length, itemY.codes, itemY.categories.length, dataset.rows, work.table, work.tally);
    for (const rho of [-0.7, -0.05, 0.3, 0.81, 0.97, 0.999999]) {
      polychoricLikelihood(rho, work.table, itemX.thresholds, itemY.thresholds, work);
      const written = Array.from(work.derivatives);
      expect(Object.is(polychoricLogLikelihoodOfGrid(work.table, itemX.thresholds, itemY.thresholds, work), written[0]), `rho ${rho}`).toBe(true);
      // Without ℓ the derivatives are the same and ℓ is NaN.
      polychoricLikelihood(rho, work.table, itemX.thresholds, itemY.thresholds, work, false);
      expect(Number.isNaN(work.derivatives[0])).toBe(true);
      expect(Array.from(work.derivatives.subarray(1))).toEqual(written.slice(1));
      expect(Object.is(polychoricLogLikelihoodOfGrid(work.table, itemX.thresholds, itemY.thresholds, work), written[0])).toBe(true);
    }
  });

  it('checks its inputs', () => {
    expect(() => polychoricCorrelation([1, 2], [1])).toThrow(/polychoricCorrelation: vectors must have equal length/);
    const many = Array.from({ length: 40 }, (_, i) => i);
    expect(() => polychoricCorrelation(many, many)).toThrow(/more than 15 distinct values/);
    expect(() => createPolychoricWorkspace(1)).toThrow(RangeError);
    expect(POLYCHORIC_LIMITS.correction).toBe(0.5);
  });
});

describe('codeOrdinalItem', () => {
  it('codes answers to the ranks of their distinct values, counts them, and leaves missing answers at the category count', () => {
    // Category c is the c-th smallest distinct answer (Olsson 1979's first step); −0 is 0.
    const values = [3, 1, NaN, 3, -0, 7, 1, 1, 0, 3, NaN, 7];
    const item = codeOrdinalItem(values);
    expect(Array.from(item.categories)).toEqual([0, 1, 3, 7]);
    expect(Object.is(item.categories[0], 0)).toBe(true);
    expect(Array.from(item.codes)).toEqual([2, 1, 4, 2, 0, 3, 1, 1, 0, 2, 4, 3]);
    expect(Array.from(item.counts)).toEqual([2, 3, 3, 2]);
    expect(item.observed).toBe(10);
    // Thresholds: Φ⁻¹ of the shares at or below each category, 2/10, 5/10, 8/10
    // (R 4.2.2: print(qnorm(c(0.2, 0.5, 0.8)), digits = 17)).
    [-0.84162123357291418, 0, 0.84162123357291441].forEach((expected, c) => expect(item.thresholds.limits[c]).toBeCloseTo(expected, 12));
  });

  it('codes 254 distinct values in any order, and refuses one more or an infinite value', () => {
    const random = Array.from({ length: 2000 }, (_, i) => ((i * 7919) % 254) - 100.5);
    const item = codeOrdinalItem(random, 254);
    expect(item.categories).toHaveLength(254);
    random.forEach((value, i) => expect(item.categories[item.codes[i]]).toBe(value));
    expect(() => codeOrdinalItem([...random, 1000], 254)).toThrow(/more than 254 distinct values/);
    expect(() => codeOrdinalItem([1, 2, Infinity])).toThrow(/value 2 is infinite/);
    expect(() => codeOrdinalItem([1, 1, -Infinity])).toThrow(/value 2 is infinite/);
  });
});

describe('codeOrdinalItem: whole-number answers by table, others by search', () => {
  it('gives each answer the index of its category in ascending order, NaN the category count, whatever the values', () => {
    // Second opinion: the code of an answer is its rank among the sorted distinct answers.
    const cases: number[][] = [
      [3, 1, 5, 5, NaN, 2, 4, 1, 3],
      [0, -0, 10, 7, NaN, 0, 10],
      [-9, -3, -9, 2, NaN],
      [1.5, 2.5, 1.5, 3.25, NaN],
      [0, 1024, 512, 0],
      [0, 1025, 512, 0],
      [7, 7, NaN, 7],
      [NaN, NaN],
      [300, 2, 300, 2.5, 255, 256, 2, 255],
    ];
    for (const values of cases) {
      const item = codeOrdinalItem(Float64Array.from(values));
      const sorted = [...new Set(values.filter((value) => !Number.isNaN(value)).map((value) => value + 0))].sort((a, b) => a - b);
      expect(Array.from(item.categories)).toEqual(sorted);
      expect(Array.from(item.codes)).toEqual(values.map((value) => (Number.isNaN(value) ? sorted.length : sorted.indexOf(value + 0))));
      expect(Array.from(item.counts)).toEqual(sorted.map((category) => values.filter((value) => value === category).length));
      expect(item.observed).toBe(values.filter((value) => !Number.isNaN(value)).length);
    }
  });

  it('refuses more distinct answers than maxCategories and an infinite answer, small whole numbers or not', () => {
    expect(() => codeOrdinalItem(Float64Array.from([1, 2, 3, 1, 2]), 2)).toThrow(/more than 2 distinct values/);
    expect(() => codeOrdinalItem(Float64Array.from([1.5, 2.5, 3.5]), 2)).toThrow(/more than 2 distinct values/);
    expect(() => codeOrdinalItem(Float64Array.from([1, 2, 1, 2]), 2)).not.toThrow();
    expect(() => codeOrdinalItem(Float64Array.from([1, Infinity]))).toThrow(/value 1 is infinite/);
  });
});
