/**
 * The what-if of a polychoric audit whose matrix was smoothed answers what a fresh audit of the
 * remaining items answers (docs/decisions/011, addendum "the what-if smooths as the audit does"),
 * through the built server: the demo wave in a study of this file's own, a polychoric audit, the
 * what-if of removing the exact copy (events_3b, fixtures/demo/README.md; the near-copies left
 * keep the matrix indefinite), then the same wave set up without that column and audited again.
 * Before the fix the what-if projected instead of smoothing and showed a largest VIF in the tens
 * of millions beside the fresh audit's 12.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { WhatIfResponse } from '../../src/lib/api/cut-list';
import { body, type Client, demo, demoEmails, signedIn } from '../setup/http';
import { createStudy, postWave, textFile } from './waves-http';

let designer: Client;
let owner: Client;
let studyId = '';

const settings = { method: 'polychoric', bootstrap: 0, seed: 2031 };

async function auditDone(waveId: string): Promise<{ id: string; result: Record<string, any> }> {
  const started = await designer.post(`/api/waves/${waveId}/audits`, { settings });
  expect(started.status).toBe(202);
  const id = (await body(started)).audit.id as string;
  for (let attempt = 0; attempt < 600; attempt++) {
    const answer = await body(await designer.get(`/api/audits/${id}`));
    if (answer.audit.status === 'done') return { id, result: answer.result };
    expect(answer.audit.status).not.toBe('failed');
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error(`audit ${id} did not finish within a minute`);
}

/** The largest VIF over the items in the matrix, null when one is infinite (as the what-if reports it). */
function largestVif(result: Record<string, any>): number | null {
  let largest: number | null = null;
  for (const item of result.items as { inMatrix: boolean; vif: number | null }[]) {
    if (!item.inMatrix) continue;
    if (item.vif === null) return null;
    largest = largest === null ? item.vif : Math.max(largest, item.vif);
  }
  return largest;
}

const demoFile = (name: string) => readFileSync(new URL(`../../fixtures/demo/${name}`, import.meta.url), 'utf8');

/**
 * The demo responses without one column. Every field up to that column is unquoted (only the
 * free-text comment at the end of a row is quoted), so the row is cut at its commas.
 */
function withoutColumn(csv: string, name: string): string {
  const index = csv.slice(0, csv.indexOf('\n')).split(',').indexOf(name);
  expect(index).toBeGreaterThan(0);
  return csv
    .split('\n')
    .map((line) => {
      if (line === '') return line;
      let start = 0;
      for (let k = 0; k < index; k++) start = line.indexOf(',', start) + 1;
      return line.slice(0, start) + line.slice(line.indexOf(',', start) + 1);
    })
    .join('\n');
}

/** Uploads responses and a codebook into this file's study and confirms the proposed setup, keeping every respondent. */
async function confirmedWave(responses: string, codebook: string, tag: string): Promise<string> {
  const uploaded = await postWave(designer, studyId, textFile(`${tag}.csv`, responses), { codebook: textFile(`${tag}-codebook.csv`, codebook) });
  expect(uploaded.status).toBe(201);
  const proposed = await body(uploaded);
  const confirmed = await designer.put(`/api/waves/${proposed.wave.id}/setup`, { setup: { columns: proposed.setup }, exclusions: [] });
  expect(confirmed.status, await confirmed.clone().text()).toBe(200);
  return proposed.wave.id as string;
}

beforeAll(async () => {
  designer = await signedIn(demoEmails.designer);
  owner = await signedIn(demoEmails.owner);
  studyId = await createStudy(designer, demo.team, 'What-if of a smoothed matrix');
});

afterAll(async () => {
  if (studyId) await owner.delete(`/api/studies/${studyId}`);
});

describe('the what-if of a smoothed polychoric audit', () => {
  it('gives the figures of a fresh audit of the remaining items', async () => {
    const responses = demoFile('library-pilot-1.csv');
    const codebook = demoFile('library-codebook.csv');
    const before = await auditDone(await confirmedWave(responses, codebook, 'demo-whole'));
    expect((before.result.warnings as { code: string }[]).some((warning) => warning.code === 'matrix-smoothed')).toBe(true);
    const response = await designer.post(`/api/audits/${before.id}/what-if`, { removed: ['events_3b'] });
    expect(response.status).toBe(200);
    const whatIf: WhatIfResponse = await body(response);

    // The same answers without that column, as a new wave: a fresh audit of the remaining items.
    const reducedCodebook = codebook.split('\n').filter((line) => !line.startsWith('events_3b,')).join('\n');
    const fresh = await auditDone(await confirmedWave(withoutColumn(responses, 'events_3b'), reducedCodebook, 'demo-without-copy'));
    expect((fresh.result.items as { id: string }[]).some((item) => item.id === 'events_3b')).toBe(false);
    expect((fresh.result.warnings as { code: string }[]).some((warning) => warning.code === 'matrix-smoothed')).toBe(true);

    const expectedVif = largestVif(fresh.result);
    expect(expectedVif).not.toBeNull();
    expect(expectedVif!).toBeLessThan(100);
    expect(whatIf.maxVif! / expectedVif!).toBeCloseTo(1, 8);
    expect(whatIf.conditionNumber! / fresh.result.conditionNumber).toBeCloseTo(1, 8);
    for (const scale of fresh.result.scales as { id: string; alpha: number | null }[]) {
      const mine = whatIf.scales.find((entry) => entry.id === scale.id);
      expect(mine, scale.id).toBeDefined();
      expect(mine!.alpha ?? -1).toBeCloseTo(scale.alpha ?? -1, 10);
    }
  });
});
