/**
 * Helpers of the wave tests: multipart uploads through a test Client (its cookies, bearer token
 * and Origin), fresh studies, and read-only looks into the test server's SQLite file.
 */
import Database from 'better-sqlite3';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { inject } from 'vitest';
import { decodeMatrix } from '../../src/lib/ingest';
import type { ItemMatrix } from '../../src/lib/stats/types';
import { body, type HttpClient } from '../setup/http';

export const wavesDirectory = join(import.meta.dirname, '..', '..', 'fixtures', 'waves');
export const demoDirectory = join(import.meta.dirname, '..', '..', 'fixtures', 'demo');

/** A file to upload. */
export interface FilePart {
  name: string;
  bytes: Uint8Array<ArrayBuffer>;
}

/**
 * Reads a fixture into a file part.
 * @param directory the folder.
 * @param name the file name.
 */
export function fixture(directory: string, name: string): FilePart {
  const buffer = readFileSync(join(directory, name));
  const bytes = new Uint8Array(new ArrayBuffer(buffer.byteLength));
  bytes.set(buffer);
  return { name, bytes };
}

/**
 * A text file part.
 * @param name the file name.
 * @param text its content (written as UTF-8).
 */
export function textFile(name: string, text: string): FilePart {
  const encoded = new TextEncoder().encode(text);
  const bytes = new Uint8Array(new ArrayBuffer(encoded.byteLength));
  bytes.set(encoded);
  return { name, bytes };
}

/**
 * Uploads a wave as a browser form would.
 * @param client the caller.
 * @param studyId the study.
 * @param file the responses.
 * @param extra codebook and text fields.
 */
export async function postWave(
  client: HttpClient,
  studyId: string,
  file: FilePart | null,
  extra: { codebook?: FilePart; fields?: Record<string, string> } = {},
): Promise<Response> {
  const form = new FormData();
  if (file) form.set('file', new Blob([file.bytes]), file.name);
  if (extra.codebook) form.set('codebook', new Blob([extra.codebook.bytes]), extra.codebook.name);
  for (const [name, value] of Object.entries(extra.fields ?? {})) form.set(name, value);
  return client.call('POST', `/api/studies/${studyId}/waves`, { formData: form, headers: { accept: 'application/json' } });
}

/**
 * Creates a study in a team.
 * @returns its id.
 */
export async function createStudy(client: HttpClient, teamId: string, name: string): Promise<string> {
  const response = await client.post('/api/studies', { teamId, name });
  if (response.status !== 201) throw new Error(`creating a study failed: ${response.status} ${await response.text()}`);
  return (await body(response)).study.id as string;
}

/** The test server's database, read-only. */
export function readOnlyDatabase(path: string = inject('databasePath')): Database.Database {
  return new Database(path, { readonly: true, fileMustExist: true });
}

/** The upload folder of a test server (beside its database, see tests/setup/app-server.ts). */
export function uploadDirOf(databasePath: string = inject('databasePath')): string {
  return join(dirname(databasePath), 'uploads');
}

/** A wave row as SQLite holds it. */
export interface WaveRecord {
  id: string;
  study_id: string;
  label: string;
  status: string;
  file_hash: string;
  codebook_hash: string | null;
  row_count: number;
  item_count: number;
  matrix: Buffer | null;
  setup: string | null;
  screening: string | null;
  exclusions: string;
  respondent_ids: string | null;
}

/** The wave row, or undefined. */
export function waveRecord(db: Database.Database, id: string): WaveRecord | undefined {
  return db.prepare('select * from waves where id = ?').get(id) as WaveRecord | undefined;
}

/** The stored matrix of a wave, decoded. */
export function storedMatrix(db: Database.Database, id: string): ItemMatrix {
  const row = waveRecord(db, id);
  if (!row?.matrix) throw new Error(`wave ${id} has no stored matrix`);
  return decodeMatrix(new Uint8Array(row.matrix));
}
