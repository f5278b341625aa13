import { describe, expect, it } from 'vitest';
import { resolveReadLimits, shapeTable, uniqueHeaders, WaveRefusal, type TableSource } from '../../src/lib/ingest';

const source: TableSource = { fileName: 'a.csv', format: 'csv', encoding: 'utf-8', delimiter: ',', decimalSeparator: '.', sheet: null, sheets: [] };
const grid = (rows: string[][], countRaggedRows = true) => ({ rows: Object.freeze(rows.map((row) => Object.freeze(row))), fileRows: rows.map((_, i) => i + 1), countRaggedRows });

describe('uniqueHeaders', () => {
  it('renames repeats with _2, _3 and blanks by position, with one warning per kind', () => {
    const named = uniqueHeaders(['Q1', 'Q1', '', 'q1', 'Q1_2', '']);
    expect(named.headers).toEqual(['Q1', 'Q1_3', 'column_3', 'q1_4', 'Q1_2', 'column_6']);
    expect(named.warnings.map((warning) => warning.code)).toEqual(['duplicate-header', 'blank-header']);
    expect(new Set(named.headers.map((name) => name.toLowerCase())).size).toBe(6);
  });
});

describe('shapeTable', () => {
  it('drops blank rows, pads short rows, adds columns for long ones, and reports both', () => {
    const table = shapeTable(grid([['', ''], ['id', 'Q1'], ['1', '2'], ['', ''], ['2'], ['3', '4', '5'], ['', '']]), source, resolveReadLimits(), [], null);
    expect(table.headers).toEqual(['id', 'Q1', 'column_3']);
    expect(table.rows).toEqual([['1', '2', ''], ['2', '', ''], ['3', '4', '5']]);
    expect(table.fileRows).toEqual([3, 5, 6]);
    expect(table.warnings.map((warning) => warning.code).sort()).toEqual(['blank-header', 'blank-rows-skipped', 'ragged-rows']);
  });

  it('does not call sheet rows ragged (a sheet omits trailing empty cells)', () => {
    const table = shapeTable(grid([['id', 'Q1', 'Q2'], ['1', '2']], false), source, resolveReadLimits(), [], null);
    expect(table.warnings).toEqual([]);
    expect(table.rows).toEqual([['1', '2', '']]);
  });

  it('refuses past the column, row and cell limits with 413, and an all-blank grid with 422', () => {
    const cases: [string[][], Partial<Parameters<typeof resolveReadLimits>[0]>, number, string][] = [
      [[['a', 'b', 'c'], ['1', '2', '3']], { maxColumns: 2 }, 413, 'too-many-columns'],
      [[['a'], ['1'], ['2'], ['3']], { maxRows: 2 }, 413, 'too-many-rows'],
      [[['a', 'b'], ['1', '2'], ['3', '4']], { maxCells: 3 }, 413, 'too-many-cells'],
      [[['', ' '], []], {}, 422, 'empty-file'],
    ];
    for (const [rows, limits, status, code] of cases) {
      try {
        shapeTable(grid(rows), source, resolveReadLimits(limits), [], null);
        throw new Error(`expected ${code}`);
      } catch (error) {
        expect(error).toBeInstanceOf(WaveRefusal);
        expect([(error as WaveRefusal).status, (error as WaveRefusal).code]).toEqual([status, code]);
      }
    }
  });

  it('notes formula-looking cells and a header row that holds only numbers', () => {
    const table = shapeTable(grid([['1', '2'], ['=A1', '3']]), source, resolveReadLimits(), [], null);
    expect(table.warnings.map((warning) => warning.code).sort()).toEqual(['formula-like-cells', 'header-looks-like-data']);
    expect(table.rows[0][0]).toBe('=A1');
  });
});
