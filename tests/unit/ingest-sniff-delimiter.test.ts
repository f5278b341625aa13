import { describe, expect, it } from 'vitest';
import { sniffDecimalSeparator, sniffDelimiter } from '../../src/lib/ingest';

describe('sniffDelimiter', () => {
  it('finds comma, semicolon, tab and pipe from consistent field counts', () => {
    expect(sniffDelimiter('id,Q1,Q2\n1,2,3\n2,3,4\n')).toBe(',');
    expect(sniffDelimiter('id;Q1;Q2\n1;2;3\n2;3;4\n')).toBe(';');
    expect(sniffDelimiter('id\tQ1\tQ2\n1\t2\t3\n')).toBe('\t');
    expect(sniffDelimiter('id|Q1|Q2\n1|2|3\n')).toBe('|');
  });

  it('is not misled by decimal commas in a semicolon file, even when every row has one', () => {
    // Under "," the header "id;score" is one field, so comma cannot be the delimiter.
    expect(sniffDelimiter('id;score\n1;3,5\n2;4,0\n')).toBe(';');
  });

  it('respects quotes: delimiters inside quoted fields do not count (RFC 4180 §2.6)', () => {
    expect(sniffDelimiter('id;comment\n1;"a, b, c"\n2;"d, e"\n')).toBe(';');
    expect(sniffDelimiter('id,comment\n1,"a; b; c"\n2,"x; y"\n')).toBe(',');
  });

  it('says comma for a one-column file', () => {
    expect(sniffDelimiter('score\n1\n2\n')).toBe(',');
  });
});

describe('sniffDecimalSeparator', () => {
  const rows = (cells: string[][]) => Object.freeze(cells.map((row) => Object.freeze(row)));
  it('finds decimal commas only when the delimiter is not a comma and no cell uses a point', () => {
    expect(sniffDecimalSeparator(rows([['w'], ['1,25'], ['2']]), ';')).toBe(',');
    expect(sniffDecimalSeparator(rows([['w'], ['1,25'], ['2.5']]), ';')).toBe('.');
    expect(sniffDecimalSeparator(rows([['w'], ['1,25']]), ',')).toBe('.');
    expect(sniffDecimalSeparator(rows([['w'], ['2']]), '\t')).toBe('.');
  });

  it('does not let a thousands group (1.234) decide, and skips the header', () => {
    expect(sniffDecimalSeparator(rows([['w'], ['1.234'], ['0,5']]), ';')).toBe(',');
    expect(sniffDecimalSeparator(rows([['3.5'], ['0,5']]), ';')).toBe(',');
  });
});
