/**
 * Parallel analysis on polychoric correlations (Garrido, Abad & Ponsoda 2013), checked loosely
 * against psych::fa.parallel(x, cor = "poly", fa = "pc") within simulation error. psych's
 * resampled reference ($pc.simr, the MEAN of the random eigenvalues, values.sim.mean in its
 * source) shuffles each observed column independently, which keeps every item's marginal
 * proportions, as our draws at the observed thresholds do in expectation.
 * Fixture: scripts/reference/real-questionnaires.R → fixtures/reference/real-parallel-poly.json.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  correlationMatrix,
  createSeededRandom,
  forgetRandomPolychoricEigenvalues,
  itemMatrixFromRows,
  parallelAnalysis,
  polychoricCodeEigenvalues,
  polychoricParallelAnalysis,
  randomOrdinalCodes,
  randomPolychoricEigenvalues,
  symmetricEigenvalues,
} from '../../src/lib/stats';

interface PaSet { data: string; items: string[]; rows: number[][]; observed: number[]; simulatedMean: number[]; resampledMean: number[]; ncomp: number; iterations: number; call: string }
const fixture = JSON.parse(readFileSync(join(import.meta.dirname, '..', '..', 'fixtures', 'reference', 'real-parallel-poly.json'), 'utf8')) as { sets: PaSet[] };

describe('polychoricParallelAnalysis against psych::fa.parallel(cor = "poly")', () => {
  for (const set of fixture.sets) {
    it(set.data, () => {
      const data = itemMatrixFromRows(set.rows);
      const poly = correlationMatrix(data, { method: 'polychoric', missing: 'listwise', repair: 'none' });
      const observed = Array.from(symmetricEigenvalues(poly.matrix));
      // set.call: $pc.values, the eigenvalues of psych's polychoric matrix
      observed.forEach((value, k) => expect(value).toBeCloseTo(set.observed[k], 3));
      const result = polychoricParallelAnalysis(observed, data.rows, poly.thresholds as number[][], { iterations: 20, seed: 2026 });
      // set.call: $pc.simr (mean of 20 resampled polychoric eigenvalue sets); 20 draws of each
      // side: the means agree within 0.04 (simulation error, from the spread of the draws).
      result.randomMean.forEach((value, k) => expect(Math.abs(value - set.resampledMean[k])).toBeLessThan(0.04));
      // set.call: $ncomp, observed eigenvalues above the resampled mean (Horn's criterion)
      let aboveMean = 0;
      while (aboveMean < observed.length && observed[aboveMean] > result.randomMean[aboveMean]) aboveMean++;
      expect(aboveMean).toBe(set.ncomp);
      // Random Pearson eigenvalues of normal data (the old reference) are the other, wrong yardstick.
      const pearson = parallelAnalysis(observed, data.rows, { iterations: 20, seed: 2026 });
      // Polychoric estimates vary more than Pearson r of normal data, so random polychoric eigenvalues spread wider.
      expect(result.random95[0]).toBeGreaterThan(pearson.random95[0]);
    });
  }

  it('repeats exactly for the same seed and refuses items without thresholds', () => {
    const thresholds = [[-0.5, 0.5], [0], [-1, 0, 1]];
    const a = polychoricParallelAnalysis([1.5, 0.9, 0.6], 100, thresholds, { iterations: 3, seed: 9 });
    const b = polychoricParallelAnalysis([1.5, 0.9, 0.6], 100, thresholds, { iterations: 3, seed: 9 });
    expect(a).toEqual(b);
    expect(() => polychoricParallelAnalysis([1.5, 0.9, 0.6], 100, [[-0.5], [], [0]])).toThrow(RangeError);
    expect(() => polychoricParallelAnalysis([1.5, 0.9], 100, thresholds)).toThrow(RangeError);
  });

  it('reuses the random eigenvalues of the same size, thresholds and seed, and hands out fresh results', () => {
    const thresholds = [[-0.4, 0.6], [0.1], [-1, 0, 1]];
    const observed = [1.6, 0.8, 0.6];
    const first = polychoricParallelAnalysis(observed, 80, thresholds, { seed: 31, iterations: 6 });
    (first.random95 as number[]).fill(0);
    const again = polychoricParallelAnalysis(observed, 80, thresholds, { seed: 31, iterations: 6 });
    expect(again.random95.every((value) => value > 0)).toBe(true);
    // A cached answer is the answer of a fresh computation: a cache filled by another size first.
    polychoricParallelAnalysis(observed, 81, thresholds, { seed: 31, iterations: 6 });
    expect(polychoricParallelAnalysis(observed, 80, thresholds, { seed: 31, iterations: 6 })).toEqual(again);
    expect(polychoricParallelAnalysis(observed, 80, [[-0.4, 1.2], [0.1], [-1, 0, 1]], { seed: 31, iterations: 6 }).random95).not.toEqual(again.random95);
  });

  it('draws the codes of every data set first and estimates them after, as one loop drawing and estimating each set in turn', () => {
    // The reference is the plain loop the draws were first written as: one generator, data set
    // after data set, item after item, respondent after respondent; cut, estimate, eigenvalues.
    const thresholds = [[-0.7, 0.3], [0.4], [-1, -0.2, 0.6, 1.4], [-0.3, 0.8], [0.1, 1]];
    const [rows, iterations, seed] = [90, 4, 77];
    const random = createSeededRandom(seed);
    const data = new Float64Array(rows * thresholds.length);
    const expected = new Float64Array(thresholds.length * iterations);
    for (let t = 0; t < iterations; t++) {
      thresholds.forEach((limits, j) => {
        for (let i = 0; i < rows; i++) {
          const z = random.nextNormal();
          let code = 0;
          while (code < limits.length && z > limits[code]) code++;
          data[j * rows + i] = code;
        }
      });
      const values = symmetricEigenvalues(correlationMatrix({ rows, columns: thresholds.length, data }, { method: 'polychoric', missing: 'listwise', repair: 'none' }).matrix);
      values.forEach((value, k) => (expected[k * iterations + t] = value));
    }
    forgetRandomPolychoricEigenvalues();
    const values = randomPolychoricEigenvalues(rows, thresholds, iterations, seed);
    expect(values.length).toBe(expected.length);
    expected.forEach((value, at) => expect(Object.is(values[at], value), `value ${at}`).toBe(true));
    // The codes split anywhere between data sets give the same draw-major eigenvalues.
    const codes = randomOrdinalCodes(rows, thresholds, iterations, seed);
    expect(Math.max(...codes)).toBe(4);
    const size = rows * thresholds.length;
    const split = [...polychoricCodeEigenvalues(codes.subarray(0, size), rows, thresholds.length), ...polychoricCodeEigenvalues(codes.subarray(size), rows, thresholds.length)];
    for (let t = 0; t < iterations; t++) thresholds.forEach((_, k) => expect(Object.is(split[t * thresholds.length + k], expected[k * iterations + t])).toBe(true));
    expect(() => polychoricCodeEigenvalues(codes.subarray(1), rows, thresholds.length)).toThrow(/not a whole number/);
  });

  it('summarises given random eigenvalues exactly as its own draws, without changing them', () => {
    const thresholds = [[-0.4, 0.6], [0.1], [-1, 0, 1]];
    const observed = [1.7, 0.8, 0.5];
    forgetRandomPolychoricEigenvalues();
    const drawn = polychoricParallelAnalysis(observed, 60, thresholds, { seed: 8, iterations: 5 });
    const given = randomPolychoricEigenvalues(60, thresholds, 5, 8);
    const copy = given.slice();
    const summarised = polychoricParallelAnalysis(observed, 60, thresholds, { seed: 8, iterations: 5, randomEigenvalues: given });
    drawn.random95.forEach((value, k) => expect(Object.is(summarised.random95[k], value)).toBe(true));
    drawn.randomMean.forEach((value, k) => expect(Object.is(summarised.randomMean[k], value)).toBe(true));
    expect(summarised.suggested).toBe(drawn.suggested);
    expect(given).toEqual(copy);
    expect(() => polychoricParallelAnalysis(observed, 60, thresholds, { seed: 8, iterations: 5, randomEigenvalues: given.subarray(1) })).toThrow(/randomEigenvalues holds 14 values/);
  });
});
