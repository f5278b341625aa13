/**
 * Every entry of the awkward-file corpus (fixtures/waves/expected.json, written with the files by
 * scripts/make-wave-fixtures.ts) goes through the upload endpoint of the built server, each into a
 * fresh study, and where a wave is expected, through the confirmation with the proposal unchanged
 * and no exclusions (the corpus's own rule, expected.json "howToRun"). Checked:
 * - a refusal comes back with the expected status and code in api.md's error shape, and the
 *   database then holds no wave row and no stored-file row for the file (nor the file on disk);
 * - a wave comes back with the expected rows, items, warnings, roles, headers and how it was read,
 *   and is stored as expected: item ids, recoded cells of the stored matrix, outcomes, weights,
 *   completion times;
 * - never a 500.
 * Entries with their own limits run against a second server started with those limits.
 */
import type Database from 'better-sqlite3';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { contentHash } from '../../src/lib/ingest';
import { startTestServer, type TestServer } from '../setup/app-server';
import { body, Client, demo, demoEmails, signedIn } from '../setup/http';
import { readWaveCorpus, type CorpusEntry } from '../setup/wave-corpus';
import { createStudy, fixture, postWave, readOnlyDatabase, storedMatrix, uploadDirOf, waveRecord, wavesDirectory } from './waves-http';

const corpus = readWaveCorpus();

/** The server's configuration variable for each reader limit a corpus entry may set. */
const limitVariables: Record<string, string> = {
  maxBytes: 'UPLOAD_MAX_BYTES',
  maxRows: 'UPLOAD_MAX_ROWS',
  maxColumns: 'UPLOAD_MAX_COLUMNS',
  maxWorkbookMemoryMb: 'UPLOAD_MAX_WORKBOOK_MEMORY_MB',
  maxWorkbookSeconds: 'UPLOAD_MAX_WORKBOOK_SECONDS',
};

/** A server to upload to: the shared one, or one started with an entry's limits. */
interface Target {
  client: Client;
  db: Database.Database;
  databasePath: string;
  studies: string[];
  server: TestServer | null;
}

const targets = new Map<string, Target>();

async function targetFor(entry: CorpusEntry): Promise<Target> {
  const key = JSON.stringify(entry.limits ?? {});
  const known = targets.get(key);
  if (known) return known;
  let server: TestServer | null = null;
  let client: Client;
  if (entry.limits) {
    const environment: Record<string, string> = {};
    for (const [name, value] of Object.entries(entry.limits)) {
      const variable = limitVariables[name];
      if (!variable) throw new Error(`${entry.file}: the limit ${name} cannot be set on the server (only ${Object.keys(limitVariables).join(', ')})`);
      environment[variable] = String(value);
    }
    server = await startTestServer({ seed: true, logName: `app-server-limits-${targets.size}.log`, environment });
    client = new Client(server.baseUrl);
    const response = await client.signIn(demoEmails.designer, 'paredown-demo');
    if (response.status !== 302) throw new Error('sign-in on the limits server failed');
  } else {
    client = await signedIn(demoEmails.designer);
  }
  const databasePath = server?.databasePath ?? inject('databasePath');
  const target: Target = { client, db: readOnlyDatabase(databasePath), databasePath, studies: [], server };
  targets.set(key, target);
  return target;
}

let owner: Client;

beforeAll(async () => {
  owner = await signedIn(demoEmails.owner);
});

afterAll(async () => {
  for (const target of targets.values()) {
    target.db.close();
    if (target.server) {
      await target.server.stop();
      continue;
    }
    for (const id of target.studies) await owner.delete(`/api/studies/${id}`);
  }
});

function codes(warnings: { code: string }[]): string[] {
  return [...new Set(warnings.map((warning) => warning.code))].sort();
}

describe('the awkward-file corpus through the upload endpoint', () => {
  it('has the entries the reader is tested with', () => {
    expect(corpus.entries.length).toBeGreaterThanOrEqual(28);
  });

  for (const entry of corpus.entries) {
    it(`${entry.file}: ${entry.about}`, async () => {
      const target = await targetFor(entry);
      const studyId = await createStudy(target.client, demo.team, `Corpus: ${entry.file}`);
      target.studies.push(studyId);
      const file = fixture(wavesDirectory, entry.file);
      const codebook = entry.codebook ? fixture(wavesDirectory, entry.codebook) : undefined;
      const response = await postWave(target.client, studyId, file, { codebook, fields: entry.sheet ? { sheet: entry.sheet } : {} });
      expect(response.status, 'never a 500').toBeLessThan(500);
      const answer = await body(response);

      const { refused, wave: expected } = entry.expect;
      if (refused) {
        expect({ status: response.status, code: answer.error?.code }).toEqual({ status: refused.status, code: refused.code });
        expect(Object.keys(answer)).toEqual(['error']);
        expect(Object.keys(answer.error).sort()).toEqual(['code', 'message']);
        expect(answer.error.message).toMatch(/^[A-Z"].*[.)]$/s);
        expect(answer.error.message).not.toMatch(/\n\s+at /);
        // Nothing of a refused upload is kept: no wave, no stored-file record, no file on disk.
        const hash = contentHash(file.bytes);
        expect(target.db.prepare('select count(*) as n from waves where study_id = ?').get(studyId)).toEqual({ n: 0 });
        expect(target.db.prepare('select count(*) as n from stored_files where hash = ?').get(hash)).toEqual({ n: 0 });
        expect(existsSync(join(uploadDirOf(target.databasePath), hash.slice(0, 2), hash))).toBe(false);
        return;
      }

      expect(response.status, JSON.stringify(answer.error ?? {})).toBe(201);
      expect(answer.wave.status).toBe('proposed');
      expect(answer.wave.rows).toBe(expected!.rows);
      expect(codes(answer.warnings)).toEqual([...expected!.warnings].sort());
      if (expected!.headers) expect(answer.proposal.columns.map((column: { column: string }) => column.column)).toEqual(expected!.headers);
      for (const [column, role] of Object.entries(expected!.roles ?? {})) {
        expect(answer.proposal.columns.find((proposed: { column: string }) => proposed.column === column)?.role, column).toBe(role);
      }
      for (const [key, value] of Object.entries(expected!.source ?? {})) expect(answer.wave.source[key], key).toBe(value);
      // Example cells of ignored columns (personal data, free text) never leave the server.
      for (const column of answer.proposal.columns) if (column.role === 'ignore') expect(column.profile.examples).toEqual([]);

      // Confirm the proposal unchanged, with no exclusions.
      const confirmed = await target.client.put(`/api/waves/${answer.wave.id}/setup`, { setup: { columns: answer.setup }, exclusions: [] });
      expect(confirmed.status, 'never a 500').toBeLessThan(500);
      const stored = await body(confirmed);
      expect(confirmed.status, JSON.stringify(stored.error ?? {})).toBe(200);
      expect(stored.wave.status).toBe('confirmed');
      expect(stored.wave.rows).toBe(expected!.rows);
      expect(stored.wave.items).toBe(expected!.items);
      expect(stored.items.length).toBe(expected!.items);
      expect(codes(stored.warnings)).toEqual([...expected!.warnings].sort());
      if (expected!.itemIds) expect(stored.items.map((item: { id: string }) => item.id)).toEqual(expected!.itemIds);

      // What the database holds.
      const record = waveRecord(target.db, answer.wave.id)!;
      expect(record.status).toBe('confirmed');
      expect(record.row_count).toBe(expected!.rows);
      expect(record.item_count).toBe(expected!.items);
      const matrix = storedMatrix(target.db, answer.wave.id);
      expect([matrix.rows, matrix.columns]).toEqual([expected!.rows, expected!.items]);
      const items = target.db.prepare('select position, item_id as id, header from wave_items where wave_id = ? order by position').all(answer.wave.id) as { position: number; id: string; header: string }[];
      expect(items.map((item) => item.position)).toEqual([...Array(expected!.items).keys()]);
      const setup = JSON.parse(record.setup!);
      const screening = record.screening ? JSON.parse(record.screening) : null;
      for (const cell of expected!.cells ?? []) {
        const role = answer.proposal.columns.find((proposed: { column: string }) => proposed.column === cell.column)?.role;
        const k = items.findIndex((item) => item.header === cell.column);
        let value: number | null | undefined;
        if (k >= 0) {
          const stored = matrix.data[k * matrix.rows + cell.row];
          value = Number.isNaN(stored) ? null : stored;
        } else if (role === 'outcome') value = setup.outcomes.find((outcome: { header: string }) => outcome.header === cell.column)?.values[cell.row];
        else if (role === 'weight') value = setup.weight?.[cell.row];
        else if (role === 'duration') value = screening?.duration?.[cell.row];
        expect(value, `${cell.column} row ${cell.row}`).not.toBeUndefined();
        if (cell.value === null) expect(value, `${cell.column} row ${cell.row}`).toBeNull();
        else expect(value, `${cell.column} row ${cell.row}`).toBeCloseTo(cell.value, 12);
      }
      // Personal data never becomes an item.
      for (const column of answer.proposal.columns) {
        if (/personal data/i.test(column.reason)) expect(items.some((item) => item.header === column.column), column.column).toBe(false);
      }
      // The original is kept byte for byte under its hash.
      const hash = contentHash(file.bytes);
      expect(record.file_hash).toBe(hash);
      expect(existsSync(join(uploadDirOf(target.databasePath), hash.slice(0, 2), hash))).toBe(true);
    });
  }
});
