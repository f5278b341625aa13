import { describe, expect, it } from 'vitest';
import { readTable } from '../../src/lib/ingest';
import { codeCells, tableColumn, tableColumnCodes } from '../../src/lib/ingest/table-columns';

const encoder = new TextEncoder();

describe('tableColumn', () => {
  it('gives the cells of a column in row order, the same strings as gathering them from the rows', async () => {
    // Awkward CSV: a byte-order mark, CRLF line ends, quoted fields holding the delimiter, a
    // doubled quote and a line break, a ragged row (padded) and blank cells.
    const text = '\ufeffid,q1,q2,"q,3"\r\n1,3,,"a,b"\r\n2," 4 ","x""y",5\r\n3,5,"two\nlines",\r\n4,1\r\n';
    const table = await readTable(encoder.encode(text), 'awkward.csv');
    expect(table.headers).toEqual(['id', 'q1', 'q2', 'q,3']);
    for (let j = 0; j < table.headers.length; j++) {
      const column = tableColumn(table, j);
      expect(column).toEqual(table.rows.map((row) => row[j]));
      column.forEach((cell, i) => expect(Object.is(cell, table.rows[i][j])).toBe(true));
    }
    expect(tableColumn(table, 2)).toEqual(['', 'x"y', 'two\nlines', '']);
    expect(tableColumn(table, 1)).toEqual(['3', ' 4 ', '5', '1']);
  });

  it('transposes a table once and follows a table with other rows', () => {
    const headers = ['a', 'b'];
    const rows = [['1', '2'], ['3', '4']];
    const first = tableColumn({ headers, rows }, 1);
    expect(tableColumn({ headers, rows }, 1)).toBe(first);
    const more = [...rows, ['5', '6']];
    expect(tableColumn({ headers, rows: more }, 1)).toEqual(['2', '4', '6']);
    expect(tableColumn({ headers, rows }, 0)).toEqual(['1', '3']);
  });

  it('is wider than one block of columns and refuses a column the table does not have', () => {
    const width = 150;
    const headers = Array.from({ length: width }, (_, j) => `q${j}`);
    const rows = Array.from({ length: 7 }, (_, i) => Array.from({ length: width }, (_, j) => `${i}:${j}`));
    for (const j of [0, 63, 64, 127, 128, 149]) expect(tableColumn({ headers, rows }, j)).toEqual(rows.map((row) => row[j]));
    expect(() => tableColumn({ headers, rows }, width)).toThrow(/tableColumn: column 150 does not exist/);
    expect(() => tableColumn({ headers, rows }, -1)).toThrow(RangeError);
    expect(() => tableColumn({ headers, rows }, 0.5)).toThrow(RangeError);
  });

  it('codes a column as its distinct texts in order of first appearance, widening the codes past 8 and 16 bits', () => {
    // Second opinion: the distinct texts by a Set (insertion order), each cell's code by indexOf.
    const width = 3;
    const n = 70_000;
    const headers = ['rating', 'ids', 'mixed'];
    const rows = Array.from({ length: n }, (_, i) => [String(i % 5 + 1), `R${i}`, i % 3 === 0 ? ` ${i % 900} ` : i % 3 === 1 ? '' : 'x']);
    for (let j = 0; j < width; j++) {
      const cells = rows.map((row) => row[j]);
      const { texts, codes } = tableColumnCodes({ headers, rows }, j);
      expect(texts).toEqual([...new Set(cells)]);
      expect(codes.length).toBe(n);
      const index = new Map(texts.map((text, k) => [text, k]));
      for (let i = 0; i < n; i++) if (codes[i] !== index.get(cells[i])) expect.fail(`column ${j}, cell ${i}: code ${codes[i]}`);
      expect(tableColumn({ headers, rows }, j)).toEqual(cells);
      const alone = codeCells(cells);
      expect(alone.texts).toEqual(texts);
      expect([...alone.codes]).toEqual([...codes]);
    }
    expect(tableColumnCodes({ headers, rows }, 0).codes).toBeInstanceOf(Uint8Array);
    expect(tableColumnCodes({ headers, rows }, 1).codes).toBeInstanceOf(Uint32Array);
    expect(tableColumnCodes({ headers, rows }, 2).codes).toBeInstanceOf(Uint16Array);
    expect(() => tableColumnCodes({ headers, rows }, width)).toThrow(/tableColumnCodes: column 3 does not exist/);
  });
});
