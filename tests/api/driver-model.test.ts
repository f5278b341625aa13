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

  it("refits the driver model after the designer's own decisions in the what-if, equal to the audit's refit for the same cut", async () => {
    const id = await doneAudit({ bootstrap: 0, seed: 41_001, outcome: 'overall_sat' });
    const audit = (await body(await designer.get(`/api/audits/${id}`))).result;
    const removed: string[] = audit.afterCut.removed;
    const whatIf = await body(await reviewer.post(`/api/audits/${id}/what-if`, { removed }));
    expect(whatIf.driverModel.outcome).toBe('overall_sat');
    expect(whatIf.driverModel.r2Before).toBeCloseTo(audit.outcomeModel.r2, 12);
    const after = whatIf.driverModel.afterDecisions;
    // Source: outcomeModel.afterCut, refitted by runAudit in the audit worker (checked against
    // R's lm() in tests/unit/outcome-model.test.ts); the what-if worker refits the same cut.
    expect(after.n).toBe(audit.outcomeModel.afterCut.n);
    expect(after.r2).toBeCloseTo(audit.outcomeModel.afterCut.r2, 10);
    for (const coefficient of audit.outcomeModel.afterCut.coefficients) {
      const mine = after.coefficients.find((c: { term: string }) => c.term === coefficient.term);
      expect(mine.seRatio ?? 0).toBeCloseTo(coefficient.seRatio ?? 0, 10);
    }
    // Another decision set: dropping only coll_7 shrinks coll_2's standard error (its twin).
    const own = await body(await reviewer.post(`/api/audits/${id}/what-if`, { removed: ['coll_7'] }));
    expect(own.driverModel.afterDecisions.removed).toEqual(['coll_7']);
    expect(own.driverModel.afterDecisions.coefficients.find((c: { term: string }) => c.term === 'coll_2').seRatio).toBeLessThan(0.5);
  });

  it('refuses predictors that are not items of the wave when the audit is started, not when it runs', async () => {
    // Found by the API sweep: these were accepted (202) and the audit then failed in its worker.
    for (const predictors of [['overall_sat'], ['coll_1', 'no_such_item'], ['respondent_id']]) {
      const response = await designer.post(`/api/waves/${demoWave}/audits`, { settings: { bootstrap: 0, seed: 41_003, outcome: 'overall_sat', predictors } });
      expect(response.status).toBe(400);
      const { error } = await body(response);
      expect(error.code).toBe('unknown-predictor');
      expect(error.message).toMatch(/^settings\.predictors: .* of this wave; name the driver model's predictors by their item ids/);
    }
    const known = await designer.post(`/api/waves/${demoWave}/audits`, { settings: { bootstrap: 0, seed: 41_003, outcome: 'overall_sat', predictors: ['coll_1', 'coll_2'] } });
    expect(known.status).toBe(202);
  });

  it('says why there is no model when the audit has no outcome', async () => {
    const id = await doneAudit({ bootstrap: 0, seed: 41_002 });
    const { model, note } = await body(await reviewer.get(`/api/audits/${id}/driver-model`));
    expect(model).toBeNull();
    expect(note).toMatch(/no outcome/);
  });
});
