/**
 * Turns the bytes of a text export into a string: byte-order mark first, then the NUL-byte
 * pattern of UTF-16 without a mark, then strict UTF-8, then Windows-1252 (the usual encoding of
 * spreadsheet exports on Western European Windows machines).
 */
import { BINARY_CONTROL_SHARE, BINARY_SAMPLE_CHARS, ENCODING_SAMPLE_BYTES, UTF16_MIN_UNITS, UTF16_NUL_SHARE, UTF16_STRAY_NUL_SHARE } from './ingest-thresholds';
import type { WaveWarning } from './types';
import { WaveRefusal } from './wave-refusal';

/** Encodings the text reader decodes. */
export type TextEncodingName = 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';

/** A decoded text file. */
export interface DecodedText {
  /** The text without a byte-order mark. */
  readonly text: string;
  readonly encoding: TextEncodingName;
  readonly hadByteOrderMark: boolean;
  readonly warnings: readonly WaveWarning[];
}

/** Which UTF-16 byte order the NUL-byte pattern of the first bytes suggests, if any. */
function utf16ByNulPattern(bytes: Uint8Array): 'utf-16le' | 'utf-16be' | null {
  const end = Math.min(bytes.length, ENCODING_SAMPLE_BYTES) & ~1;
  if (end < 2) return null;
  let nulEven = 0;
  let nulOdd = 0;
  for (let i = 0; i < end; i += 2) {
    if (bytes[i] === 0) nulEven++;
    if (bytes[i + 1] === 0) nulOdd++;
  }
  const units = end / 2;
  if (units < UTF16_MIN_UNITS) return null;
  if (nulOdd / units >= UTF16_NUL_SHARE && nulEven / units < UTF16_STRAY_NUL_SHARE) return 'utf-16le';
  if (nulEven / units >= UTF16_NUL_SHARE && nulOdd / units < UTF16_STRAY_NUL_SHARE) return 'utf-16be';
  return null;
}

/** WHATWG index-windows-1252 for bytes 0x80-0x9F (the rest of the upper half equals Latin-1). */
const WINDOWS_1252_HIGH = [
  0x20ac, 0x0081, 0x201a, 0x0192, 0x201e, 0x2026, 0x2020, 0x2021, 0x02c6, 0x2030, 0x0160, 0x2039, 0x0152, 0x008d, 0x017d, 0x008f,
  0x0090, 0x2018, 0x2019, 0x201c, 0x201d, 0x2022, 0x2013, 0x2014, 0x02dc, 0x2122, 0x0161, 0x203a, 0x0153, 0x009d, 0x017e, 0x0178,
];

/**
 * Decodes Windows-1252 by the WHATWG table (Node's TextDecoder reads this label as Latin-1,
 * which turns the curly quotes and the euro sign of 0x80-0x9F into control characters).
 * @param bytes the text's bytes.
 * @returns the text.
 * References: WHATWG 2024, "Encoding Standard", index-windows-1252.
 */
export function decodeWindows1252(bytes: Uint8Array): string {
  const parts: string[] = [];
  const chunk = 8192;
  for (let start = 0; start < bytes.length; start += chunk) {
    const end = Math.min(bytes.length, start + chunk);
    const codes = new Array<number>(end - start);
    for (let i = start; i < end; i++) {
      const byte = bytes[i];
      codes[i - start] = byte >= 0x80 && byte <= 0x9f ? WINDOWS_1252_HIGH[byte - 0x80] : byte;
    }
    parts.push(String.fromCharCode(...codes));
  }
  return parts.join('');
}

function decodeStrict(bytes: Uint8Array, encoding: 'utf-8' | 'utf-16le' | 'utf-16be'): string | null {
  try {
    return new TextDecoder(encoding, { fatal: true, ignoreBOM: true }).decode(bytes);
  } catch {
    return null;
  }
}

/**
 * Whether decoded text holds so many control characters that it is a binary file.
 * @param text decoded text.
 * @returns true when more than {@link BINARY_CONTROL_SHARE} of the first characters are control characters.
 * References: none published; a common heuristic for telling text from binary data (docs/decisions/002-reading-waves.md).
 */
export function looksBinary(text: string): boolean {
  const end = Math.min(text.length, BINARY_SAMPLE_CHARS);
  if (end === 0) return false;
  let control = 0;
  for (let i = 0; i < end; i++) {
    const c = text.charCodeAt(i);
    if ((c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d && c !== 0x0c && c !== 0x0b) || c === 0x7f) control++;
  }
  return control / end > BINARY_CONTROL_SHARE;
}

/**
 * Decodes a text export.
 * @param bytes the file's bytes.
 * @param fileName the uploaded name, for messages.
 * @throws {WaveRefusal} 422 `nul-bytes` when NUL bytes appear outside a UTF-16 pattern;
 *   422 `bad-utf16` when a UTF-16 file holds invalid sequences; 422 `binary-file` when the
 *   decoded text is mostly control characters.
 * @returns the text, the encoding used, and a warning when Windows-1252 was guessed.
 * References: The Unicode Consortium 2022, "The Unicode Standard, Version 15.0" (U+FEFF byte order mark, UTF-16 byte orders);
 *   WHATWG 2024, "Encoding Standard" (the windows-1252 decoder).
 */
export function decodeText(bytes: Uint8Array, fileName: string): DecodedText {
  let encoding: TextEncodingName;
  let offset = 0;
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) {
    encoding = 'utf-8';
    offset = 3;
  } else if (bytes[0] === 0xff && bytes[1] === 0xfe) {
    encoding = 'utf-16le';
    offset = 2;
  } else if (bytes[0] === 0xfe && bytes[1] === 0xff) {
    encoding = 'utf-16be';
    offset = 2;
  } else {
    encoding = utf16ByNulPattern(bytes) ?? 'utf-8';
  }
  const hadByteOrderMark = offset > 0;
  const body = bytes.subarray(offset);
  const warnings: WaveWarning[] = [];
  let text: string | null;
  if (encoding === 'utf-16le' || encoding === 'utf-16be') {
    text = decodeStrict(body.length % 2 === 0 ? body : body.subarray(0, body.length - 1), encoding);
    if (text === null) {
      throw new WaveRefusal(422, 'bad-utf16', `"${fileName}" looks like UTF-16 text but holds invalid character sequences; save it again as UTF-8 CSV.`);
    }
  } else {
    if (body.includes(0)) {
      throw new WaveRefusal(422, 'nul-bytes', `"${fileName}" holds NUL bytes, so it is a binary or damaged file rather than text; export the responses again as CSV or XLSX.`);
    }
    text = decodeStrict(body, 'utf-8');
    if (text === null) {
      encoding = 'windows-1252';
      text = decodeWindows1252(body);
      warnings.push({
        code: 'encoding-guessed',
        columns: [],
        message: 'The file is not valid UTF-8, so it was read as Windows-1252; check that accented letters look right.',
      });
    }
  }
  if (looksBinary(text)) {
    throw new WaveRefusal(422, 'binary-file', `"${fileName}" is not a text export or a workbook (it holds binary data); export the responses as CSV or XLSX.`);
  }
  return { text, encoding, hadByteOrderMark, warnings };
}
