/**
 * Who may do what inside a team: the one role × action table of Paredown. Every endpoint asks
 * it through the server guard (src/lib/server/guard.ts), and every page asks it what to show.
 * Pure data and functions: safe to import from islands.
 */

/** Roles inside a team (product.md). */
export const roles = ['owner', 'designer', 'field_manager', 'client_reviewer'] as const;
export type Role = (typeof roles)[number];

/** Words shown for each role. */
export const roleLabels: Record<Role, string> = {
  owner: 'Owner',
  designer: 'Survey designer',
  field_manager: 'Field manager',
  client_reviewer: 'Client reviewer',
};

/** One line on what each role is for, shown where roles are chosen. */
export const roleSummaries: Record<Role, string> = {
  owner: 'Everything a designer does, plus members, roles and deleting studies.',
  designer: 'Creates studies, uploads waves, runs audits, decides and publishes the cut list.',
  field_manager: 'Reads studies and audits, receives and exports the published cut list, marks it programmed.',
  client_reviewer: 'Reads audits and the memo (aggregates only), comments, approves or asks for changes.',
};

/**
 * Every action a member may be allowed, named `verb:object`. Routes that arrive with later work
 * are listed already so the table is complete.
 */
export const actions = [
  'read:study', // GET a study, its waves, audits list and cut-list state
  'create:study', // POST /api/studies
  'edit:study', // change name, description, settings (locked items, floors)
  'delete:study', // DELETE /api/studies/{id}
  'upload:wave', // POST /api/studies/{id}/waves
  'confirm:wave', // PUT /api/waves/{id}/setup
  'read:respondents', // GET /api/waves/{id}/respondents (respondent-level rows)
  'run:audit', // POST /api/waves/{id}/audits
  'read:audit', // GET /api/audits/{id}
  'export:memo', // GET /api/audits/{id}/memo.docx, .pdf
  'read:cutlist', // GET /api/studies/{id}/cut-list
  'decide:item', // PUT /api/studies/{id}/cut-list/{itemId}
  'publish:cutlist', // POST /api/studies/{id}/cut-list/publish
  'export:cutlist', // GET /api/studies/{id}/cut-list.xlsx, .csv
  'mark:programmed', // POST /api/studies/{id}/cut-list/programmed
  'comment', // POST /api/studies/{id}/comments
  'review', // POST /api/studies/{id}/review
  'read:members', // GET /api/teams/{id}/members
  'manage:team', // invitations, role changes, removing members
] as const;
export type Action = (typeof actions)[number];

const everyMember: readonly Action[] = [
  'read:study',
  'read:audit',
  'export:memo',
  'read:cutlist',
  'export:cutlist',
  'comment',
  'read:members',
];

const designerActions: readonly Action[] = [
  ...everyMember,
  'create:study',
  'edit:study',
  'upload:wave',
  'confirm:wave',
  'read:respondents',
  'run:audit',
  'decide:item',
  'publish:cutlist',
];

/** The table itself: for each role, the actions it may take. */
export const permissionTable: Readonly<Record<Role, ReadonlySet<Action>>> = {
  owner: new Set<Action>(actions),
  designer: new Set<Action>(designerActions),
  field_manager: new Set<Action>([...everyMember, 'mark:programmed']),
  client_reviewer: new Set<Action>([...everyMember, 'review']),
};

/**
 * Whether a role may take an action.
 * @param role the member's role in the team, or null for someone outside it.
 * @param action the action asked for.
 * @returns true when the table allows it.
 */
export function can(role: Role | null | undefined, action: Action): boolean {
  if (!role) return false;
  return permissionTable[role].has(action);
}

/**
 * The roles that may take an action, in the table's order (for messages such as "owner or designer").
 * @param action the action.
 * @returns the roles allowed.
 */
export function rolesAllowed(action: Action): Role[] {
  return roles.filter((role) => permissionTable[role].has(action));
}

/** Type guard for a role name received from outside. */
export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (roles as readonly string[]).includes(value);
}
