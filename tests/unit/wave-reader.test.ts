/**
 * The wave reader thread (src/lib/ingest/wave-reader-worker.ts, started from source through tsx
 * as under Vitest and `astro dev`; the built server's bundle is covered by tests/api/waves*.test.ts):
 * - it reads exactly what the same read on the calling thread gives (the proposal, the screening
 *   preview, the accepted wave and its stored matrix);
 * - the calling thread stays free while it reads: the event loop's longest delay during the read
 *   in the thread is a small part of the delay the same read causes on the calling thread (a
 *   relative property, measured with perf_hooks.monitorEventLoopDelay; no wall-clock threshold);
 * - failures come back as the errors they were: refusals with their status and code, a
 *   RangeError for screening settings, 413 past the thread's limits.
 */
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { describe, expect, it } from 'vitest';
import * as XLSX from 'xlsx-republish';
import {
  acceptUploadInWorker, acceptWave, encodeMatrix, parseWorkbook, previewProposal, proposeSetup, readUploadInWorker, readWave, type WaveFiles,
} from '../../src/lib/ingest';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { refusal } from './ingest-test-helpers';

/** A seeded pilot wave: an id column, `items` five-point items with a few blanks, a free-text column. */
function waveRows(respondents: number, items: number, seed: number): (string | number)[][] {
  const random = createSeededRandom(seed);
  const header = ['respondent_id', ...Array.from({ length: items }, (_, k) => `Q${k + 1}`), 'comment'];
  const rows: (string | number)[][] = [header];
  for (let i = 0; i < respondents; i++) {
    const base = 1 + random.nextInt(5);
    const answers = Array.from({ length: items }, () => (random.nextInt(40) === 0 ? '' : Math.min(5, Math.max(1, base + random.nextInt(3) - 1))));
    rows.push([`R${i + 1}`, ...answers, i % 7 === 0 ? `note ${i}` : '']);
  }
  return rows;
}

function csvOf(rows: (string | number)[][]): Uint8Array {
  return new TextEncoder().encode(rows.map((row) => row.join(',')).join('\r\n') + '\r\n');
}

function xlsxOf(rows: (string | number)[][]): Uint8Array {
  const book = XLSX.utils.book_new();
  XLSX.utils.book_append_sheet(book, XLSX.utils.aoa_to_sheet(rows), 'Responses');
  return new Uint8Array(XLSX.write(book, { type: 'array', bookType: 'xlsx' }) as ArrayBuffer);
}

function files(fileName: string, bytes: Uint8Array): WaveFiles {
  return { fileName, bytes, codebookName: null, codebookBytes: null, sheet: null };
}

/** The same read on this thread: what the upload did before it moved to the reader thread. */
async function readHere(wave: WaveFiles) {
  const read = await readWave(wave, {}, { parseWorkbook });
  const proposal = proposeSetup(read.table, read.codebook);
  return { read, proposal, preview: previewProposal(read.table, proposal) };
}

/** The longest event-loop delay (ms) while `work` runs. */
async function longestDelay(work: () => Promise<unknown>): Promise<number> {
  const histogram = monitorEventLoopDelay({ resolution: 5 });
  histogram.enable();
  try {
    // The histogram records from its second tick on: let it start before the work does.
    await new Promise((resolve) => setTimeout(resolve, 50));
    await work();
    // A delay is recorded when the late timer finally fires: give it the chance.
    await new Promise((resolve) => setTimeout(resolve, 50));
  } finally {
    histogram.disable();
  }
  return histogram.max / 1e6;
}

describe('the wave reader thread', () => {
  it('reads an upload as the calling thread would: same source, warnings, proposal and screening preview', async () => {
    const rows = waveRows(120, 8, 11);
    for (const wave of [files('pilot.csv', csvOf(rows)), files('pilot.xlsx', xlsxOf(rows))]) {
      const here = await readHere(wave);
      const there = await readUploadInWorker(wave);
      expect(there.source).toEqual(here.read.source);
      expect(there.warnings).toEqual(here.read.warnings);
      expect(there.proposal).toEqual(here.proposal);
      expect(there.preview).toEqual(here.preview);
      expect(there.preview.screening?.respondents).toBe(120);
    }
  });

  it('accepts a stored upload as the calling thread would, with the stored matrix made in the thread', async () => {
    const wave = files('pilot.xlsx', xlsxOf(waveRows(90, 6, 12)));
    const { read, proposal } = await readHere(wave);
    const choice = { setup: { columns: proposal.columns }, exclusions: [0, 3] };
    const here = acceptWave(read.table, choice);
    const there = await acceptUploadInWorker(wave, choice);
    expect(there.source).toEqual(read.source);
    expect(there.accepted.setup).toEqual(here.setup);
    expect(there.accepted.screening).toEqual(here.screening);
    expect(there.accepted.wave.items).toEqual(here.wave.items);
    expect(there.accepted.wave.excluded).toEqual([0, 3]);
    expect(Array.from(there.accepted.wave.matrix.data)).toEqual(Array.from(here.wave.matrix.data));
    expect(Array.from(there.matrixBlob)).toEqual(Array.from(encodeMatrix(here.wave.matrix)));
  });

  it('leaves the calling thread free: its longest event-loop delay is a small part of the same read done on it', async () => {
    // 1,500 respondents × 120 items: 180,000 cells, enough to hold this thread for a while.
    const wave = files('large.csv', csvOf(waveRows(1_500, 120, 13)));
    await readUploadInWorker(files('warm.csv', csvOf(waveRows(20, 3, 1)))); // the first thread compiles the sources (tsx)
    const onThisThread = await longestDelay(() => readHere(wave));
    const inTheReader = await longestDelay(() => readUploadInWorker(wave));
    console.log(`longest event-loop delay: ${onThisThread.toFixed(1)} ms reading on this thread, ${inTheReader.toFixed(1)} ms with the reader thread`);
    expect(onThisThread).toBeGreaterThan(0);
    expect(inTheReader * 4).toBeLessThan(onThisThread);
  });

  it('gives back refusals with their status and code, and a RangeError for screening settings out of range', async () => {
    const wave = files('pilot.csv', csvOf(waveRows(40, 4, 14)));
    const empty = await refusal(readUploadInWorker(files('empty.csv', new Uint8Array(0))));
    expect([empty.status, empty.code]).toEqual([422, 'empty-file']);
    const { proposal } = await readHere(wave);
    const unknownColumn = await refusal(acceptUploadInWorker(wave, { setup: { columns: [...proposal.columns, { column: 'nope', role: 'item', item: null, durationUnit: null }] } }));
    expect(unknownColumn.status).toBe(400);
    await expect(acceptUploadInWorker(wave, { setup: { columns: proposal.columns }, screening: { longStringShare: 7 } as never })).rejects.toThrow(RangeError);
  });

  it('refuses a text file whose read passes the thread\'s memory limit with 413 file-too-demanding', async () => {
    const wave = files('large.csv', csvOf(waveRows(4_000, 200, 15)));
    const refused = await refusal(readUploadInWorker(wave, { maxWorkbookMemoryMb: 16 }));
    expect([refused.status, refused.code]).toEqual([413, 'file-too-demanding']);
    expect(refused.message).toMatch(/large\.csv.*16 MiB/);
  });
});
