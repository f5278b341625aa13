import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import * as XLSX from 'xlsx-republish';
import { parseWorkbookInWorker, resolveReadLimits, WaveRefusal } from '../../src/lib/ingest';

describe('parseWorkbookInWorker', () => {
  it('returns every sheet as cell texts with row numbers and hidden flags', async () => {
    const book = XLSX.utils.book_new();
    XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet([['id', 'Q1'], ['R1', 4]]), 'Data');
    XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet([[null], ['x']]), 'Notes');
    const sheets = await parseWorkbookInWorker(new Uint8Array(XLSX.write(book, { type: 'array', bookType: 'xlsx' }) as ArrayBuffer), 'a.xlsx', resolveReadLimits());
    expect(sheets).toEqual([
      { name: 'Data', hidden: false, rows: [['id', 'Q1'], ['R1', '4']], fileRows: [1, 2] },
      { name: 'Notes', hidden: false, rows: [['x']], fileRows: [2] },
    ]);
  });

  it('stops a runaway parse at the memory limit with a 413 refusal instead of exhausting the server', async () => {
    // fixtures/waves/damaged-record.xls: one BIFF8 record length corrupted (scripts/make-wave-fixtures.ts).
    const bytes = new Uint8Array(readFileSync(join(import.meta.dirname, '..', '..', 'fixtures', 'waves', 'damaged-record.xls')));
    try {
      await parseWorkbookInWorker(bytes, 'damaged-record.xls', resolveReadLimits({ maxWorkbookMemoryMb: 48 }));
      throw new Error('expected a refusal');
    } catch (error) {
      expect(error).toBeInstanceOf(WaveRefusal);
      expect([(error as WaveRefusal).status, (error as WaveRefusal).code]).toEqual([413, 'workbook-too-demanding']);
    }
  });
});
