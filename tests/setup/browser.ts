/**
 * Driving Debian's Chromium through playwright-core for the browser tests: a fresh profile per
 * context (removed after the file's tests), a list of console errors, page errors and
 * Content-Security-Policy violations seen on the page, signing in through the sign-in page's
 * island, and full-page screenshots under test-results/screenshots/.
 *
 * Importing this module registers two hooks in the importing test file: the screenshot folder is
 * made before its tests and the profiles made by `freshContext` are removed after them.
 */
import { afterAll, beforeAll } from 'vitest';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { execSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { baseUrl, demoPassword } from './http';

/** Folder the screenshots are written to, relative to the repository root. */
export const screenshots = join('test-results', 'screenshots');

const flags = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];
const profiles: string[] = [];

beforeAll(() => {
  mkdirSync(screenshots, { recursive: true });
});

afterAll(() => {
  for (const profile of profiles.splice(0)) rmSync(profile, { recursive: true, force: true });
});

/**
 * Finds the Chromium executable: $CHROMIUM_PATH, /usr/bin/chromium, or whatever `chromium` or
 * `chromium-browser` is on the PATH.
 * @throws Error when no Chromium is installed.
 * @returns The absolute path of the executable.
 */
export function chromiumPath(): string {
  if (process.env.CHROMIUM_PATH) return process.env.CHROMIUM_PATH;
  if (existsSync('/usr/bin/chromium')) return '/usr/bin/chromium';
  const found = execSync('command -v chromium || command -v chromium-browser || true', { shell: '/bin/sh', encoding: 'utf8' }).trim();
  if (!found) throw new Error('Chromium is not installed: the browser tests need /usr/bin/chromium (npm test installs it with apt-get as root).');
  return found;
}

/** A browser context on a fresh profile, its first page, and the problems seen on that page so far. */
export interface FreshContext {
  context: BrowserContext;
  page: Page;
  /** Console errors, page errors and Content-Security-Policy violations, in the order seen. */
  problems: string[];
}

/**
 * Launches headless Chromium on a fresh profile and starts recording the page's problems.
 * @param viewport Size of the page in CSS pixels (1280 × 800 unless given).
 * @throws Error when no Chromium is installed.
 * @returns The context (close it in a `finally`), its page and the live list of problems.
 */
export async function freshContext(viewport: { width: number; height: number } = { width: 1280, height: 800 }): Promise<FreshContext> {
  const profile = mkdtempSync(join(tmpdir(), 'paredown-chromium-'));
  profiles.push(profile);
  const context = await chromium.launchPersistentContext(profile, { executablePath: chromiumPath(), headless: true, args: flags, viewport });
  const page = context.pages()[0] ?? (await context.newPage());
  const problems: string[] = [];
  page.on('console', (message) => {
    if (message.type() === 'error' || /Content Security Policy/i.test(message.text())) problems.push(message.text());
  });
  page.on('pageerror', (error) => problems.push(error.message));
  return { context, page, problems };
}

/**
 * Waits until every island on the page has hydrated (Astro drops the `ssr` attribute then).
 * @param page The page to watch.
 * @throws Error (playwright's TimeoutError) after 15 seconds without hydrated islands.
 */
export async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelectorAll('astro-island').length > 0 && !document.querySelector('astro-island[ssr]'), null, { timeout: 15_000 });
}

/**
 * Signs in through the sign-in page's form with the demo password and waits for the dashboard.
 * @param page The page to sign in on.
 * @param email A demo account's address.
 * @throws Error (playwright's TimeoutError) when the dashboard does not load within 15 seconds.
 */
export async function signInThroughPage(page: Page, email: string): Promise<void> {
  await page.goto(`${baseUrl()}/signin`);
  await hydrated(page);
  await page.fill('#email', email);
  await page.fill('#password', demoPassword);
  await Promise.all([page.waitForURL(`${baseUrl()}/`, { timeout: 15_000 }), page.click('button[type=submit]')]);
}

/**
 * Saves a full-page screenshot as test-results/screenshots/<name>.png.
 * @param page The page to capture.
 * @param name File name without the extension.
 */
export async function screenshot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: join(screenshots, `${name}.png`), fullPage: true });
}

/** axe-core's script, read once (it is evaluated in the page through the DevTools protocol, which the page's CSP does not govern). */
let axeSource: string | null = null;

/**
 * The accessibility rules axe-core (Deque's open-source WCAG checker, npm `axe-core`) finds broken
 * on the page as it stands, one line each: impact, rule, help text, how many elements and the
 * first one. Sections drawn lazily (`content-visibility: auto`) are checked as they are.
 * @param page The page, loaded and hydrated.
 * @returns The violations of WCAG 2.x A and AA and axe's best-practice rules; empty when none.
 */
export async function accessibilityViolations(page: Page): Promise<string[]> {
  axeSource ??= readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(axeSource);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (context: Document, options: object) => Promise<{ violations: { id: string; impact: string | null; help: string; nodes: { target: string[] }[] }[] }> } }).axe;
    const result = await axe.run(document, { resultTypes: ['violations'], runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'best-practice'] } });
    return result.violations.map((violation) => `[${violation.impact}] ${violation.id}: ${violation.help} (${violation.nodes.length}, e.g. ${violation.nodes[0]?.target.join(' ')})`);
  });
  return violations;
}

