import { crc32, deflateRawSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import * as XLSX from 'xlsx-republish';
import { checkZipDirectory, resolveReadLimits } from '../../src/lib/ingest';
import { refusal } from './ingest-test-helpers';

const limits = resolveReadLimits();

function xlsxBytes(bookType: XLSX.BookType = 'xlsx'): Uint8Array {
  const book = XLSX.utils.book_new();
  XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet([['id', 'Q1'], [1, 2]]), 'Data');
  return new Uint8Array(XLSX.write(book, { type: 'array', bookType, compression: true }) as ArrayBuffer);
}

interface Part { name: string; content: Buffer; flags?: number; declaredSize?: number; localSize?: number }

/** A zip built by hand after PKWARE APPNOTE 4.3.7 (local header), 4.3.9 (data descriptor), 4.3.12 and 4.3.16. */
function zip(parts: readonly Part[]): Uint8Array {
  const chunks: Buffer[] = [];
  const central: Buffer[] = [];
  let offset = 0;
  for (const part of parts) {
    const name = Buffer.from(part.name);
    const data = deflateRawSync(part.content);
    const crc = crc32(part.content);
    const flags = part.flags ?? 0;
    const declared = part.declaredSize ?? part.content.length;
    const descriptor = (flags & 8) !== 0;
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(flags, 6);
    local.writeUInt16LE(8, 8);
    local.writeUInt32LE(descriptor ? 0 : crc, 14);
    local.writeUInt32LE(descriptor ? 0 : data.length, 18);
    local.writeUInt32LE(descriptor ? 0 : part.localSize ?? declared, 22);
    local.writeUInt16LE(name.length, 26);
    const trailer = Buffer.alloc(descriptor ? 16 : 0);
    if (descriptor) {
      trailer.writeUInt32LE(0x08074b50, 0);
      trailer.writeUInt32LE(crc, 4);
      trailer.writeUInt32LE(data.length, 8);
      trailer.writeUInt32LE(declared, 12);
    }
    chunks.push(local, name, data, trailer);
    const entry = Buffer.alloc(46);
    entry.writeUInt32LE(0x02014b50, 0);
    entry.writeUInt16LE(20, 4);
    entry.writeUInt16LE(20, 6);
    entry.writeUInt16LE(flags, 8);
    entry.writeUInt16LE(8, 10);
    entry.writeUInt32LE(crc, 16);
    entry.writeUInt32LE(data.length, 20);
    entry.writeUInt32LE(declared, 24);
    entry.writeUInt16LE(name.length, 28);
    entry.writeUInt32LE(offset, 42);
    central.push(entry, name);
    offset += local.length + name.length + data.length + trailer.length;
  }
  const directory = Buffer.concat(central);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(parts.length, 8);
  end.writeUInt16LE(parts.length, 10);
  end.writeUInt32LE(directory.length, 12);
  end.writeUInt32LE(offset, 16);
  return new Uint8Array(Buffer.concat([...chunks, directory, end]));
}

const workbookParts = (sheet: Part): Part[] => [
  { name: '[Content_Types].xml', content: Buffer.from('<Types/>') },
  { name: 'xl/workbook.xml', content: Buffer.from('<workbook/>') },
  sheet,
];

describe('checkZipDirectory', () => {
  it('recognises XLSX and ODS workbooks written by SheetJS', async () => {
    const xlsx = await checkZipDirectory(xlsxBytes(), 'a.xlsx', limits);
    expect(xlsx.kind).toBe('xlsx');
    expect(xlsx.entryNames).toContain('xl/workbook.xml');
    expect((await checkZipDirectory(xlsxBytes('ods'), 'a.ods', limits)).kind).toBe('ods');
  });

  it('refuses from the directory alone: too many entries or too many uncompressed bytes (413)', async () => {
    const manyEntries = await refusal(checkZipDirectory(xlsxBytes(), 'a.xlsx', resolveReadLimits({ maxZipEntries: 3 })));
    expect([manyEntries.status, manyEntries.code]).toEqual([413, 'too-many-zip-entries']);
    const tooLarge = await refusal(checkZipDirectory(xlsxBytes(), 'a.xlsx', resolveReadLimits({ maxUncompressedBytes: 100 })));
    expect([tooLarge.status, tooLarge.code]).toEqual([413, 'zip-too-large']);
  });

  it('refuses encrypted entries, a damaged directory, and a zip that is not a workbook (422)', async () => {
    const encrypted = await refusal(checkZipDirectory(zip(workbookParts({ name: 'xl/worksheets/sheet1.xml', content: Buffer.from('<x/>'), flags: 1 })), 'a.xlsx', limits));
    expect(encrypted.code).toBe('workbook-encrypted');
    const whole = xlsxBytes();
    const damaged = await refusal(checkZipDirectory(whole.subarray(0, whole.length - 30), 'a.xlsx', limits));
    expect(damaged.code).toBe('damaged-zip');
    const notWorkbook = await refusal(checkZipDirectory(zip([{ name: 'word/document.xml', content: Buffer.from('<w/>') }, { name: '[Content_Types].xml', content: Buffer.from('<Types/>') }]), 'a.xlsx', limits));
    expect([notWorkbook.code, notWorkbook.message]).toEqual(['not-a-workbook', expect.stringMatching(/Word document/)]);
  });

  it('refuses a local header whose size disagrees with the directory', async () => {
    const bytes = zip(workbookParts({ name: 'xl/worksheets/sheet1.xml', content: Buffer.alloc(5000), localSize: 0x7fffffff }));
    expect((await refusal(checkZipDirectory(bytes, 'a.xlsx', limits))).code).toBe('zip-sizes-inconsistent');
  });

  it('accepts an honest entry with a data descriptor, and refuses one that inflates past its declared size', async () => {
    const honest = zip(workbookParts({ name: 'xl/worksheets/sheet1.xml', content: Buffer.alloc(50_000, 0x41), flags: 8 }));
    expect((await checkZipDirectory(honest, 'a.xlsx', limits)).uncompressedBytes).toBe('<Types/>'.length + '<workbook/>'.length + 50_000);
    const lying = zip(workbookParts({ name: 'xl/worksheets/sheet1.xml', content: Buffer.alloc(5_000_000), flags: 8, declaredSize: 1000 }));
    expect((await refusal(checkZipDirectory(lying, 'a.xlsx', limits))).code).toBe('zip-sizes-inconsistent');
  });
});
