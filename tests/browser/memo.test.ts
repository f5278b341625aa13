/**
 * The memo in a real browser (Debian's Chromium through playwright-core): the client reviewer
 * opens an audit, reads the memo's preview and downloads it as PDF and DOCX. The downloads are
 * read back (a PDF and a zip archive), and the preview is saved as screenshots
 * (test-results/screenshots/memo-*.png). Any console error, page error or CSP violation fails.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { baseUrl, body, demoEmails, signedIn } from '../setup/http';
import { freshContext, hydrated, screenshot, signInThroughPage } from '../setup/browser';

const viewport = { width: 1280, height: 900 };

describe('the memo in Chromium', () => {
  it('the client reviewer opens the memo from the audit page and downloads both formats', async () => {
    const designer = await signedIn(demoEmails.designer);
    const started = await designer.post('/api/waves/wave-riverbend-pilot-1/audits', { settings: { bootstrap: 20, seed: 27_182 } });
    const auditId = (await body(started)).audit.id as string;
    for (let attempt = 0; attempt < 900 && (await body(await designer.get(`/api/audits/${auditId}`))).audit.status !== 'done'; attempt++) {
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
    const { context, page, problems } = await freshContext(viewport);
    try {
      await signInThroughPage(page, demoEmails.reviewer);
      await page.goto(`${baseUrl()}/audits/${auditId}`);
      await hydrated(page);
      await Promise.all([page.waitForURL(/\/memo$/, { timeout: 15_000 }), page.locator('[data-testid=open-memo]').click()]);
      const preview = page.locator('[data-testid=memo-preview]');
      await expect(preview.locator('h3').allTextContents()).resolves.toContain('6. Redundancy evidence');
      expect(await preview.locator('svg').count()).toBe(2);
      await screenshot(page, 'memo-preview');
      await preview.locator('figure').first().scrollIntoViewIfNeeded();
      await screenshot(page, 'memo-preview-map');

      for (const [testId, magic] of [['memo-pdf', '%PDF-'], ['memo-docx', 'PK']] as const) {
        const [download] = await Promise.all([page.waitForEvent('download'), page.locator(`[data-testid=${testId}]`).click()]);
        expect(download.suggestedFilename()).toMatch(new RegExp(`^paredown-memo-.+\\.${testId === 'memo-pdf' ? 'pdf' : 'docx'}$`));
        const path = await download.path();
        expect(readFileSync(path).subarray(0, magic.length).toString('latin1')).toBe(magic);
      }
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
