import { describe, expect, it } from 'vitest';
import * as XLSX from 'xlsx-republish';
import { readTable } from '../../src/lib/ingest';
import { refusal } from './ingest-test-helpers';

const text = (value: string) => new TextEncoder().encode(value);

describe('readTable', () => {
  it('reads a CSV into text cells with how it was read', async () => {
    const table = await readTable(text('id;Q1;Q2\r\nR1;3,5;4\r\nR2;2;1\r\n'), 'wave.csv');
    expect(table.headers).toEqual(['id', 'Q1', 'Q2']);
    expect(table.rows).toEqual([['R1', '3,5', '4'], ['R2', '2', '1']]);
    expect(table.source).toEqual({ fileName: 'wave.csv', format: 'csv', encoding: 'utf-8', delimiter: ';', decimalSeparator: ',', sheet: null, sheets: [] });
    expect(table.warnings.map((warning) => warning.code)).toEqual(['decimal-comma']);
    expect(table.codebookTable).toBeNull();
  });

  it('refuses an upload over the byte limit with 413 before reading it, and an empty one with 422', async () => {
    const big = await refusal(readTable(new Uint8Array(2001), 'big.csv', { maxBytes: 2000 }));
    expect([big.status, big.code]).toEqual([413, 'file-too-large']);
    const empty = await refusal(readTable(new Uint8Array(0), 'e.csv'));
    expect([empty.status, empty.code]).toEqual([422, 'empty-file']);
  });

  it('reads a workbook sheet the designer names and returns the codebook sheet beside it', async () => {
    const book = XLSX.utils.book_new();
    XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet([['id', 'Q1'], ['R1', 1]]), 'Pilot A');
    XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet([['id', 'Q1'], ['R9', 5]]), 'Pilot B');
    XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet([['item', 'min', 'max'], ['Q1', 1, 5]]), 'Codebook');
    const bytes = new Uint8Array(XLSX.write(book, { type: 'array', bookType: 'xlsx' }) as ArrayBuffer);
    const table = await readTable(bytes, 'w.xlsx', {}, { sheet: 'Pilot B' });
    expect(table.rows).toEqual([['R9', '5']]);
    expect(table.source).toMatchObject({ format: 'xlsx', sheet: 'Pilot B', sheets: ['Pilot A', 'Pilot B', 'Codebook'], encoding: null });
    expect(table.codebookTable?.rows).toEqual([['Q1', '1', '5']]);
    expect(table.warnings.map((warning) => warning.code)).toEqual(['codebook-sheet-found']);
  });

  it('applies the row limit to workbooks too (413)', async () => {
    const book = XLSX.utils.book_new();
    XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet([['Q1'], ...Array.from({ length: 30 }, (_, i) => [i % 5])]), 'Data');
    const bytes = new Uint8Array(XLSX.write(book, { type: 'array', bookType: 'xlsx' }) as ArrayBuffer);
    const error = await refusal(readTable(bytes, 'w.xlsx', { maxRows: 20 }));
    expect([error.status, error.code]).toEqual([413, 'too-many-rows']);
    expect((await readTable(bytes, 'w.xlsx', { maxRows: 30 })).rows.length).toBe(30);
  });

  it('leaves the uploaded bytes unchanged', async () => {
    const bytes = text('a,b\n1,2\n');
    const copy = Uint8Array.from(bytes);
    await readTable(bytes, 'a.csv');
    expect(bytes).toEqual(copy);
  });
});
