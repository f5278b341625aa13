/**
 * The upload page in a real browser (Debian's Chromium through playwright-core): the designer
 * creates a study, drops the demo wave on the page and adds its codebook, watches the upload
 * (throttled so the progress bar is seen), checks the proposed column setup, reviews the
 * screening, stores the wave and finds it on the study page. A refused file shows its message.
 * Screenshots of each step go to test-results/screenshots/upload-*.png. Any Content-Security-Policy
 * violation or page error fails.
 *
 * Expected counts come from fixtures/demo/README.md (400 respondents, 41 items, 6 straightliners,
 * 8 speeders, `comments` and `email` as personal data).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Page } from 'playwright-core';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { baseUrl, body, demo, demoEmails, signedIn, type Client } from '../setup/http';
import { accessibilityViolations, freshContext, hydrated, screenshot, signInThroughPage } from '../setup/browser';

const demoFiles = join(import.meta.dirname, '..', '..', 'fixtures', 'demo');
const corpusFiles = join(import.meta.dirname, '..', '..', 'fixtures', 'waves');

const studies: string[] = [];
let owner: Client;

/** Drops a file on an element the way a desktop drag and drop does (a DataTransfer holding a File). */
async function dropFile(page: Page, selector: string, path: string, name: string, type: string) {
  const transfer = await page.evaluateHandle(
    ({ base64, fileName, mediaType }) => {
      const binary = atob(base64);
      const bytes = new Uint8Array(binary.length);
      for (let i = 0; i < binary.length; i++) bytes[i] = binary.charCodeAt(i);
      const dataTransfer = new DataTransfer();
      dataTransfer.items.add(new File([bytes], fileName, { type: mediaType }));
      return dataTransfer;
    },
    { base64: readFileSync(path).toString('base64'), fileName: name, mediaType: type },
  );
  await page.dispatchEvent(selector, 'dragenter', { dataTransfer: transfer });
  await page.dispatchEvent(selector, 'drop', { dataTransfer: transfer });
}

const shot = (page: Page, name: string) => screenshot(page, `upload-${name}`);

beforeAll(async () => {
  owner = await signedIn(demoEmails.owner);
});

afterAll(async () => {
  for (const id of studies) await owner.delete(`/api/studies/${id}`);
});

describe('the upload page in Chromium', () => {
  it('takes the designer from a dropped file to a stored wave listed on the study page', async () => {
    const { context, page, problems } = await freshContext();
    try {
      await signInThroughPage(page, demoEmails.designer);
      await hydrated(page);
      await page.click(`[data-testid=new-study-${demo.team}]`);
      await page.fill(`#study-name-${demo.team}`, 'Library member survey: upload test');
      await Promise.all([page.waitForURL(/\/studies\/[^/]+$/, { timeout: 15_000 }), page.click('button:has-text("Create")')]);
      const studyId = new URL(page.url()).pathname.split('/').pop()!;
      studies.push(studyId);
      expect(await page.locator('[data-testid=wave-row]').count()).toBe(0);

      await Promise.all([page.waitForURL(`${baseUrl()}/studies/${studyId}/upload`), page.click('[data-testid=upload-wave-link]')]);
      await hydrated(page);
      await expect(page.locator('[data-testid=personal-data-caution]').textContent()).resolves.toContain('never stored as items');
      await shot(page, '1-empty');

      await dropFile(page, '[data-testid=wave-drop]', join(demoFiles, 'library-pilot-1.csv'), 'library-pilot-1.csv', 'text/csv');
      await page.setInputFiles('#codebook-file', join(demoFiles, 'library-codebook.csv'));
      await expect(page.locator('[data-testid=wave-drop-chosen]').textContent()).resolves.toContain('library-pilot-1.csv');
      await expect(page.locator('[data-testid=codebook-drop-chosen]').textContent()).resolves.toContain('library-codebook.csv');
      await page.fill('#wave-label', 'Pilot 1');
      await shot(page, '2-chosen');

      // A slow connection, so the progress bar is on screen long enough to be seen.
      const cdp = await context.newCDPSession(page);
      await cdp.send('Network.enable');
      await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 200, downloadThroughput: -1, uploadThroughput: 16 * 1024 });
      await page.click('[data-testid=upload-submit]');
      // The bar moves with the bytes sent (XMLHttpRequest upload progress), not only at the end.
      await page.waitForFunction(() => {
        const bar = document.querySelector<HTMLProgressElement>('[data-testid=upload-progress] progress');
        return bar !== null && bar.value >= 20 && bar.value <= 90;
      }, null, { timeout: 20_000 });
      await shot(page, '3-progress');
      await page.waitForSelector('[data-testid=setup-table]', { timeout: 30_000 });
      await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });

      // The proposed setup: every column with its role and reason; personal data ignored.
      expect(await page.locator('[data-testid=setup-row]').count()).toBe(46);
      await expect(page.locator('[data-testid=setup-tally]').textContent()).resolves.toMatch(/41\s*items · 2 ignored/);
      const role = (column: string) => page.locator(`[data-testid=setup-row][data-column="${column}"] [data-testid=setup-role]`).inputValue();
      await expect(role('email')).resolves.toBe('ignore');
      await expect(role('comments')).resolves.toBe('ignore');
      await expect(role('respondent_id')).resolves.toBe('respondent-id');
      await expect(role('overall_sat')).resolves.toBe('outcome');
      await expect(page.locator('[data-testid=setup-row][data-column="email"]').textContent()).resolves.toContain('personal data');
      await expect(page.locator('[data-testid=wave-warnings]').textContent()).resolves.toContain('never stored as items');
      // The designer gives the outcome a scale name (an edit the form carries to the server).
      await page.locator('[data-testid=setup-row][data-column="overall_sat"] [data-testid=setup-scale]').fill('overall');
      // The action bar sticks to the bottom of the window; at the end of the page it sits in its own place in a full-page shot.
      await page.evaluate(() => window.scrollTo(0, document.body.scrollHeight));
      await shot(page, '4-setup');
      expect(await accessibilityViolations(page), "the upload's column setup step").toEqual([]);

      await page.click('[data-testid=check-setup]');
      await page.waitForSelector('[data-testid=flagged-table]', { timeout: 30_000 });
      await expect(page.locator('[data-testid=flag-long-string] [data-testid=flag-count]').textContent()).resolves.toBe('6');
      await expect(page.locator('[data-testid=flag-speeder] [data-testid=flag-count]').textContent()).resolves.toBe('8');
      await expect(page.locator('[data-testid=exclusion-tally]').textContent()).resolves.toContain('14 of 400');
      // The designer keeps one flagged respondent in, then returns to the proposal, then keeps one in again.
      await page.locator('[data-testid=flagged-row] input[type=checkbox]').first().uncheck();
      await expect(page.locator('[data-testid=exclusion-tally]').textContent()).resolves.toContain('13 of 400');
      await page.click('button:has-text("Use the proposal")');
      await expect(page.locator('[data-testid=exclusion-tally]').textContent()).resolves.toContain('14 of 400');
      await page.locator('[data-testid=flagged-row] input[type=checkbox]').first().uncheck();
      await shot(page, '5-screening');
      expect(await accessibilityViolations(page), "the upload's screening step").toEqual([]);

      await page.click('[data-testid=confirm-wave]');
      await page.waitForSelector('[data-testid=wave-stored]', { timeout: 30_000 });
      await expect(page.locator('[data-testid=wave-stored]').textContent()).resolves.toMatch(/Respondents\s*400.*Items\s*41.*Left out of audits\s*13/s);
      await shot(page, '6-stored');

      await Promise.all([page.waitForURL(`${baseUrl()}/studies/${studyId}`), page.click('[data-testid=back-to-study]')]);
      expect(await page.locator('[data-testid=wave-row]').count()).toBe(1);
      await expect(page.locator('[data-testid=wave-row]').textContent()).resolves.toMatch(/Pilot 1.*Confirmed.*400.*13.*41/s);
      await shot(page, '7-study');

      // What was stored is what the page showed.
      const detail = await body(await owner.get(`/api/studies/${studyId}`));
      const wave = await body(await owner.get(`/api/waves/${detail.study.waves[0].id}`));
      expect(wave.wave).toMatchObject({ status: 'confirmed', rows: 400, items: 41, excluded: 13 });
      expect(wave.setup.find((column: { column: string }) => column.column === 'overall_sat').item.scale).toBe('overall');
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('shows the reason when a file is refused, and stores nothing', async () => {
    const { context, page, problems } = await freshContext();
    try {
      const studyResponse = await owner.post('/api/studies', { teamId: demo.team, name: 'Upload refusal test' });
      const studyId = (await body(studyResponse)).study.id as string;
      studies.push(studyId);
      await signInThroughPage(page, demoEmails.designer);
      await page.goto(`${baseUrl()}/studies/${studyId}/upload`);
      await hydrated(page);
      await page.setInputFiles('#wave-file', join(corpusFiles, 'junk-renamed.xlsx'));
      await page.click('[data-testid=upload-submit]');
      const message = page.locator('[data-testid=upload-error]');
      await expect(message.textContent({ timeout: 15_000 })).resolves.toContain('junk-renamed.xlsx');
      await shot(page, 'error');
      const detail = await body(await owner.get(`/api/studies/${studyId}`));
      expect(detail.study.waves).toEqual([]);
      // The refusal is a 422 the page reports; nothing else went wrong.
      expect(problems.filter((problem) => !/422|Failed to load resource/.test(problem))).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('continues the setup of a wave uploaded earlier from the study page', async () => {
    const { context, page, problems } = await freshContext();
    try {
      const studyId = (await body(await owner.post('/api/studies', { teamId: demo.team, name: 'Upload continue test' }))).study.id as string;
      studies.push(studyId);
      const form = new FormData();
      form.set('file', new Blob([readFileSync(join(corpusFiles, 'tab-separated.tsv'))]), 'tab-separated.tsv');
      const cookie = [...owner.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
      const uploaded = await fetch(`${baseUrl()}/api/studies/${studyId}/waves`, { method: 'POST', headers: { cookie, origin: baseUrl() }, body: form });
      expect(uploaded.status).toBe(201);
      await signInThroughPage(page, demoEmails.designer);
      await page.goto(`${baseUrl()}/studies/${studyId}`);
      await expect(page.locator('[data-testid=wave-row]').textContent()).resolves.toContain('Setup to confirm');
      await Promise.all([page.waitForURL(/\/upload\?wave=/), page.click('[data-testid=wave-row] a:has-text("Continue")')]);
      await hydrated(page);
      await expect(page.locator('[data-testid=upload-note]').textContent()).resolves.toContain('Continuing the setup');
      // fixtures/waves/expected.json: tab-separated.tsv holds an id column and five items.
      expect(await page.locator('[data-testid=setup-row]').count()).toBe(6);
      await page.click('[data-testid=check-setup]');
      await page.waitForSelector('[data-testid=confirm-wave]', { timeout: 30_000 });
      await page.click('[data-testid=confirm-wave]');
      await page.waitForSelector('[data-testid=wave-stored]', { timeout: 30_000 });
      await shot(page, 'continued');
      const detail = await body(await owner.get(`/api/studies/${studyId}`));
      expect(detail.study.waves).toEqual([expect.objectContaining({ status: 'confirmed', rows: 5, items: 5 })]);
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('tells a reviewer that uploading is for owners and designers', async () => {
    const { context, page, problems } = await freshContext();
    try {
      await signInThroughPage(page, demoEmails.reviewer);
      const response = await page.goto(`${baseUrl()}/studies/${demo.study}/upload`);
      expect(response?.status()).toBe(403);
      await expect(page.locator('[data-testid=upload-not-allowed]').textContent()).resolves.toContain('owner or survey designer');
      expect(await page.locator('#wave-file').count()).toBe(0);
      await page.goto(`${baseUrl()}/studies/${demo.study}`);
      expect(await page.locator('[data-testid=upload-wave-link]').count()).toBe(0);
      expect(problems.filter((problem) => !/403|Failed to load resource/.test(problem))).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
