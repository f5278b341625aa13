import { describe, expect, it } from 'vitest';
import { guessAnswerRange } from '../../src/lib/ingest';

describe('guessAnswerRange', () => {
  it('takes common codes beyond the answers as missing codes (8/9 after 1..5, 99 after 0..10, -9 before 1..5)', () => {
    expect(guessAnswerRange(Object.freeze([1, 2, 3, 4, 5, 8, 9]))).toEqual({ min: 1, max: 5, missingCodes: [8, 9] });
    expect(guessAnswerRange([0, 3, 5, 7, 10, 9, 8, 99])).toEqual({ min: 0, max: 10, missingCodes: [99] });
    expect(guessAnswerRange([1, 2, 3, 4, 5, -9])).toEqual({ min: 1, max: 5, missingCodes: [-9] });
  });

  it('keeps a code next to the answers as an answer (8 after 1..7), and ordinary values always', () => {
    expect(guessAnswerRange([1, 2, 3, 4, 5, 6, 7, 8])).toEqual({ min: 1, max: 8, missingCodes: [] });
    expect(guessAnswerRange([1, 2, 3, 12])).toEqual({ min: 1, max: 12, missingCodes: [] });
  });

  it('does not call a code missing when the answers themselves are as far apart (few respondents)', () => {
    expect(guessAnswerRange([2, 4, 6, 8])).toEqual({ min: 2, max: 8, missingCodes: [] });
    expect(guessAnswerRange([1, 3, 4, 5, 8])).toEqual({ min: 1, max: 5, missingCodes: [8] });
  });

  it('returns null without values', () => {
    expect(guessAnswerRange([])).toBeNull();
  });
});
