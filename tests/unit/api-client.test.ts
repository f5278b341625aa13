/**
 * The typed client of src/lib/api against a stubbed fetch: what it sends (method, path, JSON
 * body, headers) and how it reads every kind of answer (data, the error shape, an error without
 * it, no answer at all). tests/api/typed-client.test.ts runs the same calls against the built
 * server.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { auditsApi } from '../../src/lib/api/audits';
import { callApi, resultFromAnswer } from '../../src/lib/api/client';
import { errorFromAnswer, isApiErrorResponse, NETWORK_ERROR_CODE, UNKNOWN_ERROR_CODE } from '../../src/lib/api/errors';
import { studiesApi } from '../../src/lib/api/studies';
import { teamsApi } from '../../src/lib/api/teams';
import { wavesApi } from '../../src/lib/api/waves';

interface Sent {
  path: string;
  method: string;
  body: unknown;
  headers: Record<string, string>;
}

/** Replaces fetch with one that records the request and answers `status` with `text`. */
function answerWith(status: number, text: string): Sent[] {
  const sent: Sent[] = [];
  vi.stubGlobal('fetch', async (path: string, init: RequestInit) => {
    sent.push({ path, method: String(init.method), body: init.body === undefined ? undefined : JSON.parse(String(init.body)), headers: init.headers as Record<string, string> });
    return new Response(status === 204 ? null : text, { status, headers: { 'Content-Type': 'application/json' } });
  });
  return sent;
}

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('the typed client', () => {
  it('sends the route, method and JSON body of each call', async () => {
    const sent = answerWith(201, '{"study":{"id":"s1"}}');
    const created = await studiesApi.create({ teamId: 't1', name: 'Pilot' });
    expect(created).toEqual({ ok: true, status: 201, data: { study: { id: 's1' } } });
    expect(sent[0]).toMatchObject({ path: '/api/studies', method: 'POST', body: { teamId: 't1', name: 'Pilot' } });
    expect(sent[0].headers['Content-Type']).toBe('application/json');
    await teamsApi.changeRole('t 1', 'u/2', { role: 'designer' });
    // Ids are escaped into the path: a slash in an id cannot reach another route.
    expect(sent[1]).toMatchObject({ path: '/api/teams/t%201/members/u%2F2', method: 'PUT', body: { role: 'designer' } });
    await auditsApi.retry('a1');
    expect(sent[2]).toMatchObject({ path: '/api/audits/a1/retry', method: 'POST', body: undefined });
    await wavesApi.respondents('w1', { page: 2, flagged: true });
    expect(sent[3]).toMatchObject({ path: '/api/waves/w1/respondents?page=2&flagged=true', method: 'GET' });
    await auditsApi.cancel('a/1');
    expect(sent[4]).toMatchObject({ path: '/api/audits/a%2F1/cancel', method: 'POST', body: undefined });
  });

  it('answers a 204 with null data', async () => {
    answerWith(204, '');
    expect(await studiesApi.delete('s1')).toEqual({ ok: true, status: 204, data: null });
  });

  it('passes the error shape through as it came', async () => {
    answerWith(403, '{"error":{"code":"missing-permission","message":"Your role may not do this: it needs the permission delete:study."}}');
    const refused = await studiesApi.delete('s1');
    expect(refused).toEqual({
      ok: false,
      status: 403,
      error: { code: 'missing-permission', message: 'Your role may not do this: it needs the permission delete:study.' },
    });
  });

  it('makes the error shape from an answer that lacks it', async () => {
    answerWith(502, '<html>Bad gateway</html>');
    const failed = await callApi('GET', '/api/studies');
    expect(failed).toEqual({ ok: false, status: 502, error: { code: UNKNOWN_ERROR_CODE, message: 'The server answered 502.' } });
  });

  it('turns a lost connection into the network error, never a throw', async () => {
    vi.stubGlobal('fetch', async () => {
      throw new TypeError('fetch failed');
    });
    const lost = await studiesApi.list();
    expect(lost.ok).toBe(false);
    if (!lost.ok) {
      expect(lost.status).toBe(0);
      expect(lost.error.code).toBe(NETWORK_ERROR_CODE);
    }
  });

  it('recognises the error shape and nothing else', () => {
    expect(isApiErrorResponse({ error: { code: 'x', message: 'y' } })).toBe(true);
    for (const other of [null, 'error', { error: 'x' }, { error: { code: 1, message: 'y' } }, { error: { code: 'x' } }]) expect(isApiErrorResponse(other)).toBe(false);
    expect(errorFromAnswer(0, null).code).toBe(NETWORK_ERROR_CODE);
    expect(resultFromAnswer(200, 'not json')).toEqual({ ok: true, status: 200, data: null });
  });
});
