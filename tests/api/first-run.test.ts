/**
 * An empty database with demo seeding off: the first visit goes to /setup, which creates the
 * first owner and team once, and never again. Runs its own server (DEMO_SEED=0).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../setup/app-server';
import { body, Client, signInSucceeded } from '../setup/http';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer({ seed: false, logName: 'first-run-server.log' });
});

afterAll(async () => {
  await server?.stop();
});

describe('first run', () => {
  it('sends every page to /setup while nobody has an account', async () => {
    const visitor = new Client(server.baseUrl);
    for (const path of ['/', '/signin', '/account']) {
      const response = await visitor.get(path);
      expect(response.status).toBe(303);
      expect(response.headers.get('location')).toBe('/setup');
    }
    expect((await visitor.get('/setup')).status).toBe(200);
    expect((await visitor.get('/api/me')).status).toBe(401);
  });

  it('creates the first owner and team, signs in, and refuses a second setup', async () => {
    const visitor = new Client(server.baseUrl);
    const tooShort = await visitor.post('/api/setup', { teamName: 'Survey Methods Unit', name: 'Ana Pires', email: 'ana@example.org', password: 'short' });
    expect(tooShort.status).toBe(400);
    const created = await visitor.post('/api/setup', { teamName: 'Survey Methods Unit', name: 'Ana Pires', email: 'Ana@Example.org', password: 'a-long-enough-password' });
    expect(created.status).toBe(201);

    const owner = new Client(server.baseUrl);
    expect(signInSucceeded(await owner.signIn('ana@example.org', 'a-long-enough-password'))).toBe(true);
    const me = await body(await owner.get('/api/me'));
    expect(me.teams).toEqual([expect.objectContaining({ name: 'Survey Methods Unit', role: 'owner' })]);
    expect((await body(await owner.get('/api/studies'))).studies).toEqual([]);

    const again = await new Client(server.baseUrl).post('/api/setup', { teamName: 'Other', name: 'Eve', email: 'eve@example.org', password: 'a-long-enough-password' });
    expect(again.status).toBe(409);
    expect((await body(again)).error.code).toBe('already-set-up');
    const setupPage = await new Client(server.baseUrl).get('/setup');
    expect(setupPage.status).toBe(303);
    expect(setupPage.headers.get('location')).toBe('/signin');
  });
});
