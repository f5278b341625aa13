/**
 * Round trip (issue 4): the same answers written as a workbook with xlsx-republish and as CSV
 * give identical stored matrices, byte for byte.
 */
import { describe, expect, it } from 'vitest';
import * as XLSX from 'xlsx-republish';
import { acceptWave, encodeMatrix, proposeSetup, readTable, type BuiltWave } from '../../src/lib/ingest';

type Cell = string | number | null;
const rows: Cell[][] = [['respondent_id', 'Q1', 'Q2', 'Q3_r', 'Q4', 'score']];
for (let i = 0; i < 60; i++) {
  rows.push([
    `R${i + 1}`,
    (i % 5) + 1,
    i % 11 === 0 ? 9 : ((i * 3) % 5) + 1,
    i % 13 === 0 ? null : ((i * 7) % 5) + 1,
    i % 17 === 0 ? 8 : ((i * 2 + 1) % 5) + 1,
    Math.round(((i * 37) % 100) * 0.25 * 100) / 100,
  ]);
}

function csvText(delimiter: string, decimalComma: boolean): string {
  return rows.map((row) => row.map((cell) => (cell === null ? '' : decimalComma && typeof cell === 'number' ? String(cell).replace('.', ',') : String(cell))).join(delimiter)).join('\r\n');
}

async function wave(bytes: Uint8Array, name: string): Promise<BuiltWave> {
  const table = await readTable(bytes, name);
  return acceptWave(table, { setup: proposeSetup(table) }).wave;
}

function workbook(bookType: XLSX.BookType): Uint8Array {
  const book = XLSX.utils.book_new();
  XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet(rows), 'Responses');
  return new Uint8Array(XLSX.write(book, { type: 'array', bookType }) as ArrayBuffer);
}

describe('workbook and CSV of the same answers', () => {
  it('give byte-identical encoded matrices (recoded and raw) for XLSX, XLS, ODS and a semicolon CSV with decimal commas', async () => {
    const reference = await wave(new TextEncoder().encode(csvText(',', false)), 'wave.csv');
    expect(reference.items.map((item) => item.id)).toEqual(['Q1', 'Q2', 'Q3_r', 'Q4']);
    expect(reference.items[2].reverse).toBe(true);
    const expected = encodeMatrix(reference.matrix);
    const expectedRaw = encodeMatrix(reference.raw);
    const others: [Uint8Array, string][] = [
      [workbook('xlsx'), 'wave.xlsx'],
      [workbook('biff8'), 'wave.xls'],
      [workbook('ods'), 'wave.ods'],
      [new TextEncoder().encode(csvText(';', true)), 'wave-de.csv'],
    ];
    for (const [bytes, name] of others) {
      const other = await wave(bytes, name);
      expect(encodeMatrix(other.matrix), name).toEqual(expected);
      expect(encodeMatrix(other.raw), name).toEqual(expectedRaw);
      expect(other.outcomes.length + other.items.length, name).toBe(reference.outcomes.length + reference.items.length);
    }
  });
});
