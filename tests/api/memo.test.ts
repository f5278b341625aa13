/**
 * The memo over HTTP: every member of the team (the client reviewer first of all) downloads it as
 * PDF and DOCX, with file names that say what they are; refusals say why (an audit that is not
 * done, a version that was never published, a malformed version). The content itself is checked
 * in tests/unit/memo.test.ts.
 */
import Database from 'better-sqlite3';
import { inject } from 'vitest';
import { beforeAll, describe, expect, it } from 'vitest';
import { body, type Client, demo, demoEmails, signedIn } from '../setup/http';

const demoWave = 'wave-riverbend-pilot-1';
let reviewer: Client;
let designer: Client;
let auditId: string;

async function waitForStatus(client: Client, id: string, wanted: string): Promise<void> {
  for (let attempt = 0; attempt < 900; attempt++) {
    if ((await body(await client.get(`/api/audits/${id}`))).audit.status === wanted) return;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error(`audit ${id} never became ${wanted}`);
}

beforeAll(async () => {
  reviewer = await signedIn(demoEmails.reviewer);
  designer = await signedIn(demoEmails.designer);
  const started = await designer.post(`/api/waves/${demoWave}/audits`, { settings: { bootstrap: 0, seed: 31_337 } });
  auditId = (await body(started)).audit.id;
  await waitForStatus(designer, auditId, 'done');
});

describe('the memo downloads', () => {
  it('gives the reviewer a PDF and a DOCX named after the study and the decisions', async () => {
    const pdf = await reviewer.get(`/api/audits/${auditId}/memo.pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get('content-type')).toBe('application/pdf');
    expect(pdf.headers.get('content-disposition')).toMatch(/^attachment; filename="paredown-memo-[a-z0-9-]+-pilot-1-current\.pdf"$/);
    const pdfBytes = Buffer.from(await pdf.arrayBuffer());
    expect(pdfBytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');

    const docx = await reviewer.get(`/api/audits/${auditId}/memo.docx`);
    expect(docx.status).toBe(200);
    expect(docx.headers.get('content-type')).toBe('application/vnd.openxmlformats-officedocument.wordprocessingml.document');
    const docxBytes = Buffer.from(await docx.arrayBuffer());
    expect(docxBytes.subarray(0, 2).toString('latin1')).toBe('PK'); // a zip archive
  });

  it('shows the memo on its preview page with both downloads', async () => {
    const page = await reviewer.get(`/audits/${auditId}/memo`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain('data-testid="memo-preview"');
    expect(html).toContain('7. Decisions');
    expect(html).toContain(`/api/audits/${auditId}/memo.pdf`);
    expect(html).toContain('<svg');
  });

  it('reports a published version when asked, and refuses one that was never published', async () => {
    const database = new Database(inject('databasePath'));
    try {
      const number = 901;
      database
        .prepare('INSERT INTO cut_list_versions (id, study_id, number, items, audit_id, published_by, published_at) VALUES (?, ?, ?, ?, ?, NULL, ?)')
        .run(`memo-test-version-${number}`, demo.study, number, JSON.stringify([{ itemId: 'coll_7', decision: 'drop', into: null, reason: 'Says what coll_2 says.', text: null }]), auditId, Date.now());
      const published = await reviewer.get(`/audits/${auditId}/memo?version=${number}`);
      expect(published.status).toBe(200);
      const html = await published.text();
      expect(html).toContain(`Published version ${number}`);
      expect(html).toContain('Says what coll_2 says.');
      const missing = await reviewer.get(`/api/audits/${auditId}/memo.pdf?version=${number + 1}`);
      expect(missing.status).toBe(404);
      expect((await body(missing)).error.code).toBe('version-not-found');
    } finally {
      database.close();
    }
    const malformed = await reviewer.get(`/api/audits/${auditId}/memo.pdf?version=two`);
    expect(malformed.status).toBe(400);
    expect((await body(malformed)).error.message).toMatch(/published version number/);
  });

  it('refuses the memo of an audit that did not finish, saying why', async () => {
    const started = await designer.post(`/api/waves/${demoWave}/audits`, { settings: { bootstrap: 0, seed: 31_338, testFault: 'throw' } });
    const failed = (await body(started)).audit.id;
    await waitForStatus(designer, failed, 'failed');
    const response = await reviewer.get(`/api/audits/${failed}/memo.docx`);
    expect(response.status).toBe(409);
    expect(await body(response)).toMatchObject({ error: { code: 'audit-not-done' } });
  });

  it('exports the decision history as CSV for every member', async () => {
    const response = await reviewer.get(`/api/studies/${demo.study}/cut-list/history.csv`);
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toBe('text/csv; charset=utf-8');
    const text = await response.text();
    expect(text.replace(/^\uFEFF/, '').split('\r\n')[0]).toBe('decided_at_utc,decided_by,item,decision,merged_into,reason,audit');
  });
});
