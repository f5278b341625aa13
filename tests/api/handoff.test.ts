/**
 * The handoff over HTTP: publishing (refused while items are undecided, numbered versions with
 * their diff), the exports read back (CSV with papaparse, XLSX with xlsx-republish: formula-like
 * cells neutralised, markup and commas intact), the "programmed" mark, threaded comments, the
 * client's review and the activity view, with each step's e-mail in the outbox.
 */
import Papa from 'papaparse';
import * as XLSX from 'xlsx-republish';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { body, type Client, demo, demoEmails, signedIn } from '../setup/http';
import { createStudy, demoDirectory, fixture, postWave } from './waves-http';
import { decide, handoffStudy, type HandoffStudy, keepAll, lastMailId, mailsAbout } from './handoff-http';

let owner: Client;
let designer: Client;
let field: Client;
let reviewer: Client;
let outsider: Client;
let study: HandoffStudy;
const studyName = 'Handoff API test, "members" <survey>';
const made: string[] = [];
/** The demo accounts among addresses (other test files may add members to the demo team for a while). */
const demoOnly = (addresses: string[]) => addresses.filter((address) => address.endsWith('@paredown.test'));

// Wording and reasons chosen to break a careless export: a formula, markup, commas, quotes, a line break.
const FORMULA_REASON = '=HYPERLINK("http://example.org","click")';
const MARKUP_WORDING = 'How <b>often</b> do you visit, on average, the "main" branch?';
const COMMA_REASON = 'Says what coll_2 says, in fewer words; see <i>the map</i>.\nSecond line.';

beforeAll(async () => {
  [owner, designer, field, reviewer, outsider] = await Promise.all([
    signedIn(demoEmails.owner),
    signedIn(demoEmails.designer),
    signedIn(demoEmails.field),
    signedIn(demoEmails.reviewer),
    signedIn(demoEmails.outsider),
  ]);
  study = await handoffStudy(designer, studyName, true);
  made.push(study.studyId);
});

afterAll(async () => {
  for (const id of made) await owner.delete(`/api/studies/${id}`);
});

/** The study's handoff as the caller's studies list (GET /api/studies) shows it. */
async function listedHandoff(client: Client): Promise<{ latestVersion: { number: number; publishedAt: string; programmedAt: string | null } | null; review: string; undecided: number | null }> {
  const { studies } = await body(await client.get('/api/studies'));
  return studies.find((entry: { id: string }) => entry.id === study.studyId).handoff;
}

describe('the studies list', () => {
  it('counts the undecided items as the study page does, for an unpublished and a published study', async () => {
    const { studies } = await body(await designer.get('/api/studies'));
    for (const id of [demo.study, demo.homeStudy, study.studyId]) {
      const detail = (await body(await designer.get(`/api/studies/${id}`))).study;
      expect(studies.find((entry: { id: string }) => entry.id === id).handoff.undecided, id).toBe(detail.cutList.counts.undecided);
    }
    // The seeded home-service study has every item decided; the new one none.
    expect(studies.find((entry: { id: string }) => entry.id === demo.homeStudy).handoff.undecided).toBe(0);
    expect(studies.find((entry: { id: string }) => entry.id === study.studyId).handoff.undecided).toBe(study.items.length);
  });
});

describe('publishing', () => {
  it('refuses with 409 naming the undecided items, and writes nothing', async () => {
    const before = lastMailId();
    const none = await designer.post(`/api/studies/${study.studyId}/cut-list/publish`, {});
    expect(none.status).toBe(409);
    const refusal = (await body(none)).error;
    expect(refusal.code).toBe('items-undecided');
    expect(refusal.message).toContain(`${study.items.length} items are undecided`);
    expect(refusal.message).toContain(study.items[0]);
    expect((await listedHandoff(designer)).undecided).toBe(study.items.length);

    await decide(study.studyId, demoEmails.designer, keepAll(study.items.filter((id) => id !== 'coll_3' && id !== 'dig_5')));
    expect((await listedHandoff(designer)).undecided).toBe(2);
    const two = await designer.post(`/api/studies/${study.studyId}/cut-list/publish`, {});
    expect(two.status).toBe(409);
    expect((await body(two)).error.message).toMatch(/^The cut list cannot be published while 2 items are undecided: coll_3 and dig_5\./);
    expect((await body(await designer.get(`/api/studies/${study.studyId}/cut-list/versions`))).versions).toEqual([]);
    expect(mailsAbout(studyName, before)).toEqual([]);
  });

  it('refuses a study without a confirmed wave, and a bad body', async () => {
    const empty = await createStudy(designer, demo.team, 'Handoff API test without a wave');
    made.push(empty);
    // Nothing to decide (nor to publish) before a wave is confirmed, even with one uploaded.
    const listed = async () => (await body(await designer.get('/api/studies'))).studies.find((entry: { id: string }) => entry.id === empty).handoff;
    expect(await listed()).toEqual({ latestVersion: null, review: 'none-published', undecided: null });
    const uploaded = await postWave(designer, empty, fixture(demoDirectory, 'home-service-pilot.csv'), { codebook: fixture(demoDirectory, 'home-service-codebook.csv') });
    expect(uploaded.status).toBe(201);
    expect(await listed()).toEqual({ latestVersion: null, review: 'none-published', undecided: null });
    const response = await designer.post(`/api/studies/${empty}/cut-list/publish`, {});
    expect(response.status).toBe(409);
    expect((await body(response)).error.code).toBe('no-confirmed-wave');
    const bad = await designer.post(`/api/studies/${study.studyId}/cut-list/publish`, { note: 3 });
    expect(bad.status).toBe(400);
  });

  it('publishes version 1 with final wording in questionnaire order and e-mails field managers and reviewers', async () => {
    await decide(study.studyId, demoEmails.designer, {
      coll_3: { decision: 'keep', reason: 'Only item on magazines.' },
      dig_5: { decision: 'keep', reason: 'Stays.' },
      coll_7: { decision: 'drop', reason: COMMA_REASON },
      hours_2: { decision: 'merge', into: 'hours_1', reason: FORMULA_REASON },
      coll_1: { decision: 'reword', wording: MARKUP_WORDING, reason: 'Clearer.' },
    });
    expect(await listedHandoff(field)).toEqual({ latestVersion: null, review: 'none-published', undecided: 0 });
    const before = lastMailId();
    const response = await designer.post(`/api/studies/${study.studyId}/cut-list/publish`, { note: 'Ready for programming.' });
    expect(response.status).toBe(201);
    // The studies list tells the field manager and the reviewer at once.
    expect(await listedHandoff(field)).toEqual({ latestVersion: { number: 1, publishedAt: expect.any(String), programmedAt: null }, review: 'awaiting', undecided: 0 });
    const { version, notified } = await body(response);
    expect(version.number).toBe(1);
    expect(version.publishedBy.name).toBeTruthy();
    expect(version.items.map((item: any) => item.itemId)).toEqual(study.items);
    expect(version.items.map((item: any) => item.position)).toEqual(study.items.map((_, index) => index + 1));
    const byId = new Map(version.items.map((item: any) => [item.itemId, item]));
    expect(byId.get('coll_1')).toMatchObject({ decision: 'reword', wording: MARKUP_WORDING, finalWording: MARKUP_WORDING, codebookWording: 'The library has the books I want to read.' });
    expect(byId.get('coll_2')).toMatchObject({ decision: 'keep', wording: null, finalWording: 'New titles arrive on the shelves quickly.' });
    expect(byId.get('hours_2')).toMatchObject({ decision: 'merge', into: 'hours_1', reason: FORMULA_REASON });
    expect(version.counts).toEqual({ keep: study.items.length - 3, drop: 1, merge: 1, reword: 1, undecided: 0 });
    expect(version.diff).toEqual({ against: null, entries: [], unchanged: study.items.length });
    expect(demoOnly(notified)).toEqual([demoEmails.field, demoEmails.reviewer]);
    const mails = mailsAbout(studyName, before).filter((mail) => demoOnly([mail.to]).length > 0);
    expect(mails.map((mail) => mail.to).sort()).toEqual([demoEmails.field, demoEmails.reviewer]);
    expect(mails[0].subject).toBe(`Cut list version 1 of “${studyName}” is published`);
    expect(mails[0].text).toContain('Ready for programming.');
    expect(mails[0].text).toContain(`/studies/${study.studyId}/field-list`);
  });

  it('refuses to publish the same decisions again, then publishes version 2 with its diff', async () => {
    const same = await designer.post(`/api/studies/${study.studyId}/cut-list/publish`, {});
    expect(same.status).toBe(409);
    expect((await body(same)).error.code).toBe('unchanged');

    await decide(study.studyId, demoEmails.designer, { coll_3: { decision: 'drop', reason: 'Magazines are out of scope.' } });
    const response = await owner.post(`/api/studies/${study.studyId}/cut-list/publish`, {});
    expect(response.status).toBe(201);
    const { version } = await body(response);
    expect(version.number).toBe(2);
    expect(version.diff.against).toBe(1);
    expect(version.diff.unchanged).toBe(study.items.length - 1);
    expect(version.diff.entries).toEqual([
      {
        itemId: 'coll_3',
        change: 'changed',
        fields: ['decision', 'reason'],
        before: { decision: 'keep', into: null, finalWording: 'The choice of magazines and newspapers meets my needs.', reason: 'Only item on magazines.' },
        after: { decision: 'drop', into: null, finalWording: 'The choice of magazines and newspapers meets my needs.', reason: 'Magazines are out of scope.' },
      },
    ]);
  });

  it('lists versions newest first and reads each with its diff', async () => {
    const list = await body(await field.get(`/api/studies/${study.studyId}/cut-list/versions`));
    expect(list.versions.map((v: any) => v.number)).toEqual([2, 1]);
    expect(list.versions[0].counts.drop).toBe(2);
    const first = await body(await reviewer.get(`/api/studies/${study.studyId}/cut-list/versions/1`));
    expect(first.version.diff.against).toBeNull();
    expect(first.version.items.find((item: any) => item.itemId === 'coll_3').decision).toBe('keep');
    const latest = await body(await reviewer.get(`/api/studies/${study.studyId}/cut-list/versions/latest`));
    expect(latest.version.number).toBe(2);
    expect((await reviewer.get(`/api/studies/${study.studyId}/cut-list/versions/3`)).status).toBe(404);
    const malformed = await reviewer.get(`/api/studies/${study.studyId}/cut-list/versions/two`);
    expect(malformed.status).toBe(400);
    expect((await body(malformed)).error.code).toBe('invalid-version');
    expect((await outsider.get(`/api/studies/${study.studyId}/cut-list/versions`)).status).toBe(404);
  });
});

describe('exports', () => {
  it('CSV: named for the study and version, every formula-like cell neutralised, markup and commas intact', async () => {
    const response = await field.get(`/api/studies/${study.studyId}/cut-list.csv`);
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    expect(response.headers.get('content-disposition')).toBe('attachment; filename="paredown-cut-list-handoff-api-test-members-survey-v2.csv"');
    const parsed = Papa.parse<string[]>((await response.text()).replace(/^\uFEFF/, ''), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const [header, ...rows] = parsed.data;
    expect(header).toEqual(['new_order', 'pilot_order', 'item', 'scale', 'in_questionnaire', 'what_became_of_it', 'merged_into', 'wording_to_program', 'codebook_wording', 'reason', 'decided_by', 'decided_at_utc']);
    expect(rows).toHaveLength(study.items.length);
    const row = (id: string) => rows.find((r) => r[2] === id)!;
    expect(row('coll_1').slice(0, 2)).toEqual(['1', '1']);
    expect(row('coll_1').slice(4, 8)).toEqual(['yes', 'Kept with new wording', '', MARKUP_WORDING]);
    expect(row('coll_7').slice(0, 1)).toEqual(['']);
    expect(row('coll_7').slice(4, 6)).toEqual(['no', 'Dropped']);
    expect(row('coll_7')[9]).toBe(COMMA_REASON);
    expect(row('hours_2').slice(5, 7)).toEqual(['Merged into hours_1', 'hours_1']);
    expect(row('hours_2')[9]).toBe(`'${FORMULA_REASON}`);
    // New order numbers the items that stay, 1..kept, in pilot order.
    const kept = rows.filter((r) => r[4] === 'yes');
    expect(kept.map((r) => r[0])).toEqual(kept.map((_, index) => String(index + 1)));
    for (const cells of rows) for (const cell of cells) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
    const old = await field.get(`/api/studies/${study.studyId}/cut-list.csv?version=1`);
    expect(old.headers.get('content-disposition')).toContain('-v1.csv"');
  });

  it('XLSX: the same rows, read back with xlsx-republish, no formula anywhere', async () => {
    const response = await reviewer.get(`/api/studies/${study.studyId}/cut-list.xlsx?version=2`);
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toBe('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
    expect(response.headers.get('content-disposition')).toBe('attachment; filename="paredown-cut-list-handoff-api-test-members-survey-v2.xlsx"');
    const book = XLSX.read(new Uint8Array(await response.arrayBuffer()), { type: 'array', cellFormula: true });
    expect(book.SheetNames).toEqual(['Cut list', 'About']);
    const sheet = book.Sheets['Cut list'];
    for (const [address, cell] of Object.entries(sheet)) {
      if (address.startsWith('!')) continue;
      expect((cell as XLSX.CellObject).f, `cell ${address} has no formula`).toBeUndefined();
    }
    const rows = XLSX.utils.sheet_to_json<(string | number)[]>(sheet, { header: 1, defval: '' });
    expect(rows).toHaveLength(study.items.length + 1);
    const row = (id: string) => rows.find((r) => r[2] === id)!;
    expect(row('coll_1')[1]).toBe(study.items.indexOf('coll_1') + 1);
    expect(row('coll_1')[7]).toBe(MARKUP_WORDING);
    expect(row('coll_7')[9]).toBe(COMMA_REASON);
    expect(row('hours_2')[9]).toBe(`'${FORMULA_REASON}`);
    expect(row('coll_3')[5]).toBe('Dropped');
    const about = XLSX.utils.sheet_to_json<(string | number)[]>(book.Sheets.About, { header: 1 });
    expect(about[0]).toEqual(['study', studyName]);
    expect(about[1]).toEqual(['version', 2]);
  });

  it('answers 409 before any version and 404 for another team', async () => {
    const empty = await createStudy(designer, demo.team, 'Handoff API test nothing published');
    made.push(empty);
    for (const extension of ['csv', 'xlsx']) {
      const response = await field.get(`/api/studies/${empty}/cut-list.${extension}`);
      expect(response.status).toBe(409);
      expect((await body(response)).error.code).toBe('nothing-published');
    }
    expect((await outsider.get(`/api/studies/${study.studyId}/cut-list.csv`)).status).toBe(404);
  });
});

describe('programmed', () => {
  it('lets the field manager mark the latest version once, e-mailing the designers', async () => {
    expect((await reviewer.post(`/api/studies/${study.studyId}/cut-list/programmed`, {})).status).toBe(403);
    const before = lastMailId();
    const response = await field.post(`/api/studies/${study.studyId}/cut-list/programmed`, {});
    expect(response.status).toBe(200);
    const { version, notified } = await body(response);
    expect(version).toMatchObject({ number: 2, programmedBy: { name: expect.any(String) } });
    expect(version.programmedAt).toEqual(expect.any(String));
    expect((await listedHandoff(reviewer)).latestVersion).toEqual({ number: 2, publishedAt: expect.any(String), programmedAt: version.programmedAt });
    // The owner published version 2: the designers and its publisher are told.
    expect(demoOnly(notified)).toEqual([demoEmails.designer, demoEmails.owner]);
    expect(mailsAbout(studyName, before).filter((mail) => demoOnly([mail.to]).length > 0).map((mail) => [mail.to, mail.subject])).toEqual([
      [demoEmails.designer, `Version 2 of “${studyName}” is programmed`],
      [demoEmails.owner, `Version 2 of “${studyName}” is programmed`],
    ]);
    const again = await field.post(`/api/studies/${study.studyId}/cut-list/programmed`, {});
    expect(again.status).toBe(409);
    expect((await body(again)).error).toMatchObject({ code: 'already-programmed', message: expect.stringMatching(/^Version 2 is already marked as programmed by /) });
    expect((await owner.post(`/api/studies/${study.studyId}/cut-list/programmed`, { version: 1 })).status).toBe(200);
    expect((await owner.post(`/api/studies/${study.studyId}/cut-list/programmed`, { version: 7 })).status).toBe(404);
  });

  it('answers 409 before any version', async () => {
    const empty = await createStudy(designer, demo.team, 'Handoff API test nothing to program');
    made.push(empty);
    const response = await field.post(`/api/studies/${empty}/cut-list/programmed`, {});
    expect(response.status).toBe(409);
    expect((await body(response)).error.code).toBe('nothing-published');
  });
});

describe('comments', () => {
  it('threads comments on the study, an item and an audit, visible to the whole team', async () => {
    const onStudy = await reviewer.post(`/api/studies/${study.studyId}/comments`, { body: 'Can we keep the magazine item?' });
    expect(onStudy.status).toBe(201);
    const root = (await body(onStudy)).comment;
    expect(root).toMatchObject({ target: { kind: 'study', id: study.studyId }, about: 'the study', parentId: null, author: { name: expect.any(String) } });
    const answer = await designer.post(`/api/studies/${study.studyId}/comments`, { parentId: root.id, body: 'It overlaps coll_2 <strongly>, see the map.' });
    expect(answer.status).toBe(201);
    const onItem = await field.post(`/api/studies/${study.studyId}/comments`, { target: { kind: 'item', id: 'hours_2' }, body: 'Merged text ready?' });
    expect((await body(onItem)).comment.about).toBe('item hours_2');
    const onAudit = await reviewer.post(`/api/studies/${study.studyId}/comments`, { target: { kind: 'audit', id: study.auditId }, body: 'The KMO looks fine.' });
    expect(onAudit.status).toBe(201);
    expect((await body(onAudit)).comment.about).toMatch(/^the audit of /);

    const listed = await body(await field.get(`/api/studies/${study.studyId}/comments`));
    expect(listed.count).toBe(4);
    expect(listed.threads.map((t: any) => t.body)).toEqual(['Can we keep the magazine item?', 'Merged text ready?', 'The KMO looks fine.']);
    expect(listed.threads[0].replies.map((r: any) => [r.body, r.parentId])).toEqual([['It overlaps coll_2 <strongly>, see the map.', root.id]]);
  });

  it('refuses an unknown item, an unknown audit, a foreign parent and an empty body', async () => {
    const unknownItem = await reviewer.post(`/api/studies/${study.studyId}/comments`, { target: { kind: 'item', id: 'no_such_item' }, body: 'x' });
    expect(unknownItem.status).toBe(400);
    expect((await body(unknownItem)).error.code).toBe('unknown-item');
    const unknownAudit = await reviewer.post(`/api/studies/${study.studyId}/comments`, { target: { kind: 'audit', id: 'no-such-audit' }, body: 'x' });
    expect((await body(unknownAudit)).error.code).toBe('unknown-audit');
    const foreign = await reviewer.post(`/api/studies/${study.studyId}/comments`, { parentId: 'not-a-comment', body: 'x' });
    expect(foreign.status).toBe(404);
    const empty = await reviewer.post(`/api/studies/${study.studyId}/comments`, { body: '   ' });
    expect(empty.status).toBe(400);
    expect((await body(empty)).error.message).toContain('empty');
    expect((await outsider.post(`/api/studies/${study.studyId}/comments`, { body: 'x' })).status).toBe(404);
  });
});

describe('review', () => {
  it('answers 409 before any version', async () => {
    const empty = await createStudy(designer, demo.team, 'Handoff API test nothing to review');
    made.push(empty);
    expect(await body(await field.get(`/api/studies/${empty}/review`))).toMatchObject({ state: 'none-published', latestVersion: null, current: null, history: [] });
    const response = await reviewer.post(`/api/studies/${empty}/review`, { verdict: 'approved' });
    expect(response.status).toBe(409);
    expect((await body(response)).error.code).toBe('nothing-published');
  });

  it('asks for changes with a comment, then approves; the designers are e-mailed each time', async () => {
    expect((await body(await field.get(`/api/studies/${study.studyId}/review`))).state).toBe('awaiting');
    const noComment = await reviewer.post(`/api/studies/${study.studyId}/review`, { verdict: 'changes_requested' });
    expect(noComment.status).toBe(400);
    expect((await body(noComment)).error.message).toContain('say which changes');
    expect((await field.post(`/api/studies/${study.studyId}/review`, { verdict: 'approved' })).status).toBe(403);

    let before = lastMailId();
    const changes = await reviewer.post(`/api/studies/${study.studyId}/review`, { verdict: 'changes_requested', comment: 'Keep coll_3, please.' });
    expect(changes.status).toBe(201);
    expect(await body(changes)).toMatchObject({ state: 'changes_requested', latestVersion: 2, current: { verdict: 'changes_requested', comment: 'Keep coll_3, please.', version: 2 } });
    expect((await listedHandoff(designer)).review).toBe('changes_requested');
    expect(mailsAbout(studyName, before).filter((mail) => demoOnly([mail.to]).length > 0).map((m) => [m.to, m.subject])).toEqual([
      [demoEmails.designer, `Changes asked for on version 2 of “${studyName}”`],
      [demoEmails.owner, `Changes asked for on version 2 of “${studyName}”`],
    ]);

    before = lastMailId();
    const approved = await reviewer.post(`/api/studies/${study.studyId}/review`, { verdict: 'approved' });
    const state = await body(approved);
    expect(state).toMatchObject({ state: 'approved', latestVersion: 2 });
    expect((await listedHandoff(designer)).review).toBe('approved');
    expect(demoOnly(state.notified)).toEqual([demoEmails.designer, demoEmails.owner]);
    expect(state.history.map((r: any) => r.verdict)).toEqual(['approved', 'changes_requested']);
    expect(mailsAbout(studyName, before).filter((mail) => demoOnly([mail.to]).length > 0).map((m) => m.subject)).toEqual([`Version 2 of “${studyName}” is approved`, `Version 2 of “${studyName}” is approved`]);
  });
});

describe('activity', () => {
  it('says who decided, published, programmed, commented and reviewed, newest first', async () => {
    const { entries } = await body(await reviewer.get(`/api/studies/${study.studyId}/activity`));
    const actions = entries.map((e: any) => e.action);
    for (const action of ['decision.changed', 'cutlist.published', 'cutlist.programmed', 'comment.posted', 'review.changes-requested', 'review.approved']) {
      expect(actions).toContain(action);
    }
    expect(actions[0]).toBe('review.approved');
    const sentences = entries.map((e: any) => e.sentence);
    expect(sentences).toContain('published version 2 of the cut list');
    expect(sentences).toContain('marked version 2 as programmed');
    expect(sentences).toContain('answered a comment on the study');
    expect(sentences).toContain('decided drop for coll_3');
    expect(entries.every((e: any) => e.who === null || typeof e.who.name === 'string')).toBe(true);
    expect((await outsider.get(`/api/studies/${study.studyId}/activity`)).status).toBe(404);
  });
});
