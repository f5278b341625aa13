/**
 * The cut-list contracts: what the decision routes accept (zod schemas, shared by the server and
 * the islands) and what they answer (types). Pure: no server, database or DOM imports, so the
 * workspace island may import it.
 *
 * Routes (DEVELOPERS.md, "Routes beyond api.md"; docs/decisions/011):
 * - GET  /api/studies/{id}/cut-list              → CutListResponse (members)
 * - PUT  /api/studies/{id}/cut-list/{itemId}     DecisionRequest → DecisionResponse (owner, designer)
 * - POST /api/studies/{id}/cut-list/accept       AcceptRequest → AcceptResponse (owner, designer)
 * - POST /api/audits/{id}/what-if                WhatIfRequest → WhatIfResponse (members)
 * - PATCH /api/studies/{id}                      StudySettingsRequest (owner, designer)
 */
import { z } from 'zod';

/** What the designer may decide for an item. */
export const decisionKinds = ['keep', 'drop', 'merge', 'reword', 'undecided'] as const;
export type DecisionKind = (typeof decisionKinds)[number];

/** Decisions that take the item out of the questionnaire (the what-if removes them). */
export const removingKinds: readonly DecisionKind[] = ['drop', 'merge'];

/** Words for each decision, as the pages show them. */
export const decisionLabels: Record<DecisionKind, string> = {
  keep: 'Keep',
  drop: 'Drop',
  merge: 'Merge into',
  reword: 'Reword',
  undecided: 'Undecided',
};

/** The longest reason and wording accepted. */
export const MAX_REASON_LENGTH = 2_000;
export const MAX_WORDING_LENGTH = 2_000;

const itemIdSchema = z.string().trim().min(1).max(200);

/**
 * The body of PUT /api/studies/{id}/cut-list/{itemId}. `into` only with merge, `wording` only
 * with reword (both required there); a reason with every decision but undecided.
 */
export const decisionRequestSchema = z
  .object({
    decision: z.enum(decisionKinds, { message: `decision must be one of ${decisionKinds.join(', ')}` }),
    into: itemIdSchema.nullable().optional(),
    wording: z.string().trim().max(MAX_WORDING_LENGTH, `wording is at most ${MAX_WORDING_LENGTH} characters`).nullable().optional(),
    reason: z.string().trim().max(MAX_REASON_LENGTH, `reason is at most ${MAX_REASON_LENGTH} characters`).default(''),
  })
  .strict()
  .superRefine((body, context) => {
    if (body.decision !== 'undecided' && body.reason === '') {
      context.addIssue({ code: 'custom', path: ['reason'], message: `say why you ${body.decision === 'merge' ? 'merge' : body.decision} this item (a reason is required for every decision except undecided)` });
    }
    if (body.decision === 'merge' && !body.into) {
      context.addIssue({ code: 'custom', path: ['into'], message: 'name the item to merge into (its id)' });
    }
    if (body.decision !== 'merge' && body.into) {
      context.addIssue({ code: 'custom', path: ['into'], message: 'into is only for a merge; leave it out for other decisions' });
    }
    if (body.decision === 'reword' && !body.wording) {
      context.addIssue({ code: 'custom', path: ['wording'], message: 'give the new wording of the item' });
    }
    if (body.decision !== 'reword' && body.wording) {
      context.addIssue({ code: 'custom', path: ['wording'], message: 'wording is only for a reword; leave it out for other decisions' });
    }
  });
export type DecisionRequest = z.input<typeof decisionRequestSchema>;

/**
 * The body of POST /api/studies/{id}/cut-list/accept: one recommendation of the reference audit
 * by its index (0-based, the audit's order), or every stable one. The reason defaults to the
 * recommendation's own.
 */
export const acceptRequestSchema = z
  .object({
    recommendation: z.union([z.number().int().min(0).max(100_000), z.literal('all-stable')], { message: 'recommendation must be an index (0, 1, ...) or "all-stable"' }),
    reason: z.string().trim().max(MAX_REASON_LENGTH).optional(),
  })
  .strict();
export type AcceptRequest = z.input<typeof acceptRequestSchema>;

/** The body of POST /api/audits/{id}/what-if: the items the decisions take out. */
export const whatIfRequestSchema = z
  .object({
    removed: z.array(itemIdSchema).max(5_000),
  })
  .strict();
export type WhatIfRequest = z.infer<typeof whatIfRequestSchema>;

/** The body of PATCH /api/studies/{id}: any subset; `null` clears a constraint. */
export const studySettingsRequestSchema = z
  .object({
    name: z.string().trim().min(1, 'name must not be empty').max(200).optional(),
    description: z.string().trim().max(2_000).optional(),
    settings: z
      .object({
        lockedItems: z.array(itemIdSchema).max(5_000).optional(),
        minItemsPerScale: z.number().int('minItemsPerScale must be a whole number').min(1).max(1_000).nullable().optional(),
        alphaFloor: z.number().min(0).max(1, 'alphaFloor is a reliability between 0 and 1').nullable().optional(),
      })
      .strict()
      .optional(),
  })
  .strict()
  .refine((body) => body.name !== undefined || body.description !== undefined || body.settings !== undefined, { message: 'send at least one of name, description, settings' });
export type StudySettingsRequest = z.input<typeof studySettingsRequestSchema>;

/** A person as the cut list names them. */
export interface PersonRef {
  id: string;
  name: string;
}

/** What the reference audit recommends for one item. */
export interface ItemRecommendation {
  /** Index of the recommendation in the audit. */
  index: number;
  action: 'keep' | 'drop' | 'merge' | 'reword';
  into: string | null;
  /** Share of bootstrap resamples that made the same proposal; null when the bootstrap did not run. */
  stability: number | null;
  unstable: boolean;
}

/** One item of the cut list with its current decision. */
export interface CutListItem {
  id: string;
  scale: string | null;
  text: string | null;
  /** Questionnaire order (column position in the wave). */
  position: number;
  locked: boolean;
  /** The item is in the reference audit (false: decided under an earlier wave, not in this one). */
  inAudit: boolean;
  decision: DecisionKind;
  into: string | null;
  wording: string | null;
  reason: string;
  decidedBy: PersonRef | null;
  decidedAt: string | null;
  /** The audit the decision was made under. */
  auditId: string | null;
  recommendation: ItemRecommendation | null;
  /** Figures behind the recommendation, from the reference audit. */
  vif: number | null;
  topPartner: { id: string; r: number } | null;
}

/** One recommendation of the reference audit, as the workspace shows it. */
export interface CutListRecommendation {
  index: number;
  cluster: string[];
  keep: string;
  actions: { item: string; action: 'keep' | 'drop' | 'merge' | 'reword'; into: string | null }[];
  reason: string;
  maxR: number | null;
  stability: number | null;
  unstable: boolean;
  /** Stable: the bootstrap ran and did not mark it unstable. */
  stable: boolean;
  /** Every action already matches the current decisions. */
  accepted: boolean;
  cautions: string[];
}

/** One entry of the decision history (newest first). */
export interface HistoryEntry {
  id: number;
  itemId: string;
  from: DecisionKind;
  to: DecisionKind;
  into: string | null;
  wording: string | null;
  reason: string;
  by: PersonRef | null;
  at: string;
  auditId: string | null;
}

/** The constraints decisions are made under. */
export interface CutListConstraints {
  /** The study's locked items and the reference audit's, together. */
  lockedItems: string[];
  minItemsPerScale: number | null;
  alphaFloor: number | null;
  maxAlphaDrop: number | null;
  secondsPerItem: number | null;
}

/** GET /api/studies/{id}/cut-list. */
export interface CutListResponse {
  studyId: string;
  /** The audit the recommendations come from: the study's latest finished audit; null before one. */
  audit: { id: string; waveId: string; waveLabel: string; finishedAt: string | null; bootstrap: number } | null;
  constraints: CutListConstraints;
  counts: Record<DecisionKind, number>;
  items: CutListItem[];
  recommendations: CutListRecommendation[];
  history: HistoryEntry[];
  /** The caller may decide (owner, designer). */
  canDecide: boolean;
}

/** PUT /api/studies/{id}/cut-list/{itemId}. */
export interface DecisionResponse {
  item: CutListItem;
  /** False when the decision was the same as before (nothing recorded). */
  changed: boolean;
}

/** POST /api/studies/{id}/cut-list/accept. */
export interface AcceptResponse {
  /** Items whose decision changed. */
  changed: string[];
  /** Reword proposals left undecided: a reword needs the new wording, which only a person can write. */
  needsWording: string[];
  /** Recommendations accepted. */
  accepted: number[];
}

/** One scale in the what-if. */
export interface WhatIfScale {
  id: string;
  itemsBefore: number;
  items: number;
  alphaBefore: number | null;
  alpha: number | null;
  omegaBefore: number | null;
  omega: number | null;
  spearmanBrown: number | null;
}

/** POST /api/audits/{id}/what-if. */
export interface WhatIfResponse {
  auditId: string;
  removed: string[];
  itemsRemoved: number;
  minutesSaved: number;
  secondsPerItem: number;
  maxVifBefore: number | null;
  maxVif: number | null;
  conditionNumberBefore: number | null;
  conditionNumber: number | null;
  scales: WhatIfScale[];
  warnings: { code: string; items: string[]; message: string }[];
  /**
   * The audit's driver model refitted without the items these decisions remove, on the same
   * respondents (null when the audit has no outcome; `afterDecisions` null when the decisions
   * remove no predictor): each remaining item's standard error with its ratio after/before.
   */
  driverModel: {
    outcome: string;
    r2Before: number;
    adjR2Before: number | null;
    afterDecisions: { removed: string[]; n: number; r2: number; adjR2: number | null; coefficients: { term: string; se: number | null; seRatio: number | null }[] } | null;
  } | null;
  /** Milliseconds the worker spent (evidence from its cache when warm, then the cut). */
  computeMs: number;
  /** The worker had to rebuild the audit's evidence first (the first what-if of an audit). */
  coldStart: boolean;
}

/**
 * The item ids the given decisions take out of the questionnaire, in the given order.
 * @param items the cut list's items.
 * @returns ids of items dropped or merged that are in the reference audit.
 */
export function removedItemIds(items: readonly Pick<CutListItem, 'id' | 'decision' | 'inAudit'>[]): string[] {
  return items.filter((item) => item.inAudit && removingKinds.includes(item.decision)).map((item) => item.id);
}
