/**
 * What the handoff reads about a study's items: the latest confirmed wave's items (questionnaire
 * order, codebook wording, scale) and the current decisions, read straight from the `decisions`
 * table. The new wording of a reword is read when the table has that column (the workspace adds
 * it); before then every decision has none.
 */
import { and, desc, eq, inArray, isNotNull } from 'drizzle-orm';
import { sql } from 'drizzle-orm';
import { users, waveItems, waves } from '../../../db/schema';
import type { HandoffDecision } from '../../api/handoff';
import type { Db } from '../../../db/client';

/** An item of the wave the cut list is made for. */
export interface WaveItem {
  itemId: string;
  /** 1-based questionnaire order. */
  position: number;
  text: string | null;
  scale: string | null;
}

/** The latest confirmed wave of a study with its items in questionnaire order, or null. */
export function latestConfirmedWave(db: Pick<Db, 'select'>, studyId: string): { id: string; label: string; items: WaveItem[] } | null {
  const wave = db
    .select({ id: waves.id, label: waves.label })
    .from(waves)
    .where(and(eq(waves.studyId, studyId), eq(waves.status, 'confirmed'), isNotNull(waves.confirmedAt)))
    .orderBy(desc(waves.confirmedAt), desc(waves.createdAt))
    .limit(1)
    .get();
  if (!wave) return null;
  const items = db
    .select({ itemId: waveItems.itemId, position: waveItems.position, text: waveItems.text, scale: waveItems.scale })
    .from(waveItems)
    .where(eq(waveItems.waveId, wave.id))
    .orderBy(waveItems.position)
    .all()
    .map((item, index) => ({ ...item, position: index + 1 }));
  return { ...wave, items };
}

/** A current decision as the handoff reads it. */
export interface CurrentDecision {
  itemId: string;
  decision: HandoffDecision;
  into: string | null;
  wording: string | null;
  reason: string;
  auditId: string | null;
  decidedById: string | null;
  decidedBy: string | null;
  decidedAt: Date | null;
}

const KINDS: readonly HandoffDecision[] = ['keep', 'drop', 'merge', 'reword', 'undecided'];

/**
 * The current decisions of a study by item id.
 * @param db the database or a transaction.
 * @param studyId the study.
 */
export function currentDecisions(db: Pick<Db, 'all' | 'select'>, studyId: string): Map<string, CurrentDecision> {
  // Raw SQL on purpose: `wording` exists once the workspace's migration ran, and `select *`
  // reads it then without this code naming a column the schema may not have yet.
  const rows = db.all<Record<string, unknown>>(sql`select * from decisions where study_id = ${studyId}`);
  const ids = [...new Set(rows.map((row) => row.decided_by).filter((id): id is string => typeof id === 'string'))];
  const names = new Map(ids.length > 0 ? db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids)).all().map((u) => [u.id, u.name]) : []);
  const result = new Map<string, CurrentDecision>();
  for (const row of rows) {
    const kind = KINDS.includes(row.decision as HandoffDecision) ? (row.decision as HandoffDecision) : 'undecided';
    const by = typeof row.decided_by === 'string' ? row.decided_by : null;
    result.set(String(row.item_id), {
      itemId: String(row.item_id),
      decision: kind,
      into: typeof row.into_item_id === 'string' ? row.into_item_id : null,
      wording: typeof row.wording === 'string' && row.wording.trim() !== '' ? row.wording : null,
      reason: typeof row.reason === 'string' ? row.reason : '',
      auditId: typeof row.audit_id === 'string' ? row.audit_id : null,
      decidedById: by,
      decidedBy: by ? (names.get(by) ?? 'a former member') : null,
      decidedAt: typeof row.decided_at === 'number' ? new Date(row.decided_at) : null,
    });
  }
  return result;
}
