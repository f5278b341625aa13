import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { readDelimitedText, resolveReadLimits, WaveRefusal } from '../../src/lib/ingest';

const limits = resolveReadLimits();

describe('readDelimitedText', () => {
  it('keeps quoted line breaks, doubled quotes and delimiters inside fields (RFC 4180 §2.5-2.7)', () => {
    const read = readDelimitedText('id,comment\r\n1,"two\r\nlines, and ""quotes"""\r\n2,plain\r\n', 'a.csv', limits);
    expect(read.grid.rows.slice(0, 3)).toEqual([['id', 'comment'], ['1', 'two\r\nlines, and "quotes"'], ['2', 'plain']]);
    // The second record starts on line 2; the third on line 4, after the embedded line break.
    expect(read.grid.fileRows.slice(0, 3)).toEqual([1, 2, 4]);
  });

  it('numbers the records by the line breaks before them, whatever the line ends (LF, CRLF, CR, mixed, in quotes or not)', () => {
    // Second opinion: papaparse's cursor after each record, and the line breaks of the text consumed
    // since the previous one counted by a regular expression (the reader's former way).
    const texts = [
      'a,b\n1,2\n3,4\n',
      'a,b\r\n1,2\r\n3,4',
      'a,b\r1,2\r3,4\r',
      'a,b\n1,x\ry\n3,4\r\n5,6\n',
      'a,b\r\n1,"x\ny"\r\n3,"p\r\nq\rr"\r\n5,6\r\n',
      'a,b\n1,"x\r\ny"\n\n3,4\n',
      'a,b\r\n1,2\r\r\n3,4\n\r',
      'a,b',
    ];
    for (const text of texts) {
      const read = readDelimitedText(text, 'a.csv', limits);
      const expected: number[] = [];
      let line = 1;
      let last = 0;
      Papa.parse<string[]>(text, {
        delimiter: ',',
        skipEmptyLines: false,
        step: (result) => {
          expected.push(line);
          line += (text.slice(last, result.meta.cursor).match(/\r\n|\r|\n/g) ?? []).length;
          last = result.meta.cursor;
        },
      });
      expect(read.grid.fileRows, JSON.stringify(text)).toEqual(expected);
    }
  });

  it('takes the delimiter from an Excel "sep=" first line and numbers lines after it', () => {
    const read = readDelimitedText('sep=;\r\nid;Q1\r\n1;2,5\r\n', 'a.csv', limits);
    expect(read.delimiter).toBe(';');
    expect(read.decimalSeparator).toBe(',');
    expect(read.grid.rows[0]).toEqual(['id', 'Q1']);
    expect(read.grid.fileRows[0]).toBe(2);
  });

  it('refuses a quoted field that never closes, naming its line', () => {
    try {
      readDelimitedText('id,c\n1,ok\n2,"open\n3,x\n', 'a.csv', limits);
      throw new Error('expected a refusal');
    } catch (error) {
      expect(error).toBeInstanceOf(WaveRefusal);
      expect((error as WaveRefusal).code).toBe('unterminated-quote');
      expect((error as WaveRefusal).message).toMatch(/line 3/);
    }
  });

  it('stops reading one row past the row limit', () => {
    const text = `id\n${Array.from({ length: 1000 }, (_, i) => i).join('\n')}\n`;
    const read = readDelimitedText(text, 'a.csv', resolveReadLimits({ maxRows: 10 }));
    // header + 10 rows + 1 extra row is where it stops
    expect(read.grid.rows.length).toBe(12);
  });

  it('drops a trailing DOS end-of-file marker (0x1A)', () => {
    const read = readDelimitedText('a,b\n1,2\n\u001a', 'a.csv', limits);
    expect(read.grid.rows.filter((row) => row.some((cell) => cell !== ''))).toEqual([['a', 'b'], ['1', '2']]);
  });
});
