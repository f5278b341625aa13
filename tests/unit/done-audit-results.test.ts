/**
 * Done audits' results, parsed once per process (src/lib/server/audit-jobs/done-audit-results.ts):
 * on the seeded demo, the demo's done audit is read once and shared, frozen deeply so no caller can
 * change what later requests see; an audit that is not done, or none, gives null.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, type Db } from '../../src/db/client';
import { audits } from '../../src/db/schema';
import { doneAuditResult } from '../../src/lib/server/audit-jobs/done-audit-results';
import { seedDemo } from '../../src/lib/server/demo-seed';

const demoAudit = 'audit-riverbend-pilot-1';
let folder = '';
let db: Db;

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'paredown-done-results-'));
  db = openDatabase(join(folder, 'paredown.sqlite'));
  const outcome = await seedDemo(db, { enabled: true, uploadDir: join(folder, 'uploads') });
  expect(outcome.seeded).toBe(true);
}, 120_000);

afterAll(() => {
  db?.$client.close();
  rmSync(folder, { recursive: true, force: true });
});

describe('doneAuditResult', () => {
  it('gives null for an audit that is not done, and keeps nothing for it; null for none', () => {
    db.update(audits).set({ status: 'running' }).where(eq(audits.id, demoAudit)).run();
    try {
      expect(doneAuditResult(db, demoAudit)).toBeNull();
    } finally {
      db.update(audits).set({ status: 'done' }).where(eq(audits.id, demoAudit)).run();
    }
    expect(doneAuditResult(db, demoAudit)).not.toBeNull();
    expect(doneAuditResult(db, 'audit-that-does-not-exist')).toBeNull();
  });

  it('parses the stored JSON once and shares it, frozen', () => {
    const stored = db.select({ result: audits.result }).from(audits).where(eq(audits.id, demoAudit)).get()?.result;
    expect(stored).toBeTruthy();
    const first = doneAuditResult(db, demoAudit);
    expect(first).toEqual(JSON.parse(stored!));
    // Read once: the stored text could change under it (it never does for a done audit) and the kept copy is what comes back.
    db.update(audits).set({ result: '{}' }).where(eq(audits.id, demoAudit)).run();
    expect(doneAuditResult(db, demoAudit)).toBe(first);
    expect(Object.isFrozen(first)).toBe(true);
    expect(Object.isFrozen(first!.items)).toBe(true);
    expect(Object.isFrozen(first!.items[0])).toBe(true);
    expect(() => {
      (first!.items as unknown as unknown[]).push({});
    }).toThrow(TypeError);
    expect(() => {
      (first!.items[0] as { vif: number | null }).vif = 0;
    }).toThrow(TypeError);
  });

});
