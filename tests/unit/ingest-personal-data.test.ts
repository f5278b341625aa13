import { describe, expect, it } from 'vitest';
import { findPersonalData, looksLikeEmail, looksLikePhoneNumber } from '../../src/lib/ingest';
import { SAMPLE_CELLS } from '../../src/lib/ingest/ingest-thresholds';
import { sampleCells, samplePositions } from '../../src/lib/ingest/personal-data';

describe('looksLikeEmail (RFC 5321 §4.1.2: local-part@domain)', () => {
  it('recognises addresses and not other text', () => {
    expect(looksLikeEmail('ann.lee@example.org')).toBe(true);
    expect(looksLikeEmail('a+b@sub.example.co.uk')).toBe(true);
    expect(['@example.org', 'ann@', 'ann at example.org', 'a@b'].map(looksLikeEmail)).toEqual([false, false, false, false]);
  });
});

describe('looksLikePhoneNumber (ITU-T E.164: at most 15 digits)', () => {
  it('recognises grouped, international and leading-zero numbers but not plain ids or ratings', () => {
    for (const text of ['+44 20 7946 0001', '020 7946 0002', '(020) 7946-0003', '0161 496 0005', '07946000123']) expect(looksLikePhoneNumber(text), text).toBe(true);
    for (const text of ['1234567', '5', '3.5', '+1234567890123456', '12:30', '1990-01-01', '01.02.1990', '3.3333333', '0.1428571', '12345.6789012', '2,6666667']) expect(looksLikePhoneNumber(text), text).toBe(false);
  });
});

describe('findPersonalData', () => {
  const cells = (...values: string[]) => Object.freeze(values);
  it('finds e-mail addresses and phone numbers by their values, whatever the header', () => {
    expect(findPersonalData('contact', cells('a@example.org', 'b@example.org', ''), '.')).toEqual({ what: 'e-mail addresses', fromValues: true });
    expect(findPersonalData('x', cells('+44 20 7946 0001', '020 7946 0002'), '.')).toEqual({ what: 'phone numbers', fromValues: true });
  });

  it('finds names, addresses and dates of birth by the header', () => {
    expect(findPersonalData('FirstName', cells('3'), '.')?.what).toBe('names');
    expect(findPersonalData('post_code', cells('1'), '.')?.what).toBe('postal addresses');
    expect(findPersonalData('DOB', cells('1990-01-01'), '.')?.what).toBe('dates of birth');
  });

  it('finds personal names and free text by their values, but not answer labels', () => {
    expect(findPersonalData('who', cells('Ann Lee', 'Bo Chan', 'Cy van Dijk'), '.')?.what).toBe('names');
    expect(findPersonalData('remarks', cells('The reading room should open earlier', 'More new novels would be welcome'), '.')?.what).toBe('free text');
    expect(findPersonalData('Q1', cells('Neither agree nor disagree', 'Strongly Agree', 'Strongly Disagree'), '.')).toBeNull();
    expect(findPersonalData('Q1', cells('1', '2', '5'), '.')).toBeNull();
  });
});

describe('samplePositions', () => {
  it('are the positions sampleCells takes: all of up to SAMPLE_CELLS cells, else SAMPLE_CELLS evenly spaced ones', () => {
    for (const length of [0, 1, 7, SAMPLE_CELLS, SAMPLE_CELLS + 1, 4_999, 100_000]) {
      const cells = Array.from({ length }, (_, k) => `c${k}`);
      const positions = samplePositions(length);
      expect(positions.map((position) => cells[position])).toEqual([...sampleCells(cells)]);
      expect(positions.length).toBe(Math.min(length, SAMPLE_CELLS));
      for (let k = 1; k < positions.length; k++) expect(positions[k]).toBeGreaterThan(positions[k - 1]);
    }
    // Hand-worked: 4,000 cells give every second one, 0, 2, 4, ...
    expect(samplePositions(2 * SAMPLE_CELLS).slice(0, 3)).toEqual([0, 2, 4]);
  });
});
