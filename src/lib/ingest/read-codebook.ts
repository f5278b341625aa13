/**
 * Reads a codebook table (its own file or a sheet of the responses workbook) with the columns
 * `item, scale, reverse, min, max, missing, text, labels`, any of which but `item` may be absent.
 */
import { codebookColumnOf, type CodebookColumn } from './codebook-columns';
import { parseNumber } from './parse-number';
import type { Codebook, CodebookEntry, ItemType, ValueLabel, WaveTable, WaveWarning } from './types';
import { parseValueLabels } from './value-labels';
import { WaveRefusal } from './wave-refusal';

const YES = new Set(['yes', 'y', 'true', 't', '1', 'reverse', 'reversed', 'r', 'x']);
const NO = new Set(['no', 'n', 'false', 'f', '0', '']);

/**
 * Reads a yes/no cell of the `reverse` column.
 * @param cell the cell text.
 * @returns true, false, or null when the text is neither (blank is "no").
 * References: Paredown audit-json.md, codebook column `reverse` (yes/no).
 */
export function parseYesNo(cell: string): boolean | null {
  const key = cell.trim().toLowerCase();
  if (YES.has(key)) return true;
  if (NO.has(key)) return false;
  return null;
}

const ITEM_TYPES: readonly [RegExp, ItemType][] = [
  [/^(rating|ratings|likert|grid|rating grid|rating scale|scale|ordinal)$/, 'rating'],
  [/^(scored|score|test|scored test|ability|knowledge|correct|right wrong|right\/wrong)$/, 'scored'],
  [/^(dichotomous|binary|checklist|check ?list|yes ?no|yes\/no|0\/1|boolean)$/, 'dichotomous'],
];

/**
 * Reads a cell of the codebook's `type` column.
 * @param cell the cell text, e.g. `rating`, `Likert`, `scored`, `test`, `dichotomous`, `yes/no`.
 * @returns the item type, or null when the text names none.
 * References: none published; the product's own codebook format (rating grid, scored test, dichotomous checklist).
 */
export function parseItemType(cell: string): ItemType | null {
  const key = cell.trim().toLowerCase().replace(/[_-]+/g, ' ').replace(/\s+/g, ' ');
  for (const [pattern, type] of ITEM_TYPES) if (pattern.test(key)) return type;
  return null;
}

/**
 * Reads the `missing` cell: codes separated by spaces or semicolons (also commas where numbers
 * use a decimal point).
 * @param cell the cell text.
 * @param decimalSeparator the table's decimal separator.
 * @returns the codes read and the parts that are not numbers.
 * References: Paredown audit-json.md, codebook column `missing` (codes separated by spaces or semicolons).
 */
export function parseMissingCodes(cell: string, decimalSeparator: '.' | ','): { codes: number[]; unreadable: string[] } {
  const separators = decimalSeparator === '.' ? /[\s;,]+/ : /[\s;]+/;
  const codes: number[] = [];
  const unreadable: string[] = [];
  for (const part of cell.split(separators)) {
    if (part === '') continue;
    const code = parseNumber(part, decimalSeparator);
    if (Number.isNaN(code)) unreadable.push(part);
    else if (!codes.includes(code)) codes.push(code);
  }
  return { codes, unreadable };
}

/**
 * Reads a codebook.
 * @param table the codebook as read by `readTable` (or `table.codebookTable` of a workbook).
 * @throws {WaveRefusal} 422 `codebook-without-item-column` when no column names the items;
 *   422 `empty-codebook` when no row names an item.
 * @returns the entries (one per item, the first row winning when an item repeats), the codebook
 *   columns found, and warnings for unreadable cells (`codebook-invalid-value`), repeated items
 *   (`codebook-duplicate-item`) and unknown columns (`codebook-unknown-column`).
 * References: Paredown audit-json.md, codebook columns; docs/decisions/002-reading-waves.md (the `labels` column).
 */
export function readCodebook(table: WaveTable): Codebook {
  const where = `the codebook "${table.source.sheet ?? table.source.fileName}"`;
  const columnIndex = new Map<CodebookColumn, number>();
  const unknown: string[] = [];
  table.headers.forEach((header, j) => {
    const column = codebookColumnOf(table.originalHeaders[j] || header);
    if (column === null) unknown.push(header);
    else if (!columnIndex.has(column)) columnIndex.set(column, j);
  });
  if (!columnIndex.has('item')) {
    throw new WaveRefusal(422, 'codebook-without-item-column', `${where[0].toUpperCase()}${where.slice(1)} has no column naming the items; add a column headed "item" that holds each item's column name in the data.`);
  }
  const decimalSeparator = table.source.decimalSeparator;
  const warnings: WaveWarning[] = [];
  const invalid: string[] = [];
  const repeated: string[] = [];
  const entries: CodebookEntry[] = [];
  const seen = new Set<string>();
  const cellOf = (row: readonly string[], column: CodebookColumn): string | null => {
    const j = columnIndex.get(column);
    if (j === undefined) return null;
    const text = row[j].trim();
    return text === '' ? null : text;
  };
  table.rows.forEach((row, i) => {
    const item = cellOf(row, 'item');
    if (item === null) return;
    const line = table.fileRows[i];
    if (seen.has(item.toLowerCase())) {
      repeated.push(item);
      return;
    }
    seen.add(item.toLowerCase());
    const reverseCell = cellOf(row, 'reverse');
    let reverse: boolean | null = null;
    if (reverseCell !== null) {
      reverse = parseYesNo(reverseCell);
      if (reverse === null) invalid.push(`reverse "${reverseCell}" for ${item} (row ${line})`);
    } else if (columnIndex.has('reverse')) {
      reverse = false;
    }
    const number = (column: 'min' | 'max'): number | null => {
      const cell = cellOf(row, column);
      if (cell === null) return null;
      const value = parseNumber(cell, decimalSeparator);
      if (Number.isNaN(value)) {
        invalid.push(`${column} "${cell}" for ${item} (row ${line})`);
        return null;
      }
      return value;
    };
    let min = number('min');
    let max = number('max');
    if (min !== null && max !== null && min >= max) {
      invalid.push(`range ${min} to ${max} for ${item} (row ${line})`);
      min = null;
      max = null;
    }
    let missingCodes: number[] | null = null;
    const missingCell = cellOf(row, 'missing');
    if (missingCell !== null) {
      const read = parseMissingCodes(missingCell, decimalSeparator);
      missingCodes = read.codes;
      for (const part of read.unreadable) invalid.push(`missing code "${part}" for ${item} (row ${line})`);
    } else if (columnIndex.has('missing')) {
      missingCodes = [];
    }
    let labels: ValueLabel[] | null = null;
    const labelsCell = cellOf(row, 'labels');
    if (labelsCell !== null) {
      const read = parseValueLabels(labelsCell);
      labels = [...read.labels];
      for (const part of read.unreadable) invalid.push(`value label "${part}" for ${item} (row ${line})`);
    }
    let type: ItemType | null = null;
    const typeCell = cellOf(row, 'type');
    if (typeCell !== null) {
      type = parseItemType(typeCell);
      if (type === null) invalid.push(`type "${typeCell}" for ${item} (row ${line}; use rating, scored or dichotomous)`);
    }
    entries.push({
      item, scale: cellOf(row, 'scale'), reverse, min, max, missingCodes, text: cellOf(row, 'text'), labels,
      ...(columnIndex.has('type') ? { type } : {}),
      ...(columnIndex.has('facet') ? { facet: cellOf(row, 'facet') } : {}),
    });
  });
  if (entries.length === 0) {
    throw new WaveRefusal(422, 'empty-codebook', `${where[0].toUpperCase()}${where.slice(1)} names no items; fill its "item" column with the column names of the data.`);
  }
  if (invalid.length > 0) {
    warnings.push({
      code: 'codebook-invalid-value',
      columns: [],
      message: `${invalid.length} codebook ${invalid.length === 1 ? 'cell was' : 'cells were'} not understood and left out: ${invalid.slice(0, 5).join('; ')}${invalid.length > 5 ? '; ...' : ''}.`,
    });
  }
  if (repeated.length > 0) {
    warnings.push({
      code: 'codebook-duplicate-item',
      columns: repeated,
      message: `The codebook lists ${repeated.slice(0, 5).join(', ')}${repeated.length > 5 ? ', ...' : ''} more than once; the first row of each was used.`,
    });
  }
  if (unknown.length > 0) {
    warnings.push({
      code: 'codebook-unknown-column',
      columns: unknown,
      message: `The codebook ${unknown.length === 1 ? 'column' : 'columns'} ${unknown.slice(0, 5).map((name) => `"${name}"`).join(', ')} ${unknown.length === 1 ? 'is' : 'are'} not used (known columns: item, scale, reverse, min, max, missing, text, labels, type, facet).`,
    });
  }
  return { entries, columns: [...columnIndex.keys()], warnings };
}
