/**
 * The permission table, route by route (tests/api/permissions.test.ts runs it): every route that
 * exists is called as each demo role, as the other team's owner, as the designer through a
 * personal API token, through a token the designer has revoked, and anonymously, and each status
 * is checked. ADD A ROW HERE FOR EVERY NEW
 * ROUTE AND METHOD (DEVELOPERS.md, "Add a route"): tests/api/route-inventory.test.ts fails,
 * naming the route, while a file under src/pages/api/ exports a method that no row calls.
 *
 * Expected statuses follow api.md: 401 not signed in, 403 signed in but the role may not,
 * 404 not in one of your teams, and src/lib/permissions.ts for who may do what.
 */
import Database from 'better-sqlite3';
import { inject } from 'vitest';
import { body, type Client, createMember, demo, inviteAndReadToken, uniqueEmail } from '../setup/http';
import { postWave, textFile } from './waves-http';

export type Caller = 'owner' | 'designer' | 'field' | 'reviewer' | 'outsider' | 'token' | 'revoked' | 'anonymous';
export const callers: Caller[] = ['owner', 'designer', 'field', 'reviewer', 'outsider', 'token', 'revoked', 'anonymous'];

/** Expected status per caller; `token` defaults to the designer's, `revoked` to 401 (see {@link expectedStatus}). */
export type Expectation = Partial<Record<Caller, number>> & Record<Exclude<Caller, 'token' | 'revoked'>, number>;

export interface Row {
  name: string;
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** The path, given what `prepare` made for this caller. */
  path: (target: string) => string;
  body?: (target: string) => unknown;
  /** Makes a fresh target (an id or token) for each caller, for routes that consume or change it. */
  prepare?: () => Promise<string>;
  expect: Expectation;
}

/**
 * The status a caller should get from a row. A token sent but not accepted (revoked, or of a
 * deleted account) is answered 401 on every route and page, public ones included, never served
 * as if anonymous (RFC 6750 §3.1, `invalid_token`; docs/decisions/015-schema-backups.md).
 * @param row the row.
 * @param caller who calls.
 * @returns the expected HTTP status.
 */
export function expectedStatus(row: Row, caller: Caller): number {
  return row.expect[caller] ?? (caller === 'revoked' ? 401 : row.expect.designer);
}

/** Filled by the permission test's beforeAll (signed-in clients, a token, an anonymous one). */
export const clients = {} as Record<Caller, Client>;
export const createdStudies: string[] = [];
export const outsideStudies: string[] = [];

/** Shortcuts for common shapes of expectation. */
const anyoneSignedIn = (status: number): Expectation => ({ owner: status, designer: status, field: status, reviewer: status, outsider: status, anonymous: 401 });
const demoTeamMembers = (status: number): Expectation => ({ owner: status, designer: status, field: status, reviewer: status, outsider: 404, anonymous: 401 });
const onlyOwner = (status: number): Expectation => ({ owner: status, designer: 403, field: 403, reviewer: 403, outsider: 404, anonymous: 401 });
const pageForMembers: Expectation = { owner: 200, designer: 200, field: 200, reviewer: 200, outsider: 404, anonymous: 303 };
const pageForAnyone: Expectation = { owner: 200, designer: 200, field: 200, reviewer: 200, outsider: 200, anonymous: 303 };

const freshStudy = async () => {
  const response = await clients.owner.post('/api/studies', { teamId: demo.team, name: 'Permission test study' });
  const { study } = await body(response);
  createdStudies.push(study.id);
  return study.id as string;
};
const freshOutsideStudy = async () => {
  const response = await clients.outsider.post('/api/studies', { teamId: demo.outsideTeam, name: 'Permission test study' });
  const { study } = await body(response);
  outsideStudies.push(study.id);
  return study.id as string;
};
const freshMember = async () => {
  const member = await createMember(clients.owner, demo.team, 'client_reviewer');
  return member.userId;
};
const freshInvitationId = async () => {
  const response = await clients.owner.post(`/api/teams/${demo.team}/invitations`, { email: uniqueEmail('withdrawn'), role: 'designer' });
  return (await body(response)).invitation.id as string;
};
const freshInvitationToken = () => inviteAndReadToken(clients.owner, demo.team, uniqueEmail('invitee'), 'client_reviewer');
const freshOwnerToken = async () => {
  const response = await clients.owner.post('/api/tokens', { name: 'permission test' });
  return (await body(response)).token.id as string;
};

/** The seeded, confirmed wave of the demo study (src/lib/server/demo-seed.ts). */
export const demoWave = 'wave-riverbend-pilot-1';
let outsideWaveId: string | null = null;
/** A proposed wave in a fresh study of the other team (made once). */
export const outsideWave = async () => {
  if (outsideWaveId) return outsideWaveId;
  const studyId = await freshOutsideStudy();
  const response = await postWave(clients.outsider, studyId, textFile('transport.csv', 'respondent_id,T1,T2,T3\nn1,1,2,3\nn2,2,3,4\nn3,4,4,5\nn4,5,3,2\n'));
  outsideWaveId = (await body(response)).wave.id as string;
  return outsideWaveId;
};

// Audits (issue 5), of the demo wave.
let auditSeeds = 0;
/**
 * A seed no other call used, so that each caller starts a new audit (the same settings are
 * reused). Fixed, not from the clock: the test server's database is new on every run
 * (tests/setup/app-server.ts), so a counter in a range of this file's own is unique and a failure
 * replays with the same seeds (audits.test.ts counts from 100_001, the browser test uses 50_000).
 */
const freshAuditSeed = async () => String(9_000_000 + (auditSeeds += 1));
let sharedAuditId: string | null = null;
export const anAudit = async () => {
  sharedAuditId ??= (await body(await clients.owner.post(`/api/waves/${demoWave}/audits`, { settings: { bootstrap: 0, seed: 4_242 } }))).audit.id as string;
  return sharedAuditId;
};
/** The shared audit, once it is done. */
const aDoneAudit = async () => {
  const id = await anAudit();
  for (let attempt = 0; attempt < 600 && (await body(await clients.owner.get(`/api/audits/${id}`))).audit.status !== 'done'; attempt++) {
    await new Promise((r) => setTimeout(r, 100));
  }
  return id;
};
/** A new audit made to fail (test servers accept `testFault`), once it has failed. */
const freshFailedAudit = async () => {
  const started = await clients.owner.post(`/api/waves/${demoWave}/audits`, { settings: { bootstrap: 0, seed: Number(await freshAuditSeed()), testFault: 'throw' } });
  const id = (await body(started)).audit.id as string;
  for (let attempt = 0; attempt < 600; attempt++) {
    if ((await body(await clients.owner.get(`/api/audits/${id}`))).audit.status === 'failed') return id;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`audit ${id} did not fail`);
};
const runAudit: Expectation = { owner: 202, designer: 202, field: 403, reviewer: 403, outsider: 404, anonymous: 401 };
/** Audit rows written by `freshQueuedAudit`, removed by the permission test's afterAll. */
export const insertedAudits: string[] = [];
/**
 * A queued audit of the demo wave, written straight into the database (the seeded audit's
 * settings, a hash of its own): who may cancel is the guard's answer and the status decides the
 * rest, so no worker need be held by a real audit for each caller. Cancel answers the same for a
 * queued row the pool does not hold (tests/api/audits-cancel.test.ts cancels real ones).
 */
const freshQueuedAudit = async () => {
  const id = `permission-cancel-${insertedAudits.length + 1}`;
  const db = new Database(inject('databasePath'), { fileMustExist: true });
  try {
    db.pragma('busy_timeout = 5000');
    const { settings } = db.prepare('SELECT settings FROM audits WHERE id = ?').get(demoAudit) as { settings: string };
    db.prepare("INSERT INTO audits (id, wave_id, settings, settings_hash, status, progress) VALUES (?, ?, ?, ?, 'queued', 0)").run(id, demoWave, settings, `hash-${id}`);
  } finally {
    db.close();
  }
  insertedAudits.push(id);
  return id;
};
const cancelAudit: Expectation = { owner: 200, designer: 200, field: 403, reviewer: 403, outsider: 404, anonymous: 401 };

// Decisions, what-if and study settings (issue 10).
/** The demo's seeded, finished audit (src/lib/server/demo-audit.ts). */
const demoAudit = 'audit-riverbend-pilot-1';
const designerOnly = (status: number): Expectation => ({ owner: status, designer: status, field: 403, reviewer: 403, outsider: 404, anonymous: 401 });
// The handoff (issue 11): a fresh study of the demo team with one published version (written
// straight into the database: publishing itself needs every item decided, tested in handoff.test.ts).
const freshStudyWithVersion = async () => {
  const id = await freshStudy();
  const db = new Database(inject('databasePath'), { fileMustExist: true });
  try {
    db.prepare('INSERT INTO cut_list_versions (id, study_id, number, items, published_at) VALUES (?, ?, 1, ?, ?)').run(
      `permission-version-${id}`,
      id,
      JSON.stringify([{ itemId: 'q1', decision: 'keep', into: null, reason: 'Stays.', wording: null, position: 1 }]),
      Date.now(),
    );
  } finally {
    db.close();
  }
  return id;
};
const handoffWrite = (allowed: ('owner' | 'designer' | 'field' | 'reviewer')[], status: number): Expectation => ({
  owner: allowed.includes('owner') ? status : 403,
  designer: allowed.includes('designer') ? status : 403,
  field: allowed.includes('field') ? status : 403,
  reviewer: allowed.includes('reviewer') ? status : 403,
  outsider: 404,
  anonymous: 401,
});
const otherTeams = (outsider: number): Expectation => ({ owner: 404, designer: 404, field: 404, reviewer: 404, outsider, anonymous: 401 });
/** A fresh demo-team study holding one uploaded wave whose setup is not confirmed. */
const freshProposedWave = async () => {
  const studyId = await freshStudy();
  const response = await postWave(clients.owner, studyId, textFile('proposed.csv', 'respondent_id,A1,A2,A3\nr1,1,2,3\nr2,2,3,4\nr3,4,4,5\nr4,5,3,2\n'));
  return (await body(response)).wave.id as string;
};


export const table: Row[] = [
  // Health and the caller
  { name: 'health', method: 'GET', path: () => '/api/health', expect: { owner: 200, designer: 200, field: 200, reviewer: 200, outsider: 200, anonymous: 200 } },
  { name: 'me', method: 'GET', path: () => '/api/me', expect: anyoneSignedIn(200) },
  {
    name: 'change password (wrong present password: nothing changes)',
    method: 'PUT',
    path: () => '/api/me/password',
    body: () => ({ currentPassword: 'not-the-password', newPassword: 'another-long-password' }),
    expect: { ...anyoneSignedIn(400), token: 403 },
  },
  // Studies
  { name: 'list studies', method: 'GET', path: () => '/api/studies', expect: anyoneSignedIn(200) },
  {
    name: 'create study in the demo team',
    method: 'POST',
    path: () => '/api/studies',
    body: () => ({ teamId: demo.team, name: 'Permission test study' }),
    expect: { owner: 201, designer: 201, field: 403, reviewer: 403, outsider: 404, anonymous: 401 },
  },
  { name: 'read the demo study', method: 'GET', path: () => `/api/studies/${demo.study}`, expect: demoTeamMembers(200) },
  {
    name: "read the other team's study",
    method: 'GET',
    path: () => `/api/studies/${demo.outsideStudy}`,
    expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 200, anonymous: 401 },
  },
  { name: 'read a study that does not exist', method: 'GET', path: () => '/api/studies/no-such-study', expect: anyoneSignedIn(404) },
  { name: 'delete a study', method: 'DELETE', path: (id) => `/api/studies/${id}`, prepare: freshStudy, expect: onlyOwner(204) },
  {
    name: "delete a study of the other team",
    method: 'DELETE',
    path: (id) => `/api/studies/${id}`,
    prepare: freshOutsideStudy,
    expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 204, anonymous: 401 },
  },
  // Waves (multipart uploads by every role, and what each role reads, are tested in tests/api/waves.test.ts)
  {
    name: 'upload a wave (a JSON body: the guard answers first, then 400 not-multipart)',
    method: 'POST',
    path: () => `/api/studies/${demo.study}/waves`,
    expect: { owner: 400, designer: 400, field: 403, reviewer: 403, outsider: 404, anonymous: 401 },
  },
  {
    name: "upload a wave to the other team's study",
    method: 'POST',
    path: () => `/api/studies/${demo.outsideStudy}/waves`,
    expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 400, anonymous: 401 },
  },
  { name: 'read the demo wave', method: 'GET', path: () => `/api/waves/${demoWave}`, expect: demoTeamMembers(200) },
  { name: 'read a wave that does not exist', method: 'GET', path: () => '/api/waves/no-such-wave', expect: anyoneSignedIn(404) },
  {
    name: "read the other team's wave",
    method: 'GET',
    path: (id) => `/api/waves/${id}`,
    prepare: outsideWave,
    expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 200, anonymous: 401 },
  },
  {
    name: 'check the setup of the demo wave (dry run: nothing stored)',
    method: 'PUT',
    path: () => `/api/waves/${demoWave}/setup`,
    body: () => ({ exclusions: [], dryRun: true }),
    expect: { owner: 200, designer: 200, field: 403, reviewer: 403, outsider: 404, anonymous: 401 },
  },
  {
    name: "confirm the other team's wave",
    method: 'PUT',
    path: (id) => `/api/waves/${id}/setup`,
    prepare: outsideWave,
    body: () => ({ exclusions: [], dryRun: true }),
    expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 400, anonymous: 401 },
  },
  {
    name: 'respondent-level rows of the demo wave',
    method: 'GET',
    path: () => `/api/waves/${demoWave}/respondents`,
    expect: { owner: 200, designer: 200, field: 403, reviewer: 403, outsider: 404, anonymous: 401 },
  },
  {
    name: "respondent-level rows of the other team's wave",
    method: 'GET',
    path: (id) => `/api/waves/${id}/respondents`,
    prepare: outsideWave,
    expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 409, anonymous: 401 },
  },
  // Audits
  {
    name: 'start an audit of the demo wave',
    method: 'POST',
    path: () => `/api/waves/${demoWave}/audits`,
    body: (seed) => ({ settings: { bootstrap: 0, seed: Number(seed) } }),
    prepare: freshAuditSeed,
    expect: runAudit,
  },
  { name: 'start an audit of a wave that does not exist', method: 'POST', path: () => '/api/waves/no-such-wave/audits', body: () => ({ settings: {} }), expect: anyoneSignedIn(404) },
  {
    name: "start an audit of the other team's (proposed) wave",
    method: 'POST',
    path: (id) => `/api/waves/${id}/audits`,
    prepare: outsideWave,
    body: () => ({ settings: {} }),
    expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 409, anonymous: 401 },
  },
  { name: 'list the audits of the demo wave', method: 'GET', path: () => `/api/waves/${demoWave}/audits`, expect: demoTeamMembers(200) },
  {
    name: "list the audits of the other team's wave",
    method: 'GET',
    path: (id) => `/api/waves/${id}/audits`,
    prepare: outsideWave,
    expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 200, anonymous: 401 },
  },
  { name: 'read an audit', method: 'GET', path: (id) => `/api/audits/${id}`, prepare: anAudit, expect: demoTeamMembers(200) },
  { name: 'download an audit', method: 'GET', path: (id) => `/api/audits/${id}?download=1`, prepare: aDoneAudit, expect: demoTeamMembers(200) },
  { name: "an audit's driver model", method: 'GET', path: (id) => `/api/audits/${id}/driver-model`, prepare: aDoneAudit, expect: demoTeamMembers(200) },
  { name: "read an audit's overlap map", method: 'GET', path: (id) => `/api/audits/${id}/overlap-map`, prepare: aDoneAudit, expect: demoTeamMembers(200) },
  { name: 'read the overlap map of an audit that does not exist', method: 'GET', path: () => '/api/audits/no-such-audit/overlap-map', expect: anyoneSignedIn(404) },
  { name: "read a pair's crosstab", method: 'GET', path: (id) => `/api/audits/${id}/crosstab?a=coll_2&b=coll_7`, prepare: aDoneAudit, expect: demoTeamMembers(200) },
  { name: 'the memo of an audit as PDF', method: 'GET', path: (id) => `/api/audits/${id}/memo.pdf`, prepare: aDoneAudit, expect: demoTeamMembers(200) },
  { name: 'the memo of an audit as DOCX', method: 'GET', path: (id) => `/api/audits/${id}/memo.docx`, prepare: aDoneAudit, expect: demoTeamMembers(200) },
  { name: 'the memo of an audit that does not exist', method: 'GET', path: () => '/api/audits/no-such-audit/memo.pdf', expect: anyoneSignedIn(404) },
  { name: 'the decision history as CSV', method: 'GET', path: () => `/api/studies/${demo.study}/cut-list/history.csv`, expect: demoTeamMembers(200) },
  { name: "the other team's decision history as CSV", method: 'GET', path: () => `/api/studies/${demo.outsideStudy}/cut-list/history.csv`, expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 200, anonymous: 401 } },
  { name: 'read an audit that does not exist', method: 'GET', path: () => '/api/audits/no-such-audit', expect: anyoneSignedIn(404) },
  { name: 'retry a failed audit', method: 'POST', path: (id) => `/api/audits/${id}/retry`, prepare: freshFailedAudit, expect: runAudit },
  { name: 'cancel a queued audit', method: 'POST', path: (id) => `/api/audits/${id}/cancel`, prepare: freshQueuedAudit, expect: cancelAudit },
  // Team members and invitations
  { name: 'list members', method: 'GET', path: () => `/api/teams/${demo.team}/members`, expect: demoTeamMembers(200) },
  {
    name: 'change a member role',
    method: 'PUT',
    path: (userId) => `/api/teams/${demo.team}/members/${userId}`,
    body: () => ({ role: 'field_manager' }),
    prepare: freshMember,
    expect: onlyOwner(200),
  },
  { name: 'remove a member', method: 'DELETE', path: (userId) => `/api/teams/${demo.team}/members/${userId}`, prepare: freshMember, expect: onlyOwner(204) },
  {
    name: 'withdraw an invitation',
    method: 'DELETE',
    path: (id) => `/api/teams/${demo.team}/invitations/${id}`,
    prepare: freshInvitationId,
    expect: onlyOwner(204),
  },
  { name: 'list open invitations', method: 'GET', path: () => `/api/teams/${demo.team}/invitations`, expect: onlyOwner(200) },
  {
    name: 'invite by e-mail',
    method: 'POST',
    path: () => `/api/teams/${demo.team}/invitations`,
    body: () => ({ email: uniqueEmail('invited'), role: 'designer' }),
    expect: onlyOwner(201),
  },
  {
    name: 'accept an invitation meant for someone else',
    method: 'POST',
    path: (token) => `/api/invitations/${token}/accept`,
    body: () => ({ name: 'New Person', password: 'a-long-test-password' }),
    prepare: freshInvitationToken,
    expect: { owner: 403, designer: 403, field: 403, reviewer: 403, outsider: 403, anonymous: 201 },
  },
  { name: 'accept an unknown invitation', method: 'POST', path: () => '/api/invitations/not-a-token/accept', expect: { ...anyoneSignedIn(404), anonymous: 404 } },
  // Personal API tokens
  { name: 'list tokens', method: 'GET', path: () => '/api/tokens', expect: anyoneSignedIn(200) },
  { name: 'create a token', method: 'POST', path: () => '/api/tokens', body: () => ({ name: 'test' }), expect: { ...anyoneSignedIn(201), token: 403 } },
  {
    name: "revoke the owner's token",
    method: 'DELETE',
    path: (id) => `/api/tokens/${id}`,
    prepare: freshOwnerToken,
    expect: { owner: 204, designer: 404, field: 404, reviewer: 404, outsider: 404, anonymous: 401 },
  },
  // Mail kept in the outbox (MAIL_TRANSPORT=outbox in tests)
  { name: 'outbox', method: 'GET', path: () => '/api/outbox', expect: anyoneSignedIn(200) },
  // First run
  {
    name: 'setup after setup',
    method: 'POST',
    path: () => '/api/setup',
    body: () => ({ teamName: 'T', name: 'N', email: 'late@example.org', password: 'a-long-test-password' }),
    expect: { owner: 409, designer: 409, field: 409, reviewer: 409, outsider: 409, anonymous: 409 },
  },
  // Anything else under /api/
  { name: 'unknown API route', method: 'GET', path: () => '/api/no-such-thing', expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 404, anonymous: 404 } },
  // Auth.js's own routes
  { name: 'auth csrf', method: 'GET', path: () => '/api/auth/csrf', expect: { owner: 200, designer: 200, field: 200, reviewer: 200, outsider: 200, anonymous: 200 } },
  { name: 'auth session', method: 'GET', path: () => '/api/auth/session', expect: { owner: 200, designer: 200, field: 200, reviewer: 200, outsider: 200, anonymous: 200 } },
  // Pages
  { name: 'page: dashboard', method: 'GET', path: () => '/', expect: pageForAnyone },
  { name: 'page: demo study', method: 'GET', path: () => `/studies/${demo.study}`, expect: pageForMembers },
  { name: 'page: upload a wave', method: 'GET', path: () => `/studies/${demo.study}/upload`, expect: { owner: 200, designer: 200, field: 403, reviewer: 403, outsider: 404, anonymous: 303 } },
  { name: "page: other team's study", method: 'GET', path: () => `/studies/${demo.outsideStudy}`, expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 200, anonymous: 303 } },
  { name: 'page: an audit', method: 'GET', path: (id) => `/audits/${id}`, prepare: anAudit, expect: pageForMembers },
  { name: "page: an audit's memo", method: 'GET', path: (id) => `/audits/${id}/memo`, prepare: aDoneAudit, expect: pageForMembers },
  { name: 'page: demo team members', method: 'GET', path: () => `/teams/${demo.team}/members`, expect: pageForMembers },
  { name: 'page: account', method: 'GET', path: () => '/account', expect: pageForAnyone },
  { name: 'page: outbox', method: 'GET', path: () => '/outbox', expect: pageForAnyone },
  { name: 'page: sign-in', method: 'GET', path: () => '/signin', expect: { owner: 303, designer: 303, field: 303, reviewer: 303, outsider: 303, anonymous: 200 } },
  { name: 'page: setup after setup', method: 'GET', path: () => '/setup', expect: { owner: 303, designer: 303, field: 303, reviewer: 303, outsider: 303, anonymous: 303 } },
  { name: 'read the cut list', method: 'GET', path: () => `/api/studies/${demo.study}/cut-list`, expect: demoTeamMembers(200) },
  { name: "read another team's cut list", method: 'GET', path: () => `/api/studies/${demo.outsideStudy}/cut-list`, expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 200, anonymous: 401 } },
  // Setting an undecided item to undecided changes nothing, so the demo's history stays clean.
  { name: 'decide an item', method: 'PUT', path: () => `/api/studies/${demo.study}/cut-list/coll_1`, body: () => ({ decision: 'undecided' }), expect: designerOnly(200) },
  { name: "decide an item of another team's study", method: 'PUT', path: () => `/api/studies/${demo.outsideStudy}/cut-list/T1`, body: () => ({ decision: 'undecided' }), expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 404, anonymous: 401 } },
  // A bad index reaches validation (400) only past the guard.
  { name: 'accept a recommendation', method: 'POST', path: () => `/api/studies/${demo.study}/cut-list/accept`, body: () => ({ recommendation: -1 }), expect: designerOnly(400) },
  { name: 'what-if of an audit', method: 'POST', path: () => `/api/audits/${demoAudit}/what-if`, body: () => ({ removed: [] }), expect: demoTeamMembers(200) },
  { name: 'what-if of an audit that does not exist', method: 'POST', path: () => '/api/audits/no-such-audit/what-if', body: () => ({ removed: [] }), expect: anyoneSignedIn(404) },
  { name: 'change a study', method: 'PATCH', path: (id) => `/api/studies/${id}`, prepare: freshStudy, body: () => ({ description: 'Changed by the permission test' }), expect: designerOnly(200) },
  { name: "change another team's study", method: 'PATCH', path: () => `/api/studies/${demo.outsideStudy}`, body: () => ({ description: 'A short module on local buses and cycling, in planning. Invented.' }), expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 200, anonymous: 401 } },
  { name: 'discard an unconfirmed wave', method: 'DELETE', path: (id) => `/api/waves/${id}`, prepare: freshProposedWave, expect: designerOnly(204) },
  { name: 'discard a confirmed wave', method: 'DELETE', path: () => `/api/waves/${demoWave}`, expect: designerOnly(409) },
  { name: 'page: decisions of the demo study', method: 'GET', path: () => `/studies/${demo.study}/decisions`, expect: pageForMembers },
  { name: "page: decisions of another team's study", method: 'GET', path: () => `/studies/${demo.outsideStudy}/decisions`, expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 200, anonymous: 303 } },
  { name: 'page: invitation link that does not exist', method: 'GET', path: () => '/invite/not-a-token', expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 404, anonymous: 404 } },
  // The handoff (issue 11)
  {
    name: 'publish the cut list (the demo study has undecided items: 409 after the guard)',
    method: 'POST',
    path: () => `/api/studies/${demo.study}/cut-list/publish`,
    expect: handoffWrite(['owner', 'designer'], 409),
  },
  { name: "publish the other team's cut list", method: 'POST', path: () => `/api/studies/${demo.outsideStudy}/cut-list/publish`, expect: otherTeams(409) },
  { name: 'list published versions', method: 'GET', path: () => `/api/studies/${demo.study}/cut-list/versions`, expect: demoTeamMembers(200) },
  { name: "list the other team's versions", method: 'GET', path: () => `/api/studies/${demo.outsideStudy}/cut-list/versions`, expect: otherTeams(200) },
  { name: 'read a published version with its diff', method: 'GET', path: (id) => `/api/studies/${id}/cut-list/versions/1`, prepare: freshStudyWithVersion, expect: demoTeamMembers(200) },
  { name: 'export the published list as XLSX', method: 'GET', path: (id) => `/api/studies/${id}/cut-list.xlsx`, prepare: freshStudyWithVersion, expect: demoTeamMembers(200) },
  { name: 'export the published list as CSV', method: 'GET', path: (id) => `/api/studies/${id}/cut-list.csv`, prepare: freshStudyWithVersion, expect: demoTeamMembers(200) },
  { name: "export the other team's list (nothing published: 409 after the guard)", method: 'GET', path: () => `/api/studies/${demo.outsideStudy}/cut-list.csv`, expect: otherTeams(409) },
  {
    name: 'mark a version programmed',
    method: 'POST',
    path: (id) => `/api/studies/${id}/cut-list/programmed`,
    prepare: freshStudyWithVersion,
    expect: handoffWrite(['owner', 'field'], 200),
  },
  { name: "mark the other team's version programmed", method: 'POST', path: () => `/api/studies/${demo.outsideStudy}/cut-list/programmed`, expect: otherTeams(409) },
  { name: 'read the comments', method: 'GET', path: () => `/api/studies/${demo.study}/comments`, expect: demoTeamMembers(200) },
  {
    name: 'comment on a study',
    method: 'POST',
    path: (id) => `/api/studies/${id}/comments`,
    prepare: freshStudy,
    body: () => ({ body: 'A permission test comment.' }),
    expect: demoTeamMembers(201),
  },
  { name: "comment on the other team's study", method: 'POST', path: () => `/api/studies/${demo.outsideStudy}/comments`, body: () => ({ body: 'x' }), expect: otherTeams(201) },
  { name: 'read the review state', method: 'GET', path: () => `/api/studies/${demo.study}/review`, expect: demoTeamMembers(200) },
  {
    name: 'review the latest version',
    method: 'POST',
    path: (id) => `/api/studies/${id}/review`,
    prepare: freshStudyWithVersion,
    body: () => ({ verdict: 'approved' }),
    expect: handoffWrite(['owner', 'reviewer'], 201),
  },
  { name: "review the other team's study (nothing published: 409 after the guard)", method: 'POST', path: () => `/api/studies/${demo.outsideStudy}/review`, body: () => ({ verdict: 'approved' }), expect: otherTeams(409) },
  { name: "a study's activity", method: 'GET', path: () => `/api/studies/${demo.study}/activity`, expect: demoTeamMembers(200) },
  { name: "the other team's activity", method: 'GET', path: () => `/api/studies/${demo.outsideStudy}/activity`, expect: otherTeams(200) },
  { name: 'page: the list to program', method: 'GET', path: () => `/studies/${demo.study}/field-list`, expect: pageForMembers },
  { name: 'page: the review', method: 'GET', path: () => `/studies/${demo.study}/review`, expect: pageForMembers },
  { name: 'page: the activity', method: 'GET', path: () => `/studies/${demo.study}/activity`, expect: pageForMembers },
  { name: "page: the other team's list to program", method: 'GET', path: () => `/studies/${demo.outsideStudy}/field-list`, expect: { owner: 404, designer: 404, field: 404, reviewer: 404, outsider: 200, anonymous: 303 } },
];
