/**
 * Builds the stored form of a wave from its table and the confirmed setup: the item metadata,
 * the recoded response matrix and the raw one, respondent ids, completion times, weights and
 * outcomes, with warnings about what the designer should look at.
 */
import type { ItemMatrix } from '../stats/types';
import { MIN_RESPONDENTS_FOR_AUDIT } from './ingest-thresholds';
import { parseDuration } from './parse-duration';
import { parseNumber } from './parse-number';
import { recodeCodedItem, recodeCodedItemInto } from './recode-item';
import { tableColumn, tableColumnCodes } from './table-columns';
import type { BuiltWave, ColumnSetup, ItemCounts, WaveItem, WaveOutcome, WaveTable, WaveWarning } from './types';
import type { CheckedSetup } from './validate-setup';
import { WaveRefusal } from './wave-refusal';

function list(values: readonly string[], most = 5): string {
  return values.slice(0, most).join(', ') + (values.length > most ? ', ...' : '');
}

function sameValues(a: Float64Array, b: Float64Array): boolean {
  for (let i = 0; i < a.length; i++) {
    const x = a[i];
    const y = b[i];
    if (x !== y && !(Number.isNaN(x) && Number.isNaN(y))) return false;
  }
  return true;
}

/**
 * FNV-1a over one 32-bit word of each value of one column: the word holding the sign, exponent
 * and leading mantissa bits on a little-endian machine, which tells answer codes and NaN apart
 * (NaN is canonical here, so equal columns hash alike; the hash only groups candidates, equality
 * is then checked value by value, so the groups do not depend on which word is taken).
 */
function columnHash(values: Float64Array): number {
  const words = new Uint32Array(values.buffer, values.byteOffset, values.length * 2);
  let hash = 0x811c9dc5;
  for (let i = 1; i < words.length; i += 2) hash = Math.imul(hash ^ words[i], 0x01000193);
  return hash >>> 0;
}

/**
 * Groups of items whose recoded answers are identical, missing cells included.
 * @param matrix a recoded matrix.
 * @returns groups of 0-based item indices, each of two or more, in order.
 * References: Fowler, Noll & Vo 1991, "FNV hash" (FNV-1a, here over 32-bit words), used only to group candidates; equality is checked value by value.
 */
export function identicalGroups(matrix: ItemMatrix): number[][] {
  const n = matrix.rows;
  const byHash = new Map<number, number[]>();
  for (let k = 0; k < matrix.columns; k++) {
    const hash = columnHash(matrix.data.subarray(k * n, (k + 1) * n));
    const bucket = byHash.get(hash);
    if (bucket) bucket.push(k);
    else byHash.set(hash, [k]);
  }
  const groups: number[][] = [];
  for (const candidates of byHash.values()) {
    const left = [...candidates];
    while (left.length > 1) {
      const first = left.shift() as number;
      const firstValues = matrix.data.subarray(first * n, (first + 1) * n);
      const group = [first];
      for (let m = left.length - 1; m >= 0; m--) {
        const other = left[m];
        if (sameValues(firstValues, matrix.data.subarray(other * n, (other + 1) * n))) {
          group.push(other);
          left.splice(m, 1);
        }
      }
      if (group.length > 1) groups.push(group.sort((a, b) => a - b));
    }
  }
  return groups.sort((a, b) => a[0] - b[0]);
}

function countWarning(code: string, items: readonly WaveItem[], pick: (counts: ItemCounts) => number, what: string, advice: string): WaveWarning | null {
  const affected = items.filter((item) => pick(item.counts) > 0);
  if (affected.length === 0) return null;
  const total = affected.reduce((sum, item) => sum + pick(item.counts), 0);
  return {
    code,
    columns: affected.map((item) => item.header),
    message: `${total} ${what} in ${affected.length} ${affected.length === 1 ? 'item' : 'items'} (${list(affected.map((item) => `${item.id}: ${pick(item.counts)}`))}) were set to missing; ${advice}`,
  };
}

/**
 * Checks the respondent rows to leave out of audits.
 * @param exclusions 0-based respondent rows.
 * @param respondents number of respondents.
 * @throws {WaveRefusal} 400 `invalid-exclusions` when a row is not a whole number in range.
 * @returns the rows sorted, without repeats.
 * References: Paredown api.md (400 for bad input).
 */
export function checkExclusions(exclusions: readonly unknown[], respondents: number): number[] {
  for (const row of exclusions) {
    if (typeof row !== 'number' || !Number.isInteger(row) || row < 0 || row >= respondents) {
      throw new WaveRefusal(400, 'invalid-exclusions', `The exclusion ${JSON.stringify(row)} is not a respondent row; give 0-based row numbers below ${respondents}.`);
    }
  }
  return [...new Set(exclusions as number[])].sort((a, b) => a - b);
}

/**
 * The respondent rows audits use: every row not excluded.
 * @param wave a built wave.
 * @returns 0-based rows in order.
 * References: Paredown product.md (excluded respondents stay in the stored wave and leave audits).
 */
export function includedRows(wave: Pick<BuiltWave, 'respondents' | 'excluded'>): number[] {
  const excluded = new Set(wave.excluded);
  const rows: number[] = [];
  for (let i = 0; i < wave.respondents; i++) if (!excluded.has(i)) rows.push(i);
  return rows;
}

/** Build warnings that depend on which respondents are excluded (recomputed when the exclusions change). */
export const EXCLUSION_WARNING_CODES: readonly string[] = Object.freeze(['constant-item', 'more-items-than-respondents', 'too-few-respondents']);
const exclusionCodes = new Set(EXCLUSION_WARNING_CODES);
/** Build warnings written after `constant-item`, which therefore goes in front of them. */
const afterConstant = new Set(['identical-items', 'missing-code-inside-range']);

/** What {@link applyExclusions} needs of a wave: a built one, or one read back from its stored matrix. */
export interface ExcludableWave {
  /** The recoded matrix, every respondent included. */
  readonly matrix: ItemMatrix;
  /** The items in matrix order. */
  readonly items: readonly Pick<WaveItem, 'id' | 'header'>[];
  /** The wave's build warnings (those of EXCLUSION_WARNING_CODES are replaced). */
  readonly warnings: readonly WaveWarning[];
}

/** The exclusions of a wave and the build warnings under them. */
export interface WaveExclusions {
  /** 0-based rows left out of audits, sorted, without repeats. */
  readonly excluded: number[];
  readonly warnings: WaveWarning[];
}

/**
 * Leaves respondents out of a wave's audits: checks the rows against the matrix, then works out
 * again the warnings that depend on who is included (constant items, more items than respondents,
 * too few respondents), keeping every other warning and the order buildWave writes them in.
 * Needs only the recoded matrix, so a stored wave's exclusions change without its original file.
 * @param wave the matrix, its items and the current build warnings.
 * @param exclusions 0-based respondent rows (untrusted).
 * @throws {WaveRefusal} 400 `invalid-exclusions` when a row is not a whole number in range.
 * @throws {RangeError} when the matrix does not have one column per item (an internal fault).
 * @returns the checked exclusions and the warnings.
 * References: Paredown product.md (excluded respondents stay in the stored wave and leave audits); methods.md §1.
 */
export function applyExclusions(wave: ExcludableWave, exclusions: readonly unknown[]): WaveExclusions {
  const { matrix, items } = wave;
  if (matrix.columns !== items.length) throw new RangeError(`applyExclusions: the matrix has ${matrix.columns} columns for ${items.length} items`);
  const n = matrix.rows;
  const excluded = checkExclusions(exclusions, n);
  const included = includedRows({ respondents: n, excluded });
  const warnings = wave.warnings.filter((warning) => !exclusionCodes.has(warning.code));
  const constant: string[] = [];
  items.forEach((item, k) => {
    const values = new Set<number>();
    for (const i of included) {
      const value = matrix.data[k * n + i];
      if (!Number.isNaN(value)) values.add(value);
      if (values.size > 1) break;
    }
    if (values.size < 2) constant.push(item.id);
  });
  if (constant.length > 0) {
    const at = warnings.findIndex((warning) => afterConstant.has(warning.code));
    warnings.splice(at < 0 ? warnings.length : at, 0, {
      code: 'constant-item',
      columns: items.filter((item) => constant.includes(item.id)).map((item) => item.header),
      message: `${constant.length} ${constant.length === 1 ? 'item has' : 'items have'} fewer than two different answers (${list(constant)}) and will be left out of correlations.`,
    });
  }
  if (items.length > included.length) {
    warnings.push({ code: 'more-items-than-respondents', columns: [], message: `There are ${items.length} items but only ${included.length} ${included.length === 1 ? 'respondent' : 'respondents'}, so the correlation matrix is singular and VIF cannot be computed; collect more responses or audit fewer items.` });
  }
  if (included.length < MIN_RESPONDENTS_FOR_AUDIT) {
    warnings.push({ code: 'too-few-respondents', columns: [], message: `Only ${included.length} ${included.length === 1 ? 'respondent is' : 'respondents are'} included; an audit needs at least ${MIN_RESPONDENTS_FOR_AUDIT}.` });
  }
  return { excluded, warnings };
}

/**
 * Builds a wave from a table and its confirmed setup. The setup was checked once by
 * `validateSetup` (its type says so); the exclusions are checked here, once (applyExclusions).
 * Callers outside the ingest usually go through `acceptWave` (accept-wave.ts).
 * @param table a table from `readTable`.
 * @param setup the confirmed setup, as `validateSetup` returned it for this table.
 * @param exclusions 0-based respondent rows to leave out of audits (kept in the wave).
 * @throws {WaveRefusal} 422 `no-respondents` for a table without answers; 400 `invalid-exclusions`.
 * @returns the wave: items with their setup and cell counts; `matrix` recoded (missing codes,
 *   out-of-range and unreadable cells NaN, reverse-keyed items `min + max − x`); `raw` before
 *   recoding; ids, durations in seconds, weights, outcomes; warnings `out-of-range-values`,
 *   `non-numeric-cells`, `unmapped-labels`, `constant-item`, `identical-items`,
 *   `missing-code-inside-range`, `duplicate-respondent-id`, `duration-unreadable`,
 *   `weight-unreadable`, `more-items-than-respondents`, `too-few-respondents`.
 * References: Paredown methods.md §1 "Preparing the response matrix".
 */
export function buildWave(table: WaveTable, setup: CheckedSetup, exclusions: readonly unknown[] = []): BuiltWave {
  const n = table.rows.length;
  if (n === 0) {
    throw new WaveRefusal(422, 'no-respondents', `"${table.source.fileName}" has a header row but no answers; upload the export with the responses.`);
  }
  const confirmed = setup;
  const decimalSeparator = table.source.decimalSeparator;
  const setupOf = new Map<string, ColumnSetup>(confirmed.columns.map((entry) => [entry.column, entry]));
  const column = (j: number) => tableColumn(table, j);

  const itemColumns: number[] = [];
  table.headers.forEach((header, j) => {
    if (setupOf.get(header)?.role === 'item') itemColumns.push(j);
  });
  const rawData = new Float64Array(n * itemColumns.length);
  const recodedData = new Float64Array(n * itemColumns.length);
  const items: WaveItem[] = itemColumns.map((j, k) => {
    const header = table.headers[j];
    const item = (setupOf.get(header) as ColumnSetup).item!;
    const counts = recodeCodedItemInto(tableColumnCodes(table, j), item, decimalSeparator, rawData.subarray(k * n, (k + 1) * n), recodedData.subarray(k * n, (k + 1) * n));
    return {
      id: item.id, header, scale: item.scale, reverse: item.reverse, min: item.min, max: item.max,
      missingCodes: [...item.missingCodes], text: item.text, labels: [...item.labels], missingLabels: [...item.missingLabels],
      ...(item.type ? { type: item.type } : {}),
      ...(item.facet ? { facet: item.facet } : {}),
      counts,
    };
  });
  const matrix: ItemMatrix = { rows: n, columns: items.length, data: recodedData };
  const raw: ItemMatrix = { rows: n, columns: items.length, data: rawData };

  const warnings: WaveWarning[] = [];
  let respondentIds: string[] | null = null;
  let duration: Float64Array | null = null;
  let weight: Float64Array | null = null;
  const outcomes: WaveOutcome[] = [];
  table.headers.forEach((header, j) => {
    const entry = setupOf.get(header);
    if (!entry || entry.role === 'item' || entry.role === 'ignore') return;
    const cells = column(j);
    if (entry.role === 'respondent-id') {
      respondentIds = cells.map((cell) => cell.trim());
      const seen = new Set<string>();
      const repeated = new Set<string>();
      for (const id of respondentIds) {
        if (seen.has(id)) repeated.add(id);
        seen.add(id);
      }
      if (repeated.size > 0) {
        warnings.push({ code: 'duplicate-respondent-id', columns: [header], message: `${repeated.size} respondent ${repeated.size === 1 ? 'id appears' : 'ids appear'} more than once (${list([...repeated].map((id) => id === '' ? '(blank)' : id))}); check for doubled rows.` });
      }
    } else if (entry.role === 'duration') {
      duration = Float64Array.from(cells, (cell) => parseDuration(cell, entry.durationUnit ?? 'seconds', decimalSeparator));
      const unreadable = cells.filter((cell, i) => cell.trim() !== '' && Number.isNaN(duration![i])).length;
      if (unreadable > 0) {
        warnings.push({ code: 'duration-unreadable', columns: [header], message: `${unreadable} completion ${unreadable === 1 ? 'time' : 'times'} in "${header}" could not be read and count as missing.` });
      }
    } else if (entry.role === 'weight') {
      weight = Float64Array.from(cells, (cell) => {
        const value = parseNumber(cell, decimalSeparator);
        return value >= 0 ? value : Number.NaN;
      });
      const unreadable = cells.filter((cell, i) => cell.trim() !== '' && Number.isNaN(weight![i])).length;
      if (unreadable > 0) {
        warnings.push({ code: 'weight-unreadable', columns: [header], message: `${unreadable} ${unreadable === 1 ? 'weight' : 'weights'} in "${header}" are not numbers of zero or more and count as missing.` });
      }
    } else if (entry.role === 'outcome') {
      if (entry.item) {
        const read = recodeCodedItem(tableColumnCodes(table, j), entry.item, decimalSeparator);
        outcomes.push({ id: entry.item.id, header, values: read.recoded, counts: read.counts });
      } else {
        const values = Float64Array.from(cells, (cell) => parseNumber(cell, decimalSeparator));
        const blank = cells.filter((cell) => cell.trim() === '').length;
        const answered = values.filter((value) => !Number.isNaN(value)).length;
        outcomes.push({
          id: header, header, values,
          counts: { answered, blank, declaredMissing: 0, outOfRange: 0, nonNumeric: n - blank - answered, unmappedLabel: 0, mappedLabel: 0 },
        });
      }
    }
  });

  const counted = [
    countWarning('out-of-range-values', items, (counts) => counts.outOfRange, 'values outside the valid range', 'check the range or the missing codes.'),
    countWarning('non-numeric-cells', items, (counts) => counts.nonNumeric, 'cells that are not numbers', 'check the export or add value labels.'),
    countWarning('unmapped-labels', items, (counts) => counts.unmappedLabel, 'answer texts matching no value label', 'add them to the value labels.'),
  ];
  for (const warning of counted) if (warning) warnings.push(warning);

  const identical = identicalGroups(matrix).map((group) => group.map((k) => items[k].id).join(' = '));
  if (identical.length > 0) {
    warnings.push({ code: 'identical-items', columns: [], message: `${identical.length} ${identical.length === 1 ? 'group of items holds' : 'groups of items hold'} identical answers (${list(identical)}); all but one of each group may be copied columns.` });
  }
  const codesInside = items.filter((item) => item.missingCodes.some((code) => code >= item.min && code <= item.max));
  if (codesInside.length > 0) {
    warnings.push({ code: 'missing-code-inside-range', columns: codesInside.map((item) => item.header), message: `${codesInside.length} ${codesInside.length === 1 ? 'item has' : 'items have'} a missing code inside the valid range (${list(codesInside.map((item) => item.id))}), so real answers with that code count as missing; check the codebook.` });
  }
  // constant-item, more-items-than-respondents and too-few-respondents depend on the exclusions.
  const { excluded, warnings: all } = applyExclusions({ matrix, items, warnings }, exclusions);
  return { respondents: n, items, matrix, raw, respondentIds, duration, weight, outcomes, excluded, warnings: all };
}
