/**
 * Runs the permission table (tests/api/permission-table.ts) against the built server, and checks
 * what the one guard (src/lib/server/guard.ts) answers for each kind of object.
 */
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { body, Client, demo, demoEmails, signedIn } from '../setup/http';
import { anAudit, callers, clients, createdStudies, demoWave, expectedStatus, insertedAudits, outsideStudies, outsideWave, table } from './permission-table';

beforeAll(async () => {
  for (const caller of ['owner', 'designer', 'field', 'reviewer', 'outsider'] as const) {
    clients[caller] = await signedIn(demoEmails[caller]);
  }
  const created = await clients.designer.post('/api/tokens', { name: 'permission test (designer)' });
  const token = new Client();
  token.bearer = (await body(created)).secret;
  clients.token = token;
  // A second token of the designer's, revoked before the table runs.
  const doomed = await body(await clients.designer.post('/api/tokens', { name: 'permission test (revoked)' }));
  const revoked = new Client();
  revoked.bearer = doomed.secret;
  expect((await revoked.get('/api/me')).status).toBe(200);
  expect((await clients.designer.delete(`/api/tokens/${doomed.token.id}`)).status).toBe(204);
  clients.revoked = revoked;
  clients.anonymous = new Client();
});

/** Leaves the demo as the seed made it, for the other test files (the browser test's screenshots). */
afterAll(async () => {
  const db = new Database(inject('databasePath'), { fileMustExist: true });
  try {
    db.pragma('busy_timeout = 5000');
    for (const id of insertedAudits) db.prepare('DELETE FROM audits WHERE id = ?').run(id);
  } finally {
    db.close();
  }
  for (const id of createdStudies) await clients.owner.delete(`/api/studies/${id}`);
  for (const id of outsideStudies) await clients.outsider.delete(`/api/studies/${id}`);
  for (const [client, teamId] of [[clients.owner, demo.team], [clients.outsider, demo.outsideTeam]] as const) {
    const studies = await body(await client.get('/api/studies'));
    for (const study of studies.studies) {
      if (study.name === 'Permission test study') await client.delete(`/api/studies/${study.id}`);
    }
    const team = await body(await client.get(`/api/teams/${teamId}/members`));
    for (const member of team.members) {
      if (member.email.endsWith('@example.org')) await client.delete(`/api/teams/${teamId}/members/${member.userId}`);
    }
    for (const invitation of team.invitations) await client.delete(`/api/teams/${teamId}/invitations/${invitation.id}`);
  }
  for (const caller of ['owner', 'designer', 'field', 'reviewer', 'outsider'] as const) {
    const mine = await body(await clients[caller].get('/api/tokens'));
    for (const token of mine.tokens) await clients[caller].delete(`/api/tokens/${token.id}`);
  }
});

describe('permission table', () => {
  for (const row of table) {
    it(`${row.method} ${row.name}`, async () => {
      const outcomes: Record<string, number> = {};
      const wanted: Record<string, number> = {};
      let target = '';
      for (const caller of callers) {
        // The revoked token is sent to the valid token's target: it must be refused before the
        // target is looked at (were it served, the used-up target would answer 404 or 409, not 401).
        if (row.prepare && caller !== 'revoked') target = await row.prepare();
        const response = await clients[caller].call(row.method, row.path(target), { json: row.body?.(target) });
        outcomes[caller] = response.status;
        wanted[caller] = expectedStatus(row, caller);
        if (response.status >= 400 && response.headers.get('content-type')?.includes('application/json')) {
          const error = (await body(response)).error;
          expect(error, `${caller}: error shape`).toMatchObject({ code: expect.any(String), message: expect.any(String) });
        }
      }
      expect(outcomes).toEqual(wanted);
      // Rows that prepare a target per caller (an audit made to fail, a member invited) take longer on a busy machine.
    }, row.prepare ? 180_000 : undefined);
  }

  it('names the missing permission in a 403', async () => {
    const response = await clients.reviewer.delete(`/api/studies/${demo.study}`);
    expect(response.status).toBe(403);
    const { error } = await body(response);
    expect(error.code).toBe('missing-permission');
    expect(error.message).toContain('delete:study');
  });

  it('answers 404 with the kind of object named, the same for another team\'s object as for none', async () => {
    // The one guard (src/lib/server/guard.ts), kind by kind: the outsider asks for the demo team's
    // object and for one that does not exist; both answers must be identical (api.md: never
    // reveal that it exists).
    const kinds: { kind: string; code: string; theirs: string; none: string }[] = [
      { kind: 'team', code: 'team-not-found', theirs: `/api/teams/${demo.team}/members`, none: '/api/teams/no-such-team/members' },
      { kind: 'study', code: 'study-not-found', theirs: `/api/studies/${demo.study}`, none: '/api/studies/no-such-study' },
      { kind: 'wave', code: 'wave-not-found', theirs: `/api/waves/${demoWave}`, none: '/api/waves/no-such-wave' },
      { kind: 'audit', code: 'audit-not-found', theirs: `/api/audits/${await anAudit()}`, none: '/api/audits/no-such-audit' },
    ];
    for (const { kind, code, theirs, none } of kinds) {
      const [a, b] = [await clients.outsider.get(theirs), await clients.outsider.get(none)];
      expect([a.status, b.status], kind).toEqual([404, 404]);
      const [bodyA, bodyB] = [await body(a), await body(b)];
      expect(bodyA.error.code, kind).toBe(code);
      expect(bodyA, kind).toEqual(bodyB);
    }
    // And the other way round: the demo owner asking for the outsider's wave.
    const theirWave = await clients.owner.get(`/api/waves/${await outsideWave()}`);
    expect((await body(theirWave)).error.code).toBe('wave-not-found');
  });

  it('names the missing permission in a 403 for every kind of object', async () => {
    const refusals: { kind: string; response: Promise<Response>; permission: string }[] = [
      { kind: 'team', response: clients.designer.get(`/api/teams/${demo.team}/invitations`), permission: 'manage:team' },
      { kind: 'study', response: clients.field.delete(`/api/studies/${demo.study}`), permission: 'delete:study' },
      { kind: 'wave', response: clients.reviewer.get(`/api/waves/${demoWave}/respondents`), permission: 'read:respondents' },
      { kind: 'audit', response: clients.field.post(`/api/audits/${await anAudit()}/retry`), permission: 'run:audit' },
    ];
    for (const { kind, response, permission } of refusals) {
      const answer = await response;
      expect(answer.status, kind).toBe(403);
      const { error } = await body(answer);
      expect(error.code, kind).toBe('missing-permission');
      expect(error.message, kind).toContain(permission);
    }
  });

  it('answers 401 before looking the object up, for every kind', async () => {
    for (const path of [`/api/teams/${demo.team}/members`, '/api/studies/no-such-study', '/api/waves/no-such-wave', '/api/audits/no-such-audit']) {
      const answer = await clients.anonymous.get(path);
      expect(answer.status, path).toBe(401);
    }
  });

  it('refuses a write without our Origin when it carries cookies, but not a bearer-token write', async () => {
    const crossSite = await clients.owner.call('POST', '/api/studies', { json: { teamId: demo.team, name: 'x' }, noOrigin: true });
    expect(crossSite.status).toBe(403);
    expect((await body(crossSite)).error.code).toBe('cross-site-request');
    const script = await clients.token.call('POST', '/api/studies', { json: { teamId: demo.team, name: 'Permission test study' }, noOrigin: true });
    expect(script.status).toBe(201);
  });

  it('answers a method a route does not have, and an oversized body, without a 500', async () => {
    const patch = await clients.owner.call('PATCH', '/api/studies', { json: {} });
    expect(patch.status).toBeGreaterThanOrEqual(400);
    expect(patch.status).toBeLessThan(500);
    const huge = await clients.owner.post('/api/studies', { teamId: demo.team, name: 'x', description: 'y'.repeat(1_100_000) });
    expect(huge.status).toBe(413);
    expect((await body(huge)).error.code).toBe('body-too-large');
  });

  it('answers 401 for a revoked or unknown token, saying why, on routes and pages that need no sign-in too', async () => {
    const unknown = new Client();
    unknown.bearer = 'pd_not-a-real-token';
    const notParedown = new Client();
    notParedown.bearer = 'not-even-our-prefix';
    for (const [client, path] of [[unknown, '/api/me'], [clients.revoked, '/api/me'], [clients.revoked, '/api/health'], [clients.revoked, '/signin'], [notParedown, '/']] as const) {
      const response = await client.get(path);
      expect(response.status, path).toBe(401);
      // RFC 6750 §3: the challenge names the scheme and the error.
      expect(response.headers.get('www-authenticate'), path).toBe('Bearer error="invalid_token"');
      const { error } = await body(response);
      expect(error.code, path).toBe('token-not-recognised');
      expect(error.message, path).toMatch(/token .*revoked/i);
    }
  });
});
