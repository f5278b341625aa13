/**
 * The demo's pilot wave as seeded (src/lib/server/demo-seed.ts) is stored as an upload followed by its
 * confirmation would store it: the versioned setup document (StoredWaveSetup) with how the file
 * was read and its warnings, and no example cells of ignored columns, so none of the e-mail
 * addresses in fixtures/demo/library-pilot-1.csv reaches the database or a browser.
 *
 * Facts about the demo files come from fixtures/demo/README.md (the planted ground truth of
 * src/lib/synth/demo.ts): `comments` and `email` are personal data, `hours_7` is constant and
 * `events_3b` copies `events_3`.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../../src/db/client';
import { demoIds, seedDemo } from '../../src/lib/server/demo-seed';
import { parseStoredSetup, STORED_SETUP_VERSION } from '../../src/lib/server/waves/stored-wave';
import { startTestServer, type TestServer } from '../setup/app-server';
import { body, Client, demo, demoEmails, demoPassword, signInSucceeded } from '../setup/http';
import { createStudy, demoDirectory, fixture, postWave } from './waves-http';

/** Anything shaped like an e-mail address (local part, @, a domain with a dot). */
const emailAddress = /[A-Za-z0-9._%+-]+@[A-Za-z0-9-]+(\.[A-Za-z0-9-]+)*\.[A-Za-z]{2,}/;

const folder = mkdtempSync(join(tmpdir(), 'paredown-seed-wave-'));
let setupText: string;

beforeAll(async () => {
  const db = openDatabase(join(folder, 'seed.sqlite'));
  try {
    const outcome = await seedDemo(db, { enabled: true, uploadDir: join(folder, 'uploads'), fixturesDir: demoDirectory });
    expect(outcome.seeded).toBe(true);
    setupText = (db.$client.prepare('select setup from waves where id = ?').get(demoIds.demoWave) as { setup: string }).setup;
  } finally {
    db.$client.close();
  }
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('the seeded demo wave', () => {
  it('stores no e-mail address anywhere in its setup, though the file holds many', () => {
    // The precondition, so that the assertion below can fail: the demo file has an `email` column with addresses.
    expect(readFileSync(join(demoDirectory, 'library-pilot-1.csv'), 'utf8')).toMatch(emailAddress);
    expect(setupText).not.toMatch(emailAddress);
    expect(setupText).not.toContain('@');
  });

  it('stores the versioned setup document an upload stores, with the source and the warnings', () => {
    const raw = JSON.parse(setupText);
    expect(raw.version).toBe(STORED_SETUP_VERSION);
    const stored = parseStoredSetup(raw, 400); // fixtures/demo/README.md: 400 respondents
    expect(stored.source).toMatchObject({ fileName: 'library-pilot-1.csv', format: 'csv', codebookName: 'library-codebook.csv', codebookFrom: 'file' });
    expect(stored.respondents).toBe(400); // fixtures/demo/README.md
    const ignored = stored.proposal.filter((column) => column.role === 'ignore');
    expect(ignored.map((column) => column.column).sort()).toEqual(['comments', 'email']); // fixtures/demo/README.md: personal data
    for (const column of ignored) expect(column.profile.examples, column.column).toEqual([]);
    // Examples of the other columns are kept (only ignored columns are blanked).
    expect(stored.proposal.find((column) => column.column === 'coll_1')?.profile.examples.length).toBeGreaterThan(0);
    expect(stored.warnings.map((warning) => warning.code)).toContain('personal-data-ignored');
    const buildCodes = stored.buildWarnings.map((warning) => warning.code);
    expect(buildCodes).toContain('constant-item'); // fixtures/demo/README.md: hours_7 is constant
    expect(buildCodes).toContain('identical-items'); // fixtures/demo/README.md: events_3b copies events_3
    expect(Object.keys(stored.itemCounts ?? {})).toHaveLength(41); // fixtures/demo/README.md: 41 items
    expect(stored.outcomes?.map((outcome) => outcome.id)).toEqual(['overall_sat']); // fixtures/demo/library-codebook.csv: the outcome column
    expect(stored.columns.every((column) => !('reason' in column) && !('profile' in column))).toBe(true);
  });
});

describe('the seeded demo wave on a server', () => {
  let server: TestServer;
  let designer: Client;
  let studyId: string;

  beforeAll(async () => {
    server = await startTestServer({ seed: true, logName: 'seed-wave-server.log' });
    designer = new Client(server.baseUrl);
    if (!signInSucceeded(await designer.signIn(demoEmails.designer, demoPassword))) throw new Error('designer sign-in failed');
    studyId = await createStudy(designer, demo.team, 'Seed comparison');
  });

  afterAll(async () => {
    await server?.stop();
  });

  it('shows what uploading and confirming the same files with the proposed setup and exclusions shows', async () => {
    const uploaded = await postWave(designer, studyId, fixture(demoDirectory, 'library-pilot-1.csv'), { codebook: fixture(demoDirectory, 'library-codebook.csv') });
    expect(uploaded.status).toBe(201);
    const proposed = await body(uploaded);
    const confirmed = await designer.put(`/api/waves/${proposed.wave.id}/setup`, { setup: { columns: proposed.setup }, exclusions: proposed.screening.proposedExclusions });
    expect(confirmed.status).toBe(200);
    const upload = await body(confirmed);
    const seededResponse = await designer.get(`/api/waves/${demoIds.demoWave}`);
    expect(seededResponse.status).toBe(200);
    const seededText = await seededResponse.text();
    expect(seededText).not.toMatch(emailAddress);
    const seeded = JSON.parse(seededText);
    for (const part of ['proposal', 'setup', 'items', 'outcomes', 'warnings', 'screening', 'screeningNote', 'exclusions'] as const) {
      expect(seeded[part], part).toEqual(upload[part]);
    }
    const summary = ({ status, format, sheet, fileName, codebookName, source, rows, items, excluded }: Record<string, unknown>) => ({ status, format, sheet, fileName, codebookName, source, rows, items, excluded });
    expect(summary(seeded.wave)).toEqual(summary(upload.wave));
    expect(seeded.warnings.length).toBeGreaterThan(0);
  });
});
