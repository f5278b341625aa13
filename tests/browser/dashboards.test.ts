/**
 * A real browser (Debian's Chromium through playwright-core) signs in as every demo user through
 * the sign-in page's island and saves a screenshot of the dashboard to
 * test-results/screenshots/<role>.png. Any Content-Security-Policy violation or page error fails.
 */
import { describe, expect, it } from 'vitest';
import { baseUrl, demo, demoEmails } from '../setup/http';
import { freshContext, hydrated, screenshot, signInThroughPage } from '../setup/browser';

describe('dashboards in Chromium', () => {
  const roles = [
    ['owner', demoEmails.owner, 'Owner'],
    ['designer', demoEmails.designer, 'Survey designer'],
    ['field_manager', demoEmails.field, 'Field manager'],
    ['client_reviewer', demoEmails.reviewer, 'Client reviewer'],
    ['outsider', demoEmails.outsider, 'Owner'],
  ] as const;

  for (const [role, email, roleLabel] of roles) {
    it(`signs in as ${email} and shows the dashboard`, async () => {
      const { context, page, problems } = await freshContext();
      try {
        await signInThroughPage(page, email);
        await page.waitForLoadState('networkidle');
        await expect(page.locator('[data-testid=signed-in-as]').textContent()).resolves.toContain(email);
        await expect(page.locator('[data-testid=team-section]').first().textContent()).resolves.toContain(roleLabel);
        const studyList = await page.locator('main').textContent();
        if (role === 'outsider') {
          expect(studyList).toContain('Northgate resident panel');
          expect(studyList).not.toContain('Riverbend City Libraries');
        } else {
          expect(studyList).toContain('Riverbend City Libraries member survey 2027');
          expect(studyList).not.toContain('Northgate resident panel');
        }
        // The seeded home-service study's version 1 waits on the field manager and the reviewer (demo-handoff.ts).
        const nextSteps = await page.locator('[data-testid=study-next-step]').allTextContents();
        if (role === 'field_manager') expect(nextSteps).toContain('Version 1 to program');
        else if (role === 'client_reviewer') expect(nextSteps).toContain('Version 1 to review');
        else expect(nextSteps.filter((step) => step.startsWith('Version'))).toEqual([]);
        // The member survey is audited and unpublished: its designers are pointed at deciding (or publishing).
        const member = page.locator('[data-testid=study-row]', { hasText: 'Riverbend City Libraries member survey 2027' });
        const memberStep = member.locator('[data-testid=study-next-step]');
        if (role === 'owner' || role === 'designer') await expect(memberStep.textContent()).resolves.toMatch(/^(\d+ items? to decide|Ready to publish)$/);
        else expect(await memberStep.count()).toBe(0);
        const canCreate = role === 'owner' || role === 'designer' || role === 'outsider';
        expect(await page.locator('button:has-text("New study")').count()).toBe(canCreate ? 1 : 0);
        await screenshot(page, role);
        expect(problems).toEqual([]);
      } finally {
        await context.close();
      }
    });
  }

  it('shows the study page and the members page to the owner, with working islands', async () => {
    const { context, page, problems } = await freshContext();
    try {
      await signInThroughPage(page, demoEmails.owner);
      await page.goto(`${baseUrl()}/studies/${demo.study}`);
      await expect(page.locator('[data-testid=study-name]').textContent()).resolves.toContain('Riverbend City Libraries');
      expect(await page.locator('[data-testid=wave-row]').count()).toBe(1);
      await screenshot(page, 'study-owner');
      await page.goto(`${baseUrl()}/teams/${demo.team}/members`);
      expect(await page.locator('[data-testid=member-row]').count()).toBeGreaterThanOrEqual(4);
      await screenshot(page, 'members-owner');
      await page.goto(`${baseUrl()}/account`);
      await hydrated(page);
      await page.fill('#token-name', 'browser test');
      await page.click('button:has-text("Create token")');
      await expect(page.locator('[data-testid=new-token]').textContent({ timeout: 10_000 })).resolves.toMatch(/^pd_/);
      await screenshot(page, 'account-owner');
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('invites through the members page, and the invitee joins from the link in the outbox', async () => {
    const owner = await freshContext();
    const invitee = await freshContext();
    const email = `browser-invitee-${Date.now()}@example.org`;
    try {
      await signInThroughPage(owner.page, demoEmails.owner);
      await owner.page.goto(`${baseUrl()}/teams/${demo.team}/members`);
      await hydrated(owner.page);
      await owner.page.fill('#invite-email', email);
      await owner.page.selectOption('#invite-role', 'field_manager');
      await owner.page.click('button:has-text("Send invitation")');
      await owner.page.waitForSelector(`[data-testid=invitation-row]:has-text("${email}")`, { timeout: 10_000 });
      await owner.page.goto(`${baseUrl()}/outbox`);
      const link = await owner.page.locator(`[data-testid=outbox-mail]:has-text("${email}") a`).first().getAttribute('href');
      expect(link).toMatch(/\/invite\//);
      await screenshot(owner.page, 'outbox-owner');

      await invitee.page.goto(link!);
      await hydrated(invitee.page);
      await screenshot(invitee.page, 'invite-new-account');
      await invitee.page.fill('#name', 'Browser Invitee');
      await invitee.page.fill('#password', 'browser-password');
      await invitee.page.fill('#repeat', 'browser-password');
      await Promise.all([invitee.page.waitForURL(`${baseUrl()}/`, { timeout: 15_000 }), invitee.page.click('button[type=submit]')]);
      await expect(invitee.page.locator('[data-testid=team-section]').first().textContent()).resolves.toContain('Field manager');

      // Leave the team as the seed made it for the screenshots of other runs.
      await owner.page.goto(`${baseUrl()}/teams/${demo.team}/members`);
      owner.page.once('dialog', (dialog) => void dialog.accept());
      await hydrated(owner.page);
      await owner.page.locator('[data-testid=member-row]:has-text("Browser Invitee") button:has-text("Remove")').click();
      await owner.page.waitForSelector('[data-testid=member-row]:has-text("Browser Invitee")', { state: 'detached', timeout: 10_000 });
      expect([...owner.problems, ...invitee.problems]).toEqual([]);
    } finally {
      await owner.context.close();
      await invitee.context.close();
    }
  });

  it('shows the sign-in page with a neutral message after a wrong password', async () => {
    const { context, page, problems } = await freshContext();
    try {
      await page.goto(`${baseUrl()}/signin`);
      await hydrated(page);
      await page.fill('#email', demoEmails.designer);
      await page.fill('#password', 'not-the-password');
      await page.click('button[type=submit]');
      await expect(page.locator('[data-testid=signin-error]').textContent({ timeout: 10_000 })).resolves.toContain('do not match an account');
      await screenshot(page, 'signin-error');
      expect(problems.filter((p) => !/401|Failed to load resource/.test(p))).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
