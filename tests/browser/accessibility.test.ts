/**
 * Every page of the demo, as each role sees it, checked in Chromium by axe-core (npm `axe-core`,
 * Deque's open-source checker of WCAG 2.1 A and AA and its best practices): no rule may be broken.
 * The published, programmed and approved states of a cut list are checked in handoff.test.ts,
 * where they are made. Any Content-Security-Policy violation fails too: a page that answered "not
 * found" once carried the API's policy, which blocked its own stylesheet. On a phone's width
 * (390 CSS pixels) no page scrolls sideways: wide tables scroll inside their panel.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, demo, demoEmails, inviteAndReadToken, signedIn, uniqueEmail } from '../setup/http';
import type { Page } from 'playwright-core';
import { accessibilityViolations, freshContext, signInThroughPage } from '../setup/browser';

const audit = 'audit-riverbend-pilot-1';
const wave = 'wave-riverbend-pilot-1';
const study = `/studies/${demo.study}`;
/** The study whose seeded cut list is published: the field list and the review page have a version to show. */
const home = `/studies/${demo.homeStudy}`;

/** Pages per demo user (null: signed out). */
const pagesByUser: [string | null, string[]][] = [
  [null, ['/signin', '/forgot-password', '/no-such-page']],
  [demoEmails.owner, ['/', `/teams/${demo.team}/members`, '/account', '/outbox', '/studies/new']],
  [demoEmails.designer, [study, `/audits/${audit}`, `${study}/decisions`, `${study}/upload`, `${study}/waves/${wave}`, `${study}/activity`]],
  [demoEmails.field, ['/', study, `${study}/field-list`, home, `${home}/field-list`]],
  [demoEmails.reviewer, ['/', study, `${study}/review`, `/audits/${audit}/memo`, `/audits/${audit}`, `${home}/review`]],
  // Another team's pages: the not-found page, styled (its stylesheet allowed by the page's policy).
  [demoEmails.outsider, [study, `/audits/${audit}`, `/teams/${demo.team}/members`, `${study}/waves/${wave}`]],
];

describe('accessibility of the demo pages (axe-core in Chromium)', () => {
  // The owner's account page lists an API token and the outbox an invitation with its long link,
  // so both are checked as they look with content (wide on a phone).
  beforeAll(async () => {
    const owner = await signedIn(demoEmails.owner);
    expect((await owner.post('/api/tokens', { name: 'accessibility check, a long token name for a narrow screen' })).status).toBe(201);
    await inviteAndReadToken(owner, demo.team, uniqueEmail('a-rather-long-address-for-a-narrow-screen'), 'client_reviewer');
  });

  for (const [email, paths] of pagesByUser) {
    it(`breaks no rule on the pages ${email ?? 'a signed-out visitor'} opens`, async () => {
      const problems = await visitEach(email, paths, { width: 1280, height: 900 }, async (page, label) => {
        expect(await accessibilityViolations(page), label).toEqual([]);
        if (email === demoEmails.outsider) {
          await expect(page.locator('h1').textContent()).resolves.toBe('Nothing here');
          expect(await page.evaluate(() => getComputedStyle(document.body).backgroundColor), 'the stylesheet applies').not.toBe('rgba(0, 0, 0, 0)');
        }
      });
      expect(problems.filter((problem) => !/status of 404/.test(problem))).toEqual([]);
    }, 120_000);
  }

  it("fits every page into a phone's width (390 px), where it breaks no rule either: only wide tables scroll, inside their panel", async () => {
    for (const [email, paths] of pagesByUser) {
      await visitEach(email, paths, { width: 390, height: 800 }, async (page, label) => {
        const { scrollWidth, clientWidth } = await page.evaluate(() => ({ scrollWidth: document.documentElement.scrollWidth, clientWidth: document.documentElement.clientWidth }));
        expect(scrollWidth, label).toBeLessThanOrEqual(clientWidth);
        expect(await accessibilityViolations(page), `${label} at 390 px`).toEqual([]);
      });
    }
  }, 180_000);
});

/**
 * Opens each path in a fresh Chromium of the given size, signed in as `email` (null: signed out),
 * and runs `check` on the loaded page with a label naming the user and path.
 * @returns The page's problems (console errors, page errors, CSP violations) over all paths.
 */
async function visitEach(
  email: string | null,
  paths: readonly string[],
  viewport: { width: number; height: number },
  check: (page: Page, label: string) => Promise<void>,
): Promise<string[]> {
  const { context, page, problems } = await freshContext(viewport);
  try {
    if (email !== null) await signInThroughPage(page, email);
    for (const path of paths) {
      await page.goto(`${baseUrl()}${path}`);
      await page.waitForLoadState('networkidle');
      await check(page, `${email ?? 'signed out'} ${path}`);
    }
    return [...problems];
  } finally {
    await context.close();
  }
}
