/**
 * Respondent screening (methods.md §6) against base-R values from
 * scripts/reference/ingest-screening.R (fixtures/reference/ingest-screening.json).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  answersAsGiven, DEFAULT_SCREENING_OPTIONS, longStringIndex, medianOf, missingShare, screenRespondents, speedCheck, withinPersonSd, type WaveItem,
} from '../../src/lib/ingest';
import { itemMatrixFromRows } from '../../src/lib/stats/types';

const reference = JSON.parse(readFileSync(join(import.meta.dirname, '..', '..', 'fixtures', 'reference', 'ingest-screening.json'), 'utf8')) as {
  answers: (number | null)[][]; durations: (number | null)[]; long_string: number[]; within_sd: (number | null)[];
  missing_share: number[]; median_duration: number; speeders_third: number[];
};
const answers = itemMatrixFromRows(reference.answers.map((row) => row.map((value) => value ?? Number.NaN)));
const durations = Float64Array.from(reference.durations, (value) => value ?? Number.NaN);

describe('screening statistics against R 4.2.2', () => {
  it('long-string index (Johnson 2005)', () => {
    const before = Float64Array.from(answers.data);
    // R 4.2.2: apply(answers, 1, function(r) max(rle(r[!is.na(r)])$lengths))
    expect(longStringIndex(answers)).toEqual(reference.long_string);
    expect(answers.data).toEqual(before);
  });

  it('within-person SD (Dunn et al. 2018)', () => {
    // R 4.2.2: apply(answers, 1, sd, na.rm = TRUE)  (NA for fewer than two answers)
    const sd = withinPersonSd(answers);
    reference.within_sd.forEach((expected, i) => {
      if (expected === null) expect(sd[i]).toBeNull();
      else expect(sd[i]).toBeCloseTo(expected, 12);
    });
  });

  it('share of items missing', () => {
    // R 4.2.2: rowMeans(is.na(answers))
    missingShare(answers).forEach((share, i) => expect(share).toBeCloseTo(reference.missing_share[i], 14));
  });

  it('median completion time and speeders below 1/3 of it', () => {
    // R 4.2.2: median(durations, na.rm = TRUE); which(durations < median / 3) - 1
    expect(medianOf(durations)).toBe(reference.median_duration);
    const check = speedCheck(durations, 1 / 3);
    expect(check.speeders).toEqual(reference.speeders_third);
    expect(check.threshold).toBeCloseTo(reference.median_duration / 3, 12);
    expect(check.ratio[4]).toBeNull();
    expect(() => speedCheck(durations, 0)).toThrow(RangeError);
    expect(medianOf([NaN])).toBeNull();
  });
});

const items: WaveItem[] = Array.from({ length: 7 }, (_, k) => ({
    id: `Q${k + 1}`, header: `Q${k + 1}`, scale: null, reverse: k === 6, min: 1, max: 5, missingCodes: [], text: null, labels: [], missingLabels: [],
    counts: { answered: 0, blank: 0, declaredMissing: 0, outOfRange: 0, nonNumeric: 0, unmappedLabel: 0, mappedLabel: 0 },
  }));
  // The wave stores item 7 reverse-scored; screening looks at the answers as given.
  const recoded = { ...answers, data: Float64Array.from(answers.data) };
  for (let i = 0; i < recoded.rows; i++) {
    const index = 6 * recoded.rows + i;
    if (!Number.isNaN(recoded.data[index])) recoded.data[index] = 6 - recoded.data[index];
  }
const wave = { matrix: recoded, items, duration: durations, respondents: recoded.rows };

describe('screenRespondents', () => {

  it('flips reverse-keyed items back to the answers as given', () => {
    expect(Array.from(answersAsGiven(wave).data)).toEqual(Array.from(answers.data));
  });

  it('flags each condition with its count and proposes the union for exclusion (defaults: common practice)', () => {
    const result = screenRespondents(wave);
    const flag = (code: string) => result.flags.find((candidate) => candidate.code === code);
    // Run threshold: max(5, ceil(0.5 × 7)) = 5; only respondent 0 (run 7, R above) reaches it.
    expect(flag('long-string')).toMatchObject({ threshold: 5, count: 1, respondents: [0] });
    // SD 0 with at least 3 answers: respondent 0 (respondent 4 has SD 0 from only 2 answers).
    expect(flag('low-variability')).toMatchObject({ count: 1, respondents: [0] });
    expect(flag('speeder')).toMatchObject({ count: 1, respondents: [1] });
    // More than half missing: respondents 4 (5/7) and 6 (6/7).
    expect(flag('mostly-missing')).toMatchObject({ count: 2, respondents: [4, 6] });
    expect(result.proposedExclusions).toEqual([0, 1, 4, 6]);
    expect(result.medianDuration).toBe(420);
    expect(result.options).toEqual(DEFAULT_SCREENING_OPTIONS);
    expect(result.duration?.[4]).toBeNull();
    expect(JSON.parse(JSON.stringify(result)).withinSd[6]).toBeNull();
  });

  it('takes configurable cut-offs and has no speeder flag without durations', () => {
    const result = screenRespondents({ ...wave, duration: null }, { longStringMinimum: 4, missingShareAbove: 0.8 });
    expect(result.flags.map((flag) => flag.code)).toEqual(['long-string', 'low-variability', 'mostly-missing']);
    expect(result.flags[0].respondents).toEqual([0, 2, 5, 7]);
    expect(result.flags[2].respondents).toEqual([6]);
    expect(() => screenRespondents(wave, { speederShare: 2 })).toThrow(RangeError);
  });
});

describe('screenRespondents on a scored test (psych::lsat6, LSAT section 6, Bock & Lieberman 1970)', () => {
  // scripts/reference/real-questionnaires.R → fixtures/reference/real-screening.json
  const real = JSON.parse(readFileSync(join(import.meta.dirname, '..', '..', 'fixtures', 'reference', 'real-screening.json'), 'utf8')) as {
    lsat6: { items: string[]; rows: number[][]; score_counts: number[] };
    lsat7: { items: string[]; rows: number[][]; score_counts: number[] };
  };
  const waveOf = (set: { items: string[]; rows: number[][] }, type?: 'rating' | 'scored' | 'dichotomous') => {
    const matrix = itemMatrixFromRows(set.rows);
    const testItems: WaveItem[] = set.items.map((id) => ({
      id, header: id, scale: 'test', reverse: false, min: 0, max: 1, missingCodes: [], text: null, labels: [], missingLabels: [],
      ...(type ? { type } : {}),
      counts: { answered: 0, blank: 0, declaredMissing: 0, outOfRange: 0, nonNumeric: 0, unmappedLabel: 0, mappedLabel: 0 },
    }));
    return { matrix, items: testItems, duration: null, respondents: matrix.rows };
  };

  it('never proposes excluding the best performers of a 0/1 test, and says which rules it applied', () => {
    for (const set of [real.lsat6, real.lsat7]) {
      for (const type of [undefined, 'scored', 'dichotomous'] as const) {
        const result = screenRespondents(waveOf(set, type));
        expect(result.proposedExclusions).toEqual([]);
        expect(result.flags.map((flag) => flag.code)).toEqual(['mostly-missing']);
        const rule = (code: string) => result.rules.find((entry) => entry.code === code);
        expect(rule('long-string')).toMatchObject({ applied: false, items: 0 });
        expect(rule('low-variability')?.applied).toBe(false);
        expect(rule('long-string')?.note).toMatch(/no rating-grid items/);
        expect(rule('mostly-missing')?.applied).toBe(true);
        expect(result.itemTypes[type ?? 'dichotomous']).toBe(5);
      }
    }
  });

  it('treated as a rating grid (the old behaviour) it would flag every perfect and every zero score', () => {
    const result = screenRespondents(waveOf(real.lsat6, 'rating'));
    // R 4.2.2: table(rowSums(lsat6)) → 3 examinees score 0 and 298 score 5 of 5: all 301 flagged.
    const expected = real.lsat6.score_counts[0] + real.lsat6.score_counts[5];
    expect(expected).toBe(301);
    expect(result.proposedExclusions.length).toBe(expected);
    expect(result.rules.find((entry) => entry.code === 'long-string')?.applied).toBe(true);
  });

  it('applies the grid rules to the rating items only in a mixed wave', () => {
    const mixed = { ...wave, items: items.map((item, k) => (k < 2 ? { ...item, type: 'scored' as const } : item)) };
    const result = screenRespondents({ ...mixed, duration: null });
    expect(result.itemTypes).toEqual({ rating: 5, scored: 2, dichotomous: 0 });
    expect(result.rules[0].note).toMatch(/5 rating-grid items only \(left out: 2 scored items/);
    // Run threshold over 5 grid items: max(5, ceil(2.5)) = 5.
    expect(result.flags[0].threshold).toBe(5);
  });
});

describe('screening indices on more respondents than one block of rows', () => {
  it('give the figures of reading each respondent across the items, one after another', () => {
    // Second opinion: the row-by-row loops the indices had before they read rows in blocks.
    const rows = 2_500;
    const columns = 13;
    let seed = 7;
    const next = () => ((seed = (seed * 1103515245 + 12345) >>> 0) >>> 8) / 2 ** 24;
    const data = Float64Array.from({ length: rows * columns }, (_, t) => (t % 97 === 0 || next() < 0.05 ? NaN : t % rows < 40 ? 3 : 1 + Math.floor(next() * 5)));
    const answers = { rows, columns, data };
    const longest: number[] = [];
    const sd: (number | null)[] = [];
    const missing: number[] = [];
    for (let i = 0; i < rows; i++) {
      let best = 0, run = 0, previous = NaN, count = 0, mean = 0, squares = 0, absent = 0;
      for (let j = 0; j < columns; j++) {
        const value = data[j * rows + i];
        if (Number.isNaN(value)) { absent++; continue; }
        run = value === previous ? run + 1 : 1;
        previous = value;
        best = Math.max(best, run);
        count++;
        const delta = value - mean;
        mean += delta / count;
        squares += delta * (value - mean);
      }
      longest.push(best);
      sd.push(count >= 2 ? Math.sqrt(squares / (count - 1)) : null);
      missing.push(absent / columns);
    }
    expect(longStringIndex(answers)).toEqual(longest);
    expect(withinPersonSd(answers)).toEqual(sd);
    expect(missingShare(answers)).toEqual(missing);
    expect(longest.slice(0, 40).every((run) => run >= 10)).toBe(true);
  });
});
