/**
 * The resample path's descriptives, usable items and complete rows, computed from the original
 * rows with weights (weightedItemDescriptives, usableItemsFromDescriptives, completeDraws,
 * deferredSelection), against the same figures computed on the resampled matrix itself
 * (itemDescriptives, usableItems, completeRows on selectRespondents' copy): the counts, shares,
 * extremes, verdicts and notices bit for bit, the mean and standard deviation to 1e-12. The
 * reference functions are the core's, themselves checked in item-descriptives.test.ts and
 * correlation-matrix.test.ts. Then computeEvidence on a resample both ways: the same descriptives
 * the decision reads (n, missing rate, floor, ceiling), usable items, completeness and
 * Belsley-Kuh-Welsch figures.
 */
import { describe, expect, it } from 'vitest';
import { computeEvidence } from '../../src/lib/engine/compute-evidence';
import { resolveEngineSettings } from '../../src/lib/engine/engine-settings';
import type { EngineItem } from '../../src/lib/engine/types';
import { completeDraws, completeRows } from '../../src/lib/stats/complete-rows';
import { usableItems, usableItemsFromDescriptives } from '../../src/lib/stats/usable-items';
import { itemDescriptives, type ItemRange } from '../../src/lib/stats/item-descriptives';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { deferredSelection, selectItems, selectRespondents, type ItemMatrix } from '../../src/lib/stats/types';
import { weightedItemDescriptives } from '../../src/lib/stats/weighted-item-descriptives';

const ROWS = 60;

/**
 * A wave built to exercise every branch: items 0-3 rated 1-5 with scattered missing answers and
 * many answers at 1 and 5 (floor and ceiling), item 4 answered by respondents 0-2 only, item 5
 * constant except respondent 7 (constant in most resamples), item 6 answered by respondent 11
 * only, item 7 never answered, item 8 half-point answers without a stated range, item 9 constant.
 */
function wave(seed: number): ItemMatrix {
  const random = createSeededRandom(seed);
  const columns = 10;
  const data = new Float64Array(ROWS * columns).fill(Number.NaN);
  for (let i = 0; i < ROWS; i++) {
    const common = random.nextNormal();
    for (let j = 0; j < 4; j++) {
      const value = Math.min(5, Math.max(1, Math.round(3 + 1.6 * common + random.nextNormal())));
      data[j * ROWS + i] = random.next() < 0.12 ? Number.NaN : value;
    }
    if (i < 3) data[4 * ROWS + i] = 1 + i;
    data[5 * ROWS + i] = i === 7 ? 4 : 2;
    if (i === 11) data[6 * ROWS + i] = 3;
    data[8 * ROWS + i] = random.next() < 0.2 ? Number.NaN : 0.5 * Math.round(2 * random.next() * 4);
    data[9 * ROWS + i] = 3;
  }
  return { rows: ROWS, columns, data };
}

const RANGES: readonly (ItemRange | null)[] = [...Array.from({ length: 8 }, () => ({ min: 1, max: 5 })), null, { min: 1, max: 5 }];

function draws(seed: number): { rows: Int32Array; weights: Float64Array } {
  const random = createSeededRandom(seed);
  const rows = new Int32Array(ROWS);
  const weights = new Float64Array(ROWS);
  for (let k = 0; k < ROWS; k++) {
    rows[k] = random.nextInt(ROWS);
    weights[rows[k]]++;
  }
  return { rows, weights };
}

describe('the resample path against its copy', () => {
  const matrix = wave(31);
  Object.freeze(matrix);
  const original = Float64Array.from(matrix.data);

  for (const seed of [1, 2, 3, 4, 5, 6, 7, 8]) {
    it(`gives the same descriptives, usable items and complete rows (resample ${seed})`, () => {
      const { rows, weights } = draws(seed);
      const copy = selectRespondents(matrix, rows);
      const expected = itemDescriptives(copy, { ranges: RANGES });
      const actual = weightedItemDescriptives(matrix, weights, { ranges: RANGES });
      expect(actual).toHaveLength(expected.length);
      actual.forEach((entry, j) => {
        const { mean, standardDeviation, ...exact } = entry;
        const { mean: expectedMean, standardDeviation: expectedSd, ...expectedExact } = expected[j];
        // Counts and shares from integer weights: the same bits.
        expect(exact).toStrictEqual(expectedExact);
        expect(mean === null).toBe(expectedMean === null);
        expect(standardDeviation === null).toBe(expectedSd === null);
        if (mean !== null) expect(mean).toBeCloseTo(expectedMean as number, 12);
        if (standardDeviation !== null) expect(standardDeviation).toBeCloseTo(expectedSd as number, 12);
      });
      // The usable items and their notices, wording included.
      const usable = usableItemsFromDescriptives(actual);
      expect(usable).toStrictEqual(usableItems(copy));
      // The complete rows over the usable items, and their copy.
      const completeExpected = completeRows(selectItems(copy, usable.usable));
      const complete = completeDraws(matrix, rows, usable.usable);
      expect(complete).toStrictEqual(completeExpected);
      const taken = deferredSelection(matrix, complete.map((k) => rows[k]), usable.usable);
      expect(taken.data).toStrictEqual(selectRespondents(selectItems(copy, usable.usable), completeExpected).data);
      expect(deferredSelection(matrix, rows).data).toStrictEqual(copy.data);
      expect(matrix.data).toStrictEqual(original);
    });
  }

  it('meets the branches it is meant to (floor and ceiling shares, refused and constant-in-resample items)', () => {
    const verdicts = [1, 2, 3, 4, 5, 6, 7, 8].map((seed) => usableItemsFromDescriptives(weightedItemDescriptives(matrix, draws(seed).weights, { ranges: RANGES })));
    const codes = new Set(verdicts.flatMap((verdict) => verdict.notices.map((notice) => `${notice.items[0]}:${notice.code}`)));
    expect(codes.has('7:too-few-values')).toBe(true);
    expect(codes.has('9:constant-item')).toBe(true);
    // Item 5 varies only where respondent 7 is drawn: constant in some resamples, usable in others.
    expect(codes.has('5:constant-item')).toBe(true);
    expect(verdicts.some((verdict) => verdict.usable.includes(5))).toBe(true);
    const shares = weightedItemDescriptives(matrix, draws(1).weights, { ranges: RANGES });
    expect(shares[0].floorShare).toBeGreaterThan(0);
    expect(shares[0].ceilingShare).toBeGreaterThan(0);
    expect(shares[0].missingRate).toBeGreaterThan(0);
  });

  it('refuses weights that do not fit and infinite drawn answers', () => {
    expect(() => weightedItemDescriptives(matrix, new Float64Array(3))).toThrow(/3 weights for 60 rows/);
    expect(() => weightedItemDescriptives(matrix, new Float64Array(ROWS).fill(0.5))).toThrow(/non-negative integer/);
    const data = Float64Array.from(matrix.data);
    data[2 * ROWS + 5] = Infinity;
    const weights = new Float64Array(ROWS);
    weights[5] = 2;
    expect(() => weightedItemDescriptives({ rows: ROWS, columns: 10, data }, weights)).toThrow(/item 2 has an infinite value at respondent 5/);
    // A row not drawn is not read.
    weights[5] = 0;
    weights[6] = 1;
    expect(() => weightedItemDescriptives({ rows: ROWS, columns: 10, data }, weights)).not.toThrow();
  });
});

describe('computeEvidence on a resample, from the original rows and from its copy', () => {
  const matrix = wave(47);
  const items: EngineItem[] = Array.from({ length: matrix.columns }, (_, j) => ({
    id: `Q${j + 1}`,
    scale: j < 4 ? 'S' : null,
    text: `Item ${j + 1}`,
    locked: false,
    min: RANGES[j]?.min ?? null,
    max: RANGES[j]?.max ?? null,
  }));

  for (const missing of ['pairwise', 'listwise'] as const) {
    it(`reads the same descriptives, usable items and collinearity (${missing})`, () => {
      const settings = resolveEngineSettings({ seed: 1, method: 'pearson', missing });
      for (const seed of [11, 12, 13, 14]) {
        const { rows } = draws(seed);
        const expected = computeEvidence(selectRespondents(matrix, rows), items, settings, { detail: 'decision', inverse: true, localDependence: false });
        const actual = computeEvidence(deferredSelection(matrix, rows), items, settings, { detail: 'decision', inverse: true, localDependence: false, resampleOf: { matrix, rows } });
        expect(actual.usable).toStrictEqual(expected.usable);
        expect(actual.rows).toBe(expected.rows);
        expect(actual.completeData).toBe(expected.completeData);
        expect(actual.descriptives.map(({ n, missingRate, floor, ceiling }) => ({ n, missingRate, floor, ceiling }))).toStrictEqual(
          expected.descriptives.map(({ n, missingRate, floor, ceiling }) => ({ n, missingRate, floor, ceiling })),
        );
        expect(actual.collinearity).toStrictEqual(expected.collinearity);
        // Pairwise: the diagnostics come from the complete rows' copy taken from the original rows.
        if (missing === 'pairwise') expect(actual.collinearity?.rowsUsed).toBeGreaterThan(actual.usable.length + 1);
        expect(actual.warnings.map((warning) => warning.code)).toStrictEqual(expected.warnings.map((warning) => warning.code));
      }
    });
  }
});
