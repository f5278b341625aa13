/**
 * Writes the demo study's files from the seeded generator (file-writing edge; the data come from
 * src/lib/synth/demo.ts):
 *   fixtures/demo/library-pilot-1.csv      responses
 *   fixtures/demo/library-codebook.csv     codebook (item, scale, reverse, min, max, missing, text)
 *   fixtures/demo/library-pilot-1.xlsx     both, as sheets `responses` and `codebook`
 *   fixtures/demo/home-service-pilot.csv   the second study's responses (src/lib/synth/demo.ts, homeServiceWave)
 *   fixtures/demo/home-service-codebook.csv its codebook
 * Run with `npx tsx scripts/make-demo.ts`. The same code always writes the same CSV files.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import * as XLSX from 'xlsx-republish';
import { demoWave, homeServiceWave } from '../src/lib/synth/demo';
import { codebookCells, codebookToCsv, toCsv } from '../src/lib/synth/wave-csv';

const outputFolder = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'demo');
mkdirSync(outputFolder, { recursive: true });

const wave = demoWave();
writeFileSync(join(outputFolder, 'library-pilot-1.csv'), toCsv(wave));
writeFileSync(join(outputFolder, 'library-codebook.csv'), codebookToCsv(wave.codebook));

const rows = wave.columns[0].values.length;
const responseCells: (number | string | null)[][] = [wave.columns.map((column) => column.name)];
for (let i = 0; i < rows; i++) responseCells.push(wave.columns.map((column) => column.values[i]));

const workbook = XLSX.utils.book_new();
// A fixed creation date keeps the workbook's metadata the same from run to run.
workbook.Props = { Title: 'Riverbend City Libraries member survey 2027, pilot 1 (invented demo data)', CreatedDate: new Date('2027-04-15T09:00:00Z') };
XLSX.utils.book_append_sheet(workbook, XLSX.utils.aoa_to_sheet(responseCells), 'responses');
XLSX.utils.book_append_sheet(workbook, XLSX.utils.aoa_to_sheet(codebookCells(wave.codebook)), 'codebook');
const bytes = XLSX.write(workbook, { type: 'buffer', bookType: 'xlsx', compression: true }) as Buffer;
writeFileSync(join(outputFolder, 'library-pilot-1.xlsx'), bytes);

const second = homeServiceWave();
writeFileSync(join(outputFolder, 'home-service-pilot.csv'), toCsv(second));
writeFileSync(join(outputFolder, 'home-service-codebook.csv'), codebookToCsv(second.codebook));

process.stderr.write(`make-demo: wrote ${rows} respondents × ${wave.columns.length} columns and ${wave.codebook.length} codebook rows to ${outputFolder}\n`);
