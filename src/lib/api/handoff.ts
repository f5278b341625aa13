/**
 * The handoff contracts: publishing the cut list, its versions and their diff, the "programmed"
 * mark, comments, the client's review and the study's activity. What the routes accept (zod
 * schemas, shared by the server and the islands) and what they answer (types). Pure: no server,
 * database or DOM imports, so islands may import it.
 *
 * Routes (DEVELOPERS.md, "Routes beyond api.md"; docs/decisions/012-handoff.md):
 * - POST /api/studies/{id}/cut-list/publish         PublishRequest → PublishResponse (owner, designer)
 * - GET  /api/studies/{id}/cut-list/versions        → VersionListResponse (members)
 * - GET  /api/studies/{id}/cut-list/versions/{n}    → VersionResponse (members)
 * - POST /api/studies/{id}/cut-list/programmed      ProgrammedRequest → ProgrammedResponse (field manager, owner)
 * - GET  /api/studies/{id}/cut-list.xlsx, .csv      the published list for programming (members; ?version=N)
 * - GET  /api/studies/{id}/comments                 → CommentsResponse (members)
 * - POST /api/studies/{id}/comments                 CommentRequest → CommentResponse (members)
 * - GET  /api/studies/{id}/review                   → ReviewResponse (members)
 * - POST /api/studies/{id}/review                   ReviewRequest → ReviewResponse (client reviewer, owner)
 * - GET  /api/studies/{id}/activity                 → ActivityResponse (members)
 */
import { z } from 'zod';

/** What an item's decision can be (the same five as the cut list). */
export type HandoffDecision = 'keep' | 'drop' | 'merge' | 'reword' | 'undecided';

/** The longest note and comment accepted. */
export const MAX_NOTE_LENGTH = 2_000;
export const MAX_COMMENT_LENGTH = 5_000;

/** The body of POST /cut-list/publish: an optional note for the team (it goes into the e-mail). */
export const publishRequestSchema = z
  .object({
    note: z.string().trim().max(MAX_NOTE_LENGTH, `note is at most ${MAX_NOTE_LENGTH} characters`).default(''),
  })
  .strict();
export type PublishRequest = z.input<typeof publishRequestSchema>;

/** The body of POST /cut-list/programmed: which version (the latest when left out). */
export const programmedRequestSchema = z
  .object({
    version: z.number().int('version must be a whole number').min(1, 'version is a published version number such as 1').optional(),
  })
  .strict();
export type ProgrammedRequest = z.input<typeof programmedRequestSchema>;

/** What a comment is about. */
export const commentTargetKinds = ['study', 'item', 'audit'] as const;
export type CommentTargetKind = (typeof commentTargetKinds)[number];

/**
 * The body of POST /comments: the study, an item (its id) or an audit (its id); `parentId` answers
 * an earlier comment (the answer takes that thread's target).
 */
export const commentRequestSchema = z
  .object({
    target: z
      .object({
        kind: z.enum(commentTargetKinds, { message: `target.kind must be one of ${commentTargetKinds.join(', ')}` }),
        id: z.string().trim().min(1).max(200).optional(),
      })
      .strict()
      .default({ kind: 'study' }),
    parentId: z.string().trim().min(1).max(200).optional(),
    body: z.string().trim().min(1, 'write the comment (it is empty)').max(MAX_COMMENT_LENGTH, `a comment is at most ${MAX_COMMENT_LENGTH} characters`),
  })
  .strict()
  .superRefine((value, context) => {
    if (value.target.kind !== 'study' && !value.target.id && !value.parentId) {
      context.addIssue({ code: 'custom', path: ['target', 'id'], message: `name the ${value.target.kind} the comment is about (its id)` });
    }
  });
export type CommentRequest = z.input<typeof commentRequestSchema>;

/** The client's verdicts. */
export const reviewVerdicts = ['approved', 'changes_requested'] as const;
export type ReviewVerdict = (typeof reviewVerdicts)[number];

/** The body of POST /review: approve, or ask for changes saying which (a comment is then required). */
export const reviewRequestSchema = z
  .object({
    verdict: z.enum(reviewVerdicts, { message: 'verdict must be approved or changes_requested' }),
    comment: z.string().trim().max(MAX_COMMENT_LENGTH, `a comment is at most ${MAX_COMMENT_LENGTH} characters`).default(''),
  })
  .strict()
  .superRefine((value, context) => {
    if (value.verdict === 'changes_requested' && value.comment === '') {
      context.addIssue({ code: 'custom', path: ['comment'], message: 'say which changes you ask for (a comment is required with changes_requested)' });
    }
  });
export type ReviewRequest = z.input<typeof reviewRequestSchema>;

/** A person as the handoff names them (null id: a former member). */
export interface PersonRef {
  id: string | null;
  name: string;
}

/**
 * One item of a published version, frozen at publication. `wording` is the designer's new
 * wording (reword) or null, as the memo reads it; `finalWording` is what the field manager
 * programs: the new wording where given, else the codebook's.
 */
export interface FrozenItem {
  itemId: string;
  decision: HandoffDecision;
  into: string | null;
  reason: string;
  wording: string | null;
  finalWording: string | null;
  codebookWording: string | null;
  scale: string | null;
  /** Questionnaire order in the wave (1 = first item). */
  position: number;
  decidedBy: string | null;
  decidedById: string | null;
  decidedAt: string | null;
}

/** The fields compared between versions. */
export type DiffField = 'decision' | 'into' | 'wording' | 'reason';

/** What changed for one item between two versions. */
export interface DiffEntry {
  itemId: string;
  change: 'added' | 'removed' | 'changed';
  /** The fields that differ for a changed item. */
  fields: DiffField[];
  before: Pick<FrozenItem, 'decision' | 'into' | 'finalWording' | 'reason'> | null;
  after: Pick<FrozenItem, 'decision' | 'into' | 'finalWording' | 'reason'> | null;
}

/** The diff of a version against the one before it (null `against` for the first version). */
export interface VersionDiff {
  against: number | null;
  entries: DiffEntry[];
  unchanged: number;
}

/** One review of a version. */
export interface ReviewView {
  id: string;
  version: number | null;
  verdict: ReviewVerdict;
  comment: string;
  reviewer: PersonRef | null;
  createdAt: string;
}

/** A published version as lists show it. */
export interface VersionSummary {
  number: number;
  publishedAt: string;
  publishedBy: PersonRef | null;
  programmedAt: string | null;
  programmedBy: PersonRef | null;
  auditId: string | null;
  counts: Record<HandoffDecision, number>;
  /** The latest review of this version. */
  review: ReviewView | null;
}

/** A version with its items (questionnaire order) and its diff. */
export interface VersionDetail extends VersionSummary {
  items: FrozenItem[];
  diff: VersionDiff;
}

export interface PublishResponse {
  version: VersionDetail;
  /** Addresses e-mailed (the team's field managers and client reviewers). */
  notified: string[];
}
export interface VersionListResponse {
  versions: VersionSummary[];
}
export interface VersionResponse {
  version: VersionDetail;
}
export interface ProgrammedResponse {
  version: VersionSummary;
  /** Addresses e-mailed (the team's designers). */
  notified: string[];
}

/** A comment with its answers. */
export interface CommentView {
  id: string;
  parentId: string | null;
  target: { kind: CommentTargetKind; id: string };
  /** Words for the target, e.g. "the study", "item coll_2", "the audit of 3 Mar 2027". */
  about: string;
  author: PersonRef | null;
  body: string;
  createdAt: string;
  replies: CommentView[];
}
export interface CommentsResponse {
  /** Threads, oldest first; answers nested under them, oldest first. */
  threads: CommentView[];
  count: number;
}
export interface CommentResponse {
  comment: CommentView;
}

/** The review state of the latest version: `awaiting` until its first review. */
export type ReviewState = 'none-published' | 'awaiting' | ReviewVerdict;

export interface ReviewResponse {
  state: ReviewState;
  latestVersion: number | null;
  /** The latest review of the latest version. */
  current: ReviewView | null;
  /** Every review of every version, newest first. */
  history: ReviewView[];
  /** After a POST: the addresses e-mailed (the team's designers). */
  notified?: string[];
}

/** One entry of the activity view. */
export interface ActivityView {
  id: number;
  at: string;
  who: PersonRef | null;
  action: string;
  /** One sentence, e.g. "published version 2 of the cut list". */
  sentence: string;
}
export interface ActivityResponse {
  entries: ActivityView[];
}
