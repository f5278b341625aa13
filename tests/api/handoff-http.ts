/**
 * Helpers of the handoff tests: a study of the demo team with the demo pilot wave uploaded and
 * confirmed (and optionally audited), decisions written straight into the test server's database
 * (as the workspace's PUT route writes them: the decision, its history entry and an activity
 * entry), and the outbox read back.
 */
import Database from 'better-sqlite3';
import { inject } from 'vitest';
import { body, type Client, demo, signedIn } from '../setup/http';
import { createStudy, demoDirectory, fixture, postWave } from './waves-http';

/** A study ready for the handoff. */
export interface HandoffStudy {
  studyId: string;
  waveId: string;
  /** Item ids of the confirmed wave in questionnaire order. */
  items: string[];
  auditId: string | null;
}

/**
 * Creates a study in the demo team and uploads, confirms (and audits) the demo pilot wave.
 * @param designer a designer's client.
 * @param name the study's name.
 * @param audit whether to run an audit (bootstrap off) and wait for it.
 */
export async function handoffStudy(designer: Client, name: string, audit = false): Promise<HandoffStudy> {
  const studyId = await createStudy(designer, demo.team, name);
  const uploaded = await postWave(designer, studyId, fixture(demoDirectory, 'library-pilot-1.csv'), { codebook: fixture(demoDirectory, 'library-codebook.csv') });
  if (uploaded.status !== 201) throw new Error(`upload failed: ${uploaded.status} ${await uploaded.text()}`);
  const wave = await body(uploaded);
  const confirmed = await designer.put(`/api/waves/${wave.wave.id}/setup`, { setup: { columns: wave.setup }, exclusions: wave.screening.proposedExclusions });
  if (confirmed.status !== 200) throw new Error(`confirm failed: ${confirmed.status} ${await confirmed.text()}`);
  const items = withDatabase((db) =>
    (db.prepare('select item_id as id from wave_items where wave_id = ? order by position').all(wave.wave.id) as { id: string }[]).map((row) => row.id),
  );
  let auditId: string | null = null;
  if (audit) {
    const started = await designer.post(`/api/waves/${wave.wave.id}/audits`, { settings: { bootstrap: 0, seed: 11 } });
    auditId = (await body(started)).audit.id as string;
    for (let attempt = 0; attempt < 1_200; attempt++) {
      const status = (await body(await designer.get(`/api/audits/${auditId}`))).audit.status;
      if (status === 'done') break;
      if (status === 'failed') throw new Error('the audit failed');
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
  }
  return { studyId, waveId: wave.wave.id, items, auditId };
}

/** Runs work on the test server's database and closes it. */
export function withDatabase<T>(work: (db: Database.Database) => T): T {
  const db = new Database(inject('databasePath'), { fileMustExist: true });
  db.pragma('busy_timeout = 5000');
  try {
    return work(db);
  } finally {
    db.close();
  }
}

/** The id of a user by e-mail. */
export function userId(email: string): string {
  return withDatabase((db) => (db.prepare('select id from users where email = ?').get(email) as { id: string }).id);
}

/** One decision to write. */
export interface TestDecision {
  decision: 'keep' | 'drop' | 'merge' | 'reword' | 'undecided';
  into?: string;
  wording?: string;
  reason?: string;
}

/**
 * Makes decisions through the workspace's route (PUT /api/studies/{id}/cut-list/{itemId}), signed
 * in as the given member, one item after another; fails the test on any refusal.
 * @param studyId the study.
 * @param byEmail who decides (a designer or owner).
 * @param decisions by item id.
 */
export async function decide(studyId: string, byEmail: string, decisions: Record<string, TestDecision>): Promise<void> {
  const client = await signedIn(byEmail);
  for (const [itemId, d] of Object.entries(decisions)) {
    const response = await client.put(`/api/studies/${studyId}/cut-list/${encodeURIComponent(itemId)}`, { decision: d.decision, into: d.into, wording: d.wording, reason: d.reason ?? '' });
    if (response.status !== 200) throw new Error(`deciding ${itemId} as ${byEmail} answered ${response.status}: ${await response.text()}`);
  }
}

/** Keep for every item, with a reason. */
export function keepAll(items: string[]): Record<string, TestDecision> {
  return Object.fromEntries(items.map((id) => [id, { decision: 'keep' as const, reason: 'Distinct content; stays.' }]));
}

/** A kept e-mail. */
export interface KeptMail {
  id: number;
  to: string;
  subject: string;
  text: string;
}

/** The outbox's mails after a given id whose subject mentions the text. */
export function mailsAbout(text: string, afterId = 0): KeptMail[] {
  return withDatabase((db) =>
    (db.prepare('select id, "to", subject, text from email_outbox where id > ? order by id').all(afterId) as KeptMail[]).filter((mail) => mail.subject.includes(text)),
  );
}

/** The largest outbox id so far. */
export function lastMailId(): number {
  return withDatabase((db) => (db.prepare('select coalesce(max(id), 0) as id from email_outbox').get() as { id: number }).id);
}
