// Tests of the project's own synthetic-wave generator. The figures checked here are properties
// of our generator (what it was asked to plant), not claims about a statistic, so no outside
// reference is needed: each bound below is stated with the structure that justifies it.
import { describe, expect, it } from 'vitest';
import { generateWave } from '../../src/lib/synth/generate-wave';
import { randomUnplantedWaveSpec, randomWaveSpec } from '../../src/lib/synth/random-wave-spec';
import { codebookToCsv, toCsv } from '../../src/lib/synth/wave-csv';
import type { SyntheticWave, WaveSpec } from '../../src/lib/synth/types';
import { pairsOf, pairwisePearson, preparedColumn, rawColumn } from './synth-helpers';

function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === 'object') {
    Object.values(value as object).forEach(deepFreeze);
    Object.freeze(value);
  }
  return value;
}

const SPEC: WaveSpec = deepFreeze({
  respondents: 500,
  scales: [
    {
      name: 'alpha',
      points: 5,
      items: [
        { name: 'a1', text: 'a one' },
        { name: 'a2', text: 'a two' },
        { name: 'a3', text: 'a three', reverse: true },
        { name: 'a4', text: 'a four' },
        { name: 'a5', text: 'a five, twin of a2', twinOf: 'a2' },
        { name: 'a6', text: 'a six, reversed twin of a4', twinOf: 'a4', reverse: true },
      ],
    },
    {
      name: 'beta',
      points: 7,
      items: [
        { name: 'b1', text: 'b one' },
        { name: 'b2', text: 'b two' },
        { name: 'b3', text: 'b three' },
        { name: 'b4', text: 'b four, twin of b1', twinOf: 'b1' },
        { name: 'b5', text: 'b five, twin of b1', twinOf: 'b1' },
      ],
    },
  ],
  factorCorrelation: 0.3,
  loadingRange: [0.55, 0.78],
  twinNoise: 0.15,
  skew: 0.4,
  missingCodes: [
    { code: 8, label: "don't know", rate: 0.03 },
    { code: 9, label: 'prefer not to say', rate: 0.02 },
  ],
  blankRate: 0.02,
  constantItems: [{ name: 'b_const', text: 'always 6', scale: 'beta', value: 6 }],
  duplicateColumns: [{ source: 'a1', name: 'a1_copy' }],
  straightliners: 10,
  speeders: 12,
  medianDurationSeconds: 300,
  idColumn: 'rid',
  durationColumn: 'secs',
  firstRespondentId: 1000,
  outcome: { name: 'overall', text: 'overall 0-10', weights: [1, 1], noiseShare: 0.3 },
} satisfies WaveSpec);

const wave = generateWave(SPEC, 42);
const screened = new Set([...wave.truth.straightliners, ...wave.truth.speeders]);

function screenedColumn(source: SyntheticWave, name: string, reverse: boolean): (number | null)[] {
  return preparedColumn(source, name, { reverse }).map((value, i) => (screened.has(i) ? null : value));
}

describe('generateWave', () => {
  it('repeats exactly for the same seed and differs for another seed, without touching the spec', () => {
    expect(generateWave(SPEC, 42)).toEqual(wave);
    const other = generateWave(SPEC, 43);
    expect(rawColumn(other, 'a1')).not.toEqual(rawColumn(wave, 'a1'));
    expect(Object.isFrozen(SPEC.scales[0].items)).toBe(true); // the frozen spec was read only
  });

  it('lays out id, duration, the items scale by scale with constants and copies, then the outcome', () => {
    expect(wave.columns.map((column) => column.name)).toEqual([
      'rid', 'secs', 'a1', 'a2', 'a3', 'a4', 'a5', 'a6', 'a1_copy', 'b1', 'b2', 'b3', 'b4', 'b5', 'b_const', 'overall',
    ]);
    for (const column of wave.columns) expect(column.values).toHaveLength(500);
    expect(rawColumn(wave, 'rid')).toEqual(Array.from({ length: 500 }, (_, i) => 1000 + i));
    expect(wave.codebook.map((row) => row.item)).toEqual(wave.columns.slice(2).map((column) => column.name));
    const byItem = new Map(wave.codebook.map((row) => [row.item, row]));
    expect(byItem.get('a3')).toMatchObject({ scale: 'alpha', reverse: true, min: 1, max: 5, missing: [8, 9] });
    expect(byItem.get('a6')?.reverse).toBe(true);
    expect(byItem.get('b1')).toMatchObject({ scale: 'beta', reverse: false, min: 1, max: 7 });
    expect(byItem.get('overall')).toMatchObject({ scale: '', min: 0, max: 10, missing: [] });
  });

  it('records the planted structure in the truth', () => {
    expect(wave.truth.plantedPairs).toEqual([['a2', 'a5'], ['a4', 'a6'], ['b1', 'b4'], ['b1', 'b5'], ['b4', 'b5']]);
    expect(wave.truth.reverseTwins).toEqual([['a4', 'a6']]);
    expect(wave.truth.duplicates).toEqual([['a1', 'a1_copy']]);
    expect(wave.truth.constantItems).toEqual(['b_const']);
    expect(wave.truth.scales).toEqual([
      { name: 'alpha', points: 5, items: ['a1', 'a2', 'a3', 'a4', 'a5', 'a6', 'a1_copy'] },
      { name: 'beta', points: 7, items: ['b1', 'b2', 'b3', 'b4', 'b5', 'b_const'] },
    ]);
    expect(wave.truth.straightliners).toHaveLength(10);
    expect(wave.truth.speeders).toHaveLength(12);
    expect(screened.size).toBe(22); // nobody is both
    expect(wave.truth.outcome).toBe('overall');
  });

  it('stores only valid answers, missing codes or blanks', () => {
    for (const scale of wave.truth.scales) {
      for (const item of scale.items) {
        for (const value of rawColumn(wave, item)) {
          if (value === null || value === 8 || value === 9) continue;
          expect(Number.isInteger(value) && (value as number) >= 1 && (value as number) <= scale.points).toBe(true);
        }
      }
    }
    for (const value of rawColumn(wave, 'overall')) {
      if (value !== null) expect(Number.isInteger(value) && (value as number) >= 0 && (value as number) <= 10).toBe(true);
    }
  });

  it('plants near-duplicates that correlate at 0.8 or more after recoding, and no other pair near that', () => {
    // twinNoise 0.15 gives latent r = 1/sqrt(1.0225) ≈ 0.99 (0.978 between two twins); loadings
    // at most 0.78 give at most 0.61 between other items of a scale before discretisation.
    const planted = new Set(wave.truth.plantedPairs.map((pair) => pair.join('|')));
    const copies = new Set(wave.truth.duplicates.map((pair) => pair.join('|')));
    for (const scale of wave.truth.scales) {
      const items = scale.items.filter((item) => !wave.truth.constantItems.includes(item));
      for (const [a, b] of pairsOf(items)) {
        const r = pairwisePearson(screenedColumn(wave, a, true), screenedColumn(wave, b, true));
        if (planted.has(`${a}|${b}`)) expect(r, `${a}-${b}`).toBeGreaterThanOrEqual(0.85);
        else if (!copies.has(`${a}|${b}`)) expect(r, `${a}-${b}`).toBeLessThanOrEqual(0.72);
      }
    }
  });

  it('stores the reverse-worded twin reversed: strongly negative before recoding', () => {
    const r = pairwisePearson(screenedColumn(wave, 'a4', false), screenedColumn(wave, 'a6', false));
    expect(r).toBeLessThanOrEqual(-0.85);
  });

  it('copies the duplicated column exactly and keeps the constant item constant', () => {
    expect(rawColumn(wave, 'a1_copy')).toEqual(rawColumn(wave, 'a1'));
    expect(new Set(rawColumn(wave, 'b_const'))).toEqual(new Set([6]));
  });

  it('replaces answers by missing codes and blanks near the stated rates', () => {
    // Ordinary respondents and speeders lose answers at the stated rates; straightliners never.
    const straight = new Set(wave.truth.straightliners);
    const counts = new Map<number | null, number>([[8, 0], [9, 0], [null, 0]]);
    let cells = 0;
    const items = wave.truth.scales.flatMap((scale) => scale.items).filter((item) => item !== 'b_const' && item !== 'a1_copy');
    for (const item of items) {
      rawColumn(wave, item).forEach((value, i) => {
        if (straight.has(i)) {
          expect(value === null || value === 8 || value === 9).toBe(false);
          return;
        }
        cells++;
        if (counts.has(value as number | null)) counts.set(value as number | null, (counts.get(value as number | null) as number) + 1);
      });
    }
    for (const [key, rate] of [[8, 0.03], [9, 0.02], [null, 0.02]] as const) {
      const share = (counts.get(key) as number) / cells;
      const binomialSd = Math.sqrt((rate * (1 - rate)) / cells);
      expect(Math.abs(share - rate), `code ${key}`).toBeLessThan(4 * binomialSd);
    }
  });

  it('makes straightliners repeat one answer and speeders finish in under a third of the median time', () => {
    const items = wave.truth.scales.flatMap((scale) => scale.items).filter((item) => item !== 'b_const');
    for (const row of wave.truth.straightliners) {
      expect(new Set(items.map((item) => rawColumn(wave, item)[row])).size).toBe(1);
    }
    const durations = rawColumn(wave, 'secs') as number[];
    const sorted = [...durations].sort((x, y) => x - y);
    const median = (sorted[249] + sorted[250]) / 2;
    const speeders = new Set(wave.truth.speeders);
    durations.forEach((seconds, i) => {
      if (speeders.has(i)) expect(seconds).toBeLessThan(median / 3);
      else expect(seconds).toBeGreaterThan(median / 2);
    });
  });

  it('drives the outcome by the factors', () => {
    const outcome = rawColumn(wave, 'overall') as (number | null)[];
    const a1 = screenedColumn(wave, 'a1', true);
    expect(pairwisePearson(a1, outcome)).toBeGreaterThan(0.2);
  });

  it('refuses inconsistent specs with a message naming the function', () => {
    const bad = (change: Partial<WaveSpec>): (() => unknown) => () => generateWave({ ...SPEC, ...change }, 1);
    expect(bad({ respondents: 5 })).toThrow(/generateWave: respondents/);
    expect(bad({ missingCodes: [{ code: 3, label: 'x', rate: 0.1 }] })).toThrow(/generateWave: missing code 3/);
    expect(bad({ duplicateColumns: [{ source: 'zz', name: 'zz2' }] })).toThrow(/generateWave: duplicate column "zz2"/);
    expect(bad({ duplicateColumns: [{ source: 'a1', name: 'a2' }] })).toThrow(/generateWave: column name "a2" is used twice/);
    expect(bad({ scales: [{ name: 's', points: 5, items: [{ name: 'x', text: 'x', twinOf: 'y' }] }], outcome: null, constantItems: [], duplicateColumns: [] })).toThrow(/generateWave: twin "x"/);
    expect(bad({ loadingRange: [0.8, 0.5] })).toThrow(RangeError);
    expect(() => generateWave(SPEC, 1.5)).toThrow(RangeError);
  });
});

describe('randomWaveSpec and randomUnplantedWaveSpec', () => {
  it('repeat for the same seed', () => {
    expect(randomWaveSpec(7)).toEqual(randomWaveSpec(7));
    expect(randomWaveSpec(7)).not.toEqual(randomWaveSpec(8));
  });

  it('draw structures within the stated ranges', () => {
    const clusterCounts = new Set<number>();
    for (let seed = 1; seed <= 60; seed++) {
      const spec = randomWaveSpec(seed);
      expect(spec.scales.length).toBeGreaterThanOrEqual(3);
      expect(spec.scales.length).toBeLessThanOrEqual(7);
      expect(spec.respondents).toBeGreaterThanOrEqual(150);
      expect(spec.respondents).toBeLessThanOrEqual(600);
      let clusters = 0;
      for (const scale of spec.scales) {
        expect([5, 7]).toContain(scale.points);
        const base = scale.items.filter((item) => item.twinOf === undefined);
        expect(base.length).toBeGreaterThanOrEqual(3);
        expect(base.length).toBeLessThanOrEqual(8);
        clusters += new Set(scale.items.flatMap((item) => (item.twinOf === undefined ? [] : [item.twinOf]))).size;
      }
      expect(clusters).toBeLessThanOrEqual(3);
      clusterCounts.add(clusters);
      const unplanted = randomUnplantedWaveSpec(seed);
      expect(unplanted.scales.flatMap((scale) => scale.items).some((item) => item.twinOf !== undefined)).toBe(false);
    }
    expect([...clusterCounts].sort()).toEqual([0, 1, 2, 3]);
  });

  it('give waves whose planted pairs stand clear of every other pair', () => {
    // The engine's evaluation (issue 5) relies on this separation in the generator.
    for (let seed = 1; seed <= 12; seed++) {
      for (const spec of [randomWaveSpec(seed), randomUnplantedWaveSpec(seed)]) {
        const generated = generateWave(spec, seed);
        const planted = new Set(generated.truth.plantedPairs.map((pair) => pair.join('|')));
        const items = generated.truth.scales.flatMap((scale) => scale.items);
        const prepared = new Map(items.map((item) => [item, preparedColumn(generated, item, { reverse: true })]));
        for (const [a, b] of pairsOf(items)) {
          const r = pairwisePearson(prepared.get(a)!, prepared.get(b)!);
          if (planted.has(`${a}|${b}`)) expect(r, `seed ${seed} ${a}-${b}`).toBeGreaterThanOrEqual(0.8);
          else expect(r, `seed ${seed} ${a}-${b}`).toBeLessThan(0.75);
        }
      }
    }
  });
});

describe('toCsv and codebookToCsv', () => {
  it('write RFC 4180 fields: blanks empty, quotes doubled, fields with commas or line breaks quoted', () => {
    const csv = toCsv({ columns: [{ name: 'id', values: [1, 2] }, { name: 'note', values: ['a, "b"', null] }, { name: 'x', values: ['two\nlines', 3] }] });
    expect(csv).toBe('id,note,x\r\n1,"a, ""b""","two\nlines"\r\n2,,3\r\n');
    expect(() => toCsv({ columns: [{ name: 'a', values: [1] }, { name: 'b', values: [] }] })).toThrow(/toCsv: column "b"/);
  });

  it('write the codebook with yes/no and space-separated missing codes', () => {
    const lines = codebookToCsv(wave.codebook).split('\r\n');
    expect(lines[0]).toBe('item,scale,reverse,min,max,missing,text');
    expect(lines[3]).toBe('a3,alpha,yes,1,5,8 9,a three');
    expect(lines).toContain('a5,alpha,no,1,5,8 9,"a five, twin of a2"');
  });
});
