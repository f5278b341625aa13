/**
 * The designer's workspace in Chromium: the designer opens the demo study's audit, hovers the
 * overlap map, opens a pair, re-orders the map, walks it with the keyboard, moves the threshold
 * and sorts the item table; then the same map for a generated 300-item wave uploaded through the
 * API. Frame times of a hover sweep and of each re-ordering are measured in the page and printed
 * (figures, never assertions: tests/../README.md, "Overlap map frame times"); they are also
 * written to test-results/frame-times.json. Screenshots: test-results/screenshots/workspace-*.png.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { beforeAll, describe, expect, it } from 'vitest';
import { demoIds } from '../../src/lib/server/demo-seed';
import { baseUrl, body, demo, demoEmails, signedIn, type Client } from '../setup/http';
import { accessibilityViolations, freshContext, hydrated, screenshot, screenshots, signInThroughPage } from '../setup/browser';
import { auditDone, startAuditOf300Items } from '../setup/workspace-waves';

const viewport = { width: 1280, height: 900 };
const figures: Record<string, unknown> = {};
let designer: Client;

beforeAll(async () => {
  designer = await signedIn(demoEmails.designer);
});

interface FrameStats {
  frames: number;
  meanMs: number;
  p50Ms: number;
  p95Ms: number;
  maxMs: number;
  over20Ms: number;
}

function stats(times: number[]): FrameStats {
  const sorted = [...times].sort((a, b) => a - b);
  const at = (q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
  const round = (v: number) => Math.round(v * 100) / 100;
  return { frames: times.length, meanMs: round(times.reduce((s, v) => s + v, 0) / times.length), p50Ms: round(at(0.5)), p95Ms: round(at(0.95)), maxMs: round(sorted[sorted.length - 1]), over20Ms: times.filter((t) => t > 20).length };
}

/** The map's geometry, from the data attributes the island writes. */
async function geometry(page: Page): Promise<{ margin: number; cell: number; order: string[] }> {
  const grid = page.locator('[data-testid=overlap-map-grid]');
  return {
    margin: Number(await grid.getAttribute('data-margin')),
    cell: Number(await grid.getAttribute('data-cell')),
    order: ((await grid.getAttribute('data-order')) ?? '').split(' '),
  };
}

/** Frame intervals with nothing happening: the pace of this headless browser on this machine now. */
async function idleFrames(page: Page, count: number): Promise<number[]> {
  return page.evaluate(async (frames) => {
    const next = () => new Promise<number>((resolve) => requestAnimationFrame(resolve));
    const times: number[] = [];
    let last = await next();
    for (let k = 0; k < frames; k++) {
      const now = await next();
      times.push(now - last);
      last = now;
    }
    return times;
  }, count);
}

/**
 * Sweeps the pointer over the map one cell per frame. Returns the frame intervals, the time from
 * each pointer event to the hover layer drawn for it (React render included), and that layer's
 * own drawing time.
 */
async function hoverSweep(page: Page, steps: number): Promise<{ frames: number[]; latency: number[]; draw: number[] }> {
  return page.evaluate(async (count) => {
    const target = document.querySelector('[data-testid=overlap-map-pointer]') as HTMLCanvasElement;
    const grid = document.querySelector('[data-testid=overlap-map-grid]') as HTMLElement;
    const margin = Number(grid.dataset.margin);
    const cell = Number(grid.dataset.cell);
    const m = (grid.dataset.order ?? '').split(' ').length;
    const box = target.getBoundingClientRect();
    const next = () => new Promise<number>((resolve) => requestAnimationFrame(resolve));
    const frames: number[] = [];
    const latency: number[] = [];
    const draw: number[] = [];
    let last = await next();
    let dispatchedAt = 0;
    for (let k = 0; k <= count; k++) {
      const drawnAt = Number(target.dataset.drawnAt ?? 0);
      if (dispatchedAt > 0 && drawnAt > dispatchedAt) {
        latency.push(drawnAt - dispatchedAt);
        draw.push(Number(target.dataset.drawMs ?? 0));
      }
      if (k === count) break;
      // A snake through the matrix: every frame lands on a new cell, rows and columns both change.
      const row = (k * 7) % m;
      const column = (k * 3 + Math.floor(k / m)) % m;
      dispatchedAt = performance.now();
      target.dispatchEvent(new PointerEvent('pointermove', { bubbles: true, clientX: box.left + margin + (column + 0.5) * cell, clientY: box.top + margin + (row + 0.5) * cell, pointerType: 'mouse' }));
      // Two frames per step: the island reads the pointer in the next frame and draws after it.
      await next();
      const now = await next();
      frames.push((now - last) / 2);
      last = now;
    }
    return { frames, latency, draw };
  }, steps);
}

function sweepFigures(sweep: { frames: number[]; latency: number[]; draw: number[] }, idle: number[]) {
  return { idleFrame: stats(idle), sweepFrame: stats(sweep.frames), pointerToDrawn: stats(sweep.latency), hoverLayerDraw: stats(sweep.draw) };
}

/** Re-orders the map and measures the time to the next painted frame and the matrix layer's own draw. */
async function reorder(page: Page, ordering: 'cluster' | 'scale' | 'questionnaire'): Promise<{ toFrameMs: number; drawMs: number }> {
  return page.evaluate(async (key) => {
    const input = document.querySelector(`[data-testid=map-order-${key}]`) as HTMLInputElement;
    const canvas = document.querySelector('[data-testid=overlap-map-canvas]') as HTMLCanvasElement;
    const started = performance.now();
    input.click();
    await new Promise((resolve) => requestAnimationFrame(resolve));
    await new Promise((resolve) => requestAnimationFrame(resolve));
    return { toFrameMs: Math.round((performance.now() - started) * 100) / 100, drawMs: Number(canvas.dataset.drawMs) };
  }, ordering);
}

/** The centre of a cell, in page coordinates. */
async function cellCentre(page: Page, rowItem: string, columnItem: string): Promise<{ x: number; y: number }> {
  await page.locator('[data-testid=overlap-map-grid]').scrollIntoViewIfNeeded();
  const { margin, cell, order } = await geometry(page);
  const box = (await page.locator('[data-testid=overlap-map-pointer]').boundingBox())!;
  const row = order.indexOf(rowItem);
  const column = order.indexOf(columnItem);
  expect(row).toBeGreaterThanOrEqual(0);
  expect(column).toBeGreaterThanOrEqual(0);
  return { x: box.x + margin + (column + 0.5) * cell, y: box.y + margin + (row + 0.5) * cell };
}

async function openMap(page: Page, auditId: string): Promise<void> {
  await page.goto(`${baseUrl()}/audits/${auditId}`);
  await hydrated(page);
  await page.waitForFunction(() => Number((document.querySelector('[data-testid=overlap-map-canvas]') as HTMLCanvasElement | null)?.dataset.drawMs ?? -1) >= 0, null, { timeout: 30_000 });
}

describe('the workspace in Chromium', () => {
  it('the designer explores the demo audit: map hover, a pair, re-ordering, keyboard, threshold, item table', async () => {
    const started = await designer.post(`/api/waves/${demoIds.demoWave}/audits`, { settings: { method: 'pearson', bootstrap: 0, seed: 4_243 } });
    const auditId = (await body(started)).audit.id as string;
    await auditDone(designer, auditId);
    const audit = (await body(await designer.get(`/api/audits/${auditId}`))).result;

    const { context, page, problems } = await freshContext(viewport);
    try {
      await signInThroughPage(page, demoEmails.designer);
      await page.goto(`${baseUrl()}/studies/${demo.study}`);
      await hydrated(page);
      await openMap(page, auditId);
      await screenshot(page, 'workspace-01-page');
      await page.locator('#overlap-map').screenshot({ path: join(screenshots, 'workspace-02-map.png') });

      // Hover the planted pair coll_2 × coll_7 (fixtures/demo/README.md: a near-duplicate pair).
      const target = await cellCentre(page, 'coll_2', 'coll_7');
      await page.mouse.move(target.x, target.y);
      const card = page.locator('[data-testid=overlap-map-hover] [data-testid=hover-card]');
      await card.waitFor({ state: 'visible' });
      const cardText = (await card.textContent()) ?? '';
      expect(cardText).toContain('coll_2');
      expect(cardText).toContain('coll_7');
      const i = audit.correlation.items.indexOf('coll_2');
      const j = audit.correlation.items.indexOf('coll_7');
      // The r shown is the audit's, to two decimals (audit JSON, correlation.matrix).
      expect((await page.locator('[data-testid=overlap-map-hover] [data-testid=hover-r]').textContent()) ?? '').toContain(audit.correlation.matrix[i][j].toFixed(2));
      expect(cardText).toContain(String(audit.correlation.n[i][j]));
      expect(cardText).toContain(audit.items.find((item: any) => item.id === 'coll_7').text);
      // A viewport shot: an element shot would scroll the map away from under the pointer.
      await page.screenshot({ path: join(screenshots, 'workspace-03-hover.png') });

      // Click opens the pair: its crosstab, wording, evidence and the proposal involving it.
      await page.mouse.click(target.x, target.y);
      const detail = page.locator('[data-testid=pair-detail]');
      await detail.locator('[data-testid=crosstab-table]').waitFor({ state: 'visible', timeout: 15_000 });
      expect(await detail.locator('h3').textContent()).toMatch(/coll_2 and coll_7|coll_7 and coll_2/);
      expect((await detail.locator('[data-testid=pair-recommendations]').textContent()) ?? '').toContain('Proposal');
      expect(await detail.locator('[data-testid=crosstab-table] tbody tr').count()).toBeGreaterThan(1);
      await detail.screenshot({ path: join(screenshots, 'workspace-04-pair.png') });
      expect(await accessibilityViolations(page), 'the workspace with a pair open').toEqual([]);

      // Re-order: questionnaire order, then by scale, then back.
      await reorder(page, 'questionnaire');
      expect((await geometry(page)).order.slice(0, 3)).toEqual(['coll_1', 'coll_2', 'coll_3']); // the wave's first columns
      await reorder(page, 'scale');
      await page.locator('#overlap-map').screenshot({ path: join(screenshots, 'workspace-05-by-scale.png') });
      await reorder(page, 'cluster');

      // Keyboard: focus the map, move with the arrows, hear where the focus is, open with Enter.
      await page.locator('[data-testid=overlap-map-grid]').focus();
      await page.keyboard.press('ArrowRight');
      await page.keyboard.press('ArrowDown');
      await page.keyboard.press('ArrowDown');
      const { order } = await geometry(page);
      const announcement = page.locator('[data-testid=overlap-map-announcement]');
      // Focus starts at row 1, column 2; → then ↓↓ lands on row 3, column 3 (the diagonal).
      await expect(announcement.textContent()).resolves.toContain(`${order[2]} with itself`);
      await page.keyboard.press('ArrowRight');
      const spoken = (await announcement.textContent()) ?? '';
      expect(spoken).toContain(`Row 3 ${order[2]}, column 4 ${order[3]}`);
      await page.keyboard.press('Enter');
      await expect(detail.locator('h3').textContent()).resolves.toContain(order[3]);
      await page.locator('#overlap-map').screenshot({ path: join(screenshots, 'workspace-06-keyboard.png') });

      // Threshold: lower it and more pairs count as above it.
      const countBefore = Number(((await page.locator('[data-testid=map-threshold-count]').textContent()) ?? '').split(' ')[0]);
      await page.locator('[data-testid=map-threshold]').focus();
      for (let k = 0; k < 30; k++) await page.keyboard.press('ArrowLeft');
      const countAfter = Number(((await page.locator('[data-testid=map-threshold-count]').textContent()) ?? '').split(' ')[0]);
      expect(countAfter).toBeGreaterThan(countBefore);
      await page.locator('#overlap-map').screenshot({ path: join(screenshots, 'workspace-07-threshold.png') });

      // Frame times at the demo size.
      figures.demo = { items: order.length, ...sweepFigures(await hoverSweep(page, 200), await idleFrames(page, 120)), reorder: [await reorder(page, 'questionnaire'), await reorder(page, 'scale'), await reorder(page, 'cluster')] };

      // The item table: sort by VIF, largest first; numbers right-aligned under right-aligned headers.
      const table = page.locator('[data-testid=item-table]');
      await table.scrollIntoViewIfNeeded();
      const vifHeader = page.locator('[data-testid=item-table-sort-vif]');
      await vifHeader.click();
      if ((await page.locator('th:has([data-testid=item-table-sort-vif])').getAttribute('aria-sort')) !== 'descending') await vifHeader.click();
      expect(await page.locator('th:has([data-testid=item-table-sort-vif])').getAttribute('aria-sort')).toBe('descending');
      const largest = audit.items.filter((item: any) => item.vif !== null).sort((a: any, b: any) => b.vif - a.vif)[0];
      expect(await table.locator('[data-testid=item-table-row]').first().getAttribute('data-item')).toBe(largest.id); // audit JSON: items[].vif
      expect(await table.locator('[data-testid=item-table-row]').count()).toBe(audit.items.length);
      const alignments = await page.evaluate(() => {
        const th = document.querySelector('th:has([data-testid=item-table-sort-vif])') as HTMLElement;
        const td = document.querySelector('[data-testid=item-table-row] td.num') as HTMLElement;
        return [getComputedStyle(th).textAlign, getComputedStyle(td).textAlign];
      });
      expect(alignments).toEqual(['right', 'right']);
      await page.locator('[data-testid=item-table-search]').fill('dig_');
      expect(await table.locator('[data-testid=item-table-row]').count()).toBe(audit.items.filter((item: any) => item.id.startsWith('dig_')).length);
      await page.locator('#items').screenshot({ path: join(screenshots, 'workspace-08-items.png') });
      await page.locator('[data-testid=item-table-search]').fill('');

      // Structure panels.
      await page.locator('#structure').scrollIntoViewIfNeeded();
      expect(await page.locator('[data-testid=eigenvalue-plot] circle').count()).toBeGreaterThan(0);
      expect(await page.locator('[data-testid=dependency]').count()).toBeGreaterThan(0);
      await expect(page.locator('[data-testid=near-dependencies]').textContent()).resolves.toContain('complete rows');
      await page.locator('#structure').screenshot({ path: join(screenshots, 'workspace-09-structure.png') });
      await screenshot(page, 'workspace-10-whole-page');
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('a reviewer opens a pair and sees small cells withheld', async () => {
    const started = await designer.post(`/api/waves/${demoIds.demoWave}/audits`, { settings: { method: 'pearson', bootstrap: 0, seed: 4_243 } });
    const auditId = (await body(started)).audit.id as string;
    await auditDone(designer, auditId);
    const { context, page, problems } = await freshContext(viewport);
    try {
      await signInThroughPage(page, demoEmails.reviewer);
      await openMap(page, auditId);
      const target = await cellCentre(page, 'coll_2', 'staff_4');
      await page.mouse.click(target.x, target.y);
      const note = page.locator('[data-testid=pair-detail] [data-testid=crosstab-note]');
      await note.waitFor({ state: 'visible', timeout: 15_000 });
      await expect(note.textContent()).resolves.toContain('withheld');
      await page.locator('[data-testid=pair-detail]').screenshot({ path: join(screenshots, 'workspace-11-reviewer-pair.png') });
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('the map of a 300-item wave: hover sweep and re-ordering, with frame times printed', { timeout: 600_000 }, async () => {
    const { auditId } = await startAuditOf300Items(designer, demo.team);
    await auditDone(designer, auditId, 540_000);
    const { context, page, problems } = await freshContext(viewport);
    try {
      await signInThroughPage(page, demoEmails.designer);
      await openMap(page, auditId);
      const { order } = await geometry(page);
      expect(order).toHaveLength(300);
      await page.locator('#overlap-map').screenshot({ path: join(screenshots, 'workspace-12-map-300.png') });
      const sweep = sweepFigures(await hoverSweep(page, 300), await idleFrames(page, 120));
      const reorders = [await reorder(page, 'questionnaire'), await reorder(page, 'scale'), await reorder(page, 'cluster')];
      figures.items300 = { items: 300, ...sweep, reorder: reorders };
      const cell = await cellCentre(page, order[40], order[45]);
      await page.mouse.move(cell.x, cell.y);
      await page.locator('[data-testid=overlap-map-hover] [data-testid=hover-card]').waitFor({ state: 'visible' });
      await page.screenshot({ path: join(screenshots, 'workspace-13-map-300-hover.png') });
      expect(problems).toEqual([]);
    } finally {
      await context.close();
      console.log(`Overlap map frame times (ms):\n${JSON.stringify(figures, null, 2)}`);
      writeFileSync(join('test-results', 'frame-times.json'), `${JSON.stringify(figures, null, 2)}\n`);
    }
  });
});
