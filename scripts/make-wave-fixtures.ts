/**
 * Writes the awkward-file corpus under fixtures/waves/ and its expectations in
 * fixtures/waves/expected.json. Run with `npx tsx scripts/make-wave-fixtures.ts`; it is
 * deterministic (no clock, no randomness), so re-running it reproduces the same bytes.
 *
 * Every expectation is written here by hand from what the file was built to contain; the test
 * (tests/unit/ingest-corpus.test.ts) checks the readers against them, and the upload endpoint's
 * test runs the same entries over HTTP.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { crc32, deflateRawSync } from 'node:zlib';
import * as XLSX from 'xlsx-republish';
import { waveCorpusDirectory, waveCorpusSchema, type CorpusEntry as Entry, type WaveCorpus } from '../tests/setup/wave-corpus';

const directory = waveCorpusDirectory;
mkdirSync(directory, { recursive: true });

type Cell = string | number | null;
const entries: Entry[] = [];

function save(file: string, bytes: Uint8Array | string): void {
  writeFileSync(join(directory, file), typeof bytes === 'string' ? Buffer.from(bytes, 'utf8') : bytes);
}
function csv(rows: readonly (readonly Cell[])[], delimiter = ',', newline = '\r\n'): string {
  return rows.map((row) => row.map((cell) => {
    if (cell === null) return '';
    const text = String(cell);
    return text.includes(delimiter) || /["\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
  }).join(delimiter)).join(newline) + newline;
}
function add(entry: Entry, bytes: Uint8Array | string): void {
  save(entry.file, bytes);
  entries.push(entry);
}
function workbook(sheets: Record<string, Cell[][]>, bookType: XLSX.BookType): Uint8Array {
  const book = XLSX.utils.book_new();
  for (const [name, rows] of Object.entries(sheets)) XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet(rows), name);
  return new Uint8Array(XLSX.write(book, { type: 'array', bookType, compression: true }) as ArrayBuffer);
}

/** A small, regular wave: id, 5 items on 1..5, deterministic answers. */
function basicRows(respondents: number, items = 5, firstItem = 1): Cell[][] {
  const header: Cell[] = ['respondent_id', ...Array.from({ length: items }, (_, k) => `Q${k + firstItem}`)];
  const rows: Cell[][] = [header];
  for (let i = 0; i < respondents; i++) {
    rows.push([`R${String(i + 1).padStart(3, '0')}`, ...Array.from({ length: items }, (_, k) => ((i * 7 + k * 3 + (i * k) % 4) % 5) + 1)]);
  }
  return rows;
}

/** Windows-1252 bytes of a text (Latin-1 letters map to themselves; the curly apostrophe is 0x92). */
function toWindows1252(text: string): Uint8Array {
  return new Uint8Array(Array.from(text, (c) => {
    const code = c.charCodeAt(0);
    if (code < 0x80 || (code >= 0xa0 && code <= 0xff)) return code;
    if (c === '\u2019') return 0x92;
    throw new Error(`no Windows-1252 byte for ${c}`);
  }));
}

// ── A hand-built zip (for the zip bomb and a zip that is not a workbook) ──────────────────
interface ZipPart { name: string; data: Buffer; declaredSize: number; crc: number; method: 0 | 8 }
function zipPart(name: string, content: Buffer): ZipPart {
  return { name, data: deflateRawSync(content), declaredSize: content.length, crc: crc32(content), method: 8 };
}
function buildZip(parts: readonly ZipPart[]): Uint8Array {
  const chunks: Buffer[] = [];
  const central: Buffer[] = [];
  let offset = 0;
  for (const part of parts) {
    const name = Buffer.from(part.name, 'utf8');
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(0, 6);
    local.writeUInt16LE(part.method, 8);
    local.writeUInt16LE(0, 10);
    local.writeUInt16LE(0x21, 12);
    local.writeUInt32LE(part.crc, 14);
    local.writeUInt32LE(part.data.length, 18);
    local.writeUInt32LE(part.declaredSize, 22);
    local.writeUInt16LE(name.length, 26);
    local.writeUInt16LE(0, 28);
    chunks.push(local, name, part.data);
    const entry = Buffer.alloc(46);
    entry.writeUInt32LE(0x02014b50, 0);
    entry.writeUInt16LE(20, 4);
    entry.writeUInt16LE(20, 6);
    entry.writeUInt16LE(0, 8);
    entry.writeUInt16LE(part.method, 10);
    entry.writeUInt16LE(0, 12);
    entry.writeUInt16LE(0x21, 14);
    entry.writeUInt32LE(part.crc, 16);
    entry.writeUInt32LE(part.data.length, 20);
    entry.writeUInt32LE(part.declaredSize, 24);
    entry.writeUInt16LE(name.length, 28);
    entry.writeUInt32LE(offset, 42);
    central.push(entry, name);
    offset += local.length + name.length + part.data.length;
  }
  const centralBytes = Buffer.concat(central);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(parts.length, 8);
  end.writeUInt16LE(parts.length, 10);
  end.writeUInt32LE(centralBytes.length, 12);
  end.writeUInt32LE(offset, 16);
  return new Uint8Array(Buffer.concat([...chunks, centralBytes, end]));
}

// 1. Empty and nearly empty files.
add({ file: 'empty.csv', about: 'zero bytes', expect: { refused: { status: 422, code: 'empty-file', step: 'read' } } }, '');
add({ file: 'blank-lines.csv', about: 'only blank lines and spaces', expect: { refused: { status: 422, code: 'empty-file', step: 'read' } } }, '\r\n  \r\n\r\n');
add({ file: 'header-only.csv', about: 'a header row and no answers', expect: { refused: { status: 422, code: 'no-respondents', step: 'propose' } } }, 'respondent_id,Q1,Q2,Q3\r\n');
add({
  file: 'one-respondent.csv', about: 'a single respondent',
  expect: { wave: { rows: 1, items: 3, warnings: ['constant-item', 'more-items-than-respondents', 'range-assumed', 'too-few-respondents'], roles: { respondent_id: 'respondent-id', Q1: 'item' } } },
}, csv([['respondent_id', 'Q1', 'Q2', 'Q3'], ['R001', 1, 3, 5]]));

// 2. Things that are not responses.
add({ file: 'junk-renamed.xlsx', about: 'a text file renamed to .xlsx', expect: { refused: { status: 422, code: 'not-a-workbook', step: 'read' } } },
  'This is not a workbook, only a note someone renamed.\n');
add({ file: 'zip-not-workbook.xlsx', about: 'a zip archive of a text file, named .xlsx', expect: { refused: { status: 422, code: 'not-a-workbook', step: 'read' } } },
  buildZip([zipPart('notes.txt', Buffer.from('meeting notes\n'.repeat(20)))]));
add({ file: 'pdf-renamed.csv', about: 'a PDF document named .csv', expect: { refused: { status: 422, code: 'unsupported-format', step: 'read' } } },
  '%PDF-1.4\n%\u00e2\u00e3\u00cf\u00d3\n1 0 obj\n<< /Type /Catalog >>\nendobj\n');
add({ file: 'nul-bytes.csv', about: 'a CSV with NUL bytes in it (a damaged export)', expect: { refused: { status: 422, code: 'nul-bytes', step: 'read' } } },
  new Uint8Array([...Buffer.from('id,Q1,Q2\r\nR1,3,'), 0, 0, 0, ...Buffer.from('4\r\nR2,2,5\r\n')]));
add({ file: 'control-characters.csv', about: 'binary data without NUL bytes', expect: { refused: { status: 422, code: 'binary-file', step: 'read' } } },
  new Uint8Array(Array.from({ length: 600 }, (_, i) => [1, 2, 3, 4, 5, 6, 7, 8, 14, 15, 16, 17, 18, 19, 20, 65][i % 16])));
add({ file: 'unterminated-quote.csv', about: 'a quoted field that is never closed', expect: { refused: { status: 422, code: 'unterminated-quote', step: 'read' } } },
  'respondent_id,Q1,comment\r\nR1,3,"fine\r\nR2,4,ok\r\nR3,2,ok\r\n');

// 3. The zip bomb: six sheets of 64 MiB of zeros each, deflated to a few hundred kilobytes.
{
  const zeros = Buffer.alloc(64 * 1024 * 1024);
  const sheet = { data: deflateRawSync(zeros, { level: 9 }), declaredSize: zeros.length, crc: crc32(zeros), method: 8 as const };
  const parts: ZipPart[] = [
    zipPart('[Content_Types].xml', Buffer.from('<?xml version="1.0"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"/>')),
    zipPart('xl/workbook.xml', Buffer.from('<?xml version="1.0"?><workbook/>')),
    ...Array.from({ length: 6 }, (_, k) => ({ name: `xl/worksheets/sheet${k + 1}.xml`, ...sheet })),
  ];
  add({ file: 'zip-bomb.xlsx', about: 'declares 384 MiB of sheets in a file of a few hundred kilobytes (limit 300 MB)', expect: { refused: { status: 413, code: 'zip-too-large', step: 'read' } } }, buildZip(parts));
}
// A workbook whose local header and directory disagree about a part's size.
{
  const bytes = Buffer.from(workbook({ Data: basicRows(4) }, 'xlsx'));
  bytes.writeUInt32LE(bytes.readUInt32LE(22) + 1000, 22); // first local header's uncompressed size
  add({ file: 'sizes-disagree.xlsx', about: 'a workbook whose first part declares two different sizes', expect: { refused: { status: 422, code: 'zip-sizes-inconsistent', step: 'read' } } }, new Uint8Array(bytes));
}
// A legacy workbook with one record length corrupted (the first sheet's DIMENSIONS record, type
// 0x0200, length 14 → 106): SheetJS 0.20.3 then allocates without end. The isolated reader stops
// it at its memory limit (64 MB here, to keep the test quick).
{
  const rows: Cell[][] = [['respondent_id', 'Q1', 'Q2', 'Q3', 'comment'], ...Array.from({ length: 30 }, (_, i) => [`R${i}`, (i % 5) + 1, ((i * 3) % 5) + 1, ((i * 7) % 5) + 1, `remark ${i}, "quoted"`])];
  const bytes = workbook({ Responses: rows, Codebook: [['item', 'min', 'max'], ['Q1', 1, 5]] }, 'biff8');
  const at = Buffer.from(bytes).indexOf(Buffer.from([0x00, 0x02, 0x0e, 0x00]));
  if (at < 0) throw new Error('no DIMENSIONS record found');
  bytes[at + 2] = 0x6a;
  add({
    file: 'damaged-record.xls', about: 'a BIFF8 workbook with one corrupted record length that sends the parser into runaway allocation',
    limits: { maxWorkbookMemoryMb: 64 }, expect: { refused: { status: 413, code: 'workbook-too-demanding', step: 'read' } },
  }, bytes);
}
add({ file: 'empty-workbook.xlsx', about: 'a workbook whose only sheet is empty', expect: { refused: { status: 422, code: 'empty-file', step: 'read' } } },
  workbook({ Sheet1: [] }, 'xlsx'));

// 4. Encodings.
{
  const rows: Cell[][] = [['respondent_id', 'Qualité_1', 'Qualité_2', 'Qualité_3'], ['R1', 1, 2, 3], ['R2', 2, 3, 4], ['R3', 3, 4, 5], ['R4', 5, 4, 3]];
  const text = csv(rows);
  const utf16le = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
  add({
    file: 'utf16le-bom.csv', about: 'UTF-16 little-endian with a byte-order mark (Excel "Unicode text")',
    expect: { wave: { rows: 4, items: 3, warnings: [], headers: ['respondent_id', 'Qualité_1', 'Qualité_2', 'Qualité_3'], source: { encoding: 'utf-16le' } } },
  }, new Uint8Array(utf16le));
  const le = Buffer.from(text, 'utf16le');
  const be = Buffer.alloc(le.length);
  for (let i = 0; i < le.length; i += 2) {
    be[i] = le[i + 1];
    be[i + 1] = le[i];
  }
  add({
    file: 'utf16be-no-bom.txt', about: 'UTF-16 big-endian without a byte-order mark (found by the NUL-byte pattern)',
    expect: { wave: { rows: 4, items: 3, warnings: [], headers: ['respondent_id', 'Qualité_1', 'Qualité_2', 'Qualité_3'], source: { encoding: 'utf-16be', format: 'txt' } } },
  }, new Uint8Array(be));
  add({
    file: 'utf8-bom.csv', about: 'UTF-8 with a byte-order mark (the first header must not keep it)',
    expect: { wave: { rows: 4, items: 3, warnings: [], headers: ['respondent_id', 'Qualité_1', 'Qualité_2', 'Qualité_3'], roles: { respondent_id: 'respondent-id' }, source: { encoding: 'utf-8' } } },
  }, new Uint8Array(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text, 'utf8')])));
  const latin = [['respondent_id', 'Accueil_1', 'Accueil_2', 'Accueil_3', 'Remarque'],
    ['R1', 4, 5, 4, 'Très bien, le personnel est aimable et compétent'],
    ['R2', 3, 3, 2, 'À revoir : les horaires du dimanche sont trop courts'],
    ['R3', 5, 4, 5, 'Café agréable, mais la salle d’étude est bruyante'],
    ['R4', 2, 2, 1, 'Déçu par le choix de périodiques étrangers']];
  add({
    file: 'windows-1252.csv', about: 'Windows-1252 with accents and a curly apostrophe (not valid UTF-8)',
    expect: { wave: { rows: 4, items: 3, warnings: ['encoding-guessed', 'personal-data-ignored'], roles: { Remarque: 'ignore' }, source: { encoding: 'windows-1252' } } },
  }, toWindows1252(csv(latin, ';')));
}

// 5. Delimiters and decimal commas.
add({
  file: 'semicolon-decimal-comma.csv', about: 'semicolons with decimal commas (a German or French Excel export) and a weight',
  expect: {
    wave: {
      rows: 4, items: 3, warnings: ['decimal-comma'], roles: { Gewicht: 'weight', respondent_id: 'respondent-id' },
      cells: [{ column: 'Gewicht', row: 0, value: 1.25 }, { column: 'Gewicht', row: 2, value: 0.8 }, { column: 'F1', row: 1, value: 2 }],
      source: { delimiter: ';', decimalSeparator: ',' },
    },
  },
}, 'respondent_id;F1;F2;F3;Gewicht\r\nR1;4;5;4;1,25\r\nR2;2;3;2;0,9\r\nR3;5;5;4;0,8\r\nR4;1;2;2;1,05\r\n');
add({
  file: 'tab-separated.tsv', about: 'tab-separated with quoted text holding commas',
  expect: { wave: { rows: 5, items: 5, warnings: [], source: { delimiter: '\t', format: 'tsv' } } },
}, csv(basicRows(5), '\t'));
add({
  file: 'pipe-separated.txt', about: 'pipe-separated text export',
  expect: { wave: { rows: 5, items: 5, warnings: [], source: { delimiter: '|', format: 'txt' } } },
}, csv(basicRows(5), '|', '\n'));
add({
  file: 'excel-sep-hint.csv', about: 'an Excel "sep=;" first line naming the delimiter',
  expect: { wave: { rows: 5, items: 5, warnings: [], headers: ['respondent_id', 'Q1', 'Q2', 'Q3', 'Q4', 'Q5'], source: { delimiter: ';' } } },
}, `sep=;\r\n${csv(basicRows(5), ';')}`);
add({
  file: 'quoted-newlines.csv', about: 'quoted comments with embedded line breaks, commas and doubled quotes',
  expect: { wave: { rows: 4, items: 3, warnings: ['personal-data-ignored'], roles: { comment: 'ignore' }, cells: [{ column: 'Q3', row: 3, value: 1 }] } },
}, csv([['respondent_id', 'Q1', 'Q2', 'Q3', 'comment'],
  ['R1', 4, 4, 5, 'Line one of a long remark,\r\nand line two, with "quotes" inside'],
  ['R2', 2, 3, 2, 'A single line remark about opening hours'],
  ['R3', 5, 5, 4, 'First line\nsecond line\nthird line of the remark'],
  ['R4', 1, 2, 1, 'Another remark, written over\r\ntwo lines by the respondent']]));

// 6. Headers and shapes.
add({
  file: 'duplicate-headers.csv', about: 'the same header three times',
  expect: { wave: { rows: 5, items: 4, warnings: ['duplicate-header'], itemIds: ['Q1', 'Q1_2', 'Q2', 'Q1_3'] } },
}, csv([['respondent_id', 'Q1', 'Q1', 'Q2', 'Q1'], ...basicRows(5, 4).slice(1)]));
add({
  file: 'blank-headers.csv', about: 'two columns without a header',
  expect: { wave: { rows: 5, items: 4, warnings: ['blank-header'], itemIds: ['Q1', 'column_3', 'Q3', 'column_5'] } },
}, csv([['respondent_id', 'Q1', '', 'Q3', ''], ...basicRows(5, 4).slice(1)]));
add({
  file: 'ragged-rows.csv', about: 'rows with fewer and more fields than the header',
  expect: {
    wave: {
      rows: 4, items: 4, warnings: ['blank-header', 'constant-item', 'range-assumed', 'ragged-rows'], itemIds: ['Q1', 'Q2', 'Q3', 'column_5'],
      cells: [{ column: 'Q3', row: 1, value: null }, { column: 'column_5', row: 2, value: 2 }],
    },
  },
}, 'respondent_id,Q1,Q2,Q3\r\nR1,1,2,3\r\nR2,2,3\r\nR3,3,4,5,2\r\nR4,4,5,1\r\n');
add({
  file: 'formula-cells.csv', about: 'cells that look like spreadsheet formulas (kept as text, never evaluated)',
  expect: {
    wave: {
      rows: 6, items: 3, warnings: ['formula-like-cells', 'non-numeric-cells'],
      cells: [{ column: 'Q1', row: 1, value: null }, { column: 'Q2', row: 2, value: null }, { column: 'Q2', row: 3, value: null }, { column: 'Q3', row: 4, value: -1 }, { column: 'Q3', row: 5, value: 2 }],
    },
  },
}, csv([['respondent_id', 'Q1', 'Q2', 'Q3'], ['R1', 1, 2, 1], ['R2', '=1+2', 3, 0], ['R3', 3, '@SUM(A1:A9)', -1], ['R4', 4, '+cmd|/C calc', 1], ['R5', 5, 4, -1], ['R6', 2, 5, '+2']]));
add({
  file: 'nan-infinity.csv', about: 'NaN, Infinity and -Infinity written as text',
  expect: { wave: { rows: 5, items: 3, warnings: ['formula-like-cells', 'non-numeric-cells'], cells: [{ column: 'Q1', row: 0, value: null }, { column: 'Q2', row: 1, value: null }, { column: 'Q3', row: 2, value: null }, { column: 'Q1', row: 3, value: 4 }] } },
}, csv([['respondent_id', 'Q1', 'Q2', 'Q3'], ['R1', 'NaN', 2, 1], ['R2', 2, 'Infinity', 3], ['R3', 3, 2, '-Infinity'], ['R4', 4, 5, 4], ['R5', 1, 3, 2]]));
{
  const columns = 2_100;
  const header = ['respondent_id', ...Array.from({ length: columns - 1 }, (_, k) => `V${k + 1}`)];
  const row = (i: number) => [`R${i}`, ...Array.from({ length: columns - 1 }, (_, k) => ((i + k) % 5) + 1)];
  add({ file: 'too-many-columns.csv', about: `${columns} columns, over the default limit of 2,000`, expect: { refused: { status: 413, code: 'too-many-columns', step: 'read' } } }, csv([header, row(1), row(2)]));
  const wideItems = 1_500;
  const wide: Cell[][] = [['respondent_id', ...Array.from({ length: wideItems }, (_, k) => `V${k + 1}`)]];
  for (let i = 0; i < 40; i++) wide.push([`R${i + 1}`, ...Array.from({ length: wideItems }, (_, k) => ((i * 3 + k * 7 + ((i * k) % 3)) % 5) + 1)]);
  add({
    file: 'wide-under-limit.csv', about: `${wideItems} item columns and 40 respondents, under the column limit`,
    expect: { wave: { rows: 40, items: wideItems, warnings: ['identical-items', 'more-items-than-respondents'] } },
  }, csv(wide));
}
add({
  file: 'too-many-rows.csv', about: '150 respondents read with a row limit of 100', limits: { maxRows: 100 },
  expect: { refused: { status: 413, code: 'too-many-rows', step: 'read' } },
}, csv(basicRows(150)));

// 7. Item problems.
add({
  file: 'constant-items.csv', about: 'two items everyone answered the same way',
  expect: { wave: { rows: 6, items: 5, warnings: ['constant-item', 'identical-items', 'range-assumed'], roles: { Q4: 'item', Q5: 'item' } } },
}, csv(basicRows(6, 3).map((row, i) => [...row, i === 0 ? 'Q4' : 3, i === 0 ? 'Q5' : 3])));
add({
  file: 'duplicate-column.csv', about: 'an exact copy of one item under another name',
  expect: { wave: { rows: 6, items: 5, warnings: ['identical-items'] } },
}, csv(basicRows(6, 4).map((row) => [...row, row[2] === 'Q2' ? 'Q2_copy' : row[2]])));
add({
  file: 'more-items-than-respondents.csv', about: '10 items and 6 respondents',
  expect: { wave: { rows: 6, items: 10, warnings: ['more-items-than-respondents'] } },
}, csv(basicRows(6, 10)));
add({
  file: 'missing-codes.csv', about: 'missing codes 8 and 9 on 1..5 items, 99 on a 0..10 item, -9 on another',
  expect: {
    wave: {
      rows: 8, items: 4, warnings: ['missing-codes-guessed'],
      cells: [{ column: 'Q1', row: 1, value: null }, { column: 'Q2', row: 2, value: null }, { column: 'Q4', row: 3, value: null }, { column: 'Q3', row: 4, value: null }, { column: 'Q1', row: 0, value: 1 }],
    },
  },
}, csv([['respondent_id', 'Q1', 'Q2', 'Q3', 'Q4'],
  ['R1', 1, 2, 3, 10], ['R2', 8, 3, 4, 7], ['R3', 3, 9, 5, 0], ['R4', 4, 5, 1, 99], ['R5', 5, 1, -9, 5], ['R6', 2, 4, 2, 9], ['R7', 9, 2, 3, 3], ['R8', 3, 8, 4, 6]]));
add({
  file: 'labels-instead-of-codes.csv', about: 'answers exported as agreement labels, with a "Don\'t know"',
  expect: {
    wave: {
      rows: 5, items: 3, warnings: ['labels-mapped-by-guess'],
      cells: [{ column: 'Q1', row: 0, value: 5 }, { column: 'Q2', row: 1, value: 3 }, { column: 'Q3', row: 2, value: null }, { column: 'Q1', row: 4, value: 1 }],
    },
  },
}, csv([['respondent_id', 'Q1', 'Q2', 'Q3'],
  ['R1', 'Strongly agree', 'Agree', 'Disagree'],
  ['R2', 'Agree', 'Neither agree nor disagree', 'Agree'],
  ['R3', 'Disagree', 'strongly disagree', "Don't know"],
  ['R4', 'Agree', 'Strongly Agree', 'Strongly agree'],
  ['R5', 'Strongly disagree', 'Disagree', 'Neither agree nor disagree']]));
add({
  file: 'personal-data.csv', about: 'e-mail addresses, phone numbers, names and free text beside the items',
  expect: {
    wave: {
      rows: 5, items: 3, warnings: ['formula-like-cells', 'personal-data-ignored'],
      roles: { email: 'ignore', phone: 'ignore', full_name: 'ignore', what_else: 'ignore', Q1: 'item' },
    },
  },
}, csv([['respondent_id', 'email', 'phone', 'full_name', 'Q1', 'Q2', 'Q3', 'what_else'],
  ['R1', 'ann.lee@example.org', '+44 20 7946 0001', 'Ann Lee', 4, 5, 3, 'The reading room could stay open later on Fridays'],
  ['R2', 'bo.chan@example.net', '020 7946 0002', 'Bo Chan', 2, 3, 2, 'More copies of the popular new novels, please'],
  ['R3', 'cy.diaz@example.com', '(020) 7946-0003', 'Cy Diaz', 5, 4, 5, 'Nothing to add, the staff are always helpful'],
  ['R4', 'di.evans@example.org', '+1 555 0100 004', 'Di Evans', 1, 2, 1, 'The children\u2019s corner is too noisy for study'],
  ['R5', 'ed.fox@example.net', '0161 496 0005', 'Ed Fox', 3, 3, 3, 'Please bring back the Saturday film club']]));
add({
  file: 'durations-clock.csv', about: 'completion times written as mm:ss and hh:mm:ss',
  expect: {
    wave: {
      rows: 4, items: 3, warnings: [], roles: { duration: 'duration' },
      cells: [{ column: 'duration', row: 0, value: 330 }, { column: 'duration', row: 1, value: 3723 }, { column: 'duration', row: 2, value: 45 }],
    },
  },
}, csv([['respondent_id', 'duration', 'Q1', 'Q2', 'Q3'], ['R1', '5:30', 1, 2, 3], ['R2', '1:02:03', 3, 4, 5], ['R3', '0:45', 2, 2, 2], ['R4', '12:00', 5, 4, 3]]));

// 8. Codebooks.
add({
  file: 'codebook-missing-columns.csv', codebook: 'codebook-missing-columns.codebook.csv',
  about: 'a codebook that names two items the data does not have, and a reverse-keyed item',
  expect: {
    wave: {
      rows: 5, items: 3, warnings: ['codebook-item-not-in-data'],
      cells: [{ column: 'Q3', row: 0, value: 3 }, { column: 'Q3', row: 3, value: 5 }],
    },
  },
}, csv([['respondent_id', 'Q1', 'Q2', 'Q3'], ['R1', 2, 3, 3], ['R2', 3, 4, 2], ['R3', 4, 5, 4], ['R4', 5, 4, 1], ['R5', 1, 2, 5]]));
save('codebook-missing-columns.codebook.csv', csv([['item', 'scale', 'reverse', 'min', 'max', 'missing', 'text'],
  ['Q1', 'service', 'no', 1, 5, '8 9', 'Staff answer my questions well.'],
  ['Q2', 'service', 'no', 1, 5, '8 9', 'I find what I came for.'],
  ['Q3', 'service', 'yes', 1, 5, '8 9', 'Visits often leave me frustrated.'],
  ['Q9', 'service', 'no', 1, 5, '8 9', 'An item left out of this export.'],
  ['Q10', 'service', 'no', 1, 5, '8 9', 'Another item left out of this export.']]));
add({
  file: 'codebook-value-labels.csv', codebook: 'codebook-value-labels.codebook.csv',
  about: 'answers as labels of a scale no built-in list knows, mapped by the codebook\'s labels column',
  expect: {
    wave: {
      rows: 4, items: 2, warnings: ['unmapped-labels'],
      cells: [{ column: 'V1', row: 0, value: 4 }, { column: 'V2', row: 1, value: 1 }, { column: 'V1', row: 2, value: null }, { column: 'V2', row: 3, value: null }],
    },
  },
}, csv([['respondent_id', 'V1', 'V2'], ['R1', 'Every week', 'Rarely if ever'], ['R2', 'Once a month', 'Rarely if ever'], ['R3', 'Every other day', 'Once a month'], ['R4', 'A few times a year', 'No idea']]));
save('codebook-value-labels.codebook.csv', csv([['item', 'min', 'max', 'missing', 'labels'],
  ['V1', 1, 4, '9', '1=Rarely if ever; 2=A few times a year; 3=Once a month; 4=Every week; 9=No idea'],
  ['V2', 1, 4, '9', '1=Rarely if ever; 2=A few times a year; 3=Once a month; 4=Every week']]));
{
  const data: Cell[][] = [['respondent_id', 'S1', 'S2', 'S3_r', 'overall'], ['R1', 4, 5, 2, 8], ['R2', 2, 2, 4, 4], ['R3', 5, 4, 1, 9], ['R4', 3, 3, 3, 6], ['R5', 1, 2, 4, 2]];
  const codebookSheet: Cell[][] = [['item', 'scale', 'reverse', 'min', 'max', 'missing', 'text'],
    ['S1', 'satisfaction', 'no', 1, 5, '9', 'The library meets my needs.'],
    ['S2', 'satisfaction', 'no', 1, 5, '9', 'I would miss the library if it closed.'],
    ['S3_r', 'satisfaction', 'yes', 1, 5, '9', 'The library is of little use to me.']];
  add({
    file: 'workbook-with-codebook.xlsx', about: 'responses and a "Codebook" sheet in one workbook; a reverse-keyed item and an outcome',
    expect: {
      wave: {
        rows: 5, items: 3, warnings: ['codebook-sheet-found'], roles: { overall: 'outcome' },
        cells: [{ column: 'S3_r', row: 0, value: 4 }, { column: 'S3_r', row: 4, value: 2 }, { column: 'overall', row: 2, value: 9 }],
        source: { format: 'xlsx', sheet: 'Responses' },
      },
    },
  }, workbook({ Responses: data, Codebook: codebookSheet }, 'xlsx'));
  add({
    file: 'responses.ods', about: 'an OpenDocument spreadsheet',
    expect: { wave: { rows: 5, items: 3, warnings: [], roles: { overall: 'outcome' }, source: { format: 'ods', sheet: 'Sheet1' } } },
  }, workbook({ Sheet1: data }, 'ods'));
  add({
    file: 'responses.xls', about: 'a legacy Excel 97-2003 (BIFF8) workbook',
    expect: { wave: { rows: 5, items: 3, warnings: [], roles: { overall: 'outcome' }, source: { format: 'xls', sheet: 'Sheet1' } } },
  }, workbook({ Sheet1: data }, 'biff8'));
}

const expected: WaveCorpus = {
  schema: waveCorpusSchema,
  generatedBy: 'npx tsx scripts/make-wave-fixtures.ts',
  howToRun: [
    'For each entry, read fixtures/waves/<file> with readTable(bytes, file, limits ?? {}, { sheet }).',
    'The codebook is table.codebookTable (a sheet of the same workbook) or, when "codebook" names a file, readTable of that file; both go through readCodebook.',
    'Then proposeSetup(table, codebook), and buildWave(table, proposal) with the proposal confirmed unchanged and no exclusions.',
    '"refused": the WaveRefusal expected (status, code) and the step that throws it (read, codebook, propose, build); over HTTP the same status and code come back in the api.md error shape.',
    '"wave": rows, item count and the sorted set of warning codes from all steps (table, codebook, proposal, wave); optional checks: item ids, headers, proposed roles, single values after building (null = missing), and how the file was read.',
  ],
  entries,
};
writeFileSync(join(directory, 'expected.json'), `${JSON.stringify(expected, null, 2)}\n`);
console.log(`wrote ${entries.length} corpus entries to ${directory}`);
