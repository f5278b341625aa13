/** Signing in and out, the session cookie, and the rate limit on failed attempts. */
import { describe, expect, it } from 'vitest';
import { body, Client, demoEmails, demoPassword, signedIn, signInSucceeded, uniqueEmail } from '../setup/http';

describe('sign-in', () => {
  it('signs in with the right password and sets an httpOnly, SameSite=Lax session cookie', async () => {
    const client = new Client();
    const response = await client.signIn(demoEmails.designer, demoPassword);
    expect(signInSucceeded(response)).toBe(true);
    const cookie = response.headers.getSetCookie().find((c) => c.startsWith('authjs.session-token='));
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const me = await body(await client.get('/api/me'));
    expect(me.user.email).toBe(demoEmails.designer);
    expect(me.teams).toEqual([expect.objectContaining({ id: 'team-riverbend', role: 'designer' })]);
  });

  it('accepts the e-mail address in any case', async () => {
    const client = new Client();
    expect(signInSucceeded(await client.signIn('Reviewer@Paredown.TEST', demoPassword))).toBe(true);
  });

  it('refuses a wrong password and an unknown address alike, saying nothing about which part was wrong', async () => {
    const wrongPassword = await new Client().signIn(demoEmails.field, 'not-the-password');
    const unknownAddress = await new Client().signIn(uniqueEmail('nobody'), demoPassword);
    for (const response of [wrongPassword, unknownAddress]) {
      expect(signInSucceeded(response)).toBe(false);
      expect(response.headers.getSetCookie().some((c) => c.startsWith('authjs.session-token=') && !/Max-Age=0/i.test(c))).toBe(false);
    }
    expect(new URL(wrongPassword.headers.get('location')!).search).toBe(new URL(unknownAddress.headers.get('location')!).search);
    const page = await (await new Client().get('/signin?error=CredentialsSignin')).text();
    expect(page).toContain('do not match an account');
    expect(page).not.toMatch(/unknown (user|e-mail)|wrong password/i);
  });

  it('signs out', async () => {
    const client = await signedIn(demoEmails.reviewer);
    const { csrfToken } = await body(await client.get('/api/auth/csrf'));
    const out = await client.call('POST', '/api/auth/signout', { form: { csrfToken } });
    expect(out.status).toBe(302);
    expect((await client.get('/api/me')).status).toBe(401);
  });

  it('rate-limits failed attempts per e-mail address with 429, even with the right password then', async () => {
    const email = uniqueEmail('target');
    const client = new Client();
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 6; attempt++) {
      statuses.push((await client.signIn(email, `wrong-${attempt}`, { 'x-forwarded-for': `10.1.0.${attempt + 1}` })).status);
    }
    expect(statuses).toEqual([302, 302, 302, 302, 302, 429]);
    const limited = await client.signIn(email, 'anything', { 'x-forwarded-for': '10.1.0.99' });
    expect(limited.status).toBe(429);
    expect(limited.headers.get('retry-after')).toMatch(/^\d+$/);
    expect((await body(limited)).error).toEqual({ code: 'too-many-attempts', message: expect.stringMatching(/too many/i) });
  });

  it('rate-limits failed attempts per client address across e-mail addresses', async () => {
    const address = { 'x-forwarded-for': '10.2.0.1' };
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 31; attempt++) {
      statuses.push((await new Client().signIn(uniqueEmail('spray'), 'wrong-password', address)).status);
    }
    expect(statuses.slice(0, 30).every((s) => s === 302)).toBe(true);
    expect(statuses[30]).toBe(429);
    // Another address is not affected, and a good password from it still works.
    const other = await new Client().signIn(demoEmails.owner, demoPassword, { 'x-forwarded-for': '10.2.0.2' });
    expect(signInSucceeded(other)).toBe(true);
  });

  it('answers a browser form post that is rate-limited with a readable page and 429', async () => {
    const email = uniqueEmail('form');
    const client = new Client();
    for (let attempt = 0; attempt < 5; attempt++) await client.signIn(email, 'wrong', { 'x-forwarded-for': '10.3.0.1' });
    const response = await client.signIn(email, 'wrong', { 'x-forwarded-for': '10.3.0.1', accept: 'text/html' });
    expect(response.status).toBe(429);
    expect(response.headers.get('content-type')).toContain('text/html');
    expect(await response.text()).toContain('Too many sign-in attempts');
  });

  it('sends the security headers', async () => {
    const page = await new Client().get('/signin');
    expect(page.headers.get('x-content-type-options')).toBe('nosniff');
    expect(page.headers.get('referrer-policy')).toBe('same-origin');
    const policy = page.headers.get('content-security-policy') ?? '';
    expect(policy).toContain("frame-ancestors 'none'");
    expect(policy).toMatch(/script-src 'self'( 'sha256-[^']+')+/);
    expect(policy).not.toContain('unsafe-inline');
    const api = await new Client().get('/api/health');
    expect(api.headers.get('content-security-policy')).toBe("default-src 'none'; frame-ancestors 'none'");
  });
});
