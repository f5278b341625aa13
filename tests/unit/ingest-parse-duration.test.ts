import { describe, expect, it } from 'vitest';
import { looksLikeTimeText, parseDuration } from '../../src/lib/ingest';

describe('parseDuration', () => {
  it('reads plain numbers in the stated unit', () => {
    expect(parseDuration('417')).toBe(417);
    expect(parseDuration('6.5', 'minutes')).toBe(390);
    expect(parseDuration('1500', 'milliseconds')).toBe(1.5);
    expect(parseDuration('6,5', 'minutes', ',')).toBe(390);
  });

  it('reads mm:ss and hh:mm:ss clock text (12:30 is 12 min 30 s)', () => {
    expect(parseDuration('12:30')).toBe(750);
    expect(parseDuration('1:02:03')).toBe(3723);
    expect(parseDuration('0:05:30.5')).toBe(330.5);
    expect(parseDuration('95:00')).toBe(5700);
  });

  it('reads ISO 8601 durations (ISO 8601-1: PnDTnHnMnS)', () => {
    expect(parseDuration('PT5M30S')).toBe(330);
    expect(parseDuration('PT1H')).toBe(3600);
    expect(parseDuration('P1DT1S')).toBe(86401);
  });

  it('gives NaN for blank, negative and unreadable cells', () => {
    for (const text of ['', '-5', 'fast', '12:75', 'P', 'PT', '1:2:3:4']) expect(parseDuration(text), text).toBeNaN();
  });
});

describe('looksLikeTimeText', () => {
  it('is true for clock and ISO text, not for plain numbers', () => {
    expect(['5:30', '0:05:30', 'PT5M'].map(looksLikeTimeText)).toEqual([true, true, true]);
    expect(['330', 'P', 'PT', 'x'].map(looksLikeTimeText)).toEqual([false, false, false, false]);
  });
});
