/**
 * Audits as jobs, against the built server with the seeded demo: start one as the designer, see
 * it queue, run with progress and finish with the audit JSON; reuse for the same resolved
 * settings; refusals (bad settings 400, unconfirmed wave 409); failures stored with their reason
 * (an audit that throws, a worker that dies) and retried; reading by every member role.
 *
 * Expected facts of the demo wave come from fixtures/demo/README.md ("What is planted"): five
 * planted overlap structures and 6 straightliners + 8 speeders set aside by screening.
 */
import Database from 'better-sqlite3';
import { beforeAll, describe, expect, inject, it } from 'vitest';
import { AUDIT_SCHEMA } from '../../src/lib/audit/audit-json';
import { demoIds } from '../../src/lib/server/demo-seed';
import { body, Client, demo, demoEmails, signedIn } from '../setup/http';

const waveId = demoIds.demoWave;
const clients = {} as Record<'owner' | 'designer' | 'field' | 'reviewer' | 'outsider', Client>;

/** Polls an audit until it is done or failed; records every status, stage and percent seen. */
async function settle(client: Client, auditId: string, seen: { status: string; stage: string | null; percent: number }[] = []) {
  for (let attempt = 0; attempt < 1_200; attempt++) {
    const response = await client.get(`/api/audits/${auditId}`);
    expect(response.status).toBe(200);
    const answer = await body(response);
    seen.push({ status: answer.audit.status, stage: answer.audit.stage, percent: answer.audit.percent });
    if (answer.audit.status === 'done' || answer.audit.status === 'failed') return answer;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`audit ${auditId} did not finish within two minutes`);
}

/**
 * A unique seed, so that a test's settings are its own (the same settings would be reused).
 * Fixed, not from the clock: the test server's database is new on every run
 * (tests/setup/app-server.ts), so counting in this file's own range is unique and a failure
 * replays with the same seeds (the permission table counts from 9_000_001, the browser test uses 50_000).
 */
let seedCounter = 0;
function uniqueSeed(): number {
  seedCounter += 1;
  return 100_000 + seedCounter;
}

beforeAll(async () => {
  for (const caller of ['owner', 'designer', 'field', 'reviewer', 'outsider'] as const) clients[caller] = await signedIn(demoEmails[caller]);
});

describe('an audit of the demo wave, started by the designer', () => {
  let auditId = '';
  let answer: any;
  let rawText = '';
  const seen: { status: string; stage: string | null; percent: number }[] = [];
  const settings = { method: 'pearson', bootstrap: 200, seed: 7, outcome: 'overall_sat' };

  beforeAll(async () => {
    const started = await clients.designer.post(`/api/waves/${waveId}/audits`, { settings });
    expect(started.status).toBe(202);
    const startedBody = await body(started);
    expect(startedBody.reused).toBe(false);
    expect(['queued', 'running']).toContain(startedBody.audit.status);
    expect(started.headers.get('location')).toBe(`/api/audits/${startedBody.audit.id}`);
    auditId = startedBody.audit.id;
    answer = await settle(clients.designer, auditId, seen);
    rawText = await (await clients.designer.get(`/api/audits/${auditId}`)).text();
  });

  it('answers 202 at once, then shows progress while running, then done', () => {
    expect(answer.audit.status).toBe('done');
    expect(answer.audit.percent).toBe(100);
    expect(answer.audit.error).toBeNull();
    // A 200-resample audit takes seconds; polled every 100 ms it is seen part-way.
    const midway = seen.filter((entry) => entry.status === 'running' && entry.percent > 0 && entry.percent < 100);
    expect(midway.length).toBeGreaterThan(0);
    expect(midway.every((entry) => typeof entry.stage === 'string' && entry.stage.length > 0)).toBe(true);
    const percents = seen.filter((entry) => entry.status === 'running').map((entry) => entry.percent);
    expect(percents).toEqual([...percents].sort((a, b) => a - b));
  });

  it('holds the audit JSON of audit-json.md, with recommendations and no NaN', () => {
    const result = answer.result;
    expect(result.schema).toBe(AUDIT_SCHEMA);
    expect(result.settings).toMatchObject({ method: 'pearson', missing: 'pairwise', bootstrap: 200, seed: 7, outcome: 'overall_sat' });
    // fixtures/demo/README.md: 400 respondents, 6 straightliners + 8 speeders set aside; 41 items.
    expect(result.input).toMatchObject({ rows: 400, respondentsExcluded: 14, respondentsUsed: 386, items: 41 });
    for (const key of ['items', 'correlation', 'eigenvalues', 'conditionNumber', 'collinearity', 'kmo', 'bartlett', 'parallelAnalysis', 'scales', 'recommendations', 'afterCut', 'outcomeModel', 'warnings']) {
      expect(result, key).toHaveProperty(key);
    }
    expect(result.outcomeModel.outcome).toBe('overall_sat');
    // fixtures/demo/README.md, "What is planted": every planted structure is one proposed cluster.
    const clusters = result.recommendations.map((r: { cluster: string[] }) => [...r.cluster].sort().join('+'));
    for (const planted of ['coll_2+coll_7', 'space_1+space_6', 'dig_1+dig_4+dig_7', 'staff_2+staff_6', 'events_3+events_3b']) expect(clusters).toContain(planted);
    for (const recommendation of result.recommendations) {
      expect(typeof recommendation.reason).toBe('string');
      expect(recommendation.reason.length).toBeGreaterThan(20);
      expect(recommendation.stability).toBeGreaterThanOrEqual(0);
      expect(recommendation.stability).toBeLessThanOrEqual(1);
    }
    expect(result.afterCut.itemsRemoved).toBeGreaterThan(0);
    expect(rawText).not.toMatch(/NaN|Infinity/);
    expect(result.warnings.map((w: { code: string }) => w.code)).not.toContain('non-finite-value');
  });

  it('stores timings and the resolved settings', () => {
    for (const stage of ['loadingMs', 'evidenceMs', 'structureMs', 'engineMs', 'outcomeMs', 'savingMs', 'runMs', 'queuedMs', 'totalMs']) {
      expect(answer.audit.timings[stage], stage).toBeGreaterThanOrEqual(0);
    }
    // The demo study's settings: minutesPerItem 0.15 (src/lib/server/demo-seed.ts) → 9 seconds per item.
    expect(answer.audit.settings).toMatchObject({ ...settings, secondsPerItem: 9, strongPairThreshold: 0.8, locked: [] });
    // One stored shape, echoed unchanged in the audit JSON (docs/decisions/006), key order included.
    expect(JSON.stringify(answer.result.settings)).toBe(JSON.stringify(answer.audit.settings));
  });

  it('reuses the stored result for the same resolved settings, whatever their spelling', async () => {
    const again = await clients.designer.post(`/api/waves/${waveId}/audits`, { settings });
    expect(again.status).toBe(200);
    expect(await body(again)).toMatchObject({ reused: true, audit: { id: auditId, status: 'done' } });
    // Defaults spelt out and keys reordered resolve to the same settings.
    const spelt = await clients.owner.post(`/api/waves/${waveId}/audits`, {
      settings: { outcome: 'overall_sat', seed: 7, strongPairThreshold: 0.8, missing: 'pairwise', bootstrap: 200, locked: [], method: 'pearson', secondsPerItem: 9 },
    });
    expect(spelt.status).toBe(200);
    expect((await body(spelt)).audit.id).toBe(auditId);
    // A different seed is a different audit.
    const other = await clients.designer.post(`/api/waves/${waveId}/audits`, { settings: { ...settings, seed: 8, bootstrap: 0 } });
    expect(other.status).toBe(202);
    expect((await body(other)).audit.id).not.toBe(auditId);
  });

  it('serves the audit JSON as a download', async () => {
    const response = await clients.reviewer.get(`/api/audits/${auditId}?download=1`);
    expect(response.status).toBe(200);
    expect(response.headers.get('content-disposition')).toMatch(/^attachment; filename="paredown-audit-pilot-1-.+\.json"$/);
    const downloaded = await response.json();
    expect(downloaded).toEqual(answer.result);
  });

  it('lets every member read it (aggregates only) and keeps it from the other team', async () => {
    for (const caller of ['owner', 'field', 'reviewer'] as const) {
      const response = await clients[caller].get(`/api/audits/${auditId}`);
      expect(response.status, caller).toBe(200);
      expect((await body(response)).result.schema).toBe(AUDIT_SCHEMA);
    }
    const outsider = await clients.outsider.get(`/api/audits/${auditId}`);
    expect(outsider.status).toBe(404);
    expect((await body(outsider)).error.code).toBe('audit-not-found');
  });

  it('is listed with its status on the study and on the wave', async () => {
    const study = await body(await clients.reviewer.get(`/api/studies/${demo.study}`));
    expect(study.study.audits.find((a: { id: string }) => a.id === auditId)).toMatchObject({ status: 'done', waveId });
    const wave = await body(await clients.field.get(`/api/waves/${waveId}/audits`));
    expect(wave.audits.find((a: { id: string }) => a.id === auditId)).toMatchObject({ status: 'done', percent: 100 });
    expect(wave.wave.outcomes).toEqual([{ id: 'overall_sat', header: 'overall_sat' }]);
    expect(wave.wave.items).toHaveLength(41);
    expect(wave.wave.defaults).toMatchObject({ method: 'pearson', bootstrap: 200, secondsPerItem: 9 });
  });

  it('refuses a download before the audit is done', async () => {
    const started = await clients.designer.post(`/api/waves/${waveId}/audits`, { settings: { method: 'polychoric', bootstrap: 40, seed: uniqueSeed() } });
    expect(started.status).toBe(202);
    const id = (await body(started)).audit.id;
    const early = await clients.designer.get(`/api/audits/${id}?download=1`);
    // Polychoric with 40 resamples takes seconds: the first request finds it unfinished.
    expect(early.status).toBe(409);
    expect((await body(early)).error.code).toBe('audit-not-done');
    expect((await settle(clients.designer, id)).audit.status).toBe('done');
  });
});

describe('refusals', () => {
  const post = (settings: unknown, client = clients.designer) => client.post(`/api/waves/${waveId}/audits`, { settings });

  it('answers 400 with a message naming the setting', async () => {
    const cases: [unknown, string, RegExp][] = [
      [{ method: 'kendall' }, 'invalid-body', /method/],
      [{ strongPairThreshold: 2 }, 'invalid-body', /strongPairThreshold/],
      // One sentence from the settings table (src/lib/audit/settings-table.ts), as the command line says it.
      [{ strongPairThreshold: 0 }, 'invalid-body', /^settings: strongPairThreshold must be a number above 0 and at most 1, got 0\.$/],
      [{ bootstrp: 10 }, 'invalid-body', /^settings: "bootstrp" is not an audit setting; did you mean "bootstrap"\?$/],
      [{ strongPairThresold: 0.3 }, 'invalid-body', /^settings: "strongPairThresold" is not an audit setting; did you mean "strongPairThreshold"\?$/],
      [{ seed: 1.5 }, 'invalid-body', /^settings: seed must be a whole number from -2147483648 to 2147483647, got 1\.5\.$/],
      [{ bootstrap: -1 }, 'invalid-body', /bootstrap/],
      [{ bootstrap: 1.5 }, 'invalid-body', /bootstrap/],
      [{ locked: ['no_such_item'] }, 'unknown-locked-item', /no_such_item/],
      [{ outcome: 'no_such_outcome' }, 'unknown-outcome', /no_such_outcome.*overall_sat/],
      ['pearson', 'invalid-body', /settings/],
    ];
    for (const [settings, code, message] of cases) {
      const response = await post(settings);
      expect(response.status, JSON.stringify(settings)).toBe(400);
      const { error } = await body(response);
      expect(error.code, JSON.stringify(settings)).toBe(code);
      expect(error.message, JSON.stringify(settings)).toMatch(message);
    }
    const broken = await clients.designer.call('POST', `/api/waves/${waveId}/audits`, { raw: '{"settings": ' });
    expect(broken.status).toBe(400);
  });

  it('answers 409 for a wave whose setup is not confirmed', async () => {
    // A proposed wave of the demo study, written straight into the test database (the upload
    // route is another piece of work; what matters here is the status).
    const sqlite = new Database(inject('databasePath'));
    sqlite.pragma('busy_timeout = 5000');
    const fileHash = (sqlite.prepare('select file_hash from waves where id = ?').get(waveId) as { file_hash: string }).file_hash;
    const proposedId = `wave-proposed-${Date.now()}`;
    sqlite.prepare("insert into waves (id, study_id, label, file_hash, format, status) values (?, ?, 'Proposed pilot', ?, 'csv', 'proposed')").run(proposedId, demo.study, fileHash);
    try {
      const response = await clients.designer.post(`/api/waves/${proposedId}/audits`, { settings: {} });
      expect(response.status).toBe(409);
      const { error } = await body(response);
      expect(error.code).toBe('wave-not-confirmed');
      expect(error.message).toMatch(/Proposed pilot.*not confirmed/);
    } finally {
      sqlite.prepare('delete from waves where id = ?').run(proposedId);
      sqlite.close();
    }
  });

  it('answers 404 for a wave that does not exist, and 403 for roles that may not run audits', async () => {
    const missing = await clients.designer.post('/api/waves/no-such-wave/audits', { settings: {} });
    expect(missing.status).toBe(404);
    expect((await body(missing)).error.code).toBe('wave-not-found');
    for (const caller of ['field', 'reviewer'] as const) {
      const response = await post({ seed: uniqueSeed() }, clients[caller]);
      expect(response.status, caller).toBe(403);
      expect((await body(response)).error.message).toContain('run:audit');
    }
  });
});

describe('failures', () => {
  it('stores an audit that throws as failed, with its reason, and can retry it', async () => {
    const started = await clients.designer.post(`/api/waves/${waveId}/audits`, { settings: { testFault: 'throw', bootstrap: 0, seed: uniqueSeed() } });
    expect(started.status).toBe(202);
    const id = (await body(started)).audit.id;
    const failed = await settle(clients.designer, id);
    expect(failed.audit.status).toBe('failed');
    expect(failed.audit.error).toMatch(/injected test fault made the audit throw/);
    expect(failed.audit.finishedAt).not.toBeNull();
    expect(failed.result).toBeNull();

    const refusedDownload = await clients.designer.get(`/api/audits/${id}?download=1`);
    expect(refusedDownload.status).toBe(409);

    const retried = await clients.owner.post(`/api/audits/${id}/retry`);
    expect(retried.status).toBe(202);
    expect((await body(retried)).audit).toMatchObject({ id, error: null });
    expect((await settle(clients.designer, id)).audit.status).toBe('failed');

    // The same settings again: the failed audit is queued again rather than duplicated.
    const again = await clients.designer.post(`/api/waves/${waveId}/audits`, { settings: (await body(await clients.designer.get(`/api/audits/${id}`))).audit.settings });
    expect(again.status).toBe(202);
    expect((await body(again)).audit.id).toBe(id);
    await settle(clients.designer, id);
  });

  it('stores an audit whose worker thread dies as failed, and the pool keeps working', async () => {
    const started = await clients.designer.post(`/api/waves/${waveId}/audits`, { settings: { testFault: 'crash', bootstrap: 0, seed: uniqueSeed() } });
    const id = (await body(started)).audit.id;
    const failed = await settle(clients.designer, id);
    expect(failed.audit.status).toBe('failed');
    expect(failed.audit.error).toMatch(/worker stopped unexpectedly \(exit code 70\)/);

    const next = await clients.designer.post(`/api/waves/${waveId}/audits`, { settings: { bootstrap: 0, seed: uniqueSeed() } });
    expect(next.status).toBe(202);
    expect((await settle(clients.designer, (await body(next)).audit.id)).audit.status).toBe('done');
  });

  it('refuses to retry an audit that did not fail', async () => {
    const started = await clients.designer.post(`/api/waves/${waveId}/audits`, { settings: { bootstrap: 0, seed: uniqueSeed() } });
    const id = (await body(started)).audit.id;
    await settle(clients.designer, id);
    const response = await clients.designer.post(`/api/audits/${id}/retry`);
    expect(response.status).toBe(409);
    expect((await body(response)).error.code).toBe('audit-not-failed');
  });
});
