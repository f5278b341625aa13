/**
 * The only place SheetJS runs: a worker thread with a heap limit and a time limit, so that a
 * damaged or crafted workbook that sends the parser into a runaway allocation or loop costs at
 * most those limits and ends in a refusal, never in the server running out of memory. (A BIFF8
 * file with one corrupted record length was seen to exhaust the heap in SheetJS 0.20.3.)
 *
 * The worker's code is plain CommonJS JavaScript in a string (`eval: true`), and SheetJS is
 * required by the absolute path resolved here, so it runs the same under tsx, Vitest and a
 * bundled server without a separate worker file to ship.
 */
import { createRequire } from 'node:module';
import { Worker } from 'node:worker_threads';
import type { ReadLimits } from './read-limits';
import { WaveRefusal } from './wave-refusal';

/** One sheet as parsed in the worker: cell texts per row, with the 1-based sheet row numbers. */
export interface ParsedSheet {
  readonly name: string;
  readonly hidden: boolean;
  readonly rows: string[][];
  readonly fileRows: number[];
}

const WORKER_SOURCE = String.raw`
const { parentPort, workerData } = require('node:worker_threads');
const XLSX = require(workerData.sheetjsPath);
// SheetJS reports unknown records on the console; a damaged upload must not fill the server's log.
console.log = console.warn = console.error = console.info = () => {};

// The text a CSV export would hold for a cell: numbers in canonical JavaScript form, date and
// time formats as formatted, booleans TRUE/FALSE, errors as their code (#N/A).
function cellText(cell) {
  if (!cell || cell.v === undefined || cell.v === null || cell.t === 'z') return '';
  switch (cell.t) {
    case 's': return String(cell.v);
    case 'n': {
      const value = cell.v;
      if (typeof cell.z === 'string' && XLSX.SSF.is_date(cell.z)) {
        try { return XLSX.SSF.format(cell.z, value); } catch (error) { return String(value); }
      }
      return String(value === 0 ? 0 : value);
    }
    case 'b': return cell.v ? 'TRUE' : 'FALSE';
    case 'e': return cell.w !== undefined ? String(cell.w) : '#ERROR';
    case 'd': return cell.v instanceof Date ? cell.v.toISOString() : String(cell.v);
    default: return String(cell.w !== undefined ? cell.w : cell.v);
  }
}

try {
  const workbook = XLSX.read(workerData.bytes, {
    type: 'array', dense: true, cellNF: true, cellFormula: false, cellHTML: false, cellStyles: false, bookVBA: false,
    sheetRows: workerData.sheetRows,
  });
  const flags = (workbook.Workbook && workbook.Workbook.Sheets) || [];
  const sheets = (workbook.SheetNames || []).map((name, index) => {
    const sheet = (workbook.Sheets && workbook.Sheets[name]) || {};
    const dense = Array.isArray(sheet['!data']) ? sheet['!data'] : [];
    const rows = [];
    const fileRows = [];
    dense.forEach((row, r) => {
      if (!Array.isArray(row)) return;
      const cells = new Array(row.length);
      for (let c = 0; c < row.length; c++) cells[c] = cellText(row[c]);
      rows.push(cells);
      fileRows.push(r + 1);
    });
    return { name: typeof name === 'string' ? name : 'Sheet ' + (index + 1), hidden: Boolean(flags[index] && flags[index].Hidden), rows, fileRows };
  });
  parentPort.postMessage({ ok: true, sheets });
} catch (error) {
  parentPort.postMessage({ ok: false, message: String((error && error.message) || error) });
}
`;

let sheetjsPath: string | null = null;

/**
 * Parses a workbook with SheetJS in an isolated worker thread.
 * @param bytes the workbook's bytes (copied to the worker).
 * @param fileName the uploaded name, for messages.
 * @param limits `maxRows` bounds the rows read per sheet; `maxWorkbookMemoryMb` and
 *   `maxWorkbookSeconds` bound the worker.
 * @throws {WaveRefusal} 413 `workbook-too-demanding` when the worker passes its memory or time
 *   limit; 422 `workbook-encrypted` for a password-protected workbook; 422 `workbook-unreadable`
 *   when SheetJS cannot read it.
 * @returns every sheet's cell texts, in workbook order.
 * References: SheetJS LLC 2024, "SheetJS Community Edition documentation", Parse Options (dense, sheetRows, cellNF);
 *   Node.js 20 documentation, "worker_threads: resourceLimits".
 */
export function parseWorkbookInWorker(bytes: Uint8Array, fileName: string, limits: ReadLimits): Promise<ParsedSheet[]> {
  sheetjsPath ??= createRequire(import.meta.url).resolve('xlsx-republish');
  return new Promise((resolve, reject) => {
    const worker = new Worker(WORKER_SOURCE, {
      eval: true,
      // One header row, the row limit, and one more row so that passing the limit is seen.
      workerData: { sheetjsPath, bytes, sheetRows: limits.maxRows + 2 },
      resourceLimits: { maxOldGenerationSizeMb: limits.maxWorkbookMemoryMb },
    });
    let settled = false;
    const tooDemanding = () => new WaveRefusal(413, 'workbook-too-demanding', `Reading "${fileName}" needed more than the allowed ${limits.maxWorkbookMemoryMb.toLocaleString('en-GB')} MiB of memory or ${limits.maxWorkbookSeconds} seconds, so it is too large or damaged; save the responses alone as CSV and upload that.`);
    const finish = (outcome: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      void worker.terminate();
      outcome();
    };
    const timer = setTimeout(() => finish(() => reject(tooDemanding())), limits.maxWorkbookSeconds * 1000);
    worker.on('message', (message: { ok: true; sheets: ParsedSheet[] } | { ok: false; message: string }) => finish(() => {
      if (message.ok) {
        resolve(message.sheets);
      } else if (/password/i.test(message.message)) {
        reject(new WaveRefusal(422, 'workbook-encrypted', `"${fileName}" is password-protected; save an unprotected copy and upload that.`));
      } else {
        reject(new WaveRefusal(422, 'workbook-unreadable', `"${fileName}" could not be read as a workbook (it may be damaged or from an unsupported program); save it again as XLSX or CSV.`));
      }
    }));
    worker.on('error', (error: Error & { code?: string }) => finish(() => {
      if (error.code === 'ERR_WORKER_OUT_OF_MEMORY') reject(tooDemanding());
      else reject(error);
    }));
    worker.on('exit', (code) => finish(() => reject(new Error(`parseWorkbookInWorker: the worker stopped with exit code ${code} before answering`))));
  });
}
