/**
 * Audits in a real browser (Debian's Chromium through playwright-core): the designer starts an
 * audit from the study page's form, the progress bar shows while it runs, and the audit page shows
 * the proposed cuts. Screenshots go to test-results/screenshots/audit-*.png. Any console error,
 * page error or Content-Security-Policy violation fails.
 */
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { baseUrl, demo, demoEmails } from '../setup/http';
import { accessibilityViolations, freshContext, hydrated, screenshot, screenshots, signInThroughPage } from '../setup/browser';

const viewport = { width: 1280, height: 900 };

describe('audits in Chromium', () => {
  it('the designer starts an audit on the study page, watches it run and opens its page', async () => {
    const { context, page, problems } = await freshContext(viewport);
    try {
      await signInThroughPage(page, demoEmails.designer);
      await page.goto(`${baseUrl()}/studies/${demo.study}`);
      await hydrated(page);
      const form = page.locator('[data-testid=audit-form]');
      await expect(form.locator('#audit-strongPairThreshold').inputValue()).resolves.toBe('0.8');
      // The demo study's own constraint (src/lib/server/demo-seed.ts: minutesPerItem 0.15) is shown as its default.
      await expect(form.locator('#audit-secondsPerItem').inputValue()).resolves.toBe('9');
      // Every setting of the table has a field: the further thresholds show the engine's defaults
      // (src/lib/engine/engine-settings.ts: merge at |r| 0.95, interval coverage 95%).
      await form.locator('summary:has-text("Further thresholds")').click();
      await expect(form.locator('#audit-mergeCorrelation').inputValue()).resolves.toBe('0.95');
      await expect(form.locator('#audit-confidenceLevel').inputValue()).resolves.toBe('95');
      await expect(form.locator('#audit-parallelIterations').inputValue()).resolves.toBe('100');
      await form.locator('#audit-method').selectOption('pearson');
      await form.locator('#audit-outcome').selectOption('overall_sat');
      await form.locator('#audit-bootstrap').fill('200');
      // A seed of its own, so that no earlier audit with the same settings is reused; fixed (the
      // test server's database is new on every run), so a failure replays exactly.
      await form.locator('#audit-seed').fill('50000');
      await form.locator('summary:has-text("Locked items")').click();
      await form.locator('label:has-text("hours_1") input[type=checkbox]').check();
      // A value the server would refuse (1-19 draws: no percentile) is said in the form's words,
      // the field's label and range (settings-table.ts, formFieldProblem), and nothing is sent.
      const posted: string[] = [];
      page.on('request', (request) => {
        if (request.method() === 'POST' && request.url().includes('/audits')) posted.push(request.url());
      });
      await form.locator('#audit-residualBootstrapDraws').fill('5');
      await form.locator('button[type=submit]').click();
      await expect(form.locator('[data-testid=audit-form-error]').textContent()).resolves.toBe(
        'Residual bootstrap draws: enter 0 (off) or a whole number from 20 to 10000 (you entered 5).',
      );
      expect(posted).toEqual([]);
      await form.locator('#audit-residualBootstrapDraws').fill('200');
      await form.locator('button[type=submit]').click();

      const progress = form.locator('[data-testid=audit-progress] progress');
      await progress.waitFor({ state: 'visible', timeout: 10_000 });
      await page.waitForFunction(() => Number(document.querySelector('[data-testid=audit-form] progress')?.getAttribute('value') ?? 0) > 0, null, { timeout: 30_000 });
      await page.locator('#run-audit-heading').scrollIntoViewIfNeeded();
      await screenshot(page, 'audit-study-running');
      expect(await accessibilityViolations(page), 'the study page with a running audit').toEqual([]);
      // The new audit joined the list of the study's audits too.
      expect(await page.locator('[data-testid=audit-list] [data-testid=audit-row]').count()).toBeGreaterThan(0);

      const open = form.locator('[data-testid=open-audit]');
      await open.waitFor({ state: 'visible', timeout: 90_000 });
      await screenshot(page, 'audit-study-done');
      await Promise.all([page.waitForURL(/\/audits\//, { timeout: 15_000 }), open.click()]);

      await expect(page.locator('[data-testid=audit-title]').textContent()).resolves.toContain('Audit of Pilot 1');
      // fixtures/demo/README.md, "What is planted": five overlap structures, each one proposal.
      expect(await page.locator('[data-testid=recommendation]').count()).toBe(5);
      expect((await page.locator('[data-testid=recommendations-summary]').textContent())?.trim()).toMatch(/^5 overlap clusters/);
      const reasons = await page.locator('[data-testid=recommendation-reason]').allTextContents();
      expect(reasons.every((reason) => reason.length > 20)).toBe(true);
      expect(await page.locator('[data-testid=recommendation-stability]').count()).toBe(5);
      await expect(page.locator('[data-testid=audit-figures]').textContent()).resolves.toContain('386');
      await expect(page.locator('main').textContent()).resolves.toContain('1 locked item');
      expect(await page.locator('[data-testid=after-cut-scales] tbody tr').count()).toBeGreaterThan(0);
      await expect(page.locator('[data-testid=download-json]').getAttribute('href')).resolves.toMatch(/\/api\/audits\/.+\?download=1$/);
      await screenshot(page, 'audit-page');
      // Close-ups at full resolution, to read the figures and one proposal with a blocked cut.
      await page.locator('#figures').screenshot({ path: join(screenshots, 'audit-page-figures.png') });
      await page.locator('[data-testid=recommendation]:has-text("dig_1")').screenshot({ path: join(screenshots, 'audit-page-recommendation.png') });
      await page.locator('#after-cut').screenshot({ path: join(screenshots, 'audit-page-after-cut.png') });
      // The driver model of the outcome chosen in the form, before and after the cut.
      // (the panel hydrates when its section scrolls into view, then loads its slice)
      await page.locator('#driver-model').scrollIntoViewIfNeeded();
      const driver = page.locator('[data-testid=driver-model]');
      await driver.waitFor({ state: 'visible', timeout: 30_000 });
      expect(await driver.locator('[data-testid=driver-model-table] tbody tr').count()).toBeGreaterThan(10);
      expect(await driver.locator('[data-testid=driver-model-bars] rect').count()).toBeGreaterThan(20);
      await expect(driver.locator('[data-testid=driver-model-sentences] li').first().textContent()).resolves.toMatch(/standard error is [\d.]+× what it would be/);
      await page.locator('#driver-model').screenshot({ path: join(screenshots, 'audit-page-driver-model.png') });
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('the designer cancels a running audit from its page', async () => {
    const { context, page, problems } = await freshContext(viewport);
    let id = '';
    try {
      await signInThroughPage(page, demoEmails.designer);
      await page.goto(`${baseUrl()}/studies/${demo.study}`);
      await hydrated(page);
      // Started through the API from the page's own session: polychoric with 5,000 resamples runs for
      // minutes (docs/decisions/004), so it is still queued or running when the page opens.
      id = await page.evaluate(async (wave) => {
        const response = await fetch(`/api/waves/${wave}/audits`, {
          method: 'POST',
          headers: { 'Content-Type': 'application/json' },
          body: JSON.stringify({ settings: { method: 'polychoric', bootstrap: 5000, seed: 50_001 } }),
        });
        return (await response.json()).audit.id as string;
      }, 'wave-riverbend-pilot-1');
      // The study's list of audits (a narrow column) shows the proposed cuts so far without their
      // reasons, and links to the audit's page for them.
      await page.goto(`${baseUrl()}/studies/${demo.study}`);
      await hydrated(page);
      const listed = page.locator(`[data-testid=audit-list] [data-testid=early-cut-list]`);
      await listed.first().waitFor({ state: 'visible', timeout: 30_000 });
      expect(await listed.first().locator('[data-testid=early-cut]').count()).toBeGreaterThan(0);
      await expect(listed.first().locator('a').getAttribute('href')).resolves.toBe(`/audits/${id}`);
      await expect(listed.first().textContent()).resolves.not.toContain('correlate strongly');
      await listed.first().screenshot({ path: join(screenshots, 'audit-list-early-cut-list.png') });
      await page.goto(`${baseUrl()}/audits/${id}`);
      await hydrated(page);
      const watcher = page.locator('[data-testid=audit-watcher]');
      const cancel = watcher.locator('[data-testid=cancel-audit]');
      await cancel.waitFor({ state: 'visible', timeout: 10_000 });
      await expect(cancel.textContent()).resolves.toBe('Cancel audit'); // src/lib/words/labels.ts, cancelAuditWords
      // While the bootstrap runs, the proposed cuts made so far show under the progress bar
      // (docs/decisions/026-early-cut-list.md); the demo's exact copy events_3b is among them.
      const early = watcher.locator('[data-testid=early-cut-list]');
      await early.waitFor({ state: 'visible', timeout: 30_000 });
      expect(await early.locator('[data-testid=early-cut]').count()).toBeGreaterThan(0);
      await expect(early.textContent()).resolves.toContain('events_3b');
      await expect(early.locator('h2').textContent()).resolves.toBe('Proposed cuts so far'); // src/lib/words/labels.ts, earlyCutListWords; an h2 under the page's h1
      await screenshot(page, 'audit-page-running');
      expect(await accessibilityViolations(page), 'a running audit').toEqual([]);
      // The page reloads once the audit has ended, with its status in the heading.
      await Promise.all([page.waitForEvent('load', { timeout: 15_000 }), cancel.click()]);
      await hydrated(page);
      await expect(page.locator('[data-testid=audit-title] .status').textContent()).resolves.toBe('Cancelled');
      await expect(watcher.locator('[data-testid=audit-row]').getAttribute('data-status')).resolves.toBe('cancelled');
      await expect(watcher.locator('[data-testid=audit-error]').textContent()).resolves.toMatch(/^Cancelled by .+ before it finished/);
      expect(await watcher.locator('[data-testid=cancel-audit]').count()).toBe(0);
      expect(await watcher.locator('button:has-text("Retry")').count()).toBe(1);
      await screenshot(page, 'audit-page-cancelled');
      expect(problems).toEqual([]);
    } finally {
      // Should the test fail before its click, minutes of resampling must not hold the team's thread.
      if (id) await page.evaluate(async (audit) => void (await fetch(`/api/audits/${audit}/cancel`, { method: 'POST' })), id).catch(() => undefined);
      await context.close();
    }
  });

  it('the client reviewer sees the audits and the audit page, but no form to start one', async () => {
    const { context, page, problems } = await freshContext(viewport);
    try {
      await signInThroughPage(page, demoEmails.reviewer);
      await page.goto(`${baseUrl()}/studies/${demo.study}`);
      await hydrated(page);
      expect(await page.locator('[data-testid=audit-form]').count()).toBe(0);
      const open = page.locator('[data-testid=audit-list] [data-testid=open-audit]').first();
      await open.waitFor({ state: 'visible', timeout: 30_000 });
      await screenshot(page, 'audit-study-reviewer');
      await Promise.all([page.waitForURL(/\/audits\//, { timeout: 15_000 }), open.click()]);
      expect(await page.locator('[data-testid=recommendation]').count()).toBeGreaterThan(0);
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
