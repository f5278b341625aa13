/**
 * A done audit's page sends its result sections as rendered the first time (src/lib/server/
 * kept-html.ts, docs/decisions/023-page-cost.md). What is kept must never stand in for what it
 * was not made from: another audit shows its own sections, a change of the wave's exclusions
 * shows the new screening counts, a member of another team still gets 404, and every member role
 * reads the same sections (aggregates only), with the access check made on every request.
 *
 * The wave is a small CSV made here (48 respondents, 6 items, one study of this file's own), so
 * changing its exclusions touches no other test.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { body, type Client, demo, demoEmails, signedIn } from '../setup/http';
import { createStudy, postWave, textFile } from './waves-http';

let designer: Client;
let owner: Client;
let reviewer: Client;
let outsider: Client;
let studyId = '';
let waveId = '';

/** Answers 1-5 of 48 respondents to 6 items, two groups of three that move together (a fixed generator). */
function responses(tag: string): string {
  let state = 20_261_203;
  const next = () => {
    state = (state * 1_103_515_245 + 12_345) % 2_147_483_648;
    return state / 2_147_483_648;
  };
  const clamp = (x: number) => Math.min(5, Math.max(1, Math.round(x)));
  const lines = ['respondent_id,A1,A2,A3,B1,B2,B3'];
  for (let i = 0; i < 48; i++) {
    const a = 1 + next() * 4;
    const b = 1 + next() * 4;
    const answers = [a, a, a, b, b, b].map((latent) => clamp(latent + (next() - 0.5) * 1.6));
    lines.push(`${tag}-${i},${answers.join(',')}`);
  }
  return lines.join('\n') + '\n';
}

async function settle(client: Client, auditId: string): Promise<string> {
  for (let attempt = 0; attempt < 600; attempt++) {
    const answer = await body(await client.get(`/api/audits/${auditId}`));
    if (answer.audit.status === 'done' || answer.audit.status === 'failed') return answer.audit.status as string;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`audit ${auditId} did not finish within a minute`);
}

async function startAudit(settings: Record<string, unknown>): Promise<string> {
  const started = await designer.post(`/api/waves/${waveId}/audits`, { settings });
  expect(started.status).toBe(202);
  const id = (await body(started)).audit.id as string;
  expect(await settle(designer, id)).toBe('done');
  return id;
}

async function page(client: Client, auditId: string): Promise<{ status: number; html: string }> {
  const response = await client.get(`/audits/${auditId}`, { headers: { accept: 'text/html' } });
  return { status: response.status, html: await response.text() };
}

/** The rendered result sections: from the first section to the end of the warnings. */
function sections(html: string): string {
  const from = html.indexOf('<section id="figures"');
  const to = html.indexOf('</section>', html.indexOf('<section id="warnings"'));
  expect(from).toBeGreaterThan(0);
  expect(to).toBeGreaterThan(from);
  return html.slice(from, to);
}

/** "N set aside after screening" of the structure section. */
function setAside(html: string): number {
  const match = /(\d+)\s*(?:<!--[^>]*-->\s*)*set aside after screening/.exec(html);
  expect(match, 'the screening count is on the page').not.toBeNull();
  return Number(match![1]);
}

beforeAll(async () => {
  designer = await signedIn(demoEmails.designer);
  owner = await signedIn(demoEmails.owner);
  reviewer = await signedIn(demoEmails.reviewer);
  outsider = await signedIn(demoEmails.outsider);
  studyId = await createStudy(designer, demo.team, 'Kept audit sections');
  const tag = `kept-${process.pid}-${Date.now().toString(36)}`;
  const uploaded = await postWave(designer, studyId, textFile(`${tag}.csv`, responses(tag)));
  expect(uploaded.status).toBe(201);
  const proposed = await body(uploaded);
  waveId = proposed.wave.id;
  const confirmed = await designer.put(`/api/waves/${waveId}/setup`, { setup: { columns: proposed.setup }, exclusions: [] });
  expect(confirmed.status).toBe(200);
});

afterAll(async () => {
  if (studyId) await owner.delete(`/api/studies/${studyId}`);
});

describe('the sections of a done audit, rendered once and sent again', () => {
  let pearsonAudit = '';

  it('sends the same sections to every member role, and 404 to another team after they are kept', async () => {
    pearsonAudit = await startAudit({ method: 'pearson', bootstrap: 0, seed: 31 });
    const first = await page(designer, pearsonAudit);
    expect(first.status).toBe(200);
    expect(first.html).toContain('pearson correlations');
    expect(setAside(first.html)).toBe(0);
    const again = await page(designer, pearsonAudit);
    const asReviewer = await page(reviewer, pearsonAudit);
    expect(asReviewer.status).toBe(200);
    // Kept or rendered, the sections are the same text for every reader of the audit.
    expect(sections(again.html)).toBe(sections(first.html));
    expect(sections(asReviewer.html)).toBe(sections(first.html));
    // The reader's own name is rendered afresh on every page, outside what is kept.
    expect(asReviewer.html).not.toContain(demoEmails.designer);
    expect((await page(outsider, pearsonAudit)).status).toBe(404);
  });

  it("shows the wave's new screening counts once its exclusions change", async () => {
    expect(setAside((await page(designer, pearsonAudit)).html)).toBe(0);
    const changed = await designer.put(`/api/waves/${waveId}/setup`, { exclusions: [0, 1, 2] });
    expect(changed.status).toBe(200);
    expect(setAside((await page(designer, pearsonAudit)).html)).toBe(3);
    expect(setAside((await page(reviewer, pearsonAudit)).html)).toBe(3);
  });

  it('shows another audit its own sections, and the first one still its own', async () => {
    const spearmanAudit = await startAudit({ method: 'spearman', bootstrap: 0, seed: 32 });
    const other = await page(designer, spearmanAudit);
    expect(other.status).toBe(200);
    expect(other.html).toContain('spearman correlations');
    expect(other.html).not.toContain('pearson correlations');
    const first = await page(reviewer, pearsonAudit);
    expect(first.html).toContain('pearson correlations');
    expect(first.html).not.toContain('spearman correlations');
  });
});
