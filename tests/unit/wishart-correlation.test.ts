import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { chiSquareCdf } from '../../src/lib/stats/chi-square-distribution';
import { centeredCrossProducts, pearsonFromCrossProducts } from '../../src/lib/stats/cross-products';
import { chiSquareVariate, gammaVariate } from '../../src/lib/stats/gamma-variate';
import { parallelAnalysis, quantileType7, randomCorrelationEigenvalues } from '../../src/lib/stats/parallel-analysis';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { symmetricEigenvalues } from '../../src/lib/stats/symmetric-eigen';
import { correlationFromWishartFactor, drawWishartFactor, wishartCorrelation } from '../../src/lib/stats/wishart-correlation';

interface WishartCase {
  rows: number;
  items: number;
  draws: number;
  call: string;
  random95: number[];
  randomMean: number[];
  se95: number[];
  seMean: number[];
}
// Rscript scripts/reference/parallel-analysis-wishart.R (R 4.2.2, psych 2.2.9): psych::fa.parallel's
// simulated eigenvalues of normal data, with the simulation error of each figure.
const fixture = JSON.parse(readFileSync(new URL('../../fixtures/reference/parallel-analysis-wishart.json', import.meta.url), 'utf8')) as { cases: WishartCase[] };

const Z = 1.96;
/**
 * The 95th percentile's standard error from its distribution-free 95% interval [x(l), x(u)],
 * l, u = Nq ∓ 1.96·sqrt(Nq(1 − q)) (Conover 1999, Practical Nonparametric Statistics, §3.2; from
 * memory), the same formula as the R script.
 */
function percentileStandardError(values: Float64Array, q = 0.95): number {
  const sorted = values.slice().sort();
  const n = sorted.length;
  const half = Z * Math.sqrt(n * q * (1 - q));
  const lower = Math.max(1, Math.floor(n * q - half));
  const upper = Math.min(n, Math.ceil(n * q + half));
  return (sorted[upper - 1] - sorted[lower - 1]) / (2 * Z);
}

interface Summary {
  random95: number[];
  randomMean: number[];
  se95: number[];
  seMean: number[];
}

/** Per position: 95th percentile (type 7), mean and their simulation errors, from values[k * draws + t]. */
function summarise(values: Float64Array, items: number, draws: number): Summary {
  const summary: Summary = { random95: [], randomMean: [], se95: [], seMean: [] };
  for (let k = 0; k < items; k++) {
    const column = values.slice(k * draws, (k + 1) * draws).sort();
    summary.random95.push(quantileType7(column, 0.95));
    const mean = column.reduce((sum, value) => sum + value, 0) / draws;
    const variance = column.reduce((sum, value) => sum + (value - mean) ** 2, 0) / (draws - 1);
    summary.randomMean.push(mean);
    summary.se95.push(percentileStandardError(column));
    summary.seMean.push(Math.sqrt(variance / draws));
  }
  return summary;
}

/**
 * Two independent simulations agree when every difference lies within 4 combined standard errors
 * (plus 1e-9 for positions that are zero up to rounding, past the rank of a singular matrix).
 */
function expectWithinSimulationError(ours: Summary, theirs: Summary, label: string): void {
  ours.random95.forEach((value, k) => {
    const allowed = 4 * Math.hypot(ours.se95[k], theirs.se95[k]) + 1e-9;
    expect(Math.abs(value - theirs.random95[k]), `${label}: 95th percentile at position ${k}`).toBeLessThanOrEqual(allowed);
  });
  ours.randomMean.forEach((value, k) => {
    const allowed = 4 * Math.hypot(ours.seMean[k], theirs.seMean[k]) + 1e-9;
    expect(Math.abs(value - theirs.randomMean[k]), `${label}: mean at position ${k}`).toBeLessThanOrEqual(allowed);
  });
}

/** The former method: correlate rows × items normal values drawn one by one. */
function eigenvaluesThroughData(rows: number, items: number, draws: number, seed: number): Float64Array {
  const random = createSeededRandom(seed);
  const values = new Float64Array(items * draws);
  const data = new Float64Array(rows * items);
  for (let t = 0; t < draws; t++) {
    for (let index = 0; index < data.length; index++) data[index] = random.nextNormal();
    const eigenvalues = symmetricEigenvalues(pearsonFromCrossProducts(centeredCrossProducts({ rows, columns: items, data })));
    for (let k = 0; k < items; k++) values[k * draws + t] = eigenvalues[k];
  }
  return values;
}

describe('gammaVariate and chiSquareVariate (Marsaglia & Tsang 2000)', () => {
  it.each([0.5, 1, 2.5, 19.5, 5000])('follow the chi-square law with %s degrees of freedom', (degrees) => {
    const random = createSeededRandom(41);
    const draws = Float64Array.from({ length: 20_000 }, () => chiSquareVariate(random, degrees)).sort();
    // Kolmogorov-Smirnov distance against the chi-square CDF (checked against R's pchisq in
    // chi-square-distribution.test.ts); 1.63 / sqrt(N) is the 1% critical value (Kolmogorov's
    // asymptotic law, common practice).
    let distance = 0;
    draws.forEach((x, i) => {
      const cdf = chiSquareCdf(x, degrees);
      distance = Math.max(distance, Math.abs(cdf - i / draws.length), Math.abs((i + 1) / draws.length - cdf));
    });
    expect(distance).toBeLessThan(1.63 / Math.sqrt(draws.length));
    // mean k, variance 2k (the chi-square law)
    const mean = draws.reduce((sum, x) => sum + x, 0) / draws.length;
    expect(Math.abs(mean - degrees)).toBeLessThan(4 * Math.sqrt((2 * degrees) / draws.length));
  });

  it('refuses a shape or degrees that are not positive', () => {
    const random = createSeededRandom(1);
    expect(() => gammaVariate(random, 0)).toThrow(/shape must be a positive finite number/);
    expect(() => chiSquareVariate(random, Number.NaN)).toThrow(/degrees must be a positive finite number/);
  });
});

describe('wishartCorrelation (Bartlett 1933; Odell & Feiveson 1966)', () => {
  it('draws unit-diagonal symmetric matrices whose off-diagonal r has variance 1/(n − 1)', () => {
    // Under independence E[r] = 0 and Var(r) = 1/(n − 1) exactly for normal data (Fisher 1915's
    // null distribution of r; Anderson 2003 §4.2.1).
    for (const [rows, items] of [[30, 8], [5, 8]] as const) {
      const random = createSeededRandom(rows);
      let sum = 0;
      let sumOfSquares = 0;
      let count = 0;
      let misshapen = 0;
      for (let t = 0; t < 2000; t++) {
        const { order, data } = wishartCorrelation(rows, items, random);
        if (order !== items) misshapen++;
        for (let j = 0; j < items; j++) {
          if (data[j * items + j] !== 1) misshapen++;
          for (let k = j + 1; k < items; k++) {
            if (data[j * items + k] !== data[k * items + j] || Math.abs(data[j * items + k]) > 1) misshapen++;
            sum += data[j * items + k];
            sumOfSquares += data[j * items + k] ** 2;
            count++;
          }
        }
      }
      expect(misshapen).toBe(0);
      expect(Math.abs(sum / count)).toBeLessThan(0.01);
      expect(sumOfSquares / count).toBeCloseTo(1 / (rows - 1), 2);
    }
  });

  it('refuses sizes out of range', () => {
    const random = createSeededRandom(1);
    expect(() => wishartCorrelation(1, 3, random)).toThrow(/rows must be an integer of at least 2/);
    expect(() => wishartCorrelation(10, 0, random)).toThrow(/items must be a positive integer/);
  });
});

describe('parallel analysis from Wishart draws', () => {
  it.each(fixture.cases.map((entry) => [`${entry.rows} × ${entry.items}`, entry] as const))(
    'puts the random percentiles and means where psych::fa.parallel puts them (%s)',
    (_, reference) => {
      // R: see `reference.call` in fixtures/reference/parallel-analysis-wishart.json.
      const draws = 1000;
      const ours = summarise(randomCorrelationEigenvalues(reference.rows, reference.items, draws, 17), reference.items, draws);
      expectWithinSimulationError(ours, reference, reference.call);
    },
  );

  it('puts them where correlating normal data (the former method) puts them', () => {
    for (const [rows, items] of [[60, 12], [9, 12]] as const) {
      const draws = 600;
      const direct = summarise(randomCorrelationEigenvalues(rows, items, draws, 5), items, draws);
      const throughData = summarise(eigenvaluesThroughData(rows, items, draws, 6), items, draws);
      expectWithinSimulationError(direct, throughData, `${rows} × ${items}`);
    }
  });

  it('costs nothing in the rows: the same draws for 400 and 4,000,000 respondents take the same work', () => {
    // Not a timing: with n − 1 >= p the generator is consumed the same number of times whatever n,
    // so the draws for a huge n come back (and their eigenvalues sum to p, the trace).
    const values = randomCorrelationEigenvalues(4_000_000, 6, 50, 3);
    for (let t = 0; t < 50; t++) {
      let trace = 0;
      for (let k = 0; k < 6; k++) trace += values[k * 50 + t];
      expect(trace).toBeCloseTo(6, 10);
    }
    // Near-identity for huge n: every eigenvalue within 0.01 of 1 (sd of r is 1/sqrt(n − 1) = 5e-4).
    values.forEach((value) => expect(Math.abs(value - 1)).toBeLessThan(0.01));
  });

  it('caches by (rows, items, iterations, seed) and hands out copies', () => {
    const first = randomCorrelationEigenvalues(50, 5, 20, 9);
    first.fill(0);
    const again = randomCorrelationEigenvalues(50, 5, 20, 9);
    expect(again.some((value) => value !== 0)).toBe(true);
    expect(randomCorrelationEigenvalues(50, 5, 20, 9)).toEqual(again);
    expect(randomCorrelationEigenvalues(50, 5, 20, 10)).not.toEqual(again);
    const observed = [2, 1.5, 1, 0.3, 0.2];
    expect(parallelAnalysis(observed, 50, { iterations: 20, seed: 9 })).toEqual(parallelAnalysis(observed, 50, { iterations: 20, seed: 9 }));
  });
});

describe('drawWishartFactor and correlationFromWishartFactor', () => {
  it.each([
    [500, 12, 'Bartlett'],
    [6, 12, 'Gram (rows − 1 < items)'],
  ])('compose to wishartCorrelation and take the same generator values (%s × %s, %s)', (rows, items) => {
    const whole = createSeededRandom(77);
    const split = createSeededRandom(77);
    for (let draw = 0; draw < 3; draw++) {
      const expected = wishartCorrelation(rows, items, whole);
      const factor = drawWishartFactor(rows, items, split);
      const before = factor.data.slice();
      expect(Array.from(correlationFromWishartFactor(Object.freeze({ ...factor })).data)).toEqual(Array.from(expected.data));
      expect(factor.data).toEqual(before); // the factor is not modified
    }
    // Both generators stand at the same place afterwards.
    expect(split.next()).toBe(whole.next());
  });

  it('gives a factor of the documented shape and refuses a wrong one', () => {
    const bartlett = drawWishartFactor(100, 5, createSeededRandom(1));
    expect(bartlett).toMatchObject({ items: 5, columns: 5, triangular: true });
    expect(bartlett.data[0 * 5 + 1]).toBe(0); // above the diagonal of L: never drawn
    expect(bartlett.data[0]).toBeGreaterThan(0); // sqrt(χ²(99))
    const gram = drawWishartFactor(4, 5, createSeededRandom(1));
    expect(gram).toMatchObject({ items: 5, columns: 3, triangular: false });
    expect(() => correlationFromWishartFactor({ ...gram, columns: 4 })).toThrow(/correlationFromWishartFactor: the factor holds 15 values, expected items × columns = 20/);
    expect(() => drawWishartFactor(1, 3, createSeededRandom(1))).toThrow(/drawWishartFactor: rows must be an integer of at least 2/);
  });
});
