/**
 * Issue 14 over HTTP: an audit started through the API carries what the command line's carries
 * (one function, auditInputFromSetup): every column left out is named in the warnings with its
 * reason, the screening states the rules it applied to which item types; a codebook's facet
 * column reaches the audit, a cut that would empty a facet is blocked, and the what-if names the
 * facet its removals empty; a two-scale wave has the exploratory view.
 *
 * The file is made here: 160 respondents, two scales (A: A1-A4, B: B1-B4) from two correlated
 * factors, A5 a near copy of A1 (its twin, so the engine proposes cutting one of them), a
 * free-text "comment" column (left out by the proposal) and a "batch" column the designer sets
 * to ignore. The codebook gives A1 the facet "sleep" and A5 the facet "rest", each alone.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { body, type Client, demo, demoEmails, signedIn } from '../setup/http';
import { createStudy, postWave, textFile } from './waves-http';

let designer: Client;
let owner: Client;
let studyId: string;
let audit: any;
let auditId: string;

function lcg(seed: number) {
  let state = seed >>> 0;
  return () => ((state = (Math.imul(state, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

function waveFiles() {
  const next = lcg(1407);
  const normal = () => Math.sqrt(-2 * Math.log(Math.max(next(), 1e-12))) * Math.cos(2 * Math.PI * next());
  const cut = (value: number) => Math.min(5, Math.max(1, Math.round(3 + value)));
  const tag = `realq-${process.pid}-${Date.now().toString(36)}`;
  const rows = ['respondent_id,A1,A2,A3,A4,A5,B1,B2,B3,B4,comment,batch'];
  for (let i = 0; i < 160; i++) {
    const f = normal();
    const g = 0.3 * f + 0.95 * normal();
    const a1 = cut(0.8 * f + 0.6 * normal());
    const a5 = next() < 0.92 ? a1 : cut(0.8 * f + 0.6 * normal());
    const a = [a1, ...[0, 1, 2].map(() => cut(0.8 * f + 0.6 * normal())), a5];
    const b = [0, 1, 2, 3].map(() => cut(0.8 * g + 0.6 * normal()));
    rows.push([`${tag}-${i}`, ...a, ...b, `"free text ${i}, said ${['yes', 'no', 'maybe'][i % 3]} ${i * 7}"`, String((i % 4) + 1)].join(','));
  }
  const codebook = ['item,scale,min,max,facet', 'A1,A,1,5,sleep', 'A2,A,1,5,', 'A3,A,1,5,', 'A4,A,1,5,', 'A5,A,1,5,rest', ...['B1', 'B2', 'B3', 'B4'].map((id) => `${id},B,1,5,`)];
  return { data: textFile(`${tag}.csv`, rows.join('\n') + '\n'), codebook: textFile(`${tag}-codebook.csv`, codebook.join('\n') + '\n') };
}

async function settle(client: Client, id: string) {
  for (let attempt = 0; attempt < 2_400; attempt++) {
    const answer = await body(await client.get(`/api/audits/${id}`));
    if (answer.audit.status === 'done' || answer.audit.status === 'failed') return answer;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`audit ${id} did not finish`);
}

beforeAll(async () => {
  designer = await signedIn(demoEmails.designer);
  owner = await signedIn(demoEmails.owner);
  studyId = await createStudy(designer, demo.team, 'Real questionnaires');
  const files = waveFiles();
  const uploaded = await postWave(designer, studyId, files.data, { codebook: files.codebook });
  expect(uploaded.status).toBe(201);
  const proposed = await body(uploaded);
  const roles = Object.fromEntries(proposed.setup.map((column: { column: string; role: string }) => [column.column, column.role]));
  expect(roles.comment).toBe('ignore');
  expect(roles.batch).not.toBe('ignore');
  // The designer sets "batch" aside at confirmation.
  const columns = proposed.setup.map((column: { column: string }) => (column.column === 'batch' ? { ...column, role: 'ignore', item: null } : column));
  const confirmed = await designer.put(`/api/waves/${proposed.wave.id}/setup`, { setup: { columns }, exclusions: [] });
  expect(confirmed.status).toBe(200);
  const started = await designer.post(`/api/waves/${proposed.wave.id}/audits`, { settings: { bootstrap: 0, seed: 1407 } });
  expect(started.status).toBe(202);
  auditId = (await body(started)).audit.id;
  const answer = await settle(designer, auditId);
  expect(answer.audit.status).toBe('done');
  audit = answer.result;
}, 300_000);

afterAll(async () => {
  await owner.delete(`/api/studies/${studyId}`);
});

describe('an audit started over HTTP carries what the command line carries', () => {
  it('names every column left out, with its reason', () => {
    const leftOut = audit.warnings.filter((warning: { code: string }) => warning.code === 'column-left-out');
    const named = leftOut.map((warning: { items: string[] }) => warning.items[0]);
    expect(named).toEqual(expect.arrayContaining(['comment', 'batch']));
    expect(leftOut.find((warning: { items: string[] }) => warning.items[0] === 'batch').message).toMatch(/confirmed setup sets it to ignore/);
  });

  it('states which screening rules it applied to which item types', () => {
    expect(audit.screening.itemTypes).toMatchObject({ rating: 9 });
    const codes = audit.screening.rules.map((rule: { code: string }) => rule.code);
    expect(codes).toEqual(expect.arrayContaining(['long-string', 'low-variability', 'mostly-missing']));
    expect(audit.screening.rules.find((rule: { code: string }) => rule.code === 'long-string').note).toMatch(/9 items/);
  });
});

describe('facets from the codebook', () => {
  it('reach the audit and block a cut that empties one', () => {
    expect(audit.items.find((item: { id: string }) => item.id === 'A1').facet).toBe('sleep');
    const recommendation = audit.recommendations.find((entry: { cluster: string[] }) => entry.cluster.includes('A1') && entry.cluster.includes('A5'));
    expect(recommendation).toBeDefined();
    // Whichever twin is not kept is the last item of its facet: the cut is blocked by `facet`.
    const other = recommendation.actions.find((action: { item: string }) => action.item === 'A1' || action.item === 'A5');
    expect(other.action).toBe('keep');
    expect(other.blockedBy).toContain('facet');
    expect(audit.afterCut.removed).not.toContain(other.item);
  });

  it('the what-if names the facet a removal empties', async () => {
    const response = await designer.post(`/api/audits/${auditId}/what-if`, { removed: ['A5'] });
    expect(response.status).toBe(200);
    const whatIf = await body(response);
    const emptied = whatIf.warnings.filter((warning: { code: string }) => warning.code === 'facet-emptied');
    expect(emptied).toHaveLength(1);
    expect(emptied[0].message).toMatch(/facet "rest"/);
  });
});

describe('the exploratory view of a two-scale wave', () => {
  it('is in the audit JSON and on the audit page', async () => {
    const view = audit.structure.exploratory;
    expect(view.factors).toBe(2);
    expect([...view.factorNames].sort()).toEqual(['A', 'B']);
    expect(view.omega.hierarchical).toBeLessThan(view.omega.total);
    const page = await (await designer.get(`/audits/${auditId}`)).text();
    expect(page).toContain('data-testid="exploratory-panel"');
    expect(page).toContain('Omega hierarchical');
  });
});
