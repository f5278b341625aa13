import { describe, expect, it } from 'vitest';
import * as XLSX from 'xlsx-republish';
import { readWorkbook, resolveReadLimits } from '../../src/lib/ingest';
import { refusal } from './ingest-test-helpers';

const limits = resolveReadLimits();
type Cell = string | number | boolean | null;

function book(sheets: Record<string, Cell[][] | XLSX.WorkSheet>, bookType: XLSX.BookType = 'xlsx', hidden: string[] = []): Uint8Array {
  const workbook = XLSX.utils.book_new();
  for (const [name, rows] of Object.entries(sheets)) XLSX.utils.book_append_sheet(workbook, Array.isArray(rows) ? XLSX.utils.aoa_to_sheet(rows) : rows, name);
  workbook.Workbook = { Sheets: workbook.SheetNames.map((name) => ({ name, Hidden: hidden.includes(name) ? 1 : 0 })) } as XLSX.WBProps;
  return new Uint8Array(XLSX.write(workbook, { type: 'array', bookType }) as ArrayBuffer);
}

describe('readWorkbook', () => {
  it('writes cells as a CSV export would hold them: canonical numbers, formatted times, TRUE/FALSE, error codes, formula text', async () => {
    const sheet = XLSX.utils.aoa_to_sheet([['n', 'time', 'flag', 'error', 'text'], [3.5, 330 / 86400, true, null, '=1+2']]);
    sheet.B2.z = 'h:mm:ss';
    sheet.D2 = { t: 'e', v: 0x2a, w: '#N/A' };
    for (const bookType of ['xlsx', 'biff8', 'ods'] as const) {
      const read = await readWorkbook(book({ Data: sheet }, bookType), `a.${bookType}`, limits);
      // 330 s = 0:05:30 in the cell's h:mm:ss format (SheetJS SSF).
      // SheetJS's ODS writer leaves error cells out, so that cell reads blank there.
      expect(read.responses.grid.rows[1], bookType).toEqual(['3.5', '0:05:30', 'TRUE', bookType === 'ods' ? '' : '#N/A', '=1+2']);
      expect(read.responses.grid.fileRows, bookType).toEqual([1, 2]);
    }
  });

  it('chooses the responses sheet and finds the codebook sheet by its name', async () => {
    const read = await readWorkbook(book({ Codebook: [['item', 'min'], ['Q1', 1]], Responses: [['id', 'Q1'], ['R1', 3]] }), 'a.xlsx', limits);
    expect(read.responses.name).toBe('Responses');
    expect(read.codebook?.name).toBe('Codebook');
    expect(read.warnings).toEqual([]);
  });

  it('finds a codebook sheet by its columns when its name says nothing', async () => {
    const read = await readWorkbook(book({ Data: [['id', 'Q1'], ['R1', 3]], Sheet2: [['Item', 'Scale', 'Reverse', 'Text'], ['Q1', 'S', 'no', 'Wording']] }), 'a.xlsx', limits);
    expect(read.responses.name).toBe('Data');
    expect(read.codebook?.name).toBe('Sheet2');
  });

  it('skips empty and hidden sheets, and warns when several sheets could hold responses', async () => {
    const read = await readWorkbook(book({ Empty: [], Secret: [['x'], [1]], First: [['a'], [1]], Second: [['b'], [2]] }, 'xlsx', ['Secret']), 'a.xlsx', limits);
    expect(read.responses.name).toBe('First');
    expect(read.warnings.map((warning) => warning.code)).toEqual(['sheet-chosen']);
  });

  it('reads a sheet the designer names (any case), and refuses a name that does not exist with 400', async () => {
    const bytes = book({ First: [['a'], [1]], Second: [['b'], [2]] });
    expect((await readWorkbook(bytes, 'a.xlsx', limits, 'second')).responses.name).toBe('Second');
    const error = await refusal(readWorkbook(bytes, 'a.xlsx', limits, 'Third'));
    expect([error.status, error.code]).toEqual([400, 'unknown-sheet']);
    expect(error.message).toMatch(/"First", "Second"/);
  });

  it('refuses a compound file that is not a workbook as unreadable (422)', async () => {
    const junk = new Uint8Array(1024);
    junk.set([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]);
    expect((await refusal(readWorkbook(junk, 'a.xls', limits))).code).toBe('workbook-unreadable');
  });
});
