/**
 * The audit result, version 1 (`paredown.audit/1`), as TypeScript types. One shape for every
 * way an audit leaves the product: the command line, the API and the JSON download
 * (../shared/docs/audit-json.md is the contract). Keys may be added; none may be renamed or
 * dropped without a new schema version. A value that does not exist is `null` with a matching
 * entry in `warnings`, never NaN.
 */
import type { ExploratoryJson } from './exploratory-structure';
import type { CorrelationMethod, MissingPolicy } from '../stats/types';
import type { CutReason } from '../engine/recommend-cuts';

export const AUDIT_SCHEMA = 'paredown.audit/1' as const;

/**
 * The audit's settings, echoed unchanged from the one stored shape (src/lib/audit/settings-table.ts,
 * `StoredAuditSettings`): every engine setting in the table's order (method, missing, the
 * thresholds, constraints, bootstrap and seed), then `outcome`, `locked` (sorted item ids) and
 * `parallelIterations`; `testFault` only on a test server that injected one.
 */
export interface AuditSettingsJson {
  method: CorrelationMethod;
  missing: MissingPolicy;
  outcome: string | null;
  seed: number;
  bootstrap: number;
  locked: readonly string[];
  parallelIterations: number;
  /** Engine thresholds and the designer's constraints (added keys, see the settings table). */
  [extra: string]: unknown;
}

export interface AuditItemJson {
  id: string;
  scale: string | null;
  reverse: boolean;
  n: number;
  mean: number | null;
  sd: number | null;
  missingRate: number;
  floor: number | null;
  ceiling: number | null;
  vif: number | null;
  tolerance: number | null;
  r2: number | null;
  msa: number | null;
  itemRest: number | null;
  alphaIfDeleted: number | null;
  topPartner: { id: string; r: number } | null;
  [extra: string]: unknown;
}

export interface AuditWarningJson {
  code: string;
  items: string[];
  message: string;
}

export interface AuditScaleJson {
  id: string;
  items: string[];
  alpha: number | null;
  alphaStd: number | null;
  omegaTotal: number | null;
  [extra: string]: unknown;
}

export interface AuditRecommendationJson {
  cluster: string[];
  keep: string;
  actions: { item: string; action: 'drop' | 'merge' | 'reword' | 'keep'; into: string | null; [extra: string]: unknown }[];
  evidence: { maxR: number | null; conditionIndex: number | null; vifBefore: number | null; vifAfter: number | null; [extra: string]: unknown };
  stability: number | null;
  /** One sentence, worded by src/lib/words from `because`. */
  reason: string;
  /** The structured reason behind `reason` (added key; absent from results stored before it). */
  because?: CutReason;
  [extra: string]: unknown;
}

/**
 * The early cut list: an audit's recommendations as soon as they are made, before the bootstrap
 * has checked how often resamples repeat them (each `stability` is still null). A running audit's
 * summary carries it (GET /api/audits/{id}) until the audit ends; the finished JSON replaces it.
 */
export interface EarlyCutListJson {
  /** The resamples the bootstrap is running to check them. */
  resamples: number;
  recommendations: AuditRecommendationJson[];
}

export interface AuditAfterCutJson {
  maxVif: number | null;
  conditionNumber: number | null;
  scales: { id: string; alpha: number | null; omegaTotal: number | null; items: number; [extra: string]: unknown }[];
  itemsRemoved: number;
  minutesSaved: number;
  [extra: string]: unknown;
}

export interface AuditCoefficientJson {
  term: string;
  estimate: number;
  se: number | null;
  t: number | null;
  p: number | null;
  vif: number | null;
  sst: number | null;
  tolerance: number | null;
  relativeWeight: number | null;
  [extra: string]: unknown;
}

export interface AuditOutcomeModelJson {
  outcome: string;
  n: number;
  r2: number;
  adjR2: number | null;
  ssr: number;
  sigma: number | null;
  coefficients: AuditCoefficientJson[];
  /** Respondents with the outcome and every predictor answered: the rows the model rests on. */
  completeRows?: number;
  /**
   * The same model without the items the proposed cut removes, on the same respondents, with each
   * remaining coefficient's `seRatio` (after/before); null when the cut removes no predictor.
   */
  afterCut?: {
    removed: string[];
    n: number;
    r2: number;
    adjR2: number | null;
    ssr: number;
    sigma: number | null;
    coefficients: (AuditCoefficientJson & { seRatio: number | null })[];
  } | null;
  [extra: string]: unknown;
}

/** Overlap evidence of one flagged pair (audit-json.md `pairs`). */
export interface AuditPairJson {
  items: string[];
  r: number;
  lower: number | null;
  upper: number | null;
  n: number;
  /** Residual correlation after the scale's one-factor model (Q3 scale); null across scales or in scales of fewer than four items. */
  residual: number | null;
  relativeResidual: number | null;
  residualCritical: number | null;
  wto: number | null;
  partial: number | null;
  /** Modification index of the pair's residual covariance in its scale's one-factor ML model, the scale's critical value and the standardized expected change; null as for the residual. */
  mi: number | null;
  miCritical: number | null;
  sepc: number | null;
  wording: number | null;
  rules: string[];
  [extra: string]: unknown;
}

export interface AuditJson {
  schema: typeof AUDIT_SCHEMA;
  settings: AuditSettingsJson;
  input: { rows: number; respondentsUsed: number; respondentsExcluded: number; items: number; [extra: string]: unknown };
  items: AuditItemJson[];
  correlation: {
    method: CorrelationMethod;
    missing: MissingPolicy;
    items: string[];
    matrix: number[][];
    n: number[][];
    repaired: boolean;
  };
  eigenvalues: number[];
  conditionNumber: number | null;
  collinearity: {
    columns: string[];
    conditionIndices: number[];
    varianceProportions: number[][];
    rowsUsed: number;
  } | null;
  kmo: number | null;
  bartlett: { chi2: number | null; df: number; p: number | null; [extra: string]: unknown } | null;
  parallelAnalysis: { observed: number[]; random95: number[]; suggested: number; [extra: string]: unknown } | null;
  /** The exploratory view of a multi-scale wave (added key; null for one scale; absent from older results). */
  structure?: { exploratory: ExploratoryJson | null };
  scales: AuditScaleJson[];
  recommendations: AuditRecommendationJson[];
  afterCut: AuditAfterCutJson | null;
  outcomeModel: AuditOutcomeModelJson | null;
  warnings: AuditWarningJson[];
  [extra: string]: unknown;
}
