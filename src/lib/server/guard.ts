/**
 * The one server guard every endpoint calls. It answers as api.md says: 401 when nobody is
 * signed in, 404 when the study or team is not in one of the caller's teams (never revealing that
 * it exists), 403 naming the missing permission when the role may not.
 */
import { eq } from 'drizzle-orm';
import { studies } from '../../db/schema';
import { can, roleLabels, rolesAllowed, type Action, type Role } from '../permissions';
import type { CurrentUser, Membership } from './current-user';
import { getDb } from './db';
import { HttpError, fail } from './errors';

/** The part of Astro's locals the guard reads. */
export interface GuardLocals {
  user: CurrentUser | null;
  authProblem?: string | null;
}

/** A study as the guard returns it. */
export type StudyRow = typeof studies.$inferSelect;

function roleList(action: Action): string {
  return rolesAllowed(action)
    .map((role) => roleLabels[role].toLowerCase())
    .join(' or ');
}

function forbidden(role: Role, action: Action): HttpError {
  return fail.forbidden(
    `Your role (${roleLabels[role].toLowerCase()}) may not do this: it needs the permission ${action}, which belongs to ${roleList(action)}.`,
    'missing-permission',
  );
}

/**
 * The signed-in caller.
 * @param locals Astro locals filled by the middleware.
 * @throws HttpError 401 when nobody is signed in (or the token was not recognised).
 * @returns the user.
 */
export function requireUser(locals: GuardLocals): CurrentUser {
  if (!locals.user) {
    if (locals.authProblem === 'token-not-recognised') {
      throw fail.unauthenticated('The API token was not recognised; it may have been revoked.');
    }
    throw fail.unauthenticated();
  }
  return locals.user;
}

/**
 * The caller's membership of a team, checked against an action.
 * @param locals Astro locals.
 * @param teamId the team.
 * @param action what the caller wants to do there.
 * @throws HttpError 401 not signed in, 404 not a member, 403 the role may not.
 * @returns the user and their membership.
 */
export function requireTeamAccess(locals: GuardLocals, teamId: string, action: Action): { user: CurrentUser; membership: Membership } {
  const user = requireUser(locals);
  const membership = user.memberships.find((m) => m.teamId === teamId);
  if (!membership) throw fail.notFound('No such team among yours.', 'team-not-found');
  if (!can(membership.role, action)) throw forbidden(membership.role, action);
  return { user, membership };
}

/**
 * The study, when the caller's team holds it and their role allows the action.
 * @param locals Astro locals.
 * @param studyId the study.
 * @param action what the caller wants to do.
 * @throws HttpError 401 not signed in, 404 no such study in the caller's teams, 403 the role may not.
 * @returns the user, their membership of the study's team and the study.
 */
export function requireStudyAccess(
  locals: GuardLocals,
  studyId: string,
  action: Action,
): { user: CurrentUser; membership: Membership; study: StudyRow } {
  const user = requireUser(locals);
  const study = getDb().select().from(studies).where(eq(studies.id, studyId)).get();
  const membership = study ? user.memberships.find((m) => m.teamId === study.teamId) : undefined;
  if (!study || !membership) throw fail.notFound('No such study among your teams.', 'study-not-found');
  if (!can(membership.role, action)) throw forbidden(membership.role, action);
  return { user, membership, study };
}

/**
 * Runs a guard and turns its 404 into null: pages then answer a bare 404, and the wave and audit
 * guards answer their own 404 (never revealing what exists). Every other error passes through.
 * @param check the guard call.
 * @throws whatever `check` throws except an HttpError with status 404.
 * @returns what `check` returned, or null when it answered 404.
 */
export function nullWhenNotFound<T>(check: () => T): T | null {
  try {
    return check();
  } catch (error) {
    if (error instanceof HttpError && error.status === 404) return null;
    throw error;
  }
}

/**
 * The caller's role in a team, for pages deciding what to show (null when not a member).
 * @param user the signed-in user or null.
 * @param teamId the team.
 */
export function roleIn(user: CurrentUser | null, teamId: string): Role | null {
  return user?.memberships.find((m) => m.teamId === teamId)?.role ?? null;
}
