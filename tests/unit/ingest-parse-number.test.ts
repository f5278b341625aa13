import { describe, expect, it } from 'vitest';
import { isBlankCell, looksLikeFormula, parseNumber } from '../../src/lib/ingest';
import { trimCell } from '../../src/lib/ingest/parse-number';

describe('parseNumber', () => {
  it('reads plain decimal notation with a point (ISO 80000-1: decimal sign)', () => {
    expect(parseNumber(' 3 ', '.')).toBe(3);
    expect(parseNumber('-9', '.')).toBe(-9);
    expect(parseNumber('+4', '.')).toBe(4);
    expect(parseNumber('3.5', '.')).toBe(3.5);
    expect(parseNumber('.5', '.')).toBe(0.5);
    expect(parseNumber('1e3', '.')).toBe(1000);
  });

  it('reads decimal commas and thousands points where the file uses them', () => {
    expect(parseNumber('3,5', ',')).toBe(3.5);
    expect(parseNumber('1.234,5', ',')).toBe(1234.5);
    expect(parseNumber('12', ',')).toBe(12);
    expect(parseNumber('3,5', '.')).toBeNaN();
    expect(parseNumber('3.5', ',')).toBeNaN();
  });

  it('treats NaN and Infinity text, hex, formulas and blanks as no number; never returns −0', () => {
    for (const text of ['NaN', 'Infinity', '-Infinity', 'inf', '0x1F', '=1+2', '', '  ', '1 2', '3,5,1', 'yes']) {
      expect(parseNumber(text, '.'), text).toBeNaN();
    }
    expect(Object.is(parseNumber('-0', '.'), 0)).toBe(true);
    expect(parseNumber('1e400', '.')).toBeNaN();
  });
});

describe('parseNumber on plain digits (its fast path)', () => {
  it('reads every run of digits as Number() does, up to and past the fast path\'s 15 digits', () => {
    // ECMA-262 Number(string) (StringToNumber) is the reference the slow path uses after its check.
    const cells = ['0', '7', '10', '007', '00', '5', '99999', '123456789012345', '999999999999999', '1234567890123456', '98765432109876543210'];
    for (const cell of cells) {
      for (const separator of ['.', ','] as const) expect(parseNumber(cell, separator), `${cell} (${separator})`).toBe(Number(cell));
    }
    // Anything but digits leaves the fast path for the checked one.
    // Anything but ASCII digits leaves the fast path for the checked one: white space is trimmed,
    // other digits (Arabic-Indic, full-width) are text, as the pattern \d is ASCII only.
    const expected: [string, number][] = [['4 ', 4], [' 4', 4], ['4.', 4], ['4a', Number.NaN], ['٣', Number.NaN], ['４', Number.NaN]];
    for (const [cell, value] of expected) expect(parseNumber(cell, '.'), cell).toBe(value);
  });
});

describe('looksLikeFormula (OWASP "CSV Injection": cells starting with = + - @ tab CR)', () => {
  it('flags formula-looking text but not plain signed numbers', () => {
    for (const text of ['=1+2', '@SUM(A1)', '+cmd|/C calc', '-2+3', '\t=1', '-Infinity']) expect(looksLikeFormula(text, '.'), text).toBe(true);
    for (const text of ['-9', '+4', '3', 'Agree', '', '- ']) expect(looksLikeFormula(text, '.'), text).toBe(text === '- ');
  });
});

describe('isBlankCell', () => {
  it('is true only for empty or white-space cells', () => {
    expect(isBlankCell('')).toBe(true);
    expect(isBlankCell(' \t')).toBe(true);
    expect(isBlankCell('0')).toBe(false);
  });
});

describe('trimCell', () => {
  it('equals String.prototype.trim on every kind of edge (ECMA-262 white space and line terminators)', () => {
    const edges = ['', ' ', '\t', '\n', '\r', '\v', '\f', '\u00a0', '\u1680', '\u2000', '\u2028', '\u2029', '\u202f', '\u205f', '\u3000', '\ufeff', '\u0085', '\u007f', '\u0000'];
    const cores = ['', '3', '10', 'a b', 'Agree', '-1', '~', '!', 'é'];
    for (const before of edges) {
      for (const core of cores) {
        for (const after of edges) {
          const cell = `${before}${core}${after}`;
          expect(trimCell(cell), JSON.stringify(cell)).toBe(cell.trim());
        }
      }
    }
  });

  it('returns a cell with visible ASCII ends as it is', () => {
    const cell = '4';
    expect(trimCell(cell)).toBe(cell);
    expect(trimCell('a  b')).toBe('a  b');
  });
});
