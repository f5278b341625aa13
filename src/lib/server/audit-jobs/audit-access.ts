/**
 * The guard for routes and pages under /api/audits/{id} and /audits/{id}: the audit's study must
 * be in one of the caller's teams (else 404, never revealing that it exists) and the role must
 * allow the action (else 403 naming the permission).
 */
import { eq } from 'drizzle-orm';
import { audits, waves } from '../../../db/schema';
import type { Action } from '../../permissions';
import type { CurrentUser, Membership } from '../current-user';
import { getDb } from '../db';
import { fail } from '../errors';
import { nullWhenNotFound, requireStudyAccess, requireUser, type GuardLocals, type StudyRow } from '../guard';

/**
 * The audit's study and the caller's membership, when the caller may take the action.
 * @param locals Astro locals.
 * @param auditId the audit.
 * @param action what the caller wants to do.
 * @throws HttpError 401 not signed in, 404 `audit-not-found` (no such audit in the caller's teams), 403 the role may not.
 * @returns the user, their membership, the study and the audit's wave id.
 */
export function requireAuditAccess(
  locals: GuardLocals,
  auditId: string,
  action: Action,
): { user: CurrentUser; membership: Membership; study: StudyRow; waveId: string } {
  requireUser(locals);
  const notFound = () => fail.notFound('No such audit among your teams.', 'audit-not-found');
  const row = getDb()
    .select({ waveId: audits.waveId, studyId: waves.studyId })
    .from(audits)
    .innerJoin(waves, eq(waves.id, audits.waveId))
    .where(eq(audits.id, auditId))
    .get();
  if (!row) throw notFound();
  const access = nullWhenNotFound(() => requireStudyAccess(locals, row.studyId, action));
  if (!access) throw notFound();
  return { ...access, waveId: row.waveId };
}
