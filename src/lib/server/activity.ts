/** The activity log: every write says who did what, where and when. */
import { activityLog } from '../../db/schema';
import type { Db } from '../../db/client';

/** One entry of the activity log. */
export interface ActivityEntry {
  teamId?: string | null;
  studyId?: string | null;
  userId: string | null;
  /** `object.verb`, e.g. `study.created`, `member.role-changed`. */
  action: string;
  detail?: Record<string, unknown>;
}

/**
 * Records an entry (inside the caller's transaction when it passes one).
 * @param db the database or transaction.
 * @param entry what happened.
 */
export function logActivity(db: Pick<Db, 'insert'>, entry: ActivityEntry): void {
  db.insert(activityLog)
    .values({
      teamId: entry.teamId ?? null,
      studyId: entry.studyId ?? null,
      userId: entry.userId,
      action: entry.action,
      detail: entry.detail ?? {},
      at: new Date(),
    })
    .run();
}
