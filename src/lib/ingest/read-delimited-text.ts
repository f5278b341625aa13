/**
 * Reads decoded text as rows of fields with papaparse: quoted fields may hold delimiters, quotes
 * (doubled) and line breaks. Stops as soon as the row limit is passed, so an oversized file costs
 * little more than its first rows.
 */
import Papa from 'papaparse';
import type { CellGrid } from './shape-table';
import type { ReadLimits } from './read-limits';
import { sniffDecimalSeparator, sniffDelimiter, type Delimiter } from './sniff-delimiter';
import type { WaveWarning } from './types';
import { WaveRefusal } from './wave-refusal';

/** Rows of a text export with what was found about its layout. */
export interface DelimitedText {
  readonly grid: CellGrid;
  readonly delimiter: Delimiter;
  readonly decimalSeparator: '.' | ',';
  readonly warnings: readonly WaveWarning[];
}

const SEPARATOR_HINT = /^sep=([,;\t|])\r?\n/;

/** The text without a run of DOS end-of-file characters (U+001A) at its very end, as `text.replace(/\u001a+$/, '')` gives it, without scanning the whole text. */
function withoutTrailingEndOfFile(text: string): string {
  let end = text.length;
  while (end > 0 && text.charCodeAt(end - 1) === 0x1a) end--;
  return end === text.length ? text : text.slice(0, end);
}

/**
 * Counts the line breaks (CRLF, CR or LF; CRLF once) between two positions of a text, as
 * `text.slice(start, end).match(/\r\n|\r|\n/g).length` counts them. A text with one kind of line
 * end (the usual export) is searched with indexOf for that character alone; one with both CR and
 * LF is counted character by character.
 */
class LineBreakCounter {
  private readonly only: string | null;
  private readonly none: boolean;

  constructor(private readonly text: string) {
    const hasReturn = text.indexOf('\r') !== -1;
    const hasFeed = text.indexOf('\n') !== -1;
    this.none = !hasReturn && !hasFeed;
    this.only = hasReturn && hasFeed ? null : hasReturn ? '\r' : '\n';
  }

  between(start: number, end: number): number {
    if (this.none || start >= end) return 0;
    const text = this.text;
    if (this.only !== null) {
      let count = 0;
      for (let p = text.indexOf(this.only, start); p !== -1 && p < end; p = text.indexOf(this.only, p + 1)) count++;
      return count;
    }
    let count = 0;
    for (let p = start; p < end; p++) {
      const code = text.charCodeAt(p);
      if (code === 0x0d) {
        count++;
        if (p + 1 < end && text.charCodeAt(p + 1) === 0x0a) p++;
      } else if (code === 0x0a) {
        count++;
      }
    }
    return count;
  }
}

/**
 * Parses a text export.
 * @param text decoded text without a byte-order mark.
 * @param fileName the uploaded name, for messages.
 * @param limits the row and column limits (parsing stops once they are passed).
 * @throws {WaveRefusal} 422 `unterminated-quote` when a quoted field is never closed (the rest of
 *   the file would become one cell).
 * @returns the rows (with 1-based starting line numbers), delimiter, decimal separator and warnings.
 * References: Shafranovich 2005, RFC 4180 "Common Format and MIME Type for CSV Files", §2.
 */
export function readDelimitedText(text: string, fileName: string, limits: ReadLimits): DelimitedText {
  let body = withoutTrailingEndOfFile(text);
  let delimiter: Delimiter;
  let firstLine = 1;
  const hint = SEPARATOR_HINT.exec(body);
  if (hint) {
    delimiter = hint[1] as Delimiter;
    body = body.slice(hint[0].length);
    firstLine = 2;
  } else {
    delimiter = sniffDelimiter(body);
  }

  const rows: string[][] = [];
  const fileRows: number[] = [];
  const warnings: WaveWarning[] = [];
  let nonBlankRows = 0;
  let line = firstLine;
  let lastCursor = 0;
  let unterminatedAt: number | null = null;
  let malformedQuotes = 0;
  // papaparse's own test for its fast mode (no quote character anywhere in the input).
  const quoteFree = body.indexOf('"') === -1;
  const lineBreaks = new LineBreakCounter(body);
  Papa.parse<string[]>(body, {
    delimiter,
    skipEmptyLines: false,
    step: (result, parser) => {
      // The parser's row grows by appending, which leaves it spare room: keep an exact copy (for
      // 100,000 rows of 300 cells the spare room alone is over 100 MB). Text without a quote is
      // split by papaparse's fast mode, whose rows are split() arrays of their exact length.
      const row = quoteFree ? result.data : result.data.slice();
      const cursor = result.meta.cursor;
      rows.push(row);
      fileRows.push(line);
      line += lineBreaks.between(lastCursor, cursor);
      lastCursor = cursor;
      for (const error of result.errors) {
        if (error.code === 'MissingQuotes') unterminatedAt = fileRows[fileRows.length - 1];
        else if (error.code === 'InvalidQuotes') malformedQuotes++;
      }
      if (row.some((cell) => cell.trim() !== '')) nonBlankRows++;
      let significant = row.length;
      while (significant > 0 && row[significant - 1].trim() === '') significant--;
      // One row past the limits is enough for shapeTable to refuse with the right message.
      if (nonBlankRows > limits.maxRows + 1 || significant > limits.maxColumns) parser.abort();
    },
  });
  if (unterminatedAt !== null) {
    throw new WaveRefusal(422, 'unterminated-quote', `A quoted field starting on line ${unterminatedAt} of "${fileName}" is never closed, so the rest of the file would run into one cell; fix the stray double quote or export the file again.`);
  }
  if (malformedQuotes > 0) {
    warnings.push({
      code: 'malformed-quotes',
      columns: [],
      message: `${malformedQuotes} ${malformedQuotes === 1 ? 'field has' : 'fields have'} a stray double quote after the closing quote; the text was kept as it stands.`,
    });
  }
  const decimalSeparator = sniffDecimalSeparator(rows, delimiter);
  return { grid: { rows, fileRows, countRaggedRows: true }, delimiter, decimalSeparator, warnings };
}
