/**
 * Issue 16 (hardening), the pure parts: the sign-in limit's client address and e-mail (read as
 * Auth.js 0.37 reads bodies), the path after signing in, the capped body reader, the counts-only
 * wave warning, the refusal of an audit with nothing to compute (also through the command line),
 * the size unit and Strict-Transport-Security. The HTTP side is tests/api/hardening.test.ts.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { nothingToCompute } from '../../src/lib/audit/audit-input';
import { safeNextPath, safeRedirectUrl } from '../../src/lib/safe-path';
import { readBodyCapped } from '../../src/lib/server/read-body';
import { withSecurityHeaders } from '../../src/lib/server/security-headers';
import { signInClientAddress, signInEmailFromBody } from '../../src/lib/server/sign-in-limit';
import { aggregateWarning } from '../../src/lib/server/waves/wave-view';
import { formatMebibytes } from '../../src/lib/words/formats';

describe('signInClientAddress', () => {
  it('ignores X-Forwarded-For unless the proxy is trusted', () => {
    expect(signInClientAddress({ forwardedFor: '203.0.113.9', socketAddress: '127.0.0.1', trustProxy: false })).toBe('127.0.0.1');
    expect(signInClientAddress({ forwardedFor: null, socketAddress: '::1', trustProxy: false })).toBe('::1');
  });

  it('behind a trusted proxy takes the address that proxy added (the right-most)', () => {
    expect(signInClientAddress({ forwardedFor: '198.51.100.7', socketAddress: '127.0.0.1', trustProxy: true })).toBe('198.51.100.7');
    // A client that sends its own header cannot choose: the proxy appends what it saw.
    expect(signInClientAddress({ forwardedFor: '10.0.0.1, 198.51.100.7', socketAddress: '127.0.0.1', trustProxy: true })).toBe('198.51.100.7');
    expect(signInClientAddress({ forwardedFor: ' , ', socketAddress: '127.0.0.1', trustProxy: true })).toBe('127.0.0.1');
  });
});

describe('signInEmailFromBody', () => {
  it('reads a form and a JSON body alike, normalised as the credentials provider does', () => {
    expect(signInEmailFromBody('application/x-www-form-urlencoded', 'email=%20Someone%40Example.ORG&password=x')).toBe('someone@example.org');
    expect(signInEmailFromBody('application/json', JSON.stringify({ email: ' Someone@Example.ORG ', password: 'x' }))).toBe('someone@example.org');
    expect(signInEmailFromBody('application/json; charset=utf-8', '{"email":"a@b.test"}')).toBe('a@b.test');
  });

  it('takes the last of repeated fields, as Object.fromEntries in Auth.js does', () => {
    expect(signInEmailFromBody('application/x-www-form-urlencoded', 'email=decoy%40x.test&email=target%40x.test')).toBe('target@x.test');
    expect(signInEmailFromBody('application/json', '{"email":"decoy@x.test","email":"target@x.test"}')).toBe('target@x.test');
    expect(Object.fromEntries(new URLSearchParams('email=a&email=b')).email).toBe('b');
  });

  it('gives nothing for bodies Auth.js does not read', () => {
    expect(signInEmailFromBody('text/plain', 'email=a%40b.test')).toBe('');
    expect(signInEmailFromBody(null, 'email=a%40b.test')).toBe('');
    expect(signInEmailFromBody('application/json', 'not json')).toBe('');
    expect(signInEmailFromBody('application/json', '"a@b.test"')).toBe('');
  });
});

describe('safeNextPath and safeRedirectUrl', () => {
  it.each([
    ['/\t/evil.test'], ['/%09/evil.test'], ['/\\evil.test'], ['/%5Cevil.test'], ['//evil.test'], ['/%2F/evil.test'], ['/%2F%2Fevil.test'],
    ['/\n'], ['/\r'], ['/\u0000'], ['/\u2028'], ['/%0A'], ['/%E2%80%A8'], ['https://evil.test/'], ['evil.test'], [''], ['/%zz'],
  ])('turns %j into /', (value) => {
    expect(safeNextPath(value)).toBe('/');
  });

  it('keeps a same-site path with its query and fragment', () => {
    expect(safeNextPath('/studies/abc?tab=cut#list')).toBe('/studies/abc?tab=cut#list');
    expect(safeNextPath('/a/..//evil.test')).toBe('/');
    expect(safeNextPath(42)).toBe('/');
  });

  it('gives Auth.js an address on our origin only', () => {
    const base = 'http://127.0.0.1:4321';
    expect(safeRedirectUrl('/studies', base)).toBe(`${base}/studies`);
    expect(safeRedirectUrl(`${base}/account`, base)).toBe(`${base}/account`);
    expect(safeRedirectUrl('https://evil.test/x', base)).toBe(`${base}/`);
    expect(safeRedirectUrl('/\n', base)).toBe(`${base}/`);
    expect(safeRedirectUrl(`${base}/\t/evil.test`, base)).toBe(`${base}/`);
    expect(safeRedirectUrl({ toString: () => '/x' }, base)).toBe(`${base}/`);
  });
});

describe('readBodyCapped', () => {
  /** A body of `chunks` chunks of 64 KiB, counting how many were pulled. */
  function chunkedRequest(chunks: number, headers: Record<string, string> = {}) {
    let pulled = 0;
    const stream = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (pulled >= chunks) return controller.close();
        pulled += 1;
        controller.enqueue(new Uint8Array(64 * 1024));
      },
    });
    const request = new Request('http://x/', { method: 'POST', body: stream, headers, duplex: 'half' } as RequestInit);
    return { request, pulled: () => pulled };
  }

  it('stops a chunked body without Content-Length at the cap with 413', async () => {
    const body = chunkedRequest(1000);
    await expect(readBodyCapped(body.request, 1024 * 1024)).rejects.toMatchObject({ status: 413, code: 'body-too-large' });
    // 1 MiB is 16 chunks of 64 KiB; the 17th passes it. A few more may be queued by the stream.
    expect(body.pulled()).toBeLessThan(24);
  });

  it('refuses a declared length past the cap before reading', async () => {
    const body = chunkedRequest(1000, { 'content-length': String(50 * 1024 * 1024) });
    await expect(readBodyCapped(body.request, 1024 * 1024)).rejects.toMatchObject({ status: 413 });
    expect(body.pulled()).toBeLessThan(2);
  });

  it('reads a body within the cap whole', async () => {
    const body = chunkedRequest(3);
    expect((await readBodyCapped(body.request, 1024 * 1024)).byteLength).toBe(3 * 64 * 1024);
  });

  it('settles when one copy of a cloned request is cut off (a tee branch)', async () => {
    const body = chunkedRequest(1000);
    const copy = body.request.clone();
    await expect(readBodyCapped(copy, 256 * 1024)).rejects.toMatchObject({ status: 413 });
  });
});

describe('aggregateWarning', () => {
  it('keeps only the count of repeated respondent ids', () => {
    const stored = { code: 'duplicate-respondent-id', columns: ['id'], message: '2 respondent ids appear more than once (270048, 270142); check for doubled rows.' };
    expect(aggregateWarning(stored)).toEqual({ code: 'duplicate-respondent-id', columns: ['id'], message: '2 respondent ids appear more than once; check for doubled rows.' });
    const other = { code: 'constant-item', columns: ['Q1'], message: '1 item has fewer than two different answers.' };
    expect(aggregateWarning(other)).toBe(other);
  });
});

describe('nothingToCompute', () => {
  const matrix = (rows: number, columns: number[][]) => ({ rows, columns: columns.length, data: Float64Array.from(columns.flat()) });

  it('refuses a single respondent, or none left after exclusions', () => {
    expect(nothingToCompute(matrix(1, [[1], [2], [3]]))).toBe('There is only one respondent in the audit, and an audit compares answers across respondents, so it needs at least two.');
    expect(nothingToCompute(matrix(2, [[1, 2], [2, 3]]), { skipRows: [0, 1] })).toBe('There is no respondent in the audit (2 were left out by screening or by hand), and an audit compares answers across respondents, so it needs at least two.');
  });

  it('refuses when fewer than two items vary, counting only the respondents kept', () => {
    expect(nothingToCompute(matrix(3, [[3, 3, 3], [4, 4, 4]]))).toMatch(/^No item has two different answers among the 3 respondents in the audit, so there is nothing to compare/);
    expect(nothingToCompute(matrix(3, [[1, 2, 3], [4, 4, Number.NaN]]))).toMatch(/^Only one item has two different answers/);
    // Row 2 holds the only differing answers; with it left out, nothing varies.
    expect(nothingToCompute(matrix(3, [[1, 1, 5], [2, 2, 4]]), { skipRows: [2] })).toMatch(/^No item has two different answers among the 2 respondents in the audit \(1 was left out/);
    expect(nothingToCompute(matrix(3, [[1, 2, 3], [3, 2, 1]]))).toBeNull();
  });

  it('makes the command line exit 2 with the sentence and no JSON', () => {
    const folder = mkdtempSync(join(tmpdir(), 'paredown-nothing-'));
    const file = join(folder, 'constant.csv');
    writeFileSync(file, ['respondent_id,Q1,Q2,Q3', ...Array.from({ length: 12 }, (_, i) => `r${i},3,4,2`)].join('\n') + '\n');
    const result = spawnSync(process.execPath, ['--import', 'tsx', 'src/cli/audit.ts', file, '--bootstrap', '0'], { encoding: 'utf8', timeout: 120_000 });
    rmSync(folder, { recursive: true, force: true });
    expect(result.status).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr.trim().split('\n').at(-1)).toBe('paredown audit: No item has two different answers among the 12 respondents in the audit, so there is nothing to compare; check the column setup and the exclusions.');
  });
});

describe('small findings', () => {
  it('states sizes in MiB (1 MiB = 1,048,576 bytes)', () => {
    expect(formatMebibytes(50 * 1024 * 1024)).toBe('50 MiB');
    expect(formatMebibytes(1024 * 1024)).toBe('1 MiB');
    expect(formatMebibytes(64 * 1024)).toBe('0.1 MiB');
  });

  it('adds Strict-Transport-Security only when the site is https', () => {
    expect(withSecurityHeaders(new Response('x'), false, true).headers.get('strict-transport-security')).toBe('max-age=31536000');
    expect(withSecurityHeaders(new Response('x'), false, false).headers.get('strict-transport-security')).toBeNull();
  });
});
