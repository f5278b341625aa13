/**
 * Exported cells: formula-like text never runs in a spreadsheet, and CSV round-trips wording with
 * commas, quotes, line breaks and markup. The round trip is checked with an independent parser
 * (papaparse), not with our own writer's inverse.
 */
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { neutraliseCell, toCsv } from '../../src/lib/export/spreadsheet-cells';

describe('neutraliseCell', () => {
  it('prefixes every text that a spreadsheet would read as a formula', () => {
    // The starting characters OWASP lists for CSV injection: = + - @ tab carriage return.
    for (const dangerous of ['=1+1', '+SUM(A1)', '-2+3', '@cmd', '\t=1', '\r=1']) {
      expect(neutraliseCell(dangerous)).toBe(`'${dangerous}`);
    }
  });

  it('leaves ordinary text, numbers and empty cells alone', () => {
    expect(neutraliseCell('How often do you visit?')).toBe('How often do you visit?');
    expect(neutraliseCell('a=b')).toBe('a=b');
    expect(neutraliseCell(3)).toBe('3');
    expect(neutraliseCell(null)).toBe('');
  });
});

describe('toCsv', () => {
  const rows = [
    ['item', 'wording'],
    ['q1', 'Books, films and music'],
    ['q2', 'She said "often"\nthen "rarely"'],
    ['q3', '<b>Bold</b> & <i>italic</i>'],
    ['q4', '=HYPERLINK("http://evil.test")'],
    ['q5', 'Опрос участников'],
  ];

  it('round-trips through an independent CSV parser, with formulas made inert', () => {
    const csv = toCsv(rows);
    expect(csv.startsWith('\uFEFF')).toBe(true);
    const parsed = Papa.parse<string[]>(csv.slice(1), { skipEmptyLines: true }).data;
    expect(parsed).toEqual(rows.map((row) => row.map((cell) => (cell.startsWith('=') ? `'${cell}` : cell))));
  });

  it('ends every record with CRLF (RFC 4180)', () => {
    expect(toCsv([['a', 'b'], ['c', 'd']])).toBe('\uFEFFa,b\r\nc,d\r\n');
  });
});
