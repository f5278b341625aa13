/**
 * The guard for routes under /api/waves/{id}: the wave's study must be in one of the caller's
 * teams (else 404, never revealing that it exists) and the role must allow the action (else 403).
 */
import { eq } from 'drizzle-orm';
import { waves } from '../../../db/schema';
import type { Action } from '../../permissions';
import type { CurrentUser, Membership } from '../current-user';
import { getDb } from '../db';
import { fail } from '../errors';
import { nullWhenNotFound, requireStudyAccess, requireUser, type GuardLocals, type StudyRow } from '../guard';
import type { WaveRow } from './stored-wave';

/**
 * The wave, when the caller's team holds its study and their role allows the action.
 * @param locals Astro locals.
 * @param waveId the wave.
 * @param action what the caller wants to do.
 * @throws HttpError 401 not signed in, 404 `wave-not-found` (no such wave in the caller's teams), 403 the role may not.
 * @returns the user, their membership, the study and the wave.
 * References: Paredown api.md (401, 403, 404 "not in one of your teams").
 */
export function requireWaveAccess(
  locals: GuardLocals,
  waveId: string,
  action: Action,
): { user: CurrentUser; membership: Membership; study: StudyRow; wave: WaveRow } {
  requireUser(locals);
  const notFound = () => fail.notFound('No such wave among your teams.', 'wave-not-found');
  const wave = getDb().select().from(waves).where(eq(waves.id, waveId)).get();
  if (!wave) throw notFound();
  const access = nullWhenNotFound(() => requireStudyAccess(locals, wave.studyId, action));
  if (!access) throw notFound();
  return { ...access, wave };
}
