/** Joining a team by invitation: the e-mail in the outbox, a new account, the invited role. */
import { describe, expect, it } from 'vitest';
import { body, Client, demo, demoEmails, inviteAndReadToken, signedIn, signInSucceeded, uniqueEmail } from '../setup/http';

describe('invitations', () => {
  it('takes a new person from the e-mail in the outbox to an account with the invited role', async () => {
    const owner = await signedIn(demoEmails.owner);
    const email = uniqueEmail('newcomer');
    const created = await owner.post(`/api/teams/${demo.team}/invitations`, { email, role: 'field_manager' });
    expect(created.status).toBe(201);
    expect((await body(created)).invitation).toMatchObject({ email, role: 'field_manager' });

    const { mails } = await body(await owner.get('/api/outbox'));
    const mail = mails.find((m: { to: string }) => m.to === email);
    expect(mail.subject).toContain('Riverbend Libraries Research');
    const link = /(http:\/\/\S+\/invite\/[A-Za-z0-9_-]+)/.exec(mail.text)![1];
    const token = link.split('/invite/')[1];

    const page = await new Client().get(new URL(link).pathname);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('Join Riverbend Libraries Research');

    const accepted = await new Client().post(`/api/invitations/${token}/accept`, { name: 'Noor Haddad', password: 'newcomer-password' });
    expect(accepted.status).toBe(201);
    expect(await body(accepted)).toMatchObject({ team: { id: demo.team }, role: 'field_manager' });

    const newcomer = new Client();
    expect(signInSucceeded(await newcomer.signIn(email, 'newcomer-password'))).toBe(true);
    const me = await body(await newcomer.get('/api/me'));
    expect(me.user).toMatchObject({ email, name: 'Noor Haddad' });
    expect(me.teams).toEqual([expect.objectContaining({ id: demo.team, role: 'field_manager' })]);
    expect(me.teams[0].permissions).toContain('mark:programmed');
    expect(me.teams[0].permissions).not.toContain('decide:item');

    // A used link cannot be used again.
    const again = await new Client().post(`/api/invitations/${token}/accept`, { name: 'Someone', password: 'another-password' });
    expect(again.status).toBe(409);
    expect((await body(again)).error.code).toBe('invitation-accepted');

    // The member list shows the newcomer with the role; the activity is the owner's to see.
    const members = await body(await owner.get(`/api/teams/${demo.team}/members`));
    expect(members.members).toContainEqual(expect.objectContaining({ email, role: 'field_manager' }));
    const removed = await owner.delete(`/api/teams/${demo.team}/members/${me.user.id}`);
    expect(removed.status).toBe(204);
  });

  it('lets an existing user accept after signing in, into a second team', async () => {
    const outsiderOwner = await signedIn(demoEmails.outsider);
    const token = await inviteAndReadToken(outsiderOwner, demo.outsideTeam, demoEmails.reviewer, 'client_reviewer');
    const anonymous = await new Client().post(`/api/invitations/${token}/accept`, { name: 'X', password: 'whatever-password' });
    expect(anonymous.status).toBe(409);
    expect((await body(anonymous)).error.code).toBe('account-exists');

    const reviewer = await signedIn(demoEmails.reviewer);
    const accepted = await reviewer.post(`/api/invitations/${token}/accept`);
    expect(accepted.status).toBe(201);
    const me = await body(await reviewer.get('/api/me'));
    expect(me.teams.map((t: { id: string; role: string }) => [t.id, t.role]).sort()).toEqual(
      [
        [demo.outsideTeam, 'client_reviewer'],
        [demo.team, 'client_reviewer'],
      ].sort(),
    );
    // A role change takes effect at once, on the very next request.
    const promoted = await outsiderOwner.put(`/api/teams/${demo.outsideTeam}/members/user-reviewer`, { role: 'designer' });
    expect(promoted.status).toBe(200);
    const after = await body(await reviewer.get('/api/me'));
    expect(after.teams.find((t: { id: string }) => t.id === demo.outsideTeam).role).toBe('designer');
    expect((await outsiderOwner.delete(`/api/teams/${demo.outsideTeam}/members/user-reviewer`)).status).toBe(204);
  });

  it('keeps at least one owner', async () => {
    const owner = await signedIn(demoEmails.outsider);
    const demoted = await owner.put(`/api/teams/${demo.outsideTeam}/members/user-outsider`, { role: 'designer' });
    expect(demoted.status).toBe(409);
    expect((await body(demoted)).error.code).toBe('last-owner');
    const removed = await owner.delete(`/api/teams/${demo.outsideTeam}/members/user-outsider`);
    expect(removed.status).toBe(409);
  });

  it('refuses a bad invitation body with 400 and the error shape', async () => {
    const owner = await signedIn(demoEmails.owner);
    const badRole = await owner.post(`/api/teams/${demo.team}/invitations`, { email: uniqueEmail('x'), role: 'admin' });
    expect(badRole.status).toBe(400);
    expect((await body(badRole)).error.code).toBe('invalid-body');
    const broken = await owner.call('POST', `/api/teams/${demo.team}/invitations`, { raw: '{"email": ' });
    expect(broken.status).toBe(400);
    expect((await body(broken)).error.code).toBe('bad-json');
  });
});
