/**
 * Finds the field delimiter of a text export (comma, semicolon, tab or pipe) and whether its
 * numbers use a decimal comma.
 */
import Papa from 'papaparse';
import { DELIMITER_SAMPLE_ROWS } from './ingest-thresholds';

/** A field delimiter the reader recognises. */
export type Delimiter = ',' | ';' | '\t' | '|';
/** The delimiters tried, in order of preference when the evidence is equal. */
export const DELIMITERS: readonly Delimiter[] = [',', ';', '\t', '|'];

function fieldCounts(text: string, delimiter: Delimiter): number[] {
  const parsed = Papa.parse<string[]>(text, { delimiter, preview: DELIMITER_SAMPLE_ROWS, skipEmptyLines: 'greedy' });
  return parsed.data.map((row) => {
    let length = row.length;
    while (length > 1 && row[length - 1].trim() === '') length--;
    return length;
  });
}

/**
 * Sniffs the delimiter: each candidate splits the first rows (quotes respected, by papaparse);
 * the winner splits the header into at least two fields and gives the largest share of rows
 * with the header's field count, ties going to more fields, then to the order comma, semicolon,
 * tab, pipe. A file whose every candidate leaves the header whole has one column (comma).
 * @param text the decoded file.
 * @returns the delimiter.
 * References: Python Software Foundation 2024, "csv.Sniffer" (consistency of field counts across rows).
 */
export function sniffDelimiter(text: string): Delimiter {
  let best: Delimiter = ',';
  let bestConsistency = -1;
  let bestFields = 1;
  for (const delimiter of DELIMITERS) {
    const counts = fieldCounts(text, delimiter);
    if (counts.length === 0 || counts[0] < 2) continue;
    const header = counts[0];
    const consistency = counts.filter((count) => count === header).length / counts.length;
    if (consistency > bestConsistency || (consistency === bestConsistency && header > bestFields)) {
      best = delimiter;
      bestConsistency = consistency;
      bestFields = header;
    }
  }
  return best;
}

const COMMA_DECIMAL = /^[+-]?(?:\d+|\d{1,3}(?:\.\d{3})+),\d+$/;
const POINT_DECIMAL = /^[+-]?\d*\.\d+$/;
const THOUSANDS_GROUPED = /^[+-]?\d{1,3}(?:\.\d{3})+$/;

/**
 * Whether the numbers of a parsed file use a decimal comma: the delimiter is not a comma, some
 * cells read like `3,5`, and none like `3.5` (`1.234` may group thousands and decides nothing).
 * @param rows parsed rows (header included; it is skipped).
 * @param delimiter the file's delimiter.
 * @returns `,` or `.`.
 * References: ISO 80000-1:2022, "Quantities and units — Part 1: General" (the decimal sign is a comma or a point on the line).
 */
export function sniffDecimalSeparator(rows: readonly (readonly string[])[], delimiter: Delimiter): '.' | ',' {
  if (delimiter === ',') return '.';
  let commaDecimals = 0;
  for (let i = 1; i < rows.length; i++) {
    for (const cell of rows[i]) {
      const text = cell.trim();
      if (POINT_DECIMAL.test(text) && !THOUSANDS_GROUPED.test(text)) return '.';
      if (COMMA_DECIMAL.test(text)) commaDecimals++;
    }
  }
  return commaDecimals > 0 ? ',' : '.';
}
