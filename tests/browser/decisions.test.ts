/**
 * The decisions workspace in a real browser (Debian's Chromium through playwright-core): the
 * designer opens the demo study, goes to its decisions, accepts a recommendation, overrides one
 * decision with a reason and sees the what-if change; the history records both; the study page's
 * counts follow. Then, at tablet width (768 px), the workspace and the column-setup table of a
 * fresh upload, which the designer discards from the study page. Screenshots go to
 * test-results/screenshots/decisions-*.png. Any console error, page error or Content-Security-Policy
 * violation fails. Leaves every demo decision undecided.
 */
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { baseUrl, demo, demoEmails, signedIn } from '../setup/http';
import { accessibilityViolations, freshContext, hydrated, screenshot, screenshots, signInThroughPage } from '../setup/browser';

const desktop = { width: 1280, height: 900 };
const tablet = { width: 768, height: 1024 };

/** The what-if's "items removed" figure once it has settled. */
async function settledRemoved(page: Page): Promise<number> {
  await page.waitForFunction(() => document.querySelector('[data-testid=what-if]')?.getAttribute('aria-busy') === 'false' && document.querySelector('[data-testid=what-if-removed]') !== null, null, { timeout: 15_000 });
  return Number(await page.locator('[data-testid=what-if-removed]').textContent());
}

/** Every decided demo item back to undecided, through the API with the page's cookies. */
async function resetDecisions(page: Page) {
  const list = await (await page.request.get(`${baseUrl()}/api/studies/${demo.study}/cut-list`)).json();
  const decided = (list.items as { id: string; decision: string }[]).filter((i) => i.decision !== 'undecided');
  decided.sort((a, b) => Number(b.decision === 'merge') - Number(a.decision === 'merge'));
  for (const item of decided) {
    const response = await page.request.put(`${baseUrl()}/api/studies/${demo.study}/cut-list/${item.id}`, { data: { decision: 'undecided' }, headers: { origin: baseUrl() } });
    expect(response.status()).toBe(200);
  }
}

describe('decisions in Chromium', () => {
  it('the designer accepts a recommendation, overrides one decision with a reason and sees the what-if change', async () => {
    const { context, page, problems } = await freshContext(desktop);
    try {
      await signInThroughPage(page, demoEmails.designer);
      await resetDecisions(page);
      await page.goto(`${baseUrl()}/studies/${demo.study}`);
      await hydrated(page);
      // A fresh study: every item undecided (41 items, fixtures/demo/README.md), not "Undecided 0".
      await expect(page.locator('section[aria-labelledby=cutlist-heading]').textContent()).resolves.toMatch(/undecided\s*41/i);
      await screenshot(page, 'decisions-study-page');
      await Promise.all([page.waitForURL(/\/decisions$/, { timeout: 15_000 }), page.click('[data-testid=open-decisions]')]);
      await hydrated(page);
      await page.locator('[data-testid=recommendation]').first().waitFor({ timeout: 15_000 });
      expect(await settledRemoved(page)).toBe(0);
      await expect(page.locator('[data-testid=decision-cautions]').textContent()).resolves.toContain('evidence, not proof');
      await screenshot(page, 'decisions-workspace');

      // Accept the first recommendation that takes an item out.
      const recommendations = page.locator('[data-testid=recommendation]');
      const count = await recommendations.count();
      let accepted = -1;
      for (let index = 0; index < count && accepted < 0; index++) {
        const text = (await recommendations.nth(index).textContent()) ?? '';
        if (/Drop|Merge into/.test(text)) accepted = index;
      }
      expect(accepted).toBeGreaterThanOrEqual(0);
      const target = recommendations.nth(accepted);
      const changedItem = (await target.locator('li:has-text("Drop"), li:has-text("Merge into")').first().locator('code').textContent())!.trim();
      await target.locator('[data-testid=accept-recommendation]').click();
      await target.locator('[data-testid=recommendation-accepted]').waitFor({ timeout: 15_000 });
      const afterAccept = await settledRemoved(page);
      expect(afterAccept).toBeGreaterThanOrEqual(1);
      const scalesAfterAccept = await page.locator('[data-testid=what-if-scales]').textContent();
      await expect(page.locator(`[data-testid=item-row][data-item="${changedItem}"] [data-testid=item-decision]`).textContent()).resolves.toMatch(/Drop|Merge into/);
      await screenshot(page, 'decisions-accepted');

      // Override: keep the item after all, with a reason.
      const row = page.locator(`[data-testid=item-row][data-item="${changedItem}"]`);
      await row.scrollIntoViewIfNeeded();
      await row.locator('[data-testid=decide-button]').click();
      const editor = page.locator('[data-testid=decision-editor]');
      await editor.locator('label:has-text("Keep") input[type=radio]').check();
      // Without a reason the form says why it cannot save.
      await editor.locator('[data-testid=decision-reason]').fill('');
      await editor.locator('[data-testid=decision-save]').click();
      await expect(editor.locator('[role=alert]').textContent()).resolves.toMatch(/reason is required/);
      await editor.locator('[data-testid=decision-reason]').fill('The client tracks this question year on year.');
      await editor.locator('[data-testid=decision-save]').click();
      await editor.waitFor({ state: 'detached', timeout: 15_000 });
      await expect(row.locator('[data-testid=item-decision]').textContent()).resolves.toContain('The client tracks this question year on year.');
      await page.waitForFunction((before) => Number(document.querySelector('[data-testid=what-if-removed]')?.textContent) === before - 1, afterAccept, { timeout: 15_000 });
      expect(await settledRemoved(page)).toBe(afterAccept - 1);
      expect(await page.locator('[data-testid=what-if-scales]').textContent()).not.toBe(scalesAfterAccept);
      const history = await page.locator('[data-testid=history-entry]').allTextContents();
      expect(history[0]).toContain(changedItem);
      expect(history[0]).toMatch(/→\s*Keep/);
      expect(history[0]).toContain('Dario Lindgren');
      await screenshot(page, 'decisions-overridden');
      expect(await accessibilityViolations(page), 'the decisions after an override').toEqual([]);
      await page.locator('[data-testid=what-if]').screenshot({ path: join(screenshots, 'decisions-what-if.png') });

      await resetDecisions(page);
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('at tablet width: the workspace, and the column-setup table of a fresh upload, which the designer then discards', async () => {
    const { context, page, problems } = await freshContext(tablet);
    try {
      await signInThroughPage(page, demoEmails.designer);
      await page.goto(`${baseUrl()}/studies/${demo.study}/decisions`);
      await hydrated(page);
      await settledRemoved(page);
      await screenshot(page, 'decisions-tablet');

      const created = await page.request.post(`${baseUrl()}/api/studies`, { data: { teamId: demo.team, name: 'Tablet check study' }, headers: { origin: baseUrl() } });
      const studyId = (await created.json()).study.id as string;
      const header = ['respondent_id', ...Array.from({ length: 12 }, (_, k) => `satisfaction_with_service_${k + 1}`)].join(',');
      const rows = Array.from({ length: 30 }, (_, r) => [`r${r + 1}`, ...Array.from({ length: 12 }, (_, k) => String(((r * 7 + k * 3) % 5) + 1))].join(','));
      const uploaded = await page.request.post(`${baseUrl()}/api/studies/${studyId}/waves`, {
        multipart: { file: { name: 'tablet.csv', mimeType: 'text/csv', buffer: Buffer.from([header, ...rows].join('\n')) } },
        headers: { origin: baseUrl() },
      });
      expect(uploaded.status()).toBe(201);
      const waveId = (await uploaded.json()).wave.id as string;
      await page.goto(`${baseUrl()}/studies/${studyId}/upload?wave=${waveId}`);
      await hydrated(page);
      await page.locator('[data-testid=setup-table]').waitFor({ timeout: 15_000 });
      // The whole column setup fits the panel at 768 px: no column cut off behind a scroll.
      const overflow = await page.evaluate(() => {
        const table = document.querySelector('[data-testid=setup-table]') as HTMLElement;
        return table.scrollWidth - (table.parentElement as HTMLElement).clientWidth;
      });
      expect(overflow).toBeLessThanOrEqual(0);
      expect(await page.locator('[data-testid=setup-counts-inline]').first().isVisible()).toBe(true);
      await screenshot(page, 'decisions-tablet-column-setup');

      await page.goto(`${baseUrl()}/studies/${studyId}`);
      await hydrated(page);
      await expect(page.locator('[data-testid=wave-row]').first().textContent()).resolves.toContain('not yet');
      await page.click('[data-testid=discard-wave]');
      await Promise.all([page.waitForEvent('load'), page.click('[data-testid=discard-wave-confirm]')]);
      await hydrated(page).catch(() => undefined);
      expect(await page.locator('[data-testid=wave-row]').count()).toBe(0);
      // Only an owner deletes a study.
      expect((await (await signedIn(demoEmails.owner)).delete(`/api/studies/${studyId}`)).status).toBe(204);
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
