/**
 * A real browser (Debian's Chromium through playwright-core) signs in as every demo user through
 * the sign-in page's island and saves a screenshot of the dashboard to
 * test-results/screenshots/<role>.png. Any Content-Security-Policy violation or page error fails.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { execSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { baseUrl, demo, demoEmails, demoPassword } from '../setup/http';

const screenshots = join('test-results', 'screenshots');

function chromiumPath(): string {
  if (process.env.CHROMIUM_PATH) return process.env.CHROMIUM_PATH;
  if (existsSync('/usr/bin/chromium')) return '/usr/bin/chromium';
  const found = execSync('command -v chromium || command -v chromium-browser || true', { shell: '/bin/sh', encoding: 'utf8' }).trim();
  if (!found) throw new Error('Chromium is not installed: the browser tests need /usr/bin/chromium (npm test installs it with apt-get as root).');
  return found;
}

const flags = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

const profiles: string[] = [];

async function freshContext(): Promise<{ context: BrowserContext; page: Page; problems: string[] }> {
  const profile = mkdtempSync(join(tmpdir(), 'paredown-chromium-'));
  profiles.push(profile);
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: chromiumPath(),
    headless: true,
    args: flags,
    viewport: { width: 1280, height: 800 },
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const problems: string[] = [];
  page.on('console', (message) => {
    if (message.type() === 'error' || /Content Security Policy/i.test(message.text())) problems.push(message.text());
  });
  page.on('pageerror', (error) => problems.push(error.message));
  return { context, page, problems };
}

/** Waits until every island on the page has hydrated (Astro drops the `ssr` attribute then). */
async function hydrated(page: Page) {
  await page.waitForFunction(() => document.querySelectorAll('astro-island').length > 0 && !document.querySelector('astro-island[ssr]'), null, { timeout: 15_000 });
}

async function signInThroughPage(page: Page, email: string) {
  await page.goto(`${baseUrl()}/signin`);
  await hydrated(page);
  await page.fill('#email', email);
  await page.fill('#password', demoPassword);
  await Promise.all([page.waitForURL(`${baseUrl()}/`, { timeout: 15_000 }), page.click('button[type=submit]')]);
}

beforeAll(() => {
  mkdirSync(screenshots, { recursive: true });
});

afterAll(() => {
  for (const profile of profiles) rmSync(profile, { recursive: true, force: true });
});

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
        const canCreate = role === 'owner' || role === 'designer' || role === 'outsider';
        expect(await page.locator('button:has-text("New study")').count()).toBe(canCreate ? 1 : 0);
        await page.screenshot({ path: join(screenshots, `${role}.png`), fullPage: true });
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
      await page.screenshot({ path: join(screenshots, 'study-owner.png'), fullPage: true });
      await page.goto(`${baseUrl()}/teams/${demo.team}/members`);
      expect(await page.locator('[data-testid=member-row]').count()).toBeGreaterThanOrEqual(4);
      await page.screenshot({ path: join(screenshots, 'members-owner.png'), fullPage: true });
      await page.goto(`${baseUrl()}/account`);
      await hydrated(page);
      await page.fill('#token-name', 'browser test');
      await page.click('button:has-text("Create token")');
      await expect(page.locator('[data-testid=new-token]').textContent({ timeout: 10_000 })).resolves.toMatch(/^pd_/);
      await page.screenshot({ path: join(screenshots, 'account-owner.png'), fullPage: true });
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
      await owner.page.screenshot({ path: join(screenshots, 'outbox-owner.png'), fullPage: true });

      await invitee.page.goto(link!);
      await hydrated(invitee.page);
      await invitee.page.screenshot({ path: join(screenshots, 'invite-new-account.png'), fullPage: true });
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
      await page.screenshot({ path: join(screenshots, 'signin-error.png'), fullPage: true });
      expect(problems.filter((p) => !/401|Failed to load resource/.test(p))).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
