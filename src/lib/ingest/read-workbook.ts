/**
 * Reads XLSX, XLS and ODS workbooks through SheetJS (xlsx-republish: parse-workbook.ts, run in the
 * wave reader thread; workbook-worker.ts): lists the sheets, picks the responses sheet and a codebook sheet. Cells
 * become text the way a CSV would hold them (numbers in canonical JavaScript form, so a workbook
 * and a CSV of the same answers read alike; time formats as formatted). Formulas are never
 * evaluated: a cell's stored value is read, and a text cell that looks like a formula stays text.
 */
import { CODEBOOK_SHEET_NAME, looksLikeCodebookHeader } from './codebook-columns';
import type { CellGrid } from './shape-table';
import type { ReadLimits } from './read-limits';
import type { WaveWarning } from './types';
import { WaveRefusal } from './wave-refusal';
import type { ParsedSheet } from './parse-workbook';
import { parseWorkbookInWorker } from './workbook-worker';

/**
 * How a workbook's bytes become sheets: in a wave reader thread (parseWorkbookInWorker, the
 * default), or in this thread when this thread already is a wave reader (parseWorkbook).
 */
export type WorkbookParser = (bytes: Uint8Array, fileName: string, sheetRows: number) => ParsedSheet[] | Promise<ParsedSheet[]>;

/** One sheet as a grid of cell texts. */
export interface WorkbookSheet {
  readonly name: string;
  readonly hidden: boolean;
  readonly grid: CellGrid;
}

/** A workbook's sheets, the responses sheet chosen and a codebook sheet if one was found. */
export interface WorkbookRead {
  readonly sheets: readonly WorkbookSheet[];
  readonly responses: WorkbookSheet;
  readonly codebook: WorkbookSheet | null;
  readonly warnings: readonly WaveWarning[];
}

function firstRow(grid: CellGrid): readonly string[] {
  return grid.rows.find((row) => row.some((cell) => cell.trim() !== '')) ?? [];
}

function isEmpty(grid: CellGrid): boolean {
  return firstRow(grid).length === 0;
}

function isCodebookSheet(sheet: WorkbookSheet): boolean {
  return CODEBOOK_SHEET_NAME.test(sheet.name.trim()) || looksLikeCodebookHeader(firstRow(sheet.grid).map((cell) => cell.trim()));
}

/**
 * Reads a workbook and chooses its sheets.
 * @param bytes the file's bytes (a checked zip, or an OLE2 compound file).
 * @param fileName the uploaded name, for messages.
 * @param limits the row limit bounds how many rows of each sheet are read; the workbook memory
 *   and time limits bound the isolated parser.
 * @param requestedSheet a sheet the designer chose (matched without regard to case), or undefined to choose automatically.
 * @param parse how the bytes are parsed (in a wave reader thread by default).
 * @throws {WaveRefusal} 422 `workbook-encrypted` for a password-protected workbook; 422
 *   `workbook-unreadable` when SheetJS cannot read it; 413 `workbook-too-demanding` past the
 *   parser's memory or time limit; 422 `empty-file` when every sheet is empty; 400
 *   `unknown-sheet` when the requested sheet does not exist.
 * @returns every sheet, the responses sheet, a codebook sheet or null, and a warning when
 *   several sheets could hold responses.
 * References: SheetJS LLC 2024, "SheetJS Community Edition documentation", Parse Options (dense, sheetRows, cellNF).
 */
export async function readWorkbook(bytes: Uint8Array, fileName: string, limits: ReadLimits, requestedSheet?: string, parse?: WorkbookParser): Promise<WorkbookRead> {
  // One header row, the row limit, and one more row so that passing the limit is seen.
  const parsed = parse ? await parse(bytes, fileName, limits.maxRows + 2) : await parseWorkbookInWorker(bytes, fileName, limits);
  const sheets: WorkbookSheet[] = parsed.map((sheet) => ({
    name: sheet.name,
    hidden: sheet.hidden,
    grid: { rows: sheet.rows, fileRows: sheet.fileRows, countRaggedRows: false },
  }));
  if (sheets.length === 0) {
    throw new WaveRefusal(422, 'workbook-unreadable', `"${fileName}" could not be read as a workbook (it has no sheets); save it again as XLSX or CSV.`);
  }
  const warnings: WaveWarning[] = [];
  const filled = sheets.filter((sheet) => !isEmpty(sheet.grid));
  const codebooks = filled.filter(isCodebookSheet);
  let responses: WorkbookSheet | undefined;
  if (requestedSheet !== undefined) {
    responses = sheets.find((sheet) => sheet.name === requestedSheet)
      ?? sheets.find((sheet) => sheet.name.trim().toLowerCase() === requestedSheet.trim().toLowerCase());
    if (!responses) {
      throw new WaveRefusal(400, 'unknown-sheet', `"${fileName}" has no sheet named "${requestedSheet}"; its sheets are ${sheets.map((sheet) => `"${sheet.name}"`).join(', ')}.`);
    }
  } else {
    if (filled.length === 0) {
      throw new WaveRefusal(422, 'empty-file', `Every sheet of "${fileName}" is empty; upload the workbook that contains the responses.`);
    }
    const candidates = filled.filter((sheet) => !codebooks.includes(sheet) && !sheet.hidden);
    responses = candidates[0] ?? filled.filter((sheet) => !codebooks.includes(sheet))[0] ?? codebooks[0];
    if (candidates.length > 1) {
      warnings.push({
        code: 'sheet-chosen',
        columns: [],
        message: `"${fileName}" has ${candidates.length} sheets that could hold responses; "${responses.name}" was read, so choose another sheet if that is wrong.`,
      });
    }
  }
  const codebook = codebooks.find((sheet) => sheet !== responses) ?? null;
  return { sheets, responses, codebook, warnings };
}
