/**
 * The typed client (src/lib/api) against the built server: each domain's calls reach a route
 * that exists, with the method it answers, and come back in the shapes the contracts name. The
 * browser's fetch is played by one that sends the relative path to the test server with a
 * signed-in Client's cookies and our Origin (as a page would).
 */
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { auditsApi } from '../../src/lib/api/audits';
import { meApi } from '../../src/lib/api/me';
import { outboxApi } from '../../src/lib/api/outbox';
import { setupApi } from '../../src/lib/api/setup';
import { studiesApi } from '../../src/lib/api/studies';
import { teamsApi } from '../../src/lib/api/teams';
import { tokensApi } from '../../src/lib/api/tokens';
import { wavesApi } from '../../src/lib/api/waves';
import { type Client, demo, demoEmails, signedIn } from '../setup/http';

/** The seeded, confirmed wave of the demo study (src/db/seed.ts). */
const demoWave = 'wave-riverbend-pilot-1';
const realFetch = globalThis.fetch;
let owner: Client;
let reviewer: Client;

/** Makes the typed client's fetch talk to the test server as `client`. */
function as(client: Client): void {
  vi.stubGlobal('fetch', (path: string, init: RequestInit = {}) => {
    const headers: Record<string, string> = { ...(init.headers as Record<string, string>), origin: client.base };
    if (client.cookies.size > 0) headers.cookie = [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
    return realFetch(client.base + path, { ...init, headers, redirect: 'manual' });
  });
}

beforeAll(async () => {
  owner = await signedIn(demoEmails.owner);
  reviewer = await signedIn(demoEmails.reviewer);
});

afterEach(() => {
  vi.unstubAllGlobals();
});

const created: string[] = [];
afterAll(async () => {
  for (const id of created) await owner.delete(`/api/studies/${id}`);
});

describe('typed client against the server', () => {
  it('creates, reads, lists and deletes a study', async () => {
    as(owner);
    const made = await studiesApi.create({ teamId: demo.team, name: 'Typed client study' });
    expect(made.ok && made.status).toBe(201);
    if (!made.ok) return;
    created.push(made.data.study.id);
    const read = await studiesApi.get(made.data.study.id);
    expect(read.ok && read.data.study.name).toBe('Typed client study');
    expect(read.ok && read.data.study.role).toBe('owner');
    const listed = await studiesApi.list();
    expect(listed.ok && listed.data.studies.some((s) => s.id === made.data.study.id)).toBe(true);
    const deleted = await studiesApi.delete(made.data.study.id);
    expect(deleted).toEqual({ ok: true, status: 204, data: null });
    created.pop();
  });

  it('reads the demo wave, its respondents and its audits', async () => {
    as(owner);
    const wave = await wavesApi.get(demoWave);
    expect(wave.ok && wave.data.wave.id).toBe(demoWave);
    const page = await wavesApi.respondents(demoWave, { page: 1, perPage: 5 });
    expect(page.ok && page.data.perPage).toBe(5);
    expect(page.ok && page.data.respondents.length).toBeLessThanOrEqual(5);
    const audits = await auditsApi.listForWave(demoWave);
    expect(audits.ok && audits.data.wave.id).toBe(demoWave);
    expect(audits.ok && Array.isArray(audits.data.audits)).toBe(true);
  });

  it('reads the caller, the team, tokens, the outbox and the health', async () => {
    as(owner);
    const me = await meApi.get();
    expect(me.ok && me.data.teams.find((t) => t.id === demo.team)?.role).toBe('owner');
    const members = await teamsApi.members(demo.team);
    expect(members.ok && members.data.members.length).toBeGreaterThan(0);
    const invitations = await teamsApi.invitations(demo.team);
    expect(invitations.ok && Array.isArray(invitations.data.invitations)).toBe(true);
    const tokens = await tokensApi.list();
    expect(tokens.ok && Array.isArray(tokens.data.tokens)).toBe(true);
    const outbox = await outboxApi.list();
    expect(outbox.ok && Array.isArray(outbox.data.mails)).toBe(true);
    expect(await setupApi.health()).toEqual({ ok: true, status: 200, data: { status: 'ok' } });
  });

  it('answers refusals in the error shape, with the code the guard gives', async () => {
    as(reviewer);
    const refused = await studiesApi.delete(demo.study);
    expect(refused.ok).toBe(false);
    if (!refused.ok) {
      expect(refused.status).toBe(403);
      expect(refused.error.code).toBe('missing-permission');
      expect(refused.error.message).toContain('delete:study');
    }
    const missing = await auditsApi.get('no-such-audit');
    expect(missing).toMatchObject({ ok: false, status: 404, error: { code: 'audit-not-found' } });
    const badBody = await teamsApi.invite(demo.team, { email: 'not-an-address', role: 'designer' });
    // The reviewer is refused by the guard before the body is read (403), never a 500.
    expect(badBody).toMatchObject({ ok: false, status: 403 });
  });

  it('refuses a body the contract refuses, with 400 and the error shape', async () => {
    as(owner);
    const bad = await studiesApi.create({ teamId: demo.team, name: '   ' });
    expect(bad).toMatchObject({ ok: false, status: 400 });
  });
});
