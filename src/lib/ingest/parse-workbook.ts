/**
 * SheetJS itself: a workbook's bytes to every sheet's cell texts. Runs only inside the wave reader
 * thread (wave-reader-worker.ts), which bounds its heap and time, because a damaged or crafted
 * workbook can send the parser into a runaway allocation or loop (a BIFF8 file with one corrupted
 * record length was seen to exhaust the heap in SheetJS 0.20.3). Everyone else reads workbooks
 * through that thread (workbook-worker.ts).
 */
import * as XLSX from 'xlsx-republish';
import { WaveRefusal } from './wave-refusal';

/** One sheet as parsed: cell texts per row, with the 1-based sheet row numbers. */
export interface ParsedSheet {
  readonly name: string;
  readonly hidden: boolean;
  readonly rows: string[][];
  readonly fileRows: number[];
}

/**
 * The text a CSV export would hold for a cell: numbers in canonical JavaScript form, date and
 * time formats as formatted, booleans TRUE/FALSE, errors as their code (#N/A).
 */
function cellText(cell: XLSX.CellObject | undefined | null): string {
  if (!cell || cell.v === undefined || cell.v === null || cell.t === 'z') return '';
  switch (cell.t) {
    case 's': return String(cell.v);
    case 'n': {
      const value = cell.v as number;
      if (typeof cell.z === 'string' && XLSX.SSF.is_date(cell.z)) {
        try {
          return XLSX.SSF.format(cell.z, value);
        } catch {
          return String(value);
        }
      }
      return String(value === 0 ? 0 : value);
    }
    case 'b': return cell.v ? 'TRUE' : 'FALSE';
    case 'e': return cell.w !== undefined ? String(cell.w) : '#ERROR';
    case 'd': return cell.v instanceof Date ? cell.v.toISOString() : String(cell.v);
    default: return String(cell.w !== undefined ? cell.w : cell.v);
  }
}

/**
 * Parses a workbook in this thread.
 * @param bytes the workbook's bytes.
 * @param fileName the uploaded name, for messages.
 * @param sheetRows the most rows read per sheet (header included).
 * @throws {WaveRefusal} 422 `workbook-encrypted` for a password-protected workbook; 422
 *   `workbook-unreadable` when SheetJS cannot read it.
 * @returns every sheet's cell texts, in workbook order.
 * References: SheetJS LLC 2024, "SheetJS Community Edition documentation", Parse Options (dense, sheetRows, cellNF).
 */
export function parseWorkbook(bytes: Uint8Array, fileName: string, sheetRows: number): ParsedSheet[] {
  // SheetJS reports unknown records on the console; a damaged upload must not fill the server's log.
  const console = globalThis.console;
  const saved = [console.log, console.warn, console.error, console.info];
  console.log = console.warn = console.error = console.info = () => {};
  let workbook: XLSX.WorkBook;
  try {
    workbook = XLSX.read(bytes, {
      type: 'array', dense: true, cellNF: true, cellFormula: false, cellHTML: false, cellStyles: false, bookVBA: false, sheetRows,
    });
  } catch (error) {
    const message = String((error as Error | undefined)?.message ?? error);
    if (/password/i.test(message)) {
      throw new WaveRefusal(422, 'workbook-encrypted', `"${fileName}" is password-protected; save an unprotected copy and upload that.`);
    }
    throw new WaveRefusal(422, 'workbook-unreadable', `"${fileName}" could not be read as a workbook (it may be damaged or from an unsupported program); save it again as XLSX or CSV.`);
  } finally {
    [console.log, console.warn, console.error, console.info] = saved;
  }
  const flags = workbook.Workbook?.Sheets ?? [];
  return (workbook.SheetNames ?? []).map((name, index) => {
    const sheet = (workbook.Sheets?.[name] ?? {}) as XLSX.WorkSheet & { '!data'?: (XLSX.CellObject | undefined)[][] };
    const dense = Array.isArray(sheet['!data']) ? sheet['!data'] : [];
    const rows: string[][] = [];
    const fileRows: number[] = [];
    dense.forEach((row, r) => {
      if (!Array.isArray(row)) return;
      const cells = new Array<string>(row.length);
      for (let c = 0; c < row.length; c++) cells[c] = cellText(row[c]);
      rows.push(cells);
      fileRows.push(r + 1);
    });
    return { name: typeof name === 'string' ? name : `Sheet ${index + 1}`, hidden: Boolean(flags[index]?.Hidden), rows, fileRows };
  });
}
