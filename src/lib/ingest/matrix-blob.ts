/**
 * The stored form of a response matrix: a 16-byte header and the values as little-endian
 * 64-bit floats, column-major as in the ItemMatrix, missing as one canonical NaN. The same
 * matrix always gives the same bytes, so two uploads of the same answers store identical blobs.
 *
 * Layout (all little-endian): bytes 0-3 the ASCII magic `PDMX`; 4-7 uint32 format version (1);
 * 8-11 uint32 rows; 12-15 uint32 columns; then rows × columns float64 values.
 */
import type { ItemMatrix } from '../stats/types';

/** Version written by {@link encodeMatrix}. */
export const MATRIX_BLOB_VERSION = 1;
const MAGIC = [0x50, 0x44, 0x4d, 0x58]; // "PDMX"
const HEADER_BYTES = 16;
const MAX_UINT32 = 0xffffffff;

/**
 * Encodes a matrix for storage.
 * @param matrix respondents × items, column-major, NaN for missing.
 * @throws {RangeError} when rows or columns are not whole numbers within 32 bits, or the data length is not rows × columns.
 * @returns the blob: header then values; every NaN written as the canonical quiet NaN and −0 as 0.
 * References: IEEE 754-2019, "IEEE Standard for Floating-Point Arithmetic" (binary64 layout).
 */
export function encodeMatrix(matrix: ItemMatrix): Uint8Array {
  const { rows, columns, data } = matrix;
  if (!Number.isInteger(rows) || rows < 0 || rows > MAX_UINT32 || !Number.isInteger(columns) || columns < 0 || columns > MAX_UINT32) {
    throw new RangeError(`encodeMatrix: rows (${rows}) and columns (${columns}) must be whole numbers from 0 to ${MAX_UINT32}`);
  }
  if (data.length !== rows * columns) {
    throw new RangeError(`encodeMatrix: data holds ${data.length} values, expected rows × columns = ${rows * columns}`);
  }
  const bytes = new Uint8Array(HEADER_BYTES + data.length * 8);
  const view = new DataView(bytes.buffer);
  MAGIC.forEach((byte, i) => view.setUint8(i, byte));
  view.setUint32(4, MATRIX_BLOB_VERSION, true);
  view.setUint32(8, rows, true);
  view.setUint32(12, columns, true);
  for (let i = 0; i < data.length; i++) {
    const value = data[i];
    view.setFloat64(HEADER_BYTES + i * 8, Number.isNaN(value) ? Number.NaN : value === 0 ? 0 : value, true);
  }
  return bytes;
}

/**
 * Decodes a stored blob.
 * @param bytes a blob from {@link encodeMatrix}.
 * @throws {RangeError} when the magic, version or length does not match (a damaged or foreign blob: an internal fault, not a client's).
 * @returns the matrix (a fresh copy of the values).
 * References: IEEE 754-2019, "IEEE Standard for Floating-Point Arithmetic" (binary64 layout).
 */
export function decodeMatrix(bytes: Uint8Array): ItemMatrix {
  if (bytes.length < HEADER_BYTES || !MAGIC.every((byte, i) => bytes[i] === byte)) {
    throw new RangeError('decodeMatrix: the bytes are not a Paredown matrix blob (magic "PDMX" missing)');
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = view.getUint32(4, true);
  if (version !== MATRIX_BLOB_VERSION) throw new RangeError(`decodeMatrix: blob version ${version} is not supported (expected ${MATRIX_BLOB_VERSION})`);
  const rows = view.getUint32(8, true);
  const columns = view.getUint32(12, true);
  const expected = HEADER_BYTES + rows * columns * 8;
  if (bytes.length !== expected) throw new RangeError(`decodeMatrix: blob is ${bytes.length} bytes, expected ${expected} for ${rows} × ${columns}`);
  const data = new Float64Array(rows * columns);
  for (let i = 0; i < data.length; i++) data[i] = view.getFloat64(HEADER_BYTES + i * 8, true);
  return { rows, columns, data };
}
