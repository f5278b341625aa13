import { describe, expect, it } from 'vitest';
import { detectFileKind, fileExtension, WaveRefusal } from '../../src/lib/ingest';

const bytes = (...values: number[]) => new Uint8Array(values);

describe('detectFileKind', () => {
  it('tells zip (PKWARE APPNOTE 4.3.7: 50 4B 03 04) and OLE2 compound files (MS-CFB 2.2: D0 CF 11 E0 A1 B1 1A E1) by their first bytes', () => {
    expect(detectFileKind(bytes(0x50, 0x4b, 0x03, 0x04, 0), 'x.csv')).toBe('zip');
    expect(detectFileKind(bytes(0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1), 'x.dat')).toBe('compound');
    expect(detectFileKind(new TextEncoder().encode('a,b\n1,2\n'), 'x.csv')).toBe('text');
  });

  it('refuses a workbook name on bytes that are not a workbook, and known non-survey binaries', () => {
    const cases: [Uint8Array, string, string][] = [
      [new TextEncoder().encode('hello'), 'answers.xlsx', 'not-a-workbook'],
      [new TextEncoder().encode('hello'), 'answers.XLS', 'not-a-workbook'],
      [new TextEncoder().encode('hello'), 'answers.ods', 'not-a-workbook'],
      [new TextEncoder().encode('%PDF-1.7'), 'answers.csv', 'unsupported-format'],
      [new TextEncoder().encode('$FL2@(#) SPSS DATA FILE'), 'answers.sav', 'unsupported-format'],
    ];
    for (const [input, name, code] of cases) {
      try {
        detectFileKind(input, name);
        throw new Error(`expected a refusal for ${name}`);
      } catch (error) {
        expect(error).toBeInstanceOf(WaveRefusal);
        expect((error as WaveRefusal).status).toBe(422);
        expect((error as WaveRefusal).code).toBe(code);
      }
    }
  });
});

describe('fileExtension', () => {
  it('returns the lower-case extension or nothing', () => {
    expect(fileExtension('Wave 1.XLSX')).toBe('xlsx');
    expect(fileExtension('data')).toBe('');
    expect(fileExtension('archive.tar.gz')).toBe('gz');
  });
});
