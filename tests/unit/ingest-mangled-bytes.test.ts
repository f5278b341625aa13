/**
 * Damaged uploads: seeded byte flips and truncations of valid CSV, XLSX, XLS and ODS files must
 * each end in a WaveRefusal or a readable wave, never another exception (issue 4: never a 500).
 */
import { describe, expect, it } from 'vitest';
import * as XLSX from 'xlsx-republish';
import { acceptWave, isWaveRefusal, proposeSetup, readCodebook, readTable } from '../../src/lib/ingest';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';

const rows = [['respondent_id', 'Q1', 'Q2', 'Q3', 'comment'], ...Array.from({ length: 30 }, (_, i) => [`R${i}`, (i % 5) + 1, ((i * 3) % 5) + 1, ((i * 7) % 5) + 1, `remark ${i}, "quoted"`])];
const csv = new TextEncoder().encode(rows.map((row) => row.map((cell) => (typeof cell === 'string' && /[",]/.test(cell) ? `"${cell.replace(/"/g, '""')}"` : String(cell))).join(',')).join('\r\n'));
function book(bookType: XLSX.BookType): Uint8Array {
  const workbook = XLSX.utils.book_new();
  XLSX.utils.book_append_sheet(workbook, XLSX.utils.aoa_to_sheet(rows), 'Responses');
  XLSX.utils.book_append_sheet(workbook, XLSX.utils.aoa_to_sheet([['item', 'min', 'max'], ['Q1', 1, 5]]), 'Codebook');
  return new Uint8Array(XLSX.write(workbook, { type: 'array', bookType }) as ArrayBuffer);
}

async function outcome(bytes: Uint8Array, name: string): Promise<'refused' | 'wave'> {
  try {
    // A small memory limit keeps runaway parses of damaged workbooks quick (see ingest-workbook-worker.test.ts).
    const table = await readTable(bytes, name, { maxWorkbookMemoryMb: 64 });
    const codebook = table.codebookTable ? readCodebook(table.codebookTable) : null;
    const proposal = proposeSetup(table, codebook);
    if (proposal.columns.some((column) => column.role === 'item')) acceptWave(table, { setup: proposal });
    return 'wave';
  } catch (error) {
    if (isWaveRefusal(error)) return 'refused';
    throw new Error(`${name}: ${(error as Error).stack ?? String(error)}`);
  }
}

describe('mangled uploads', () => {
  const originals: [Uint8Array, string][] = [[csv, 'w.csv'], [book('xlsx'), 'w.xlsx'], [book('biff8'), 'w.xls'], [book('ods'), 'w.ods']];
  for (const [original, name] of originals) {
    it(`${name}: 20 seeded byte flips and 5 truncations end in a refusal or a wave`, async () => {
      expect(await outcome(original, name)).toBe('wave');
      const random = createSeededRandom(name.length * 7919);
      const seen = new Set<string>();
      for (let trial = 0; trial < 25; trial++) {
        const bytes = Uint8Array.from(original);
        let mangled: Uint8Array = bytes;
        if (trial < 20) {
          const flips = 1 + random.nextInt(8);
          for (let f = 0; f < flips; f++) bytes[random.nextInt(bytes.length)] = random.nextInt(256);
        } else {
          mangled = bytes.subarray(0, random.nextInt(bytes.length));
        }
        seen.add(await outcome(mangled, name));
      }
      // Each result is one of the two allowed kinds (the call above throws on anything else).
      for (const kind of seen) expect(['refused', 'wave']).toContain(kind);
    });
  }
});
