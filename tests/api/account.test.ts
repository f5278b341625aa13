/** The account: password changes end older sessions; personal API tokens act as their owner. */
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import { body, Client, createMember, demo, demoEmails, signedIn, signInSucceeded } from '../setup/http';

describe('password', () => {
  it('changes, ends the old session, and works for the next sign-in', async () => {
    const owner = await signedIn(demoEmails.owner);
    const member = await createMember(owner, demo.team, 'designer');
    const otherSession = await signedIn(member.email, 'a-long-test-password');

    const wrong = await member.client.put('/api/me/password', { currentPassword: 'not-it', newPassword: 'the-new-password' });
    expect(wrong.status).toBe(400);
    expect((await body(wrong)).error.code).toBe('wrong-password');
    const changed = await member.client.put('/api/me/password', { currentPassword: 'a-long-test-password', newPassword: 'the-new-password' });
    expect(changed.status).toBe(200);

    expect((await otherSession.get('/api/me')).status).toBe(401);
    expect(signInSucceeded(await new Client().signIn(member.email, 'a-long-test-password'))).toBe(false);
    expect(signInSucceeded(await new Client().signIn(member.email, 'the-new-password'))).toBe(true);
    expect((await owner.delete(`/api/teams/${demo.team}/members/${member.userId}`)).status).toBe(204);
  });
});

describe('personal API tokens', () => {
  it('are shown once, stored hashed, act as their owner, and stop working when revoked', async () => {
    const designer = await signedIn(demoEmails.designer);
    const created = await designer.post('/api/tokens', { name: 'export script' });
    expect(created.status).toBe(201);
    const { token, secret } = await body(created);
    expect(secret).toMatch(/^pd_[A-Za-z0-9_-]{43}$/);
    expect(token.prefix).toBe(secret.slice(0, 10));

    const listed = await body(await designer.get('/api/tokens'));
    expect(JSON.stringify(listed)).not.toContain(secret);
    const database = new Database(inject('databasePath'), { readonly: true });
    const stored = database.prepare('select token_hash from api_tokens where id = ?').get(token.id) as { token_hash: string };
    database.close();
    expect(stored.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(stored.token_hash).not.toContain(secret.slice(3));

    const script = new Client();
    script.bearer = secret;
    const me = await body(await script.get('/api/me'));
    expect(me).toMatchObject({ user: { email: demoEmails.designer }, authenticatedBy: 'token' });
    expect(me.teams).toEqual([expect.objectContaining({ id: demo.team, role: 'designer' })]);
    expect((await script.get(`/api/studies/${demo.study}`)).status).toBe(200);
    expect((await script.get(`/api/studies/${demo.outsideStudy}`)).status).toBe(404);

    expect((await designer.delete(`/api/tokens/${token.id}`)).status).toBe(204);
    expect((await script.get('/api/me')).status).toBe(401);
    expect((await designer.delete(`/api/tokens/${token.id}`)).status).toBe(404);
  });
});

describe('activity log', () => {
  it('records the writes of a study with who did them', async () => {
    const designer = await signedIn(demoEmails.designer);
    const created = await body(await designer.post('/api/studies', { teamId: demo.team, name: 'Logged study' }));
    const owner = await signedIn(demoEmails.owner);
    expect((await owner.delete(`/api/studies/${created.study.id}`)).status).toBe(204);
    const database = new Database(inject('databasePath'), { readonly: true });
    const entries = database
      .prepare('select action, user_id as userId from activity_log where study_id = ? order by id')
      .all(created.study.id);
    database.close();
    expect(entries).toEqual([
      { action: 'study.created', userId: 'user-designer' },
      { action: 'study.deleted', userId: 'user-owner' },
    ]);
  });
});
