// Tests of the demo wave (invented Riverbend City Libraries member survey). They check properties
// of our own generator's output and that the committed files under fixtures/demo match it; no
// statistic is claimed, so no outside reference is needed.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import * as XLSX from 'xlsx-republish';
import { DEMO_SPEC, demoWave, HOME_SERVICE_SPEC, homeServiceWave } from '../../src/lib/synth/demo';
import { codebookToCsv, toCsv } from '../../src/lib/synth/wave-csv';
import { pairsOf, pairwisePearson, preparedColumn, rawColumn } from './synth-helpers';

const wave = demoWave();
const FIXTURES = fileURLToPath(new URL('../../fixtures/demo/', import.meta.url));

describe('demoWave', () => {
  it('is the same on every call', () => {
    expect(demoWave()).toEqual(wave);
  });

  it('has the stated shape: 400 respondents, 6 scales, 41 item columns, id, duration, outcome, comments, e-mail', () => {
    for (const column of wave.columns) expect(column.values).toHaveLength(400);
    expect(wave.truth.scales.map((scale) => [scale.name, scale.points, scale.items.length])).toEqual([
      ['collections', 5, 7],
      ['hours_access', 5, 7],
      ['staff_help', 7, 6],
      ['digital', 5, 7],
      ['spaces', 5, 7],
      ['events', 5, 7],
    ]);
    const names = wave.columns.map((column) => column.name);
    expect(names.slice(0, 2)).toEqual(['respondent_id', 'duration_sec']);
    expect(names.slice(-3)).toEqual(['overall_sat', 'comments', 'email']);
    expect(names).toHaveLength(2 + 41 + 3);
    expect(wave.codebook.map((row) => row.item)).toEqual(names.slice(2, -2)); // personal data not in the codebook
    expect(new Set(rawColumn(wave, 'respondent_id')).size).toBe(400);
  });

  it('gives every item its own wording', () => {
    const texts = wave.codebook.filter((row) => row.item !== 'events_3b').map((row) => row.text);
    expect(new Set(texts).size).toBe(texts.length);
  });

  it('plants the stated pairs, triple, reverse twin, copy and constant', () => {
    expect(wave.truth.plantedPairs).toEqual([
      ['coll_2', 'coll_7'],
      ['staff_2', 'staff_6'],
      ['dig_1', 'dig_4'],
      ['dig_1', 'dig_7'],
      ['dig_4', 'dig_7'],
      ['space_1', 'space_6'],
    ]);
    expect(wave.truth.reverseTwins).toEqual([['staff_2', 'staff_6']]);
    expect(wave.codebook.filter((row) => row.reverse).map((row) => row.item)).toEqual(['staff_6']);
    expect(wave.truth.duplicates).toEqual([['events_3', 'events_3b']]);
    expect(rawColumn(wave, 'events_3b')).toEqual(rawColumn(wave, 'events_3'));
    expect(wave.truth.constantItems).toEqual(['hours_7']);
    expect(new Set(rawColumn(wave, 'hours_7'))).toEqual(new Set([5]));
  });

  it('has planted pairs at r >= 0.8 after recoding and every other pair within a scale at r <= 0.75', () => {
    // Pearson on all 400 respondents, pairwise, missing codes and blanks removed, staff_6 recoded.
    const planted = new Set(wave.truth.plantedPairs.map((pair) => pair.join('|')));
    for (const scale of wave.truth.scales) {
      const items = scale.items.filter((item) => item !== 'hours_7' && item !== 'events_3b');
      for (const [a, b] of pairsOf(items)) {
        const r = pairwisePearson(preparedColumn(wave, a, { reverse: true }), preparedColumn(wave, b, { reverse: true }));
        if (planted.has(`${a}|${b}`)) expect(r, `${a}-${b}`).toBeGreaterThanOrEqual(0.8);
        else expect(r, `${a}-${b}`).toBeLessThanOrEqual(0.75);
      }
    }
  });

  it('stores the reverse-worded twin reversed: strongly negative before recoding', () => {
    const r = pairwisePearson(preparedColumn(wave, 'staff_2', { reverse: false }), preparedColumn(wave, 'staff_6', { reverse: false }));
    expect(r).toBeLessThanOrEqual(-0.8);
  });

  it('uses missing codes 8 and 9 and blanks near the stated rates', () => {
    const straight = new Set(wave.truth.straightliners);
    const items = wave.truth.scales.flatMap((scale) => scale.items).filter((item) => item !== 'hours_7' && item !== 'events_3b');
    const values = items.flatMap((item) => rawColumn(wave, item).filter((_, i) => !straight.has(i)));
    for (const [key, rate] of [[8, 0.02], [9, 0.01], [null, 0.015]] as const) {
      const share = values.filter((value) => value === key).length / values.length;
      expect(Math.abs(share - rate), `code ${key}`).toBeLessThan(4 * Math.sqrt((rate * (1 - rate)) / values.length));
    }
    expect(wave.codebook.find((row) => row.item === 'coll_1')?.missing).toEqual([8, 9]);
  });

  it('has a handful of straightliners and speeders', () => {
    expect(wave.truth.straightliners).toHaveLength(DEMO_SPEC.straightliners);
    expect(wave.truth.speeders).toHaveLength(DEMO_SPEC.speeders);
    const durations = rawColumn(wave, 'duration_sec') as number[];
    const median = [...durations].sort((x, y) => x - y)[200];
    for (const row of wave.truth.speeders) expect(durations[row]).toBeLessThan(median / 3);
  });

  it('holds invented personal data only at reserved example domains, mostly blank', () => {
    const emails = rawColumn(wave, 'email').filter((value) => value !== null) as string[];
    expect(emails.length).toBeGreaterThan(50);
    expect(emails.length).toBeLessThan(200);
    for (const email of emails) expect(email).toMatch(/^[a-z]+\.[a-z]+\d+@example\.(org|com|net)$/);
    const comments = rawColumn(wave, 'comments').filter((value) => value !== null);
    expect(comments.length).toBeGreaterThan(40);
    expect(comments.every((comment) => typeof comment === 'string')).toBe(true);
  });

  it('outcome 0-10 rises with the items', () => {
    const outcome = rawColumn(wave, 'overall_sat') as (number | null)[];
    expect(pairwisePearson(preparedColumn(wave, 'coll_1', { reverse: true }), outcome)).toBeGreaterThan(0.2);
  });
});

describe('homeServiceWave (the demo\'s second study)', () => {
  const home = homeServiceWave();

  it('is the same on every call and has the stated shape: 300 respondents, 14 items in three scales, an outcome', () => {
    expect(homeServiceWave()).toEqual(home);
    expect(home.columns[0].values).toHaveLength(300);
    expect(home.truth.scales.map((scale) => scale.items.length)).toEqual([5, 5, 4]);
    expect(home.codebook.map((row) => row.item)).toEqual([...HOME_SERVICE_SPEC.scales.flatMap((scale) => scale.items.map((item) => item.name)), 'overall_sat']);
  });

  it('has its two planted pairs at r >= 0.8 and every other pair within a scale at r <= 0.75', () => {
    const planted = new Set(home.truth.plantedPairs.map((pair) => pair.join('|')));
    expect([...planted].sort()).toEqual(['choice_1|choice_4', 'visit_2|visit_5']);
    for (const scale of home.truth.scales) {
      for (const [a, b] of pairsOf(scale.items)) {
        const r = pairwisePearson(preparedColumn(home, a, { reverse: true }), preparedColumn(home, b, { reverse: true }));
        if (planted.has(`${a}|${b}`)) expect(r, `${a}-${b}`).toBeGreaterThanOrEqual(0.8);
        else expect(r, `${a}-${b}`).toBeLessThanOrEqual(0.75);
      }
    }
  });
});

describe('fixtures/demo (written by scripts/make-demo.ts)', () => {
  it('match the generator: regenerate with `npx tsx scripts/make-demo.ts` when this fails', () => {
    expect(readFileSync(join(FIXTURES, 'library-pilot-1.csv'), 'utf8')).toBe(toCsv(wave));
    expect(readFileSync(join(FIXTURES, 'library-codebook.csv'), 'utf8')).toBe(codebookToCsv(wave.codebook));
    const home = homeServiceWave();
    expect(readFileSync(join(FIXTURES, 'home-service-pilot.csv'), 'utf8')).toBe(toCsv(home));
    expect(readFileSync(join(FIXTURES, 'home-service-codebook.csv'), 'utf8')).toBe(codebookToCsv(home.codebook));
  });

  it('workbook has the sheets responses and codebook with the same cells', () => {
    const workbook = XLSX.read(readFileSync(join(FIXTURES, 'library-pilot-1.xlsx')));
    expect(workbook.SheetNames).toEqual(['responses', 'codebook']);
    const responses = XLSX.utils.sheet_to_json<(number | string | null)[]>(workbook.Sheets.responses, { header: 1, defval: null });
    expect(responses[0]).toEqual(wave.columns.map((column) => column.name));
    expect(responses).toHaveLength(401);
    expect(responses[10]).toEqual(wave.columns.map((column) => column.values[9]));
    const codebook = XLSX.utils.sheet_to_json<(number | string)[]>(workbook.Sheets.codebook, { header: 1 });
    expect(codebook[0]).toEqual(['item', 'scale', 'reverse', 'min', 'max', 'missing', 'text']);
    expect(codebook).toHaveLength(wave.codebook.length + 1);
  });
});
