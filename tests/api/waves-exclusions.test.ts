/**
 * Changing the exclusions of a confirmed wave is worked out from its stored matrix, without the
 * original file (docs/decisions/007-one-way-in-for-waves.md): the original is removed from the
 * upload folder after confirmation, and the change, its dry run and a refusal still answer as
 * they should. The expected warnings follow from the cells of the small file made here
 * (12 respondents, 4 items) and MIN_RESPONDENTS_FOR_AUDIT = 3 (src/lib/ingest/ingest-thresholds.ts).
 */
import type Database from 'better-sqlite3';
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { contentHash } from '../../src/lib/ingest';
import { body, type Client, demo, demoEmails, signedIn } from '../setup/http';
import { createStudy, postWave, readOnlyDatabase, textFile, uploadDirOf, waveRecord } from './waves-http';

let designer: Client;
let owner: Client;
let db: Database.Database;
let studyId: string;

beforeAll(async () => {
  designer = await signedIn(demoEmails.designer);
  owner = await signedIn(demoEmails.owner);
  db = readOnlyDatabase();
  studyId = await createStudy(designer, demo.team, 'Exclusions without the original');
});

afterAll(async () => {
  db.close();
  await owner.delete(`/api/studies/${studyId}`);
});

const codes = (view: { warnings: { code: string }[] }) => view.warnings.map((warning) => warning.code);

describe('exclusions of a confirmed wave whose original file is gone', () => {
  it('change, preview and refuse from the stored matrix alone', async () => {
    // Bytes no other test uploads (the tag), so removing the file touches no other wave.
    const tag = `excl-${process.pid}-${Date.now().toString(36)}`;
    const rows = ['respondent_id,Q1,Q2,Q3,Q4'];
    for (let i = 0; i < 12; i++) rows.push(`${tag}-${i},${(i % 5) + 1},${((i * 2) % 5) + 1},${((i * 3) % 5) + 1},${((i + 2) % 5) + 1}`);
    const file = textFile(`${tag}.csv`, rows.join('\n') + '\n');
    const uploaded = await postWave(designer, studyId, file);
    expect(uploaded.status).toBe(201);
    const proposed = await body(uploaded);
    expect(proposed.setup.filter((column: { role: string }) => column.role === 'item')).toHaveLength(4);
    const confirmed = await designer.put(`/api/waves/${proposed.wave.id}/setup`, { setup: { columns: proposed.setup }, exclusions: [] });
    expect(confirmed.status).toBe(200);
    expect(codes(await body(confirmed))).not.toContain('too-few-respondents');

    const hash = contentHash(file.bytes);
    const original = join(uploadDirOf(), hash.slice(0, 2), hash);
    expect(existsSync(original)).toBe(true);
    rmSync(original);
    const matrixBefore = waveRecord(db, proposed.wave.id)!.matrix!;

    // Ten of twelve left out: 2 respondents for 4 items, fewer than the 3 an audit needs.
    const leaveOut = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9];
    const preview = await designer.put(`/api/waves/${proposed.wave.id}/setup`, { exclusions: leaveOut, dryRun: true });
    expect(preview.status).toBe(200);
    const previewed = await body(preview);
    expect(previewed.exclusions).toEqual(leaveOut);
    expect(codes(previewed)).toEqual(expect.arrayContaining(['more-items-than-respondents', 'too-few-respondents']));
    expect(JSON.parse(waveRecord(db, proposed.wave.id)!.exclusions)).toEqual([]); // a dry run stores nothing

    const changed = await designer.put(`/api/waves/${proposed.wave.id}/setup`, { exclusions: [...leaveOut].reverse() });
    expect(changed.status).toBe(200);
    const view = await body(changed);
    expect(view.wave).toMatchObject({ status: 'confirmed', rows: 12, excluded: 10 });
    expect(codes(view)).toEqual(codes(previewed));
    const record = waveRecord(db, proposed.wave.id)!;
    expect(JSON.parse(record.exclusions)).toEqual(leaveOut);
    expect(JSON.parse(record.setup!).buildWarnings.map((warning: { code: string }) => warning.code)).toEqual(expect.arrayContaining(['too-few-respondents']));
    expect(record.matrix!.equals(matrixBefore)).toBe(true);

    const refused = await designer.put(`/api/waves/${proposed.wave.id}/setup`, { exclusions: [12] });
    expect(refused.status).toBe(400);
    expect((await body(refused)).error.code).toBe('invalid-exclusions');

    const back = await designer.put(`/api/waves/${proposed.wave.id}/setup`, { exclusions: [] });
    expect(back.status).toBe(200);
    expect(codes(await body(back))).not.toContain('too-few-respondents');
    expect(existsSync(original)).toBe(false); // nothing read or wrote the original again
  });
});
