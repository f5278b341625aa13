import { describe, expect, it } from 'vitest';
import { decodeMatrix, encodeMatrix, MATRIX_BLOB_VERSION } from '../../src/lib/ingest';

describe('encodeMatrix / decodeMatrix', () => {
  const matrix = { rows: 2, columns: 3, data: Float64Array.from([1, NaN, -0, 2.5, 1e-300, -7]) };

  it('writes a 16-byte little-endian header (PDMX, version, rows, columns) and float64 values', () => {
    const before = Float64Array.from(matrix.data);
    const bytes = encodeMatrix(matrix);
    expect(bytes.length).toBe(16 + 6 * 8);
    expect(Array.from(bytes.subarray(0, 16))).toEqual([0x50, 0x44, 0x4d, 0x58, 1, 0, 0, 0, 2, 0, 0, 0, 3, 0, 0, 0]);
    expect(MATRIX_BLOB_VERSION).toBe(1);
    // IEEE 754 binary64, little-endian: 1.0 is 00 00 00 00 00 00 F0 3F; the canonical quiet NaN 00 .. F8 7F.
    expect(Array.from(bytes.subarray(16, 24))).toEqual([0, 0, 0, 0, 0, 0, 0xf0, 0x3f]);
    expect(Array.from(bytes.subarray(24, 32))).toEqual([0, 0, 0, 0, 0, 0, 0xf8, 0x7f]);
    // −0 is stored as +0
    expect(Array.from(bytes.subarray(32, 40))).toEqual([0, 0, 0, 0, 0, 0, 0, 0]);
    expect(matrix.data).toEqual(before);
  });

  it('round-trips exactly, NaN included', () => {
    const back = decodeMatrix(encodeMatrix(matrix));
    expect(back.rows).toBe(2);
    expect(back.columns).toBe(3);
    expect(Array.from(back.data)).toEqual([1, NaN, 0, 2.5, 1e-300, -7]);
  });

  it('gives identical bytes for NaNs with different payloads', () => {
    const odd = new Float64Array(1);
    new DataView(odd.buffer).setUint32(0, 1, true);
    new DataView(odd.buffer).setUint32(4, 0x7ff00000, true); // a signalling-NaN bit pattern
    expect(Number.isNaN(odd[0])).toBe(true);
    expect(encodeMatrix({ rows: 1, columns: 1, data: odd })).toEqual(encodeMatrix({ rows: 1, columns: 1, data: Float64Array.of(NaN) }));
  });

  it('decodes from a view at an offset of a larger buffer', () => {
    const bytes = encodeMatrix(matrix);
    const padded = new Uint8Array(bytes.length + 3);
    padded.set(bytes, 3);
    expect(Array.from(decodeMatrix(padded.subarray(3)).data)).toEqual([1, NaN, 0, 2.5, 1e-300, -7]);
  });

  it('refuses inconsistent input and foreign or damaged blobs', () => {
    expect(() => encodeMatrix({ rows: 2, columns: 2, data: new Float64Array(3) })).toThrow(/expected rows × columns/);
    const bytes = encodeMatrix(matrix);
    expect(() => decodeMatrix(bytes.subarray(0, bytes.length - 1))).toThrow(/expected/);
    const foreign = Uint8Array.from(bytes);
    foreign[0] = 0;
    expect(() => decodeMatrix(foreign)).toThrow(/PDMX/);
    const future = Uint8Array.from(bytes);
    future[4] = 2;
    expect(() => decodeMatrix(future)).toThrow(/version 2/);
  });
});
