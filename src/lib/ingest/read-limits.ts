/**
 * Limits on what an upload may hold, with their defaults. Every limit, when passed, ends in a
 * 413 refusal whose code names the limit (docs/decisions/002-reading-waves.md explains why a
 * count of rows or columns is a 413 and not a 422).
 */

/** Configurable limits for reading one uploaded file. All are positive integers. */
export interface ReadLimits {
  /** Largest upload in bytes (default 50 MB). */
  readonly maxBytes: number;
  /** Most respondent rows, not counting the header (default 200,000). */
  readonly maxRows: number;
  /** Most columns (default 2,000). */
  readonly maxColumns: number;
  /** Most cells, rows × columns (default 10,000,000; about 160 MB as one Float64 matrix). */
  readonly maxCells: number;
  /** Zip-based workbooks (XLSX, ODS): most uncompressed bytes over all entries (default 300 MB). */
  readonly maxUncompressedBytes: number;
  /** Zip-based workbooks: most entries in the central directory (default 10,000). */
  readonly maxZipEntries: number;
  /** Workbooks: most heap the isolated reader may use, in MB (default 1,024). */
  readonly maxWorkbookMemoryMb: number;
  /** Workbooks: most seconds the isolated reader may take (default 60). */
  readonly maxWorkbookSeconds: number;
}

/** The defaults of {@link ReadLimits}. */
export const DEFAULT_READ_LIMITS: ReadLimits = Object.freeze({
  maxBytes: 50 * 1000 * 1000,
  maxRows: 200_000,
  maxColumns: 2_000,
  maxCells: 10_000_000,
  maxUncompressedBytes: 300 * 1000 * 1000,
  maxZipEntries: 10_000,
  maxWorkbookMemoryMb: 1_024,
  maxWorkbookSeconds: 60,
});

/**
 * Fills the limits not given with the defaults and checks them.
 * @param limits any subset of {@link ReadLimits}.
 * @throws {RangeError} when a limit is not a positive integer (a configuration error, not a client's).
 * @returns the complete limits.
 * References: Paredown issue 4 (default limits); docs/decisions/002-reading-waves.md.
 */
export function resolveReadLimits(limits: Partial<ReadLimits> = {}): ReadLimits {
  const resolved = { ...DEFAULT_READ_LIMITS, ...limits };
  for (const [name, value] of Object.entries(resolved)) {
    if (!Number.isInteger(value) || value <= 0) {
      throw new RangeError(`resolveReadLimits: ${name} must be a positive integer, got ${String(value)}`);
    }
  }
  return Object.freeze(resolved);
}

/**
 * A size in mebibytes (1 MiB = 1,048,576 bytes), the one unit every size limit is stated in
 * (docs/decisions/014-hardening.md).
 * @param bytes a number of bytes.
 * @returns e.g. `50 MiB`, or `0.5 MiB` below one.
 */
export function formatMebibytes(bytes: number): string {
  const mib = bytes / (1024 * 1024);
  if (mib >= 1) return `${Math.round(mib).toLocaleString('en-GB')} MiB`;
  return `${Math.max(0.1, Math.round(mib * 10) / 10)} MiB`;
}
