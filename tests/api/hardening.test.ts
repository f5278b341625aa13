/**
 * Issue 16 (hardening), against the built server: the sign-in limit under its four tricks (a
 * forwarded address without a trusted proxy, a JSON body, repeated `email` fields, a success
 * clearing other people's failures), capped bodies in front of Auth.js and readJson, the redirect
 * after sign-in, respondent ids in wave warnings, sign-out and password change ending sessions,
 * the 500s a client could cause (TRACE, unknown Auth.js actions, an unwritable upload folder), an
 * audit with nothing to compute, and the small ones (HSTS, 415, wording).
 *
 * The limits are the configured defaults (src/lib/server/config.ts): 5 failures per e-mail and 30
 * per client address in 15 minutes, unless a test's own server sets others.
 */
import Database from 'better-sqlite3';
import { rmSync, writeFileSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { connect } from 'node:net';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { useOwnServer } from '../setup/own-server';
import { body, Client, createMember, demo, demoEmails, demoPassword, inviteAndReadToken, signedIn, signInSucceeded, uniqueEmail } from '../setup/http';
import { createStudy, postWave, textFile } from './waves-http';

/** A CSRF token and its cookie for a client, as the sign-in form fetches them. */
async function csrf(client: Client): Promise<string> {
  return (await body<{ csrfToken: string }>(await client.get('/api/auth/csrf'))).csrfToken;
}

/** Posts a raw body to the credentials callback with the client's cookies. */
async function postCredentials(client: Client, contentType: string, payload: string, headers: Record<string, string> = {}): Promise<Response> {
  return fetch(`${client.base}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: {
      'content-type': contentType,
      origin: client.base,
      cookie: [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; '),
      ...headers,
    },
    body: payload,
  });
}

/** Sends a body in 256 KiB chunks without Content-Length until the server answers (at most `most` bytes). */
function streamUntilAnswered(url: URL, headers: Record<string, string>, most: number): Promise<{ status: number; text: string; sent: number }> {
  const chunk = Buffer.alloc(256 * 1024, 0x61);
  return new Promise((resolve, reject) => {
    let sent = 0;
    let done = false;
    const request = httpRequest(url, { method: 'POST', headers: { ...headers, 'transfer-encoding': 'chunked' } });
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
    const pump = () => {
      while (!done && sent < most) {
        sent += chunk.byteLength;
        if (!request.write(chunk)) {
          request.once('drain', pump);
          return;
        }
      }
      if (!done) request.end();
    };
    pump();
  });
}

describe('the sign-in limit (finding 1)', () => {
  it('counts a JSON body to the credentials callback per e-mail, like a form', async () => {
    const email = uniqueEmail('json');
    const client = new Client();
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 5; attempt++) {
      const token = await csrf(client);
      const response = await postCredentials(client, 'application/json', JSON.stringify({ email, password: `wrong-${attempt}`, csrfToken: token, callbackUrl: `${client.base}/` }), {
        'x-forwarded-for': `10.16.1.${attempt + 1}`,
      });
      statuses.push(response.status);
    }
    // Auth.js answers a failed JSON sign-in with a redirect to the error page, like a form.
    expect(statuses).toEqual([302, 302, 302, 302, 302]);
    // The sixth attempt, as a form from yet another address: the e-mail has its 5 failures.
    expect((await client.signIn(email, 'wrong', { 'x-forwarded-for': '10.16.1.99' })).status).toBe(429);
  });

  it('reads repeated email fields the way Auth.js does (the last one)', async () => {
    const target = uniqueEmail('target');
    const client = new Client();
    for (let attempt = 0; attempt < 5; attempt++) {
      const token = await csrf(client);
      const form = `email=${encodeURIComponent(uniqueEmail('decoy'))}&email=${encodeURIComponent(target)}&password=wrong-${attempt}&csrfToken=${token}`;
      await postCredentials(client, 'application/x-www-form-urlencoded', form, { 'x-forwarded-for': `10.16.2.${attempt + 1}` });
    }
    // Auth.js checked the target's password five times: that address is now limited.
    expect((await client.signIn(target, 'wrong', { 'x-forwarded-for': '10.16.2.99' })).status).toBe(429);
  });

  it('lets a success clear only its own e-mail address, never failures recorded without one', async () => {
    const address = { 'x-forwarded-for': '10.16.3.1' };
    // 30 failures without an e-mail field from one address: its per-address limit (30) is reached.
    for (let attempt = 0; attempt < 30; attempt++) {
      const client = new Client();
      const token = await csrf(client);
      const response = await postCredentials(client, 'application/x-www-form-urlencoded', `password=wrong&csrfToken=${token}`, address);
      expect(response.status).toBe(302);
    }
    // A correct sign-in by someone else, as JSON, from another address.
    const owner = new Client();
    const token = await csrf(owner);
    const good = await postCredentials(owner, 'application/json', JSON.stringify({ email: demoEmails.owner, password: demoPassword, csrfToken: token, callbackUrl: `${owner.base}/` }), {
      'x-forwarded-for': '10.16.3.2',
    });
    expect(signInSucceeded(good)).toBe(true);
    // The first address is still limited.
    expect((await new Client().signIn(uniqueEmail('after'), 'wrong', address)).status).toBe(429);
  });
});

describe('a server without a trusted proxy (TRUST_PROXY=0, https PUBLIC_URL)', () => {
  const server = useOwnServer({
    seed: false,
    logName: 'hardening-no-proxy.log',
    environment: { TRUST_PROXY: '0', SIGNIN_MAX_FAILURES_PER_ADDRESS: '3', PUBLIC_URL: 'https://paredown.example' },
  });

  it('counts failures against the real client address, whatever X-Forwarded-For says', async () => {
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 4; attempt++) {
      const client = new Client(server.baseUrl);
      const token = await csrf(client);
      const form = new URLSearchParams({ email: uniqueEmail('spoof'), password: 'wrong', csrfToken: token }).toString();
      statuses.push((await postCredentials(client, 'application/x-www-form-urlencoded', form, { 'x-forwarded-for': `10.16.4.${attempt + 1}` })).status);
    }
    // SIGNIN_MAX_FAILURES_PER_ADDRESS=3 (this server's environment): the fourth is refused.
    expect(statuses).toEqual([302, 302, 302, 429]);
  });

  it('sends Strict-Transport-Security when PUBLIC_URL is https', async () => {
    const response = await fetch(`${server.baseUrl}/api/health`);
    expect(response.headers.get('strict-transport-security')).toBe('max-age=31536000');
  });
});

describe('bounded bodies (finding 2)', () => {
  it('refuses a credentials callback body past 64 KiB with 413 before Auth.js reads it', async () => {
    const client = new Client();
    const token = await csrf(client);
    const form = `email=${encodeURIComponent(uniqueEmail('big'))}&password=wrong&csrfToken=${token}&padding=${'a'.repeat(300 * 1024)}`;
    const response = await postCredentials(client, 'application/x-www-form-urlencoded', form);
    expect(response.status).toBe(413);
    expect((await body(response)).error.code).toBe('body-too-large');
  });

  it('stops reading a chunked body to the credentials callback at the cap', async () => {
    const answer = await streamUntilAnswered(new URL('/api/auth/callback/credentials', inject('baseUrl')), {
      'content-type': 'application/x-www-form-urlencoded',
      origin: inject('baseUrl'),
    }, 64 * 1024 * 1024);
    expect(answer.status).toBe(413);
    // The cap is 64 KiB (src/middleware.ts maxAuthBodyBytes); the answer comes long before 64 MiB.
    expect(answer.sent).toBeLessThan(16 * 1024 * 1024);
  });

  it('stops reading a chunked JSON body of an anonymous route at 1 MiB', async () => {
    const answer = await streamUntilAnswered(new URL('/api/invitations/no-such-token/accept', inject('baseUrl')), {
      'content-type': 'application/json',
      origin: inject('baseUrl'),
    }, 64 * 1024 * 1024);
    expect(answer.status).toBe(413);
    expect(JSON.parse(answer.text).error.message).toContain('1 MiB');
    // readJson's cap is 1 MiB (src/lib/server/endpoint.ts maxJsonBytes).
    expect(answer.sent).toBeLessThan(16 * 1024 * 1024);
  });
});

describe('the address after signing in (finding 3)', () => {
  it('never offers another site as the next page', async () => {
    for (const next of ['/%09/evil.test', '/%5Cevil.test', '//evil.test', '/%0A/evil.test', '/%2509/evil.test', 'https://evil.test/', '/\\/evil.test']) {
      const response = await new Client().get(`/signin?next=${next}`);
      expect(response.status).toBe(200);
      expect(await response.text()).not.toContain('evil.test');
    }
  });

  it('sends a signed-in visitor to a same-origin path whatever next holds, never a 500', async () => {
    const client = await signedIn(demoEmails.reviewer);
    for (const next of ['%0Afoo', '%0D', '%00', '%E2%80%A8', '/%09/evil.test']) {
      const response = await client.get(`/signin?next=${next}`);
      expect(response.status).toBe(303);
      expect(response.headers.get('location')).toBe('/');
    }
  });

  it('signs in with the right password whatever callbackUrl holds, and redirects on this site only', async () => {
    for (const callbackUrl of ['/\n', '/a\r\nSet-Cookie: x=1', '/\u0000', '/\u2028', '/\t/evil.test', '/\\evil.test', 'https://evil.test/x', '//evil.test']) {
      const client = new Client();
      const token = await csrf(client);
      const form = new URLSearchParams({ email: demoEmails.reviewer, password: demoPassword, csrfToken: token, callbackUrl }).toString();
      const response = await postCredentials(client, 'application/x-www-form-urlencoded', form, { 'x-forwarded-for': '10.16.5.1' });
      expect(response.status).toBe(302);
      const location = new URL(response.headers.get('location')!, client.base);
      expect(location.origin).toBe(client.base);
      expect(location.pathname.startsWith('//')).toBe(false);
      expect(location.searchParams.has('error')).toBe(false);
    }
  });
});

describe('what a reviewer sees of a wave (finding 4)', () => {
  it('gives the duplicate-respondent-id warning as a count only', async () => {
    const designer = await signedIn(demoEmails.designer);
    const reviewer = await signedIn(demoEmails.reviewer);
    const studyId = await createStudy(designer, demo.team, 'Duplicate ids');
    const tag = Date.now().toString(36);
    const rows = ['respondent_id,Q1,Q2,Q3'];
    for (let i = 0; i < 12; i++) rows.push(`${i < 2 ? `dup-${tag}` : `r-${tag}-${i}`},${(i % 5) + 1},${((i * 2) % 5) + 1},${((i * 3) % 5) + 1}`);
    const uploaded = await postWave(designer, studyId, textFile(`ids-${tag}.csv`, rows.join('\n') + '\n'));
    expect(uploaded.status).toBe(201);
    const proposed = await body(uploaded);
    const waveId = proposed.wave.id;
    // The proposer does not take a column with repeated values for the id; the designer says it is.
    const columns = proposed.setup.map((column: { column: string }) => (column.column === 'respondent_id' ? { ...column, role: 'respondent-id' } : column));
    const confirmed = await designer.put(`/api/waves/${waveId}/setup`, { setup: { columns }, exclusions: [] });
    expect(confirmed.status).toBe(200);
    const asDesigner = await body(await designer.get(`/api/waves/${waveId}`));
    const designerWarning = asDesigner.warnings.find((w: { code: string }) => w.code === 'duplicate-respondent-id');
    expect(designerWarning.message).toContain(`dup-${tag}`);
    const asReviewer = await reviewer.get(`/api/waves/${waveId}`);
    const text = await asReviewer.text();
    expect(text).not.toContain(`dup-${tag}`);
    expect(text).not.toContain(`r-${tag}`);
    const warning = JSON.parse(text).warnings.find((w: { code: string }) => w.code === 'duplicate-respondent-id');
    // One id (dup-…) appears twice in the CSV above.
    expect(warning.message).toBe('1 respondent id appears more than once; check for doubled rows.');
  });
});

describe('sessions end on the server (finding 8)', () => {
  it('stops a copied session cookie from working after sign-out', async () => {
    const member = await createMember(await signedIn(demoEmails.owner), demo.team, 'client_reviewer');
    const copy = new Client();
    for (const [name, value] of member.client.cookies) copy.cookies.set(name, value);
    expect((await copy.get('/api/me')).status).toBe(200);
    const out = await member.client.call('POST', '/api/auth/signout', { form: { csrfToken: await csrf(member.client) } });
    expect(out.status).toBe(302);
    expect((await copy.get('/api/me')).status).toBe(401);
    // Signing in again works.
    expect((await signedIn(member.email, 'a-long-test-password').then((c) => c.get('/api/me'))).status).toBe(200);
  });

  it('revokes the API tokens on a password change when asked', async () => {
    const member = await createMember(await signedIn(demoEmails.owner), demo.team, 'designer');
    const secrets: string[] = [];
    for (const name of ['script one', 'script two']) secrets.push((await body(await member.client.post('/api/tokens', { name }))).secret);
    const script = new Client();
    script.bearer = secrets[0];
    expect((await script.get('/api/me')).status).toBe(200);
    const kept = await member.client.put('/api/me/password', { currentPassword: 'a-long-test-password', newPassword: 'second-long-password' });
    expect(await body(kept)).toEqual({ changed: true, signInAgain: true, tokensRevoked: 0 });
    expect((await script.get('/api/me')).status).toBe(200);
    const again = await signedIn(member.email, 'second-long-password');
    const revoked = await again.put('/api/me/password', { currentPassword: 'second-long-password', newPassword: 'third-long-password', revokeTokens: true });
    expect(await body(revoked)).toEqual({ changed: true, signInAgain: true, tokensRevoked: 2 });
    expect((await script.get('/api/me')).status).toBe(401);
    expect((await again.get('/api/me')).status).toBe(401);
  });
});

describe('no 500 a client can cause (finding 9)', () => {
  it('answers TRACE and methods no route takes with 405', async () => {
    // (TRACK never gets this far: Node's HTTP parser refuses it; see the next test.)
    for (const method of ['TRACE', 'PROPFIND', 'PURGE']) {
      const answer = await new Promise<{ status: number; text: string; allow: string | undefined }>((resolve, reject) => {
        const request = httpRequest(new URL('/api/health', inject('baseUrl')), { method }, (response) => {
          let text = '';
          response.on('data', (part) => (text += part));
          response.on('end', () => resolve({ status: response.statusCode ?? 0, text, allow: response.headers.allow as string | undefined }));
        });
        request.on('error', reject);
        request.end();
      });
      expect(answer.status).toBe(405);
      expect(JSON.parse(answer.text).error.code).toBe('method-not-allowed');
      expect(answer.allow).toContain('GET');
    }
  });

  it("answers a request Node's parser refuses in the API's error shape: 501 for an unknown method, 431, 400", async () => {
    // Node answered these itself with a bare status line and no body, before any of our code.
    const cases: [string, number, string, string][] = [
      ['FOO /api/health HTTP/1.1\r\nHost: x\r\n\r\n', 501, 'unknown-method', 'the method FOO'],
      ['TRACK / HTTP/1.1\r\nHost: x\r\n\r\n', 501, 'unknown-method', 'the method TRACK'],
      [`GET / HTTP/1.1\r\nHost: x\r\nX-Big: ${'a'.repeat(20_000)}\r\n\r\n`, 431, 'headers-too-large', 'too large'],
      ['GET / HTTP/1.1\r\nHost: x\r\nNo colon here\r\n\r\n', 400, 'bad-request', 'could not be read'],
    ];
    const { hostname, port } = new URL(inject('baseUrl'));
    for (const [raw, status, code, words] of cases) {
      const answer = await new Promise<string>((resolve, reject) => {
        const socket = connect(Number(port), hostname, () => socket.end(raw));
        let text = '';
        socket.setEncoding('latin1');
        socket.on('data', (part) => (text += part));
        socket.on('end', () => resolve(text));
        socket.on('error', reject);
      });
      const [head, payload] = answer.split('\r\n\r\n');
      expect(head.split('\r\n')[0], raw.slice(0, 12)).toMatch(new RegExp(`^HTTP/1\\.1 ${status} [A-Z]`));
      expect(head).toMatch(/^Content-Type: application\/json/m);
      expect(head).toMatch(/^X-Content-Type-Options: nosniff$/m);
      const { error } = JSON.parse(payload);
      expect(error.code).toBe(code);
      expect(error.message).toContain(words);
    }
  });

  it("answers an address with a malformed percent-encoding with 400 in the API's error shape", async () => {
    // Found by the API sweep: the adapter's own check answered a plain-text "Bad request.".
    for (const path of ['/api/studies/%ZZ', '/api/me?x=%', '/api/audits/%E0%A4%A/what-if']) {
      const answer = await new Promise<{ status: number; text: string; type: string | undefined; nosniff: string | undefined }>((resolve, reject) => {
        const request = httpRequest(new URL(inject('baseUrl')), { method: 'GET', path }, (response) => {
          let text = '';
          response.on('data', (part) => (text += part));
          response.on('end', () =>
            resolve({ status: response.statusCode ?? 0, text, type: response.headers['content-type'], nosniff: response.headers['x-content-type-options'] as string | undefined }),
          );
        });
        request.on('error', reject);
        request.end();
      });
      expect(answer.status, path).toBe(400);
      expect(answer.type).toMatch(/^application\/json/);
      expect(answer.nosniff).toBe('nosniff');
      const { error } = JSON.parse(answer.text);
      expect(error.code).toBe('malformed-address');
      expect(error.message).toContain('%25');
    }
  });

  it("answers a method an API route does not export with 405 in the API's error shape, naming the route's methods", async () => {
    // Found by the API sweep: Astro answered these with its HTML not-found page.
    const owner = await signedIn(demoEmails.owner);
    const cases: [string, string, string][] = [
      ['POST', '/api/health', 'GET, HEAD'],
      ['DELETE', '/api/me', 'GET, HEAD'],
      ['GET', '/api/me/password', 'PUT'],
      ['PUT', `/api/studies/${demo.study}`, 'GET, HEAD, PATCH, DELETE'],
      ['OPTIONS', `/api/audits/no-such-audit/what-if`, 'POST'],
      ['GET', `/api/teams/${demo.team}/members/no-such-user`, 'PUT, DELETE'],
      ['POST', `/api/studies/${demo.study}/cut-list/coll_1`, 'PUT'],
    ];
    for (const [method, path, allow] of cases) {
      const response = await owner.call(method, path, { json: method === 'GET' || method === 'OPTIONS' ? undefined : {} });
      expect(response.status, `${method} ${path}`).toBe(405);
      expect(response.headers.get('allow')).toBe(allow);
      const { error } = await body(response);
      expect(error.code).toBe('method-not-allowed');
      expect(error.message).toBe(`${path} does not answer ${method} requests; it answers ${allow}.`);
    }
    // An unknown path is still a 404, and a page path still the HTML page.
    expect((await owner.call('POST', '/api/no/such/route', { json: {} })).status).toBe(404);
    expect((await owner.get('/no-such-page')).headers.get('content-type')).toMatch(/text\/html/);
  });

  it('answers an unknown Auth.js action with 404 and other methods with 405', async () => {
    const client = new Client();
    for (const path of ['/api/auth/nosuch', '/api/auth/csrf/extra', '/api/auth/callback/credentials/x', '/api/auth']) {
      const response = await client.get(path);
      expect(response.status).toBe(404);
      expect((await body(response)).error.code).toBe('no-such-route');
    }
    expect((await client.call('PUT', '/api/auth/session', { json: {} })).status).toBe(405);
  });

  describe('with an unwritable upload folder', () => {
    const server = useOwnServer({ seed: true, logName: 'hardening-storage.log' });

    it('answers an upload with 503 naming storage, and health notices', async () => {
      const designer = new Client(server.baseUrl);
      expect(signInSucceeded(await designer.signIn(demoEmails.designer, demoPassword))).toBe(true);
      const studyId = await createStudy(designer, demo.team, 'Storage fault');
      // A file where the upload folder should be: nothing can be written under it.
      rmSync(server.uploadDir, { recursive: true, force: true });
      writeFileSync(server.uploadDir, 'not a folder');
      const health = await fetch(`${server.baseUrl}/api/health`);
      expect(health.status).toBe(503);
      expect(await body(health)).toEqual(expect.objectContaining({ status: 'degraded', storage: 'not-writable' }));
      const rows = ['respondent_id,Q1,Q2,Q3'];
      for (let i = 0; i < 12; i++) rows.push(`s${i},${(i % 5) + 1},${((i * 2) % 5) + 1},${((i * 3) % 5) + 1}`);
      const response = await postWave(designer, studyId, textFile('storage.csv', rows.join('\n') + '\n'));
      expect(response.status).toBe(503);
      const error = (await body(response)).error;
      expect(error.code).toBe('storage-unavailable');
      expect(error.message).toMatch(/storage/);
    });
  });
});

describe('an audit with nothing to compute (finding 10)', () => {
  it('is refused with 422 and one sentence when every item is constant', async () => {
    const designer = await signedIn(demoEmails.designer);
    const studyId = await createStudy(designer, demo.team, 'Constant items');
    const tag = Date.now().toString(36);
    const rows = ['respondent_id,Q1,Q2,Q3'];
    for (let i = 0; i < 12; i++) rows.push(`c-${tag}-${i},3,4,2`);
    const uploaded = await postWave(designer, studyId, textFile(`constant-${tag}.csv`, rows.join('\n') + '\n'));
    expect(uploaded.status).toBe(201);
    const wave = await body(uploaded);
    const confirmed = await designer.put(`/api/waves/${wave.wave.id}/setup`, { setup: { columns: wave.setup }, exclusions: [] });
    expect(confirmed.status).toBe(200);
    const started = await designer.post(`/api/waves/${wave.wave.id}/audits`, { settings: {} });
    expect(started.status).toBe(422);
    const error = (await body(started)).error;
    expect(error.code).toBe('nothing-to-compute');
    expect(error.message).toBe('No item has two different answers among the 12 respondents in the audit, so there is nothing to compare; check the column setup and the exclusions.');
  });
});

describe('small findings (11)', () => {
  it('refuses a JSON route body sent with another content type with 415', async () => {
    const owner = await signedIn(demoEmails.owner);
    const response = await owner.call('POST', '/api/studies', { headers: { 'content-type': 'text/plain' }, raw: undefined, json: undefined, form: undefined });
    // No body at all is `{}` (and then a 400 for the missing name); a body in text/plain is 415.
    expect(response.status).toBe(400);
    const typed = await fetch(`${owner.base}/api/studies`, {
      method: 'POST',
      headers: { 'content-type': 'text/plain', origin: owner.base, cookie: [...owner.cookies].map(([k, v]) => `${k}=${v}`).join('; ') },
      body: JSON.stringify({ teamId: demo.team, name: 'Sent as text' }),
    });
    expect(typed.status).toBe(415);
    expect((await body(typed)).error.code).toBe('unsupported-media-type');
  });

  it('says an invitation "has expired"', async () => {
    const owner = await signedIn(demoEmails.owner);
    const email = uniqueEmail('late');
    const token = await inviteAndReadToken(owner, demo.team, email, 'client_reviewer');
    const db = new Database(inject('databasePath'));
    try {
      db.pragma('busy_timeout = 5000');
      db.prepare('update invitations set expires_at = ? where email = ?').run(Date.now() - 60_000, email.toLowerCase());
    } finally {
      db.close();
    }
    const response = await new Client().post(`/api/invitations/${token}/accept`, { name: 'Late', password: 'a-long-test-password' });
    expect(response.status).toBe(409);
    expect((await body(response)).error.message).toBe('This invitation has expired; ask the team owner for a new one.');
  });
});
