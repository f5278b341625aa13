/**
 * The structure panels' figures, read from the audit JSON: eigenvalues beside the parallel
 * analysis line, KMO and Bartlett, the near-dependencies (each condition index with the variance
 * proportions of its items), each scale's reliability before and after the proposed cut, and
 * the rows each figure rests on where that differs from the respondents the audit used. Pure.
 */
import type { AuditJson } from '../../lib/audit/audit-json';
import { CONDITION_INDEX_MODERATE, CONDITION_INDEX_STRONG, VARIANCE_PROPORTION_INVOLVED } from '../../lib/stats/tolerances';

/** Variance proportions below this are left off a dimension's bars (they explain little of it). Common practice. */
export const PROPORTION_SHOWN = 0.2;
/** At most this many dimensions are listed, the largest condition indices first. */
export const DIMENSIONS_SHOWN = 12;

function numberOrNull(value: unknown): number | null {
  return typeof value === 'number' && Number.isFinite(value) ? value : null;
}

export interface NearDependency {
  dimension: number;
  /** null: infinite (an exact dependency). */
  conditionIndex: number | null;
  strong: boolean;
  items: { id: string; proportion: number; involved: boolean }[];
}

export interface StructureView {
  respondentsUsed: number;
  /** pairwise or listwise: the rows behind correlations, VIF and reliability. */
  missing: string;
  eigenvalues: number[];
  random95: number[] | null;
  factorsSuggested: number | null;
  kmo: number | null;
  kmoLabel: string | null;
  bartlett: { chi2: number | null; df: number; p: number | null; respondents: number | null; items: number | null } | null;
  itemsInMatrix: number;
  collinearityRows: number | null;
  dependencies: NearDependency[];
  dependenciesHidden: number;
  moderate: number;
  strongThreshold: number;
  involvedThreshold: number;
  scales: { id: string; itemsBefore: number; itemsAfter: number | null; alphaBefore: number | null; alphaAfter: number | null; omegaBefore: number | null; omegaAfter: number | null }[];
  outcomeRows: number | null;
  outcome: string | null;
}

/**
 * The structure view of an audit.
 * @param audit the audit JSON.
 * @returns the figures the structure panels draw.
 */
export function structureView(audit: AuditJson): StructureView {
  const collinearity = audit.collinearity;
  const dependencies: NearDependency[] = [];
  if (collinearity) {
    collinearity.conditionIndices.forEach((raw, dimension) => {
      const index = numberOrNull(raw);
      if (index !== null && index < CONDITION_INDEX_MODERATE) return;
      const proportions = collinearity.varianceProportions[dimension] ?? [];
      const items = collinearity.columns
        .map((id, column) => ({ id, proportion: numberOrNull(proportions[column]) ?? 0, involved: (numberOrNull(proportions[column]) ?? 0) >= VARIANCE_PROPORTION_INVOLVED }))
        .filter((entry) => entry.proportion >= PROPORTION_SHOWN)
        .sort((a, b) => b.proportion - a.proportion);
      dependencies.push({ dimension, conditionIndex: index, strong: index === null || index >= CONDITION_INDEX_STRONG, items });
    });
    dependencies.sort((a, b) => (b.conditionIndex ?? Number.POSITIVE_INFINITY) - (a.conditionIndex ?? Number.POSITIVE_INFINITY));
  }
  const after = new Map((audit.afterCut?.scales ?? []).map((scale) => [scale.id, scale]));
  const bartlett = audit.bartlett;
  return {
    respondentsUsed: audit.input.respondentsUsed,
    missing: audit.correlation.missing,
    eigenvalues: audit.eigenvalues,
    random95: audit.parallelAnalysis?.random95 ?? null,
    factorsSuggested: audit.parallelAnalysis?.suggested ?? null,
    kmo: audit.kmo,
    kmoLabel: typeof audit.kmoLabel === 'string' ? audit.kmoLabel : null,
    bartlett: bartlett ? { chi2: bartlett.chi2, df: bartlett.df, p: bartlett.p, respondents: numberOrNull(bartlett.respondents), items: numberOrNull(bartlett.items) } : null,
    itemsInMatrix: audit.correlation.items.length,
    collinearityRows: collinearity?.rowsUsed ?? null,
    dependencies: dependencies.slice(0, DIMENSIONS_SHOWN),
    dependenciesHidden: Math.max(0, dependencies.length - DIMENSIONS_SHOWN),
    moderate: CONDITION_INDEX_MODERATE,
    strongThreshold: CONDITION_INDEX_STRONG,
    involvedThreshold: VARIANCE_PROPORTION_INVOLVED,
    scales: audit.scales.map((scale) => {
      const cut = after.get(scale.id);
      return {
        id: scale.id,
        itemsBefore: scale.items.length,
        itemsAfter: cut ? cut.items : null,
        alphaBefore: scale.alpha,
        alphaAfter: cut ? cut.alpha : null,
        omegaBefore: scale.omegaTotal,
        omegaAfter: cut ? cut.omegaTotal : null,
      };
    }),
    outcomeRows: audit.outcomeModel?.n ?? null,
    outcome: audit.outcomeModel?.outcome ?? null,
  };
}
