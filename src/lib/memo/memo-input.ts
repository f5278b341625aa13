/**
 * What the memo is written from: a stored audit, the decisions (current or a published version),
 * the study and wave it belongs to, and the review. Aggregates only: nothing here identifies a
 * respondent, and the server's gatherer never reads respondent rows for it.
 */
import type { AuditJson } from '../audit/audit-json';

/** The decision kinds of the cut list. */
export type MemoDecisionKind = 'keep' | 'drop' | 'merge' | 'reword' | 'undecided';

/** One item's decision as the memo reports it. */
export interface MemoDecision {
  readonly itemId: string;
  readonly decision: MemoDecisionKind;
  /** Target item of a merge. */
  readonly into: string | null;
  readonly reason: string;
  /** New wording of a reworded or merged item, when the designer gave one. */
  readonly wording: string | null;
  readonly decidedBy: string | null;
  /** ISO time. */
  readonly decidedAt: string | null;
}

/** The decisions the memo reports, and where they come from. */
export interface MemoDecisions {
  /** Published version number, or null for the current, unpublished decisions. */
  readonly version: number | null;
  readonly publishedBy: string | null;
  /** ISO time. */
  readonly publishedAt: string | null;
  readonly items: readonly MemoDecision[];
}

/** One screening flag, as counts. */
export interface MemoScreeningFlag {
  readonly code: string;
  readonly count: number;
  readonly message: string;
}

/** The client reviewer's answer. */
export interface MemoReview {
  readonly reviewer: string | null;
  readonly verdict: 'approved' | 'changes_requested';
  /** ISO time. */
  readonly at: string;
  readonly comment: string;
}

/** A comment of the study's thread. */
export interface MemoComment {
  readonly author: string | null;
  /** ISO time. */
  readonly at: string;
  /** What it is about, in words: "the study", "item coll_3", "this audit". */
  readonly about: string;
  readonly body: string;
}

/** Everything the memo is built from. */
export interface MemoInput {
  readonly study: { readonly name: string; readonly description: string; readonly team: string };
  readonly wave: { readonly label: string; readonly fileName: string | null; readonly confirmedAt: string | null };
  readonly audit: {
    readonly id: string;
    /** ISO time the audit finished. */
    readonly finishedAt: string | null;
    /** Who started the audit. */
    readonly startedBy: string | null;
    readonly result: AuditJson;
  };
  /** Screening of the wave as counts, or null when the wave was not screened. */
  readonly screening: { readonly respondents: number; readonly flags: readonly MemoScreeningFlag[] } | null;
  readonly decisions: MemoDecisions;
  /** Who prepares the memo (the designer who published, or who asked for it). */
  readonly preparedBy: string | null;
  /** The latest review of the reported version, or null. */
  readonly review: MemoReview | null;
  readonly comments: readonly MemoComment[];
  /** ISO time of generation. */
  readonly generatedAt: string;
}
