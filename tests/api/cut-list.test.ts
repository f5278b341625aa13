/**
 * Decisions, the live what-if and the study settings, against the built server with the seeded
 * demo (its finished audit, src/lib/server/demo-audit.ts): reading the cut list as every member,
 * deciding as owner and designer, refusals (400 validation, 404 item or another team, 409 locks and
 * merge chains), the history (who, when, from what to what, why), accepting recommendations in
 * one transaction (nothing half-written on a conflict), the what-if against the audit's own
 * after-cut figures, PATCH of a study, and discarding a wave. Leaves every demo decision undecided.
 *
 * Expected facts of the demo wave: 41 items (fixtures/demo/README.md, "What is planted").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CutListResponse, WhatIfResponse } from '../../src/lib/api/cut-list';
import { body, Client, demo, demoEmails, signedIn } from '../setup/http';
import { postWave, textFile } from './waves-http';

type Caller = 'owner' | 'designer' | 'field' | 'reviewer' | 'outsider';
const clients = {} as Record<Caller, Client>;
const cutListPath = `/api/studies/${demo.study}/cut-list`;
/** 41 items in the demo wave: fixtures/demo/README.md. */
const DEMO_ITEMS = 41;

async function readCutList(client: Client = clients.designer): Promise<CutListResponse> {
  const response = await client.get(cutListPath);
  expect(response.status).toBe(200);
  return body(response);
}

async function decide(client: Client, itemId: string, decision: Record<string, unknown>) {
  return client.put(`${cutListPath}/${encodeURIComponent(itemId)}`, decision);
}

/** Sets every decided demo item back to undecided (keeps first so merge chains unwind). */
async function resetDecisions() {
  const list = await readCutList(clients.owner);
  const order = [...list.items].filter((i) => i.decision !== 'undecided').sort((a, b) => Number(a.decision === 'merge') - Number(b.decision === 'merge')).reverse();
  for (const item of order) expect((await decide(clients.owner, item.id, { decision: 'undecided' })).status).toBe(200);
}

beforeAll(async () => {
  for (const caller of ['owner', 'designer', 'field', 'reviewer', 'outsider'] as const) clients[caller] = await signedIn(demoEmails[caller]);
  await resetDecisions();
});

afterAll(async () => {
  await resetDecisions();
  await clients.owner.patch(`/api/studies/${demo.study}`, { settings: { lockedItems: [] } });
});

describe('the cut list of the demo study', () => {
  it('lists every item of the latest finished audit as undecided, with the recommendations behind them', async () => {
    const list = await readCutList();
    expect(list.audit).not.toBeNull();
    expect(list.items.filter((i) => i.inAudit)).toHaveLength(DEMO_ITEMS);
    expect(list.counts.undecided).toBe(DEMO_ITEMS);
    expect(list.recommendations.length).toBeGreaterThan(0);
    const first = list.recommendations[0];
    const changed = first.actions.find((a) => a.action !== 'keep')!;
    const item = list.items.find((i) => i.id === changed.item)!;
    expect(item.recommendation).toMatchObject({ index: 0, action: changed.action });
    expect(item.text).toEqual(expect.any(String));
    expect(list.canDecide).toBe(true);
    // The study page counts the same way ("Undecided 41", not 0).
    const study = await body(await clients.designer.get(`/api/studies/${demo.study}`));
    expect(study.study.cutList.counts.undecided).toBe(DEMO_ITEMS);
  });

  it('is readable by every member, decidable only by owners and designers', async () => {
    for (const caller of ['field', 'reviewer'] as const) {
      const list = await readCutList(clients[caller]);
      expect(list.canDecide).toBe(false);
      expect((await decide(clients[caller], 'coll_1', { decision: 'keep', reason: 'x' })).status).toBe(403);
    }
    expect((await clients.outsider.get(cutListPath)).status).toBe(404);
    expect((await decide(clients.outsider, 'coll_1', { decision: 'keep', reason: 'x' })).status).toBe(404);
  });
});

describe('deciding one item', () => {
  it('refuses bad input with 400 and a sentence, an unknown item with 404', async () => {
    const historyAtStart = (await readCutList()).history.length;
    const cases: [Record<string, unknown>, RegExp][] = [
      [{ decision: 'drop' }, /reason/],
      [{ decision: 'drop', reason: '   ' }, /reason/],
      [{ decision: 'merge', reason: 'same question' }, /into/],
      [{ decision: 'merge', into: 'coll_1', reason: 'same question' }, /itself/],
      [{ decision: 'merge', into: 'no_such_item', reason: 'same question' }, /not an item/],
      [{ decision: 'reword', reason: 'clearer' }, /wording/],
      [{ decision: 'keep', reason: 'fine', wording: 'x' }, /only for a reword/],
      [{ decision: 'keep', reason: 'fine', into: 'coll_2' }, /only for a merge/],
      [{ decision: 'shorten', reason: 'x' }, /decision/],
      [{ decision: 'keep', reason: 'x', extra: 1 }, /extra|unrecognized/i],
    ];
    for (const [request, message] of cases) {
      const response = await decide(clients.designer, 'coll_1', request);
      expect(response.status, JSON.stringify(request)).toBe(400);
      expect((await body(response)).error.message).toMatch(message);
    }
    const unknown = await decide(clients.designer, 'no_such_item', { decision: 'keep', reason: 'x' });
    expect(unknown.status).toBe(404);
    // Nothing was recorded (other files may have left history of their own).
    expect((await readCutList()).history).toHaveLength(historyAtStart);
  });

  it('records keep, drop, merge and reword with who, when, from what to what and why', async () => {
    const before = Date.now();
    const kept = await decide(clients.designer, 'coll_2', { decision: 'keep', reason: 'Core of the collections scale.' });
    expect(kept.status).toBe(200);
    expect(await body(kept)).toMatchObject({ changed: true, item: { id: 'coll_2', decision: 'keep', reason: 'Core of the collections scale.', decidedBy: { name: 'Dario Lindgren' } } });
    expect((await decide(clients.owner, 'coll_7', { decision: 'merge', into: 'coll_2', reason: 'Asks the same as coll_2.' })).status).toBe(200);
    expect((await decide(clients.designer, 'staff_6', { decision: 'drop', reason: 'Overlaps staff_2.' })).status).toBe(200);
    const reworded = await decide(clients.designer, 'dig_4', { decision: 'reword', wording: 'The website makes it easy to renew a loan.', reason: 'Narrower wording.' });
    expect(await body(reworded)).toMatchObject({ item: { decision: 'reword', wording: 'The website makes it easy to renew a loan.' } });
    // The same decision again records nothing.
    expect(await body(await decide(clients.designer, 'coll_2', { decision: 'keep', reason: 'Core of the collections scale.' }))).toMatchObject({ changed: false });
    // Changing it records from what to what.
    expect((await decide(clients.designer, 'staff_6', { decision: 'keep', reason: 'The client wants it.' })).status).toBe(200);

    const list = await readCutList(clients.reviewer);
    expect(list.counts).toMatchObject({ keep: 2, merge: 1, reword: 1, drop: 0, undecided: DEMO_ITEMS - 4 });
    expect(list.history.slice(0, 5).map((h) => [h.itemId, h.from, h.to])).toEqual([
      ['staff_6', 'drop', 'keep'],
      ['dig_4', 'undecided', 'reword'],
      ['staff_6', 'undecided', 'drop'],
      ['coll_7', 'undecided', 'merge'],
      ['coll_2', 'undecided', 'keep'],
    ]);
    const merge = list.history.find((h) => h.itemId === 'coll_7')!;
    expect(merge).toMatchObject({ into: 'coll_2', reason: 'Asks the same as coll_2.', by: { name: 'Hanne Ostrowski' }, auditId: list.audit!.id });
    expect(Date.parse(merge.at)).toBeGreaterThanOrEqual(before - 1_000);
  });

  it('refuses merge chains with 409: into a removed item, or removing an item others merge into', async () => {
    // coll_7 merges into coll_2 (previous test).
    const intoMerged = await decide(clients.designer, 'coll_3', { decision: 'merge', into: 'coll_7', reason: 'x' });
    expect(intoMerged.status).toBe(409);
    expect((await body(intoMerged)).error.code).toBe('merge-target-removed');
    const dropTarget = await decide(clients.designer, 'coll_2', { decision: 'drop', reason: 'x' });
    expect(dropTarget.status).toBe(409);
    expect((await body(dropTarget)).error).toMatchObject({ code: 'item-is-merge-target', message: expect.stringContaining('coll_7') });
  });

  it('refuses dropping or merging a locked item with 409 and a sentence; keeping it is fine', async () => {
    const locked = await clients.designer.patch(`/api/studies/${demo.study}`, { settings: { lockedItems: ['coll_1'] } });
    expect(locked.status).toBe(200);
    const list = await readCutList();
    expect(list.constraints.lockedItems).toContain('coll_1');
    expect(list.items.find((i) => i.id === 'coll_1')!.locked).toBe(true);
    for (const request of [{ decision: 'drop', reason: 'x' }, { decision: 'merge', into: 'coll_2', reason: 'x' }]) {
      const response = await decide(clients.designer, 'coll_1', request);
      expect(response.status).toBe(409);
      expect((await body(response)).error).toMatchObject({ code: 'item-locked', message: expect.stringMatching(/coll_1 is locked.*cannot be/) });
    }
    expect((await decide(clients.designer, 'coll_1', { decision: 'keep', reason: 'Trend item.' })).status).toBe(200);
    // Locking an item already decided to leave is refused too.
    expect((await decide(clients.designer, 'space_6', { decision: 'drop', reason: 'x' })).status).toBe(200);
    const lockDropped = await clients.designer.patch(`/api/studies/${demo.study}`, { settings: { lockedItems: ['coll_1', 'space_6'] } });
    expect(lockDropped.status).toBe(409);
    expect((await body(lockDropped)).error.code).toBe('locked-item-removed');
    expect((await clients.designer.patch(`/api/studies/${demo.study}`, { settings: { lockedItems: [] } })).status).toBe(200);
  });
});

describe('accepting recommendations', () => {
  it('accepts one recommendation in one action, recording the recommendation as the reason', async () => {
    await resetDecisions();
    const list = await readCutList();
    const index = list.recommendations.findIndex((r) => r.actions.some((a) => a.action === 'drop' || a.action === 'merge'));
    const recommendation = list.recommendations[index];
    const response = await clients.designer.post(`${cutListPath}/accept`, { recommendation: index });
    expect(response.status).toBe(200);
    const answer = await body(response);
    expect(answer.accepted).toEqual([index]);
    const after = await readCutList();
    expect(after.recommendations[index].accepted).toBe(true);
    for (const action of recommendation.actions.filter((a) => a.action !== 'reword')) {
      const item = after.items.find((i) => i.id === action.item)!;
      expect(item.decision).toBe(action.action);
      expect(item.reason).toContain(recommendation.reason);
    }
    expect(new Set(after.history.slice(0, answer.changed.length).map((h) => h.itemId))).toEqual(new Set(answer.changed));
  });

  it('writes nothing when one of the changes conflicts (409)', async () => {
    await resetDecisions();
    const list = await readCutList();
    // A merge whose keeper the recommendation does not itself set to keep.
    const mergeOf = (r: CutListResponse['recommendations'][number]) => r.actions.find((a) => a.action === 'merge' && !r.actions.some((b) => b.item === a.into));
    const index = list.recommendations.findIndex((r) => mergeOf(r) !== undefined);
    expect(index).toBeGreaterThanOrEqual(0);
    const merge = mergeOf(list.recommendations[index])!;
    // Drop the keeper first: the merge into it must now be refused, and nothing else written.
    expect((await decide(clients.designer, merge.into!, { decision: 'drop', reason: 'Testing a conflict.' })).status).toBe(200);
    const historyBefore = (await readCutList()).history.length;
    const response = await clients.designer.post(`${cutListPath}/accept`, { recommendation: index });
    expect(response.status).toBe(409);
    const after = await readCutList();
    expect(after.history).toHaveLength(historyBefore);
    expect(after.items.find((i) => i.id === merge.item)!.decision).toBe('undecided');
  });

  it('accepts every stable recommendation at once and refuses an index the audit does not have', async () => {
    await resetDecisions();
    const list = await readCutList();
    const response = await clients.owner.post(`${cutListPath}/accept`, { recommendation: 'all-stable' });
    expect(response.status).toBe(200);
    const stable = list.recommendations.filter((r) => r.stable).map((r) => r.index);
    expect((await body(response)).accepted).toEqual(stable);
    const after = await readCutList();
    for (const index of stable) expect(after.recommendations[index].accepted || after.recommendations[index].actions.some((a) => a.action === 'reword')).toBe(true);
    const missing = await clients.owner.post(`${cutListPath}/accept`, { recommendation: 9_999 });
    expect(missing.status).toBe(404);
    expect((await body(missing)).error.code).toBe('recommendation-not-found');
    expect((await clients.owner.post(`${cutListPath}/accept`, { recommendation: 'all' })).status).toBe(400);
  });
});

describe('the what-if of the current decisions', () => {
  it("gives the audit's own after-cut figures for the audit's own proposed cut", async () => {
    const list = await readCutList();
    const audit = (await body(await clients.designer.get(`/api/audits/${list.audit!.id}`))).result;
    const response = await clients.reviewer.post(`/api/audits/${list.audit!.id}/what-if`, { removed: audit.afterCut.removed });
    expect(response.status).toBe(200);
    const whatIf: WhatIfResponse = await body(response);
    // Source: the audit JSON's afterCut, computed by runAudit in the audit worker from the same
    // evidence (src/lib/engine/simulate-cut.ts); the what-if worker rebuilds the evidence and must agree.
    expect(whatIf.itemsRemoved).toBe(audit.afterCut.itemsRemoved);
    expect(whatIf.minutesSaved).toBeCloseTo(audit.afterCut.minutesSaved, 12);
    expect(whatIf.maxVif).toBeCloseTo(audit.afterCut.maxVif, 10);
    expect(whatIf.conditionNumber).toBeCloseTo(audit.afterCut.conditionNumber, 10);
    for (const scale of audit.afterCut.scales) {
      const mine = whatIf.scales.find((s) => s.id === scale.id)!;
      expect(mine.alpha).toBeCloseTo(scale.alpha, 10);
      expect(mine.omega).toBeCloseTo(scale.omegaTotal, 8);
      expect(mine.items).toBe(scale.items);
    }
    console.log(`[what-if] demo wave: ${whatIf.computeMs} ms in the worker (${whatIf.coldStart ? 'cold' : 'warm'})`);
  });

  it('changes with the removed items and refuses unknown or repeated ones', async () => {
    const list = await readCutList();
    const path = `/api/audits/${list.audit!.id}/what-if`;
    const none: WhatIfResponse = await body(await clients.designer.post(path, { removed: [] }));
    expect(none.itemsRemoved).toBe(0);
    expect(none.minutesSaved).toBe(0);
    expect(none.scales.every((s) => s.items === s.itemsBefore)).toBe(true);
    const one: WhatIfResponse = await body(await clients.designer.post(path, { removed: ['coll_7'] }));
    expect(one.itemsRemoved).toBe(1);
    const collections = one.scales.find((s) => s.id === 'collections')!;
    expect(collections.items).toBe(collections.itemsBefore - 1);
    // Minutes saved = items x seconds per item / 60 (simulate-cut.ts; the secondsPerItem it reports).
    expect(one.minutesSaved).toBeCloseTo(one.secondsPerItem / 60, 12);
    for (const [removed, code] of [[['no_such_item'], 'unknown-item'], [['coll_7', 'coll_7'], 'repeated-item']] as const) {
      const response = await clients.designer.post(path, { removed });
      expect(response.status).toBe(400);
      expect((await body(response)).error.code).toBe(code);
    }
    expect((await clients.designer.post(path, { removed: 'coll_7' })).status).toBe(400);
    expect((await clients.outsider.post(path, { removed: [] })).status).toBe(404);
  });
});

describe('study settings', () => {
  it('changes name, description and constraints, validated, and audits see them', async () => {
    const created = await body(await clients.designer.post('/api/studies', { teamId: demo.team, name: 'Settings test study' }));
    const id = created.study.id as string;
    const bad: [unknown, RegExp][] = [
      [{}, /at least one/],
      [{ name: '' }, /name/],
      [{ settings: { alphaFloor: 1.5 } }, /alphaFloor/],
      [{ settings: { minItemsPerScale: 0 } }, /minItemsPerScale/],
      [{ settings: { minItemsPerScale: 2.5 } }, /whole number/],
      [{ settings: { maxCutShare: 0.5 } }, /maxCutShare|unrecognized/i],
      [{ settings: { lockedItems: ['Q1'] } }, /not an item/],
    ];
    for (const [request, message] of bad) {
      const response = await clients.designer.patch(`/api/studies/${id}`, request);
      expect(response.status, JSON.stringify(request)).toBe(400);
      expect((await body(response)).error.message).toMatch(message);
    }
    const ok = await clients.designer.patch(`/api/studies/${id}`, { name: 'Renamed study', description: 'New words.', settings: { minItemsPerScale: 4, alphaFloor: 0.75 } });
    expect(ok.status).toBe(200);
    expect((await body(ok)).study).toMatchObject({ name: 'Renamed study', description: 'New words.', settings: { minItemsPerScale: 4, alphaFloor: 0.75 } });
    const cleared = await body(await clients.designer.patch(`/api/studies/${id}`, { settings: { alphaFloor: null } }));
    expect(cleared.study.settings).toEqual({ minItemsPerScale: 4 });
    expect((await clients.field.patch(`/api/studies/${id}`, { name: 'x' })).status).toBe(403);
    expect((await clients.owner.delete(`/api/studies/${id}`)).status).toBe(204);
  });
});

describe('discarding a wave', () => {
  it('discards an unconfirmed wave and refuses a confirmed one with 409', async () => {
    const created = await body(await clients.designer.post('/api/studies', { teamId: demo.team, name: 'Discard test study' }));
    const studyId = created.study.id as string;
    const uploaded = await body(await postWave(clients.designer, studyId, textFile('discard.csv', 'respondent_id,A1,A2\nr1,1,2\nr2,2,3\nr3,3,1\n')));
    const waveId = uploaded.wave.id as string;
    expect((await clients.field.delete(`/api/waves/${waveId}`)).status).toBe(403);
    expect((await clients.designer.delete(`/api/waves/${waveId}`)).status).toBe(204);
    expect((await clients.designer.get(`/api/waves/${waveId}`)).status).toBe(404);
    const study = await body(await clients.designer.get(`/api/studies/${studyId}`));
    expect(study.study.waves).toHaveLength(0);
    const confirmed = await clients.designer.delete('/api/waves/wave-riverbend-pilot-1');
    expect(confirmed.status).toBe(409);
    expect((await body(confirmed)).error.code).toBe('wave-confirmed');
    expect((await clients.owner.delete(`/api/studies/${studyId}`)).status).toBe(204);
  });
});
