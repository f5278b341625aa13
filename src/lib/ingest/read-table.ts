/**
 * The entry point for an uploaded file: bytes in, a checked table out, or a {@link WaveRefusal}.
 * Used by the upload route and the audit command line alike.
 */
import { checkZipDirectory } from './check-zip-directory';
import { decodeText } from './decode-text';
import { detectFileKind, fileExtension } from './detect-file-kind';
import { readDelimitedText } from './read-delimited-text';
import { formatMebibytes, resolveReadLimits, type ReadLimits } from './read-limits';
import { readWorkbook, type WorkbookParser, type WorkbookSheet } from './read-workbook';
import { shapeTable } from './shape-table';
import type { TableFormat, TableSource, WaveTable, WaveWarning } from './types';
import { WaveRefusal } from './wave-refusal';

/** Options for {@link readTable}. */
export interface ReadTableOptions {
  /** Workbooks: the sheet holding the responses (default: chosen automatically). */
  readonly sheet?: string;
  /** Workbooks: how the bytes are parsed (in a wave reader thread by default; see WorkbookParser). */
  readonly parseWorkbook?: WorkbookParser;
}

function textFormat(fileName: string): TableFormat {
  const extension = fileExtension(fileName);
  return extension === 'tsv' || extension === 'tab' ? 'tsv' : extension === 'txt' ? 'txt' : 'csv';
}

/**
 * Reads an uploaded file (CSV, TSV, TXT, XLSX, XLS or ODS) into a table of text cells. Text
 * files: encoding found from the byte-order mark, the UTF-16 NUL pattern, strict UTF-8, then
 * Windows-1252; delimiter sniffed among comma, semicolon, tab and pipe (or taken from an Excel
 * `sep=` first line); decimal commas recognised. Workbooks: checked from the zip directory
 * before parsing, then read with SheetJS; a codebook sheet is returned beside the responses.
 * @param bytes the file's bytes, unchanged.
 * @param fileName the uploaded name (its extension only decides how text is labelled and
 *   whether a workbook was promised).
 * @param limits any of {@link ReadLimits}; the rest take their defaults.
 * @param options `sheet`: the responses sheet of a workbook; `parseWorkbook`: see WorkbookParser.
 * @throws {WaveRefusal} 413 past a limit (`file-too-large`, `too-many-rows`, `too-many-columns`,
 *   `too-many-cells`, `zip-too-large`, `too-many-zip-entries`, `workbook-too-demanding`); 422 when the bytes are not
 *   responses (`empty-file`, `not-a-workbook`, `unsupported-format`, `binary-file`, `nul-bytes`,
 *   `bad-utf16`, `unterminated-quote`, `damaged-zip`, `workbook-encrypted`, `workbook-unreadable`,
 *   `zip-sizes-inconsistent`, `unsupported-zip`); 400 `unknown-sheet`.
 * @throws {RangeError} when a configured limit is not a positive integer.
 * @returns the table with warnings, and a codebook sheet's table when the workbook has one.
 * References: Shafranovich 2005, RFC 4180 "Common Format and MIME Type for CSV Files"; ECMA-376 (2021) "Office Open XML";
 *   OASIS 2021, "Open Document Format for Office Applications (OpenDocument) v1.3".
 */
export async function readTable(
  bytes: Uint8Array,
  fileName: string,
  limits: Partial<ReadLimits> = {},
  options: ReadTableOptions = {},
): Promise<WaveTable> {
  const resolved = resolveReadLimits(limits);
  if (!(bytes instanceof Uint8Array)) throw new TypeError('readTable: bytes must be a Uint8Array');
  if (bytes.byteLength > resolved.maxBytes) {
    throw new WaveRefusal(413, 'file-too-large', `"${fileName}" is ${formatMebibytes(bytes.byteLength)}, more than the limit of ${formatMebibytes(resolved.maxBytes)}; upload only the responses needed, or a sample.`);
  }
  if (bytes.byteLength === 0) {
    throw new WaveRefusal(422, 'empty-file', `"${fileName}" is empty (0 bytes); upload the export that contains the responses.`);
  }
  const kind = detectFileKind(bytes, fileName);
  if (kind === 'text') {
    const decoded = decodeText(bytes, fileName);
    const parsed = readDelimitedText(decoded.text, fileName, resolved);
    const source: TableSource = {
      fileName,
      format: textFormat(fileName),
      encoding: decoded.encoding,
      delimiter: parsed.delimiter,
      decimalSeparator: parsed.decimalSeparator,
      sheet: null,
      sheets: [],
    };
    const warnings: WaveWarning[] = [...decoded.warnings, ...parsed.warnings];
    if (parsed.decimalSeparator === ',') {
      warnings.push({ code: 'decimal-comma', columns: [], message: 'Numbers in this file use a decimal comma (3,5); they were read as such.' });
    }
    return shapeTable(parsed.grid, source, resolved, warnings, null);
  }
  let format: TableFormat = 'xls';
  if (kind === 'zip') format = (await checkZipDirectory(bytes, fileName, resolved)).kind;
  const workbook = await readWorkbook(bytes, fileName, resolved, options.sheet, options.parseWorkbook);
  const sheetNames = workbook.sheets.map((sheet) => sheet.name);
  const sourceOf = (sheet: WorkbookSheet): TableSource => ({
    fileName, format, encoding: null, delimiter: null, decimalSeparator: '.', sheet: sheet.name, sheets: sheetNames,
  });
  const codebookTable = workbook.codebook === null
    ? null
    : shapeTable(workbook.codebook.grid, sourceOf(workbook.codebook), resolved, [], null);
  const codebookNote: WaveWarning[] = workbook.codebook === null ? [] : [{
    code: 'codebook-sheet-found',
    columns: [],
    message: `The sheet "${workbook.codebook.name}" was read as the codebook.`,
  }];
  return shapeTable(workbook.responses.grid, sourceOf(workbook.responses), resolved, [...workbook.warnings, ...codebookNote], codebookTable);
}
