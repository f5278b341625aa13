/**
 * GET /api/audits/{id}/driver-model: the outcome model's slice for the workspace panel, before and
 * after the proposed cut (the numbers themselves are checked against R's lm() in
 * tests/unit/outcome-model.test.ts); a sentence instead of a model when the audit has no outcome.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { body, type Client, demoEmails, signedIn } from '../setup/http';

const demoWave = 'wave-riverbend-pilot-1';
let reviewer: Client;
let designer: Client;

async function doneAudit(settings: Record<string, unknown>): Promise<string> {
  const id = (await body(await designer.post(`/api/waves/${demoWave}/audits`, { settings }))).audit.id as string;
  for (let attempt = 0; attempt < 900; attempt++) {
    if ((await body(await designer.get(`/api/audits/${id}`))).audit.status === 'done') return id;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error(`audit ${id} did not finish`);
}

beforeAll(async () => {
  reviewer = await signedIn(demoEmails.reviewer);
  designer = await signedIn(demoEmails.designer);
});

describe('the driver model slice', () => {
  it('gives every member the model before and after the cut, with the rows it rests on', async () => {
    const id = await doneAudit({ bootstrap: 0, seed: 41_001, outcome: 'overall_sat' });
    const response = await reviewer.get(`/api/audits/${id}/driver-model`);
    expect(response.status).toBe(200);
    const { model, note } = await body(response);
    expect(note).toBeNull();
    expect(model.outcome).toBe('overall_sat');
    expect(model.completeRows).toBe(model.n);
    expect(model.completeRows).toBeLessThanOrEqual(model.respondentsUsed);
    expect(model.coefficients[0].term).toBe('(intercept)');
    expect(model.afterCut.removed.length).toBeGreaterThan(0);
    expect(model.afterCut.n).toBe(model.n);
    const terms = model.afterCut.coefficients.map((c: { term: string }) => c.term);
    for (const removed of model.afterCut.removed) expect(terms).not.toContain(removed);
  });

  it('says why there is no model when the audit has no outcome', async () => {
    const id = await doneAudit({ bootstrap: 0, seed: 41_002 });
    const { model, note } = await body(await reviewer.get(`/api/audits/${id}/driver-model`));
    expect(model).toBeNull();
    expect(note).toMatch(/no outcome/);
  });
});
