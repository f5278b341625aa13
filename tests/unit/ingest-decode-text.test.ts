import { describe, expect, it } from 'vitest';
import { decodeText, looksBinary, WaveRefusal } from '../../src/lib/ingest';

const utf8 = (text: string) => new TextEncoder().encode(text);
function utf16(text: string, order: 'le' | 'be', bom: boolean): Uint8Array {
  const le = Buffer.from(text, 'utf16le');
  const bytes = Buffer.from(le);
  if (order === 'be') for (let i = 0; i < bytes.length; i += 2) [bytes[i], bytes[i + 1]] = [le[i + 1], le[i]];
  const mark = order === 'le' ? [0xff, 0xfe] : [0xfe, 0xff];
  return new Uint8Array(bom ? [...mark, ...bytes] : bytes);
}
function refusal(run: () => unknown): WaveRefusal {
  try {
    run();
  } catch (error) {
    if (error instanceof WaveRefusal) return error;
    throw error;
  }
  throw new Error('expected a refusal');
}

describe('decodeText', () => {
  const sample = 'id,Qualité\r\n1,4\r\n';

  it('strips a UTF-8 byte-order mark (Unicode: U+FEFF as EF BB BF)', () => {
    const decoded = decodeText(new Uint8Array([0xef, 0xbb, 0xbf, ...utf8(sample)]), 'a.csv');
    expect(decoded).toMatchObject({ text: sample, encoding: 'utf-8', hadByteOrderMark: true, warnings: [] });
  });

  it('reads UTF-16 LE and BE with a mark (FF FE / FE FF) and without one (NUL-byte pattern)', () => {
    for (const order of ['le', 'be'] as const) {
      for (const bom of [true, false]) {
        const decoded = decodeText(utf16(sample, order, bom), 'a.csv');
        expect(decoded.text).toBe(sample);
        expect(decoded.encoding).toBe(`utf-16${order}`);
        expect(decoded.hadByteOrderMark).toBe(bom);
      }
    }
  });

  it('falls back to Windows-1252 when the bytes are not UTF-8, with a warning (WHATWG: 0xE9 é, 0x92 ’)', () => {
    const decoded = decodeText(new Uint8Array([0x43, 0x61, 0x66, 0xe9, 0x2c, 0x92]), 'a.csv');
    expect(decoded.text).toBe('Café,’');
    expect(decoded.encoding).toBe('windows-1252');
    expect(decoded.warnings.map((warning) => warning.code)).toEqual(['encoding-guessed']);
  });

  it('refuses NUL bytes in a text file, invalid UTF-16, and binary data', () => {
    expect(refusal(() => decodeText(new Uint8Array([0x61, 0x2c, 0x00, 0x62, 0x0a]), 'a.csv')).code).toBe('nul-bytes');
    // An unpaired high surrogate (D800) after a byte-order mark.
    expect(refusal(() => decodeText(new Uint8Array([0xff, 0xfe, 0x61, 0x00, 0x00, 0xd8, 0x62, 0x00]), 'a.csv')).code).toBe('bad-utf16');
    const control = new Uint8Array(200).map((_, i) => (i % 3 === 0 ? 0x01 : 0x41));
    const error = refusal(() => decodeText(control, 'a.csv'));
    expect(error.status).toBe(422);
    expect(error.code).toBe('binary-file');
  });

  it('does not mutate its input', () => {
    const bytes = utf16(sample, 'le', true);
    const copy = Uint8Array.from(bytes);
    decodeText(bytes, 'a.csv');
    expect(bytes).toEqual(copy);
  });
});

describe('looksBinary', () => {
  it('tolerates tabs, line breaks and a rare stray control character, not many', () => {
    expect(looksBinary('a\tb\r\nc\fd\ve')).toBe(false);
    expect(looksBinary(`${'x'.repeat(1000)}\u001a`)).toBe(false);
    expect(looksBinary('\u0001\u0002\u0003abc')).toBe(true);
  });
});

describe('decodeWindows1252', () => {
  it('maps 0x80-0x9F by the WHATWG table and the rest as Latin-1', async () => {
    const { decodeWindows1252 } = await import('../../src/lib/ingest');
    // WHATWG index-windows-1252: 0x80 → U+20AC, 0x92 → U+2019, 0x9F → U+0178, 0x81 → U+0081; 0xE9 → U+00E9.
    expect(decodeWindows1252(new Uint8Array([0x80, 0x92, 0x9f, 0x81, 0xe9, 0x41]))).toBe('\u20ac\u2019\u0178\u0081\u00e9A');
  });
});
