/**
 * The handoff in a real browser (Debian's Chromium through playwright-core), the three journeys
 * of issue 11 on a study of the demo team:
 * 1. the designer publishes through the study page's button (first refused while an item is
 *    undecided, then version 1), and the field managers and client reviewers are e-mailed;
 * 2. the field manager finds the list from the dashboard, downloads XLSX and CSV and reads them
 *    back, and marks the version programmed (the designer is e-mailed);
 * 3. the client reviewer reads the aggregates and decisions, comments on an item, approves (the
 *    designer is e-mailed), and the study page shows the review state.
 * The decisions themselves are written into the test database as the workspace's route writes
 * them (tests/api/handoff-http.ts). Screenshots: test-results/screenshots/handoff-*.png.
 */
import { readFileSync } from 'node:fs';
import Papa from 'papaparse';
import * as XLSX from 'xlsx-republish';
import { afterAll, describe, expect, it } from 'vitest';
import { baseUrl, demoEmails, signedIn } from '../setup/http';
import { accessibilityViolations, freshContext, hydrated, screenshot, signInThroughPage } from '../setup/browser';
import { decide, handoffStudy, type HandoffStudy, keepAll, lastMailId, mailsAbout } from '../api/handoff-http';

const viewport = { width: 1280, height: 900 };
const studyName = 'Library members survey 2027 (handoff)';
const NEW_WORDING = 'How often, in a typical month, do you visit the <main> branch?';
let study: HandoffStudy;

afterAll(async () => {
  if (study) await (await signedIn(demoEmails.owner)).delete(`/api/studies/${study.studyId}`);
});

describe('the handoff in Chromium', () => {
  it('designer publishes, field manager exports and marks programmed, reviewer comments and approves', async () => {
    const designerApi = await signedIn(demoEmails.designer);
    study = await handoffStudy(designerApi, studyName, true);
    await decide(study.studyId, demoEmails.designer, {
      ...keepAll(study.items.filter((id) => id !== 'coll_3')),
      coll_7: { decision: 'drop', reason: 'Says what coll_2 says, in other words.' },
      hours_2: { decision: 'merge', into: 'hours_1', reason: '=SUM(1,2) is not a reason, but it must not run.' },
      dig_1: { decision: 'reword', wording: NEW_WORDING, reason: 'Clearer about frequency.' },
    });

    // 1. The designer.
    {
      const { context, page, problems } = await freshContext(viewport);
      try {
        await signInThroughPage(page, demoEmails.designer);
        await page.goto(`${baseUrl()}/studies/${study.studyId}`);
        await hydrated(page);
        await page.locator('[data-testid=publish-button]').click();
        await expect(page.locator('[data-testid=publish-error]').textContent()).resolves.toContain('1 item is undecided: coll_3');
        await screenshot(page, 'handoff-designer-refused');

        await decide(study.studyId, demoEmails.designer, { coll_3: { decision: 'keep', reason: 'The only item on magazines.' } });
        const before = lastMailId();
        await page.reload();
        await hydrated(page);
        await page.fill('#publish-note', 'Version for the May fieldwork.');
        await Promise.all([page.waitForURL(/\/field-list\?published=1$/, { timeout: 15_000 }), page.locator('[data-testid=publish-button]').click()]);
        await expect(page.locator('[data-testid=published-notice]').textContent()).resolves.toContain('Version 1 is published.');
        await expect(page.locator('[data-testid=field-list-heading]').textContent()).resolves.toContain('version 1');
        const mails = mailsAbout(studyName, before);
        expect(mails.map((mail) => mail.to)).toEqual(expect.arrayContaining([demoEmails.field, demoEmails.reviewer]));
        expect(mails.map((mail) => mail.to)).not.toContain(demoEmails.designer);
        await screenshot(page, 'handoff-designer-published');
        // The refused publication's 409 is logged by Chromium as a failed resource; nothing else may be.
        expect(problems.filter((problem) => !problem.includes('status of 409'))).toEqual([]);
        expect(problems).toHaveLength(1);
      } finally {
        await context.close();
      }
    }

    // 2. The field manager.
    {
      const { context, page, problems } = await freshContext(viewport);
      try {
        await signInThroughPage(page, demoEmails.field);
        // The studies list says what waits on the field manager, with a link to it.
        const row = page.locator('[data-testid=study-row]', { hasText: studyName });
        await expect(row.locator('[data-testid=study-handoff]').textContent()).resolves.toBe('Cut list: Version 1 · not yet programmed · awaiting the client’s review');
        await expect(row.locator('[data-testid=study-next-step]').getAttribute('href')).resolves.toBe(`/studies/${study.studyId}/field-list`);
        await expect(row.locator('[data-testid=study-next-step]').textContent()).resolves.toBe('Version 1 to program');
        await screenshot(page, 'handoff-field-dashboard');
        await page.getByRole('link', { name: studyName }).first().click();
        await page.waitForURL(new RegExp(`/studies/${study.studyId}$`));
        await page.locator('[data-testid=field-list-link]').click();
        await page.waitForURL(/\/field-list$/);
        await hydrated(page);
        await expect(page.locator('[data-testid=field-list-heading]').textContent()).resolves.toContain('version 1');
        const programRows = page.locator('[data-testid=program-row]');
        expect(await programRows.count()).toBe(study.items.length - 2);
        await expect(page.locator('[data-testid=program-table]').textContent()).resolves.toContain(NEW_WORDING);
        await screenshot(page, 'handoff-field-list');
        expect(await accessibilityViolations(page), 'the published field list').toEqual([]);

        const [xlsxDownload] = await Promise.all([page.waitForEvent('download'), page.locator('[data-testid=download-xlsx]').click()]);
        expect(xlsxDownload.suggestedFilename()).toBe('paredown-cut-list-library-members-survey-2027-handoff-v1.xlsx');
        const book = XLSX.read(readFileSync(await xlsxDownload.path()), { type: 'buffer', cellFormula: true });
        const sheetRows = XLSX.utils.sheet_to_json<(string | number)[]>(book.Sheets['Cut list'], { header: 1, defval: '' });
        expect(sheetRows).toHaveLength(study.items.length + 1);
        expect(sheetRows.find((row) => row[2] === 'dig_1')?.[7]).toBe(NEW_WORDING);
        expect(sheetRows.find((row) => row[2] === 'hours_2')?.[9]).toBe("'=SUM(1,2) is not a reason, but it must not run.");

        const [csvDownload] = await Promise.all([page.waitForEvent('download'), page.locator('[data-testid=download-csv]').click()]);
        expect(csvDownload.suggestedFilename()).toBe('paredown-cut-list-library-members-survey-2027-handoff-v1.csv');
        const parsed = Papa.parse<string[]>(readFileSync(await csvDownload.path(), 'utf8').replace(/^\uFEFF/, ''), { skipEmptyLines: true });
        expect(parsed.errors).toEqual([]);
        expect(parsed.data).toEqual(sheetRows.map((row) => row.map(String)));

        const before = lastMailId();
        await page.locator('[data-testid=programmed-button]').click();
        await expect(page.locator('[data-testid=programmed-result]').textContent()).resolves.toContain('Version 1 is marked as programmed.');
        expect(mailsAbout(studyName, before).map((mail) => [mail.to, mail.subject])).toContainEqual([demoEmails.designer, `Version 1 of “${studyName}” is programmed`]);
        await page.reload();
        await expect(page.locator('[data-testid=programmed-state]').textContent()).resolves.toMatch(/^Programmed by /);
        await screenshot(page, 'handoff-field-programmed');
        expect(problems).toEqual([]);
      } finally {
        await context.close();
      }
    }

    // 3. The client reviewer.
    {
      const { context, page, problems } = await freshContext(viewport);
      try {
        await signInThroughPage(page, demoEmails.reviewer);
        const row = page.locator('[data-testid=study-row]', { hasText: studyName });
        await expect(row.locator('[data-testid=study-next-step]').textContent()).resolves.toBe('Version 1 to review');
        await page.goto(`${baseUrl()}/studies/${study.studyId}`);
        await expect(page.locator('[data-testid=study-review-state]').textContent()).resolves.toContain('Awaiting the client’s review');
        await page.locator('[data-testid=review-link]').click();
        await page.waitForURL(/\/review$/);
        await hydrated(page);
        await expect(page.locator('[data-testid=audit-aggregates]').textContent()).resolves.toContain('Respondents used');
        await expect(page.locator('[data-testid=review-decisions]').textContent()).resolves.toContain('Says what coll_2 says, in other words.');
        expect(await page.locator('[data-testid=memo-link]').getAttribute('href')).toBe(`/audits/${study.auditId}/memo`);
        await screenshot(page, 'handoff-reviewer-review');
        expect(await accessibilityViolations(page), 'the review page with a published list').toEqual([]);

        await page.selectOption('#comment-target', { label: 'Item coll_7: New titles reach the shelves quickly.' });
        await page.getByLabel('Post the comment').fill('Fine to drop coll_7; the shelves question stays in coll_2.');
        await page.getByRole('button', { name: 'Post the comment' }).click();
        await expect(page.locator('[data-testid=comment]').first().textContent()).resolves.toContain('on item coll_7');

        const before = lastMailId();
        await page.fill('#review-comment', 'Approved for the May fieldwork.');
        await page.locator('[data-testid=approve-button]').click();
        await expect(page.locator('[data-testid=review-result]').textContent()).resolves.toContain('Approved by the client (version 1).');
        expect(mailsAbout(studyName, before).map((mail) => [mail.to, mail.subject])).toContainEqual([demoEmails.designer, `Version 1 of “${studyName}” is approved`]);
        await page.reload();
        await screenshot(page, 'handoff-reviewer-approved');
        expect(await accessibilityViolations(page), 'the approved review page').toEqual([]);

        await page.goto(`${baseUrl()}/studies/${study.studyId}`);
        await expect(page.locator('[data-testid=study-review-state]').textContent()).resolves.toContain('Approved by the client');
        await screenshot(page, 'handoff-reviewer-study');
        await page.locator('[data-testid=activity-link]').click();
        await page.waitForURL(/\/activity$/);
        const activity = await page.locator('[data-testid=activity-table]').textContent();
        for (const words of ['approved version 1', 'commented on item coll_7', 'marked version 1 as programmed', 'published version 1 of the cut list', 'decided keep for coll_3']) {
          expect(activity).toContain(words);
        }
        await screenshot(page, 'handoff-activity');
        expect(problems).toEqual([]);
      } finally {
        await context.close();
      }
    }
  }, 240_000);
});
