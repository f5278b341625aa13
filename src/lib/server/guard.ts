/**
 * The one server guard every endpoint and page calls, for every kind of object a route
 * addresses. It answers as api.md says, in this order:
 * 1. 401 when nobody is signed in (or the API token was not recognised);
 * 2. 404 when there is no such object, or its team is not one of the caller's (never revealing
 *    that it exists: both answers are the same);
 * 3. 403 naming the missing permission (`missing-permission`) when the caller's role in that team
 *    may not take the action (src/lib/permissions.ts).
 *
 * Each kind of object is one row of {@link objectKinds}: its 404 words and how to find it with the
 * team that holds it, in one read. To guard a new kind (cut list, comment, review: later work),
 * add a row whose `locate` joins the object to its study (or team) and returns `{ teamId, found }`;
 * routes then call `requireAccess(locals, 'comment', id, 'comment:audit')`. Nothing else changes.
 *
 * Guards only read: they never write, stamp or recover anything (docs/decisions/008).
 */
import { eq, sql } from 'drizzle-orm';
import { preparedQuery } from '../../db/prepared-query';
import { audits, studies, waves } from '../../db/schema';
import { can, roleLabels, rolesAllowed, type Action, type Role } from '../permissions';
import { tokenNotRecognisedMessage, type CurrentUser, type Membership } from './current-user';
import { getDb } from './db';
import { HttpError, fail } from './errors';

/** The part of Astro's locals the guard reads. */
export interface GuardLocals {
  user: CurrentUser | null;
  authProblem?: string | null;
}

/** A study as the guard returns it. */
export type StudyRow = typeof studies.$inferSelect;

/** A wave as the guard returns it. */
export type GuardedWaveRow = typeof waves.$inferSelect;

/** Where an object was found: the team that holds it, and what the route gets back. */
export interface Located<Found> {
  teamId: string;
  found: Found;
}

/** One kind of object a route may address. */
export interface ObjectKind<Found> {
  /** The 404 code, e.g. `wave-not-found`. */
  notFoundCode: string;
  /** The 404 sentence, e.g. "No such wave among your teams." */
  notFoundMessage: string;
  /**
   * Finds the object and the team that holds it, reading only.
   * @param id the id from the path.
   * @returns where it is, or null when there is no such object.
   */
  locate(id: string): Located<Found> | null;
}

// The guard runs on every request that names an object: its lookups are built once (src/db/prepared-query.ts).
const studyById = preparedQuery((db) => db.select().from(studies).where(eq(studies.id, sql.placeholder('id'))).prepare());
const waveWithStudy = preparedQuery((db) =>
  db.select({ wave: waves, study: studies }).from(waves).innerJoin(studies, eq(studies.id, waves.studyId)).where(eq(waves.id, sql.placeholder('id'))).prepare(),
);
const auditWithStudy = preparedQuery((db) =>
  db
    .select({ waveId: audits.waveId, study: studies })
    .from(audits)
    .innerJoin(waves, eq(waves.id, audits.waveId))
    .innerJoin(studies, eq(studies.id, waves.studyId))
    .where(eq(audits.id, sql.placeholder('id')))
    .prepare(),
);

function kind<Found>(definition: ObjectKind<Found>): ObjectKind<Found> {
  return definition;
}

/**
 * Every kind of object the guard knows, by name. A team is its own team; the others are found
 * with their study (whose team holds them) in one query.
 */
export const objectKinds = {
  team: kind({
    notFoundCode: 'team-not-found',
    notFoundMessage: 'No such team among yours.',
    locate: (id: string) => (id ? { teamId: id, found: {} } : null),
  }),
  study: kind({
    notFoundCode: 'study-not-found',
    notFoundMessage: 'No such study among your teams.',
    locate: (id: string) => {
      const study = studyById(getDb()).get({ id });
      return study ? { teamId: study.teamId, found: { study } } : null;
    },
  }),
  wave: kind({
    notFoundCode: 'wave-not-found',
    notFoundMessage: 'No such wave among your teams.',
    locate: (id: string) => {
      const row = waveWithStudy(getDb()).get({ id });
      return row ? { teamId: row.study.teamId, found: { study: row.study, wave: row.wave } } : null;
    },
  }),
  audit: kind({
    notFoundCode: 'audit-not-found',
    notFoundMessage: 'No such audit among your teams.',
    locate: (id: string) => {
      const row = auditWithStudy(getDb()).get({ id });
      return row ? { teamId: row.study.teamId, found: { study: row.study, waveId: row.waveId } } : null;
    },
  }),
} satisfies Record<string, ObjectKind<object>>;

/** The names of the kinds the guard knows. */
export type ObjectKindName = keyof typeof objectKinds;

/** What the guard gives back for a kind besides the caller: e.g. `{ study, wave }` for a wave. */
export type Found<K extends ObjectKindName> = NonNullable<ReturnType<(typeof objectKinds)[K]['locate']>>['found'];

/** The caller and their membership of the object's team, with what was found. */
export type Access<K extends ObjectKindName> = { user: CurrentUser; membership: Membership } & Found<K>;

function roleList(action: Action): string {
  return rolesAllowed(action)
    .map((role) => roleLabels[role].toLowerCase())
    .join(' or ');
}

/**
 * The 403 of a role that may not take an action, naming the permission and who has it.
 * @param role the caller's role.
 * @param action the action refused.
 * @returns the error to throw.
 */
export function forbidden(role: Role, action: Action): HttpError {
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
      throw new HttpError(401, 'token-not-recognised', tokenNotRecognisedMessage);
    }
    throw fail.unauthenticated();
  }
  return locals.user;
}

/**
 * The object, when it is held by one of the caller's teams and their role there allows the action.
 * @param locals Astro locals.
 * @param kindName which kind of object the id names (a row of {@link objectKinds}).
 * @param id the object's id, from the path.
 * @param action what the caller wants to do with it.
 * @throws HttpError 401 not signed in; 404 `<kind>-not-found` (no such object in the caller's
 *   teams); 403 `missing-permission` naming the permission when the role may not.
 * @returns the user, their membership of the object's team and what the kind finds.
 * References: Paredown api.md (401, 403, 404 "not in one of your teams").
 */
export function requireAccess<K extends ObjectKindName>(locals: GuardLocals, kindName: K, id: string, action: Action): Access<K> {
  const user = requireUser(locals);
  const objectKind: ObjectKind<Found<K>> = objectKinds[kindName] as unknown as ObjectKind<Found<K>>;
  const located = objectKind.locate(id);
  const membership = located ? user.memberships.find((m) => m.teamId === located.teamId) : undefined;
  if (!located || !membership) throw fail.notFound(objectKind.notFoundMessage, objectKind.notFoundCode);
  if (!can(membership.role, action)) throw forbidden(membership.role, action);
  return { user, membership, ...located.found } as Access<K>;
}

/**
 * Runs a guard and turns its 404 into null: pages then answer a bare 404. Every other error
 * passes through.
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
