/**
 * The demo's second study taken as far as its designer takes a handoff: the audit's proposals
 * accepted, every other item kept with a reason, version 1 of the cut list published. It runs
 * through the services the routes use (cut-list.ts, handoff/versions.ts) against the database
 * being seeded (`withDatabase`), so that the field manager finds a version to program and the
 * client reviewer one to review as soon as they sign in, and the publication's e-mails wait in
 * the seeded outbox. What the field manager and the reviewer do with it is left to them.
 */
import { eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { studies } from '../../db/schema';
import { acceptRecommendations, cutList, referenceAudit, setDecision } from './cut-list';
import { loadUser } from './current-user';
import { withDatabase } from './db';
import { publishCutList } from './handoff/versions';

/** The reason recorded for each item the designer keeps. */
const KEEP_REASON = 'Not in any overlap the audit found; its content is its own.';

/** The note published with version 1. */
const PUBLISH_NOTE = 'Version for the autumn round of home visits: two near-repeats go, everything else stays as piloted.';

/**
 * Decides every item of a seeded study's audited wave and publishes version 1 of its cut list.
 * @param db the database being seeded (its study, wave, finished audit and users in place).
 * @param ids the study and the designer who decides and publishes.
 * @throws {Error} when the study, the designer or a finished audit is missing, or a service refuses.
 * @returns the number of the version published.
 */
export async function seedDemoHandoff(db: Db, ids: { study: string; designer: string }): Promise<{ version: number }> {
  return withDatabase(db, async () => {
    const study = db.select().from(studies).where(eq(studies.id, ids.study)).get();
    const designer = loadUser(ids.designer);
    const audit = referenceAudit(db, ids.study);
    if (!study || !designer || !audit) throw new Error(`seedDemoHandoff: the study ${ids.study}, its designer ${ids.designer} or its finished audit is missing`);
    // Each proposal accepted on its own, as a designer who has read the wording would (the
    // stability check marks proposals on so small a wave as uncertain, which is why "all stable"
    // is not the way here).
    audit.result.recommendations.forEach((_, index) => acceptRecommendations(designer, study, index));
    for (const item of cutList(study, 'designer').items) {
      if (item.decision === 'undecided') setDecision(designer, study, { itemId: item.id, decision: 'keep', into: null, wording: null, reason: KEEP_REASON });
    }
    const published = await publishCutList(designer, study, PUBLISH_NOTE);
    return { version: published.version.number };
  });
}
