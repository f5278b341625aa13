/**
 * The wave routes against the built server: upload, recognising a repeated upload, the setup
 * check (dry run), confirmation in one transaction (failures forced with SQLite triggers), the
 * reversible exclusions of a confirmed wave, what each role receives, respondent pages, the
 * size limits, and the round trip of the demo wave as XLSX and as CSV.
 *
 * Expected facts about the demo files come from fixtures/demo/README.md (the planted ground
 * truth of src/lib/synth/demo.ts): 400 respondents, 41 item columns, `comments` and `email`
 * personal data, 6 straightliners and 8 speeders by respondent id.
 */
import Database from 'better-sqlite3';
import { existsSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { contentHash } from '../../src/lib/ingest';
import { useOwnServer } from '../setup/own-server';
import { body, Client, demo, demoEmails, signedIn } from '../setup/http';
import { createStudy, demoDirectory, fixture, postWave, readOnlyDatabase, storedMatrix, textFile, uploadDirOf, waveRecord, type FilePart } from './waves-http';

// fixtures/demo/README.md, "What is planted": straightliners and speeders by respondent id.
const straightliners = ['270048', '270142', '270172', '270183', '270205', '270266'];
const speeders = ['270132', '270187', '270233', '270237', '270346', '270355', '270357', '270368'];

const clients = {} as Record<'owner' | 'designer' | 'field' | 'reviewer' | 'outsider', Client>;
let db: Database.Database;
const studies: { client: Client; id: string }[] = [];
let counter = 0;

const pilotCsv = () => fixture(demoDirectory, 'library-pilot-1.csv');
const pilotCodebook = () => fixture(demoDirectory, 'library-codebook.csv');

/** A small CSV no other test uploads (its bytes, hence its hash, are new). */
function freshCsv(): FilePart {
  counter += 1;
  const tag = `${Date.now().toString(36)}-${counter}`;
  const rows = ['respondent_id,Q1,Q2,Q3,Q4'];
  for (let i = 0; i < 12; i++) rows.push(`${tag}-${i},${(i % 5) + 1},${((i * 2) % 5) + 1},${((i * 3) % 5) + 1},${((i + 2) % 5) + 1}`);
  return textFile(`fresh-${tag}.csv`, rows.join('\n') + '\n');
}

async function study(client: Client = clients.designer, teamId: string = demo.team): Promise<string> {
  const id = await createStudy(client, teamId, `Wave test ${++counter}`);
  studies.push({ client: teamId === demo.team ? clients.owner : clients.outsider, id });
  return id;
}

async function uploadPilot(studyId: string): Promise<any> {
  const response = await postWave(clients.designer, studyId, pilotCsv(), { codebook: pilotCodebook() });
  expect(response.status).toBe(201);
  return body(response);
}

function activity(studyId: string): { action: string; detail: any }[] {
  return (db.prepare('select action, detail from activity_log where study_id = ? order by id').all(studyId) as { action: string; detail: string }[])
    .map((row) => ({ action: row.action, detail: JSON.parse(row.detail) }));
}

function count(sql: string, ...parameters: unknown[]): number {
  return (db.prepare(sql).get(...parameters) as { n: number }).n;
}

beforeAll(async () => {
  for (const [key, email] of [['owner', demoEmails.owner], ['designer', demoEmails.designer], ['field', demoEmails.field], ['reviewer', demoEmails.reviewer], ['outsider', demoEmails.outsider]] as const) {
    clients[key] = await signedIn(email);
  }
  db = readOnlyDatabase();
});

afterAll(async () => {
  db.close();
  for (const { client, id } of studies) await client.delete(`/api/studies/${id}`);
  const tokens = await body(await clients.designer.get('/api/tokens'));
  for (const token of tokens.tokens) await clients.designer.delete(`/api/tokens/${token.id}`);
});

describe('uploading a wave', () => {
  it('reads the demo wave with its codebook and proposes a setup with reasons, counts and a screening preview', async () => {
    const studyId = await study();
    const response = await postWave(clients.designer, studyId, pilotCsv(), { codebook: pilotCodebook() });
    expect(response.status).toBe(201);
    const answer = await body(response);
    expect(response.headers.get('location')).toBe(`/api/waves/${answer.wave.id}`);
    expect(answer.duplicate).toBe(false);
    expect(answer.wave).toMatchObject({ status: 'proposed', label: 'Pilot 1', rows: 400, items: 41, format: 'csv', fileName: 'library-pilot-1.csv', codebookName: 'library-codebook.csv' });
    const columns = answer.proposal.columns as any[];
    expect(columns.map((column) => column.column).slice(0, 3)).toEqual(['respondent_id', 'duration_sec', 'coll_1']);
    for (const column of columns) {
      expect(column.reason.length, column.column).toBeGreaterThan(10);
      expect(column.profile.nonBlank + column.profile.blank).toBe(400);
    }
    const role = (name: string) => columns.find((column) => column.column === name);
    expect(role('respondent_id').role).toBe('respondent-id');
    expect(role('duration_sec').role).toBe('duration');
    expect(role('overall_sat').role).toBe('outcome');
    expect(role('email').role).toBe('ignore');
    expect(role('comments').role).toBe('ignore');
    // Personal data never leaves the server as examples, and is never an item.
    expect(role('email').profile.examples).toEqual([]);
    expect(JSON.stringify(answer)).not.toMatch(/@example\.(org|com|net)/);
    expect(role('staff_6').item).toMatchObject({ reverse: true, min: 1, max: 7, missingCodes: [8, 9], scale: 'staff_help' });
    expect(role('coll_2').counts).toMatchObject({ outOfRange: 0, nonNumeric: 0, unmappedLabel: 0 });
    expect(answer.warnings.map((warning: any) => warning.code)).toEqual(expect.arrayContaining(['personal-data-ignored', 'constant-item', 'identical-items']));
    // The screening preview finds the planted respondents, by id.
    const flagged = answer.screening.flagged as { respondentId: string; flags: string[] }[];
    expect(flagged.filter((r) => r.flags.includes('long-string')).map((r) => r.respondentId).sort()).toEqual(straightliners);
    expect(flagged.filter((r) => r.flags.includes('speeder')).map((r) => r.respondentId).sort()).toEqual(speeders);
    expect(answer.screening.proposedExclusions).toHaveLength(straightliners.length + speeders.length);
    // Stored as proposed: the originals, the wave without matrix or items, one activity entry.
    const record = waveRecord(db, answer.wave.id)!;
    expect(record).toMatchObject({ status: 'proposed', row_count: 400, matrix: null, file_hash: contentHash(pilotCsv().bytes), codebook_hash: contentHash(pilotCodebook().bytes) });
    expect(count('select count(*) as n from wave_items where wave_id = ?', answer.wave.id)).toBe(0);
    expect(existsSync(join(uploadDirOf(), record.file_hash.slice(0, 2), record.file_hash))).toBe(true);
    expect(activity(studyId).map((entry) => entry.action)).toEqual(['study.created', 'wave.uploaded']);
  });

  it('recognises the same upload to the same study, and keeps a separate wave only when asked', async () => {
    const studyId = await study();
    const first = await uploadPilot(studyId);
    const again = await postWave(clients.designer, studyId, pilotCsv(), { codebook: pilotCodebook() });
    expect(again.status).toBe(200);
    const repeated = await body(again);
    expect(repeated.duplicate).toBe(true);
    expect(repeated.wave.id).toBe(first.wave.id);
    expect(count('select count(*) as n from waves where study_id = ?', studyId)).toBe(1);
    expect(activity(studyId).filter((entry) => entry.action === 'wave.uploaded')).toHaveLength(1);
    // The demo's own stored wave is recognised too.
    const demoAgain = await postWave(clients.designer, demo.study, pilotCsv(), { codebook: pilotCodebook() });
    expect(demoAgain.status).toBe(200);
    expect((await body(demoAgain)).wave).toMatchObject({ id: 'wave-riverbend-pilot-1', status: 'confirmed' });

    const separate = await postWave(clients.designer, studyId, pilotCsv(), { codebook: pilotCodebook(), fields: { asNewWave: '1', label: 'Pilot 1 (again)' } });
    expect(separate.status).toBe(201);
    const kept = await body(separate);
    expect(kept.wave.label).toBe('Pilot 1 (again)');
    expect(kept.warnings.map((warning: any) => warning.code)).toContain('file-uploaded-before');
    // The original is stored once for both waves.
    expect(count('select count(*) as n from stored_files where hash = ?', contentHash(pilotCsv().bytes))).toBe(1);
    // Without the codebook it is another reading of the file: a new wave, said so.
    const withoutCodebook = await postWave(clients.designer, studyId, pilotCsv());
    expect(withoutCodebook.status).toBe(201);
    expect((await body(withoutCodebook)).wave.label).toBe('Pilot 3');
  });

  it('answers bad forms with 400 and stores nothing', async () => {
    const studyId = await study();
    const asJson = await clients.designer.post(`/api/studies/${studyId}/waves`, { file: 'x' });
    expect(asJson.status).toBe(400);
    expect((await body(asJson)).error.code).toBe('not-multipart');
    const noFile = await postWave(clients.designer, studyId, null, { fields: { label: 'x' } });
    expect(noFile.status).toBe(400);
    expect((await body(noFile)).error.code).toBe('file-required');
    const sheet = await postWave(clients.designer, studyId, fixture(demoDirectory, 'library-pilot-1.xlsx'), { fields: { sheet: 'No such sheet' } });
    expect(sheet.status).toBe(400);
    expect((await body(sheet)).error).toMatchObject({ code: 'unknown-sheet', message: expect.stringContaining('"responses"') });
    const longLabel = await postWave(clients.designer, studyId, freshCsv(), { fields: { label: 'x'.repeat(101) } });
    expect(longLabel.status).toBe(400);
    expect((await body(longLabel)).error.code).toBe('invalid-field');
    expect(count('select count(*) as n from waves where study_id = ?', studyId)).toBe(0);
    expect(count('select count(*) as n from stored_files where hash = ?', contentHash(fixture(demoDirectory, 'library-pilot-1.xlsx').bytes))).toBe(0);
  });

  it('refuses a declared body past the limit before reading it', async () => {
    const studyId = await study();
    const url = new URL(`/api/studies/${studyId}/waves`, inject('baseUrl'));
    const answer = await new Promise<{ status: number; text: string }>((resolve, reject) => {
      const request = httpRequest(url, {
        method: 'POST',
        headers: {
          'content-type': 'multipart/form-data; boundary=limit',
          // 200 MB declared, a few bytes sent: the answer must come without the rest.
          'content-length': String(200 * 1024 * 1024),
          cookie: [...clients.designer.cookies].map(([k, v]) => `${k}=${v}`).join('; '),
          origin: inject('baseUrl'),
        },
      });
      request.on('response', (response) => {
        let text = '';
        response.on('data', (chunk) => (text += chunk));
        response.on('end', () => {
          resolve({ status: response.statusCode ?? 0, text });
          request.destroy();
        });
      });
      request.on('error', reject);
      request.write('--limit\r\n');
    });
    expect(answer.status).toBe(413);
    expect(JSON.parse(answer.text).error.code).toBe('file-too-large');
  });

  it('lets owners, designers and their tokens upload, and no one else', async () => {
    const studyId = await study(clients.owner);
    const created = await clients.designer.post('/api/tokens', { name: 'wave upload test' });
    const token = new Client();
    token.bearer = (await body(created)).secret;
    const statuses: Record<string, number> = {};
    for (const [name, client] of [...Object.entries(clients), ['token', token], ['anonymous', new Client()]] as [string, Client][]) {
      const response = await postWave(client, studyId, freshCsv());
      statuses[name] = response.status;
      if (response.status >= 400) expect(Object.keys((await body(response)).error).sort()).toEqual(['code', 'message']);
    }
    expect(statuses).toEqual({ owner: 201, designer: 201, field: 403, reviewer: 403, outsider: 404, token: 201, anonymous: 401 });
    expect(count('select count(*) as n from waves where study_id = ?', studyId)).toBe(3);
  });
});

describe('confirming the setup', () => {
  it('checks a setup without storing anything (dry run), then stores the wave in one go', async () => {
    const studyId = await study();
    const uploaded = await uploadPilot(studyId);
    const before = waveRecord(db, uploaded.wave.id)!;
    const dry = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, { setup: { columns: uploaded.setup }, exclusions: [0, 1], dryRun: true });
    expect(dry.status).toBe(200);
    const preview = await body(dry);
    expect(preview).toMatchObject({ stored: false, dryRun: true, exclusions: [0, 1] });
    expect(preview.items).toHaveLength(41);
    expect(preview.items.find((item: any) => item.id === 'staff_6')).toMatchObject({ reverse: true, counts: { outOfRange: 0 } });
    expect(waveRecord(db, uploaded.wave.id)).toEqual(before);
    expect(activity(studyId).map((entry) => entry.action)).toEqual(['study.created', 'wave.uploaded']);

    const exclusions = uploaded.screening.proposedExclusions;
    const confirmed = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, { setup: { columns: uploaded.setup }, exclusions });
    expect(confirmed.status).toBe(200);
    const answer = await body(confirmed);
    expect(answer.wave).toMatchObject({ status: 'confirmed', rows: 400, items: 41, excluded: 14 });
    const record = waveRecord(db, uploaded.wave.id)!;
    expect(record.status).toBe('confirmed');
    expect(JSON.parse(record.exclusions)).toEqual(exclusions);
    const matrix = storedMatrix(db, uploaded.wave.id);
    expect([matrix.rows, matrix.columns]).toEqual([400, 41]);
    expect(JSON.parse(record.respondent_ids!)).toHaveLength(400);
    expect(count('select count(*) as n from wave_items where wave_id = ?', uploaded.wave.id)).toBe(41);
    // Ignored columns are not items; the outcome is kept beside the matrix.
    const headers = (db.prepare('select header from wave_items where wave_id = ?').all(uploaded.wave.id) as { header: string }[]).map((row) => row.header);
    expect(headers).not.toContain('email');
    expect(headers).not.toContain('comments');
    expect(headers).not.toContain('overall_sat');
    expect(JSON.parse(record.setup!).outcomes.map((outcome: any) => outcome.id)).toEqual(['overall_sat']);
    expect(activity(studyId).at(-1)).toMatchObject({ action: 'wave.confirmed', detail: { waveId: uploaded.wave.id, respondents: 400, items: 41, excluded: 14 } });
    // The study lists it.
    const detail = await body(await clients.designer.get(`/api/studies/${studyId}`));
    expect(detail.study.waves).toEqual([expect.objectContaining({ id: uploaded.wave.id, status: 'confirmed', rows: 400, items: 41, excluded: 14 })]);
  });

  it('answers a bad setup with 400 and leaves the wave as proposed', async () => {
    const studyId = await study();
    const uploaded = await uploadPilot(studyId);
    const before = waveRecord(db, uploaded.wave.id);
    const setup = uploaded.setup as any[];
    const withEmailAsItem = setup.map((column) => (column.column === 'email' ? { ...column, role: 'item', item: { id: 'email', min: 1, max: 5 } } : column));
    const cases: [unknown, string][] = [
      [{ setup: { columns: withEmailAsItem } }, 'personal-data-as-item'],
      [{ setup: { columns: [...setup, { column: 'not_there', role: 'item', item: { id: 'x', min: 1, max: 5 } }] } }, 'unknown-column'],
      [{ setup: { columns: setup.map((column) => (column.column === 'coll_1' ? { ...column, item: { ...column.item, min: 5, max: 1 } } : column)) } }, 'invalid-range'],
      [{ setup: { columns: setup }, exclusions: [400] }, 'invalid-exclusions'],
      [{ setup: { columns: setup }, exclusions: ['1'] }, 'invalid-body'],
      [{ setup: { columns: setup }, screening: { speederShare: 2 } }, 'invalid-body'],
      [{ setup: 'all of it' }, 'invalid-setup'],
      [{ exclusions: [] }, 'setup-required'],
    ];
    for (const [payload, code] of cases) {
      const response = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, payload);
      expect(response.status, code).toBe(400);
      expect((await body(response)).error.code).toBe(code);
    }
    const broken = await clients.designer.call('PUT', `/api/waves/${uploaded.wave.id}/setup`, { raw: '{"setup": ' });
    expect(broken.status).toBe(400);
    expect((await body(broken)).error.code).toBe('bad-json');
    expect(waveRecord(db, uploaded.wave.id)).toEqual(before);
  });

  it('keeps a confirmed wave immutable except for its exclusions, which stay reversible', async () => {
    const studyId = await study();
    const uploaded = await uploadPilot(studyId);
    const exclusions = uploaded.screening.proposedExclusions as number[];
    await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, { setup: { columns: uploaded.setup }, exclusions });
    const matrixBefore = waveRecord(db, uploaded.wave.id)!.matrix;

    const changed = (uploaded.setup as any[]).map((column) => (column.column === 'coll_1' ? { ...column, role: 'ignore', item: null } : column));
    const refused = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, { setup: { columns: changed }, exclusions });
    expect(refused.status).toBe(409);
    expect((await body(refused)).error.code).toBe('wave-confirmed');
    const noExclusions = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, {});
    expect(noExclusions.status).toBe(400);
    expect((await body(noExclusions)).error.code).toBe('exclusions-required');
    const screening = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, { exclusions, screening: { speederShare: 0.5 } });
    expect(screening.status).toBe(409);

    // The same setup sent back with other exclusions is fine; everyone stays in the wave.
    const none = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, { setup: { columns: uploaded.setup }, exclusions: [] });
    expect(none.status).toBe(200);
    expect((await body(none)).wave).toMatchObject({ status: 'confirmed', rows: 400, excluded: 0 });
    const back = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, { exclusions });
    expect(back.status).toBe(200);
    expect((await body(back)).exclusions).toEqual(exclusions);
    const record = waveRecord(db, uploaded.wave.id)!;
    expect(record.matrix!.equals(matrixBefore!)).toBe(true);
    expect(record.row_count).toBe(400);
    expect(activity(studyId).map((entry) => entry.action)).toEqual(['study.created', 'wave.uploaded', 'wave.confirmed', 'wave.exclusions-changed', 'wave.exclusions-changed']);
    expect(activity(studyId).at(-1)!.detail).toMatchObject({ excludedBefore: 0, excludedAfter: 14 });
  });
});

describe('transactions', () => {
  let writer: Database.Database;
  beforeAll(() => {
    writer = new Database(inject('databasePath'), { fileMustExist: true });
    writer.exec(`
      CREATE TRIGGER IF NOT EXISTS test_forced_wave_failure BEFORE INSERT ON waves WHEN NEW.label = 'forced failure'
        BEGIN SELECT RAISE(ABORT, 'forced failure (test)'); END;
      CREATE TRIGGER IF NOT EXISTS test_forced_item_failure BEFORE INSERT ON wave_items WHEN NEW.item_id = 'forced_failure_item'
        BEGIN SELECT RAISE(ABORT, 'forced failure (test)'); END;`);
  });
  afterAll(() => {
    writer.exec('DROP TRIGGER IF EXISTS test_forced_wave_failure; DROP TRIGGER IF EXISTS test_forced_item_failure;');
    writer.close();
  });

  it('leaves neither a wave, a stored-file record nor a file behind when storing an upload fails', async () => {
    const studyId = await study();
    const file = freshCsv();
    const hash = contentHash(file.bytes);
    const response = await postWave(clients.designer, studyId, file, { fields: { label: 'forced failure' } });
    // The failure is the server's (a database fault), so a 500 without details.
    expect(response.status).toBe(500);
    expect((await body(response)).error.code).toBe('internal-error');
    expect(count('select count(*) as n from waves where study_id = ?', studyId)).toBe(0);
    expect(count('select count(*) as n from stored_files where hash = ?', hash)).toBe(0);
    expect(existsSync(join(uploadDirOf(), hash.slice(0, 2), hash))).toBe(false);
    expect(activity(studyId).map((entry) => entry.action)).toEqual(['study.created']);
  });

  it('leaves the wave proposed, without matrix, items or exclusions, when storing the confirmation fails half-way', async () => {
    const studyId = await study();
    const uploaded = await uploadPilot(studyId);
    const before = waveRecord(db, uploaded.wave.id);
    // The first item gets the id the trigger refuses: the wave row is updated first, then the items fail.
    const setup = (uploaded.setup as any[]).map((column) => (column.column === 'coll_1' ? { ...column, item: { ...column.item, id: 'forced_failure_item' } } : column));
    const failed = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, { setup: { columns: setup }, exclusions: [3, 4] });
    expect(failed.status).toBe(500);
    expect(waveRecord(db, uploaded.wave.id)).toEqual(before);
    expect(count('select count(*) as n from wave_items where wave_id = ?', uploaded.wave.id)).toBe(0);
    expect(activity(studyId).map((entry) => entry.action)).toEqual(['study.created', 'wave.uploaded']);
    // The same confirmation goes through once the fault is gone.
    writer.exec('DROP TRIGGER test_forced_item_failure;');
    const confirmed = await clients.designer.put(`/api/waves/${uploaded.wave.id}/setup`, { setup: { columns: setup }, exclusions: [3, 4] });
    expect(confirmed.status).toBe(200);
    expect(count('select count(*) as n from wave_items where wave_id = ?', uploaded.wave.id)).toBe(41);
  });
});

describe('reading a wave', () => {
  let waveId: string;
  let studyId: string;
  beforeAll(async () => {
    studyId = await study();
    const uploaded = await uploadPilot(studyId);
    waveId = uploaded.wave.id;
    await clients.designer.put(`/api/waves/${waveId}/setup`, { setup: { columns: uploaded.setup }, exclusions: uploaded.screening.proposedExclusions });
  });

  it('gives reviewers and field managers aggregates only, and designers the respondent-level parts', async () => {
    for (const client of [clients.reviewer, clients.field]) {
      const response = await client.get(`/api/waves/${waveId}`);
      expect(response.status).toBe(200);
      const view = await body(response);
      expect(view.wave).toMatchObject({ id: waveId, status: 'confirmed', rows: 400, items: 41, excluded: 14 });
      expect(view.items).toHaveLength(41);
      expect(view.items[0]).toMatchObject({ id: 'coll_1', scale: 'collections', counts: expect.any(Object) });
      expect(view.screening.flags.map((flag: any) => [flag.code, flag.count])).toEqual([['long-string', 6], ['low-variability', 5], ['speeder', 8], ['mostly-missing', 0]]);
      expect(view.screening.flags[0].respondents).toBeUndefined();
      expect(view).toMatchObject({ proposal: null, setup: null, exclusions: null });
      expect(view.screening.flagged).toBeUndefined();
      // Not one respondent id in what a reviewer receives.
      const text = JSON.stringify(view);
      for (const id of [...straightliners, ...speeders]) expect(text).not.toContain(id);
    }
    const designer = await body(await clients.designer.get(`/api/waves/${waveId}`));
    expect(designer.screening.flagged.map((r: any) => r.respondentId)).toEqual(expect.arrayContaining(straightliners));
    expect(designer.exclusions).toHaveLength(14);
    const outsider = await clients.outsider.get(`/api/waves/${waveId}`);
    expect(outsider.status).toBe(404);
    expect((await body(outsider)).error.code).toBe('wave-not-found');
  });

  it('pages through respondents with their flags, for owners and designers only', async () => {
    const first = await body(await clients.designer.get(`/api/waves/${waveId}/respondents?perPage=150`));
    expect(first).toMatchObject({ page: 1, perPage: 150, total: 400, pages: 3 });
    expect(first.respondents).toHaveLength(150);
    expect(first.respondents[0]).toMatchObject({ row: 0, respondentId: '270001', excluded: false, flags: [], outcomes: { overall_sat: expect.any(Number) } });
    const last = await body(await clients.owner.get(`/api/waves/${waveId}/respondents?perPage=150&page=3`));
    expect(last.respondents.map((r: any) => r.row)).toEqual([...Array(100).keys()].map((i) => 300 + i));
    const flagged = await body(await clients.designer.get(`/api/waves/${waveId}/respondents?flagged=1`));
    expect(flagged.total).toBe(14);
    expect(flagged.respondents.every((r: any) => r.flags.length > 0 && r.excluded)).toBe(true);
    expect(flagged.respondents.filter((r: any) => r.flags.includes('speeder')).map((r: any) => r.respondentId).sort()).toEqual(speeders);
    for (const [query, status] of [['perPage=0', 400], ['page=x', 400], ['flagged=maybe', 400]] as const) {
      expect((await clients.designer.get(`/api/waves/${waveId}/respondents?${query}`)).status, query).toBe(status);
    }
    for (const client of [clients.reviewer, clients.field]) {
      const response = await client.get(`/api/waves/${waveId}/respondents`);
      expect(response.status).toBe(403);
      expect((await body(response)).error.code).toBe('missing-permission');
    }
    const proposed = await uploadPilotWithoutCodebook(studyId);
    const notYet = await clients.designer.get(`/api/waves/${proposed}/respondents`);
    expect(notYet.status).toBe(409);
    expect((await body(notYet)).error.code).toBe('wave-not-confirmed');
  });

  it('never sends the e-mail examples the first demo seed kept with its proposal', async () => {
    const view = await body(await clients.designer.get('/api/waves/wave-riverbend-pilot-1'));
    expect(view.wave).toMatchObject({ status: 'confirmed', rows: 400, items: 41 });
    expect(JSON.stringify(view)).not.toMatch(/@example\.(org|com|net)/);
  });
});

async function uploadPilotWithoutCodebook(studyId: string): Promise<string> {
  const response = await postWave(clients.designer, studyId, pilotCsv());
  expect(response.status).toBe(201);
  return (await body(response)).wave.id;
}

describe('round trip', () => {
  it('stores identical matrices from the demo workbook and the demo CSV with its codebook', async () => {
    const ids: string[] = [];
    for (const upload of [
      { file: fixture(demoDirectory, 'library-pilot-1.xlsx') },
      { file: pilotCsv(), codebook: pilotCodebook() },
    ]) {
      const studyId = await study();
      const response = await postWave(clients.designer, studyId, upload.file, { codebook: upload.codebook });
      expect(response.status).toBe(201);
      const answer = await body(response);
      const confirmed = await clients.designer.put(`/api/waves/${answer.wave.id}/setup`, { setup: { columns: answer.setup }, exclusions: answer.screening.proposedExclusions });
      expect(confirmed.status).toBe(200);
      ids.push(answer.wave.id);
    }
    const [fromWorkbook, fromText] = ids.map((id) => waveRecord(db, id)!);
    expect(fromWorkbook.matrix!.byteLength).toBe(16 + 400 * 41 * 8);
    expect(fromWorkbook.matrix!.equals(fromText.matrix!)).toBe(true);
    expect(fromWorkbook.respondent_ids).toEqual(fromText.respondent_ids);
    expect(fromWorkbook.exclusions).toEqual(fromText.exclusions);
    const items = (id: string) => db.prepare('select position, item_id, header, scale, reverse, min, max, missing_codes, text from wave_items where wave_id = ? order by position').all(id);
    expect(items(ids[0])).toEqual(items(ids[1]));
    expect(JSON.parse(fromWorkbook.setup!).source).toMatchObject({ format: 'xlsx', sheet: 'responses', codebookFrom: 'sheet' });
  });
});

describe('size limits on a server with small ones', () => {
  const server = useOwnServer({ seed: true, logName: 'app-server-small-uploads.log', environment: { UPLOAD_MAX_BYTES: String(64 * 1024) } });
  let client: Client;
  beforeAll(async () => {
    client = new Client(server.baseUrl);
    await client.signIn(demoEmails.designer, 'paredown-demo');
  });

  it('refuses a file past the limit with 413 and keeps nothing', async () => {
    const studyId = await createStudy(client, demo.team, 'Small limits');
    const big = textFile('big.csv', 'respondent_id,Q1\n' + Array.from({ length: 9000 }, (_, i) => `r${i},${(i % 5) + 1}`).join('\n'));
    expect(big.bytes.byteLength).toBeGreaterThan(64 * 1024);
    const response = await postWave(client, studyId, big);
    expect(response.status).toBe(413);
    expect((await body(response)).error.code).toBe('file-too-large');
    const small = readOnlyDatabase(server.databasePath);
    try {
      expect((small.prepare('select count(*) as n from waves where study_id = ?').get(studyId) as { n: number }).n).toBe(0);
      expect((small.prepare('select count(*) as n from stored_files where hash = ?').get(contentHash(big.bytes)) as { n: number }).n).toBe(0);
    } finally {
      small.close();
    }
  });

  it('cuts off a body without a declared length once it passes the limit', async () => {
    const studyId = await createStudy(client, demo.team, 'Small limits, streamed');
    const url = new URL(`/api/studies/${studyId}/waves`, server.baseUrl);
    const chunk = Buffer.alloc(256 * 1024, 0x61);
    const answer = await new Promise<{ status: number; text: string; sent: number }>((resolve, reject) => {
      let sent = 0;
      let done = false;
      const request = httpRequest(url, {
        method: 'POST',
        headers: {
          'content-type': 'multipart/form-data; boundary=stream',
          'transfer-encoding': 'chunked',
          cookie: [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; '),
          origin: server.baseUrl,
        },
      });
      request.on('response', (response) => {
        done = true;
        let text = '';
        response.on('data', (part) => (text += part));
        response.on('end', () => {
          resolve({ status: response.statusCode ?? 0, text, sent });
          request.destroy();
        });
      });
      request.on('error', (error) => (done ? undefined : reject(error)));
      // Up to 64 MB, stopping as soon as the server answers.
      const pump = () => {
        while (!done && sent < 64 * 1024 * 1024) {
          sent += chunk.byteLength;
          if (!request.write(chunk)) {
            request.once('drain', pump);
            return;
          }
        }
        if (!done) request.end();
      };
      request.write('--stream\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\n');
      pump();
    });
    expect(answer.status).toBe(413);
    expect(JSON.parse(answer.text).error.code).toBe('file-too-large');
    // The server stopped well before 64 MB: the cap is the limit plus 8 MB for a codebook.
    expect(answer.sent).toBeLessThan(32 * 1024 * 1024);
  });
});
