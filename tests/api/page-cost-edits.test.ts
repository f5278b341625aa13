/**
 * Two edits to Astro's and the Node adapter's code made while bundling, to cut what every page
 * costs (src/lib/server/node-adapter-hardening.ts, items 3 and 4; docs/decisions/025):
 * the static-file lookup only for paths with a file extension, and the content-security-policy
 * hashes of the head's inline script and style kept by their text. What must not change: static
 * files are still served as before, pages still answered, and the policy still names the hash of
 * every inline script and style the page carries, on the first request and on later ones.
 */
import { createHash } from 'node:crypto';
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { baseUrl, demoEmails, signedIn } from '../setup/http';

const inlineBlocks = (html: string) => [...html.matchAll(/<(script|style)(\s[^>]*)?>([\s\S]*?)<\/\1>/g)].filter((match) => !/\ssrc=/.test(match[2] ?? '')).map((match) => match[3]);
const sha256 = (text: string) => `'sha256-${createHash('sha256').update(text).digest('base64')}'`;

describe('the static-file lookup', () => {
  it('still serves the files of dist/client, with the long cache for built assets', async () => {
    const favicon = await fetch(`${baseUrl()}/favicon.svg`);
    expect(favicon.status).toBe(200);
    expect(favicon.headers.get('content-type')).toContain('image/svg+xml');
    expect((await fetch(`${baseUrl()}/robots.txt`)).status).toBe(200);
    const asset = readdirSync(join(process.cwd(), 'dist', 'client', '_astro')).find((name) => name.endsWith('.js'));
    expect(asset).toBeDefined();
    const built = await fetch(`${baseUrl()}/_astro/${asset}`);
    expect(built.status).toBe(200);
    expect(built.headers.get('cache-control')).toContain('immutable');
    expect(await built.text()).not.toBe('');
  });

  it('leaves paths without an extension, and missing files, to the pages', async () => {
    const signIn = await fetch(`${baseUrl()}/signin`);
    expect(signIn.status).toBe(200);
    expect(signIn.headers.get('content-type')).toContain('text/html');
    const designer = await signedIn(demoEmails.designer);
    expect((await designer.get('/no-such-file.svg')).status).toBe(404);
    expect((await designer.get('/_astro/no-such-chunk.js')).status).toBe(404);
    expect((await designer.get('/studies/study-riverbend-members-2027')).status).toBe(200);
  });
});

describe('the content-security-policy hashes', () => {
  it('name every inline script and style of a page, on the first request and the next ones', async () => {
    const designer = await signedIn(demoEmails.designer);
    for (const path of ['/', '/studies/study-riverbend-members-2027/decisions', '/audits/audit-riverbend-pilot-1']) {
      const policies: string[] = [];
      for (let i = 0; i < 3; i++) {
        const response = await designer.get(path);
        const html = await response.text();
        const policy = response.headers.get('content-security-policy') ?? '';
        const blocks = inlineBlocks(html);
        expect(blocks.length, path).toBeGreaterThan(0);
        for (const block of blocks) expect(policy, `${path}: ${block.slice(0, 40)}`).toContain(sha256(block));
        policies.push(policy);
      }
      expect(new Set(policies).size, path).toBe(1);
    }
  });
});
