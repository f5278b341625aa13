import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { wordingSimilarity } from '../../src/lib/engine/wording-similarity';

interface WordingFixture {
  texts: (string | null)[];
  similarity: (number | null)[][];
}

// R 4.2.2, base R only: scripts/reference/engine-wording-similarity.R (character 3-gram tf-idf cosine)
const fixture = JSON.parse(readFileSync(new URL('../../fixtures/reference/engine-wording-similarity.json', import.meta.url), 'utf8')) as WordingFixture;

describe('wordingSimilarity', () => {
  it('matches the independent R computation on every pair', () => {
    const texts = Object.freeze([...fixture.texts]);
    const result = wordingSimilarity(texts);
    expect(texts).toEqual(fixture.texts);
    expect(result.length).toBe(fixture.similarity.length);
    fixture.similarity.forEach((row, i) => {
      row.forEach((expected, j) => {
        if (expected === null) expect(result[i][j]).toBeNull();
        else expect(result[i][j]).toBeCloseTo(expected, 12); // R 4.2.2: scripts/reference/engine-wording-similarity.R
      });
    });
  });

  it('is 1 for wording that differs only in case, accents and punctuation, 0 with no gram in common, and symmetric', () => {
    const result = wordingSimilarity(['Café opening hours suit me.', 'CAFE opening hours, suit me', 'xyz', 'qqq']);
    expect(result[0][1]).toBeCloseTo(1, 14); // identity: same normalised text
    expect(result[2][3]).toBe(0); // identity: " xyz " and " qqq " share no 3-gram
    for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) expect(result[i][j]).toBe(result[j][i]);
  });

  it('gives null wherever a wording is unknown or blank', () => {
    const result = wordingSimilarity([null, 'Staff are friendly.', '   ', undefined]);
    expect(result[0]).toEqual([null, null, null, null]);
    expect(result[1]).toEqual([null, 1, null, null]);
    expect(result[2][2]).toBeNull();
  });

  it('refuses input that is not an array of strings or nulls', () => {
    expect(() => wordingSimilarity('text' as unknown as string[])).toThrow(/wordingSimilarity: texts must be an array/);
    expect(() => wordingSimilarity(['a', 3 as unknown as string])).toThrow(/texts\[1\] must be a string or null/);
  });
});
