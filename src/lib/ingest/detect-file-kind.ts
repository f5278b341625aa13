/**
 * Tells what an upload is by its first bytes (its "magic number"), never by its name alone, so a
 * renamed file is read as what it is or refused with a sentence that says what it is.
 */
import { WaveRefusal } from './wave-refusal';

/** What the bytes are: a zip container (XLSX, ODS), an OLE2 compound file (XLS), or text. */
export type FileKind = 'zip' | 'compound' | 'text';

const WORKBOOK_EXTENSIONS = new Set(['xlsx', 'xlsm', 'xlsb', 'xls', 'ods', 'ots', 'xltx', 'xltm']);

/** Binary formats people upload by mistake, with what to do instead. */
const KNOWN_BINARY: readonly { readonly magic: readonly number[]; readonly what: string }[] = [
  { magic: [0x25, 0x50, 0x44, 0x46], what: 'a PDF document' },
  { magic: [0x89, 0x50, 0x4e, 0x47], what: 'a PNG image' },
  { magic: [0xff, 0xd8, 0xff], what: 'a JPEG image' },
  { magic: [0x1f, 0x8b], what: 'a gzip archive' },
  { magic: [0x37, 0x7a, 0xbc, 0xaf], what: 'a 7-Zip archive' },
  { magic: [0x52, 0x61, 0x72, 0x21], what: 'a RAR archive' },
  { magic: [0x24, 0x46, 0x4c, 0x32], what: 'an SPSS data file (.sav)' },
  { magic: [0x24, 0x46, 0x4c, 0x33], what: 'an SPSS data file (.sav)' },
  { magic: [0x7f, 0x45, 0x4c, 0x46], what: 'a program' },
  { magic: [0x4d, 0x5a], what: 'a program' },
];

function startsWith(bytes: Uint8Array, magic: readonly number[]): boolean {
  return bytes.length >= magic.length && magic.every((byte, i) => bytes[i] === byte);
}

/**
 * The lower-case extension of a file name without the dot, or `''`.
 * @param fileName the uploaded name.
 * @returns e.g. `xlsx`.
 * References: none published; file-name convention.
 */
export function fileExtension(fileName: string): string {
  const match = /\.([A-Za-z0-9]{1,8})$/.exec(fileName.trim());
  return match ? match[1].toLowerCase() : '';
}

/**
 * Classifies an upload by its first bytes and checks the name does not promise a workbook the
 * bytes are not.
 * @param bytes the file's bytes (at least one).
 * @param fileName the uploaded name.
 * @throws {WaveRefusal} 422 `unsupported-format` for a known non-survey binary (PDF, SPSS .sav, images, archives);
 *   422 `not-a-workbook` when the name ends in a workbook extension but the bytes are not a workbook.
 * @returns `zip`, `compound` or `text`.
 * References: PKWARE 2022, "APPNOTE.TXT - .ZIP File Format Specification" 6.3.10, §4.3.7 local file header signature;
 *   Microsoft 2023, "[MS-CFB]: Compound File Binary File Format", §2.2 header signature.
 */
export function detectFileKind(bytes: Uint8Array, fileName: string): FileKind {
  const extension = fileExtension(fileName);
  if (startsWith(bytes, [0x50, 0x4b, 0x03, 0x04]) || startsWith(bytes, [0x50, 0x4b, 0x05, 0x06])) return 'zip';
  if (startsWith(bytes, [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1])) return 'compound';
  for (const known of KNOWN_BINARY) {
    if (startsWith(bytes, known.magic)) {
      throw new WaveRefusal(422, 'unsupported-format', `"${fileName}" is ${known.what}, not survey responses; export the responses as CSV, XLSX, XLS or ODS.`);
    }
  }
  if (WORKBOOK_EXTENSIONS.has(extension)) {
    throw new WaveRefusal(422, 'not-a-workbook', `"${fileName}" is named like a workbook but is not one (it may have been renamed); open it in its program and save it again as XLSX or CSV.`);
  }
  return 'text';
}
