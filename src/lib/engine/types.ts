/**
 * Shapes the redundancy engine passes between its steps (evidence, clusters, recommendations,
 * the what-if) and hands to the lead for the audit JSON (docs: audit-json.md). Plain objects and
 * arrays; every per-item array follows the order of `items[]`; a value that cannot exist is
 * `null` with a matching warning, never NaN.
 */
import type { CorrelationMethod, MissingPolicy, SquareMatrix } from '../stats/types';

/** One item as the engine sees it: its codebook facts and the designer's lock. */
export interface EngineItem {
  /** Column id, e.g. `Q03`. Unique. */
  readonly id: string;
  /** Scale id, or null for an item outside every scale. */
  readonly scale: string | null;
  /** Wording, or null when the codebook has none. */
  readonly text: string | null;
  /** Locked by the designer (trend or mandated question): never proposed for any change. */
  readonly locked: boolean;
  /** Lowest valid answer (floor category), or null to take the lowest observed answer. */
  readonly min: number | null;
  /** Highest valid answer (ceiling category), or null to take the highest observed answer. */
  readonly max: number | null;
  /**
   * False when the item's wording must not be changed (a licensed instrument, an official
   * statistic: a codebook or setup flag). Such an item is never proposed for rewording.
   * Absent means rewordable.
   */
  readonly rewordable?: boolean;
  /** The content facet the item covers (codebook `facet`), or null/absent: a cut may not leave a facet empty. */
  readonly facet?: string | null;
}

/** A warning for the audit JSON: code, item ids, one plain sentence. */
export interface EngineWarning {
  readonly code: string;
  readonly items: readonly string[];
  readonly message: string;
}

/** Answer distribution of one item (from its observed answers). */
export interface ItemDescriptives {
  /** Observed answers. */
  readonly n: number;
  readonly mean: number | null;
  readonly sd: number | null;
  /** Share of respondents without an answer, in [0, 1]. */
  readonly missingRate: number;
  /** Share of observed answers at the lowest valid category. */
  readonly floor: number | null;
  /** Share of observed answers at the highest valid category. */
  readonly ceiling: number | null;
}

/** Reliability of one scale over its usable items. */
export interface ScaleEvidence {
  readonly id: string;
  /** Indices into items[] of the scale's usable items, ascending. */
  readonly items: readonly number[];
  /** Raw Cronbach's alpha, null with fewer than two items or zero total variance. */
  readonly alpha: number | null;
  readonly alphaStd: number | null;
  /** McDonald's omega total from one-factor minres loadings, null when it cannot be computed. */
  readonly omegaTotal: number | null;
}

/** Belsley-Kuh-Welsch diagnostics of the scaled, uncentred data matrix with an intercept. */
export interface CollinearityEvidence {
  /** Column k is the intercept for k = 0, else items[columns[k]]; `-1` marks the intercept. */
  readonly columns: readonly number[];
  /** Condition indices, ascending (1 first); null for a zero singular value (an exact dependency). */
  readonly conditionIndices: readonly (number | null)[];
  /** `[dimension][column]`, same orders as above. */
  readonly varianceProportions: readonly (readonly number[])[];
  /** Complete rows used. */
  readonly rowsUsed: number;
}

/** Everything the engine reads from one wave (see compute-evidence.ts). */
export interface EngineEvidence {
  readonly items: readonly EngineItem[];
  readonly method: CorrelationMethod;
  readonly missing: MissingPolicy;
  /** Respondents in the matrix. */
  readonly rows: number;
  /** True when no usable item has a missing answer (every policy then uses every row). */
  readonly completeData: boolean;
  /** Indices into items[] of the items in the correlation matrix, ascending. */
  readonly usable: readonly number[];
  /** Correlations among the usable items (order `usable.length`), recoded values. */
  readonly correlation: SquareMatrix;
  /** Respondents behind each correlation (order `usable.length`). */
  readonly pairN: SquareMatrix;
  /**
   * Polychoric only: each r's standard error from its own estimator (two-step likelihood, Olsson
   * 1979), NaN where none exists; absent or null for Pearson and Spearman (Fisher's z applies).
   */
  readonly pairStandardErrors?: SquareMatrix | null;
  /** Polychoric only: each usable item's thresholds (normal quantiles of its cumulative proportions). */
  readonly thresholds?: readonly (readonly number[])[] | null;
  /** Respondents behind the correlation matrix: complete rows (listwise) or rows with any answer (pairwise). */
  readonly correlationRows: number;
  /** The correlation matrix was repaired to positive semi-definiteness. */
  readonly repaired: boolean;
  /** Covariances among the usable items (same order, same missing policy). */
  readonly covariance: SquareMatrix;
  /** Per item (items[] order); null for items outside the matrix or in an exact dependency. */
  readonly vif: readonly (number | null)[];
  readonly tolerance: readonly (number | null)[];
  readonly r2: readonly (number | null)[];
  /** Each item's strongest partner by |r| (index into items[] and the signed r); null outside the matrix. */
  readonly topPartner: readonly ({ readonly index: number; readonly r: number } | null)[];
  /** Groups of items (indices into items[]) that are exactly linearly dependent. */
  readonly exactDependencies: readonly (readonly number[])[];
  /**
   * R⁻¹ over the usable items, only when asked for (`computeEvidence`'s `inverse` option, bootstrap
   * resamples) and R is well conditioned (see `INVERSE_MAX_CONDITION`, inflation-evidence.ts); else absent or null.
   */
  readonly inverse?: SquareMatrix | null;
  /** Eigenvalues of the correlation matrix, descending. */
  readonly eigenvalues: readonly number[];
  /** sqrt(largest / smallest eigenvalue); null when the smallest is not positive. */
  readonly conditionNumber: number | null;
  /** null when too few complete rows (fewer than columns + 1). */
  readonly collinearity: CollinearityEvidence | null;
  /** Item-rest correlation within the item's scale (items[] order); null without a scale of 2+ items. */
  readonly itemRest: readonly (number | null)[];
  /** Raw alpha of the item's scale without it; null without a scale of 3+ items. */
  readonly alphaIfDeleted: readonly (number | null)[];
  readonly scales: readonly ScaleEvidence[];
  readonly descriptives: readonly ItemDescriptives[];
  /** Local-dependence evidence (residuals after each scale's factor model, the wTO network); null when not computed. */
  readonly localDependence: LocalDependenceEvidence | null;
  readonly warnings: readonly EngineWarning[];
}

/** Residual correlations after one scale's one-factor model. */
export interface ScaleResidualEvidence {
  readonly scale: string;
  /** Indices into items[] of the scale's usable items, ascending. */
  readonly items: readonly number[];
  /** One-factor loadings, same order. */
  readonly loadings: readonly number[];
  /** Residual correlations r_ij − λ_i λ_j, `items.length` square (zero diagonal). */
  readonly residuals: readonly (readonly number[])[];
  /** Mean off-diagonal residual of the scale. */
  readonly meanResidual: number;
  /**
   * Critical value of the relative residual (residual − mean residual) from the parametric
   * bootstrap of the fitted model; null when it could not be computed (then the fixed 0.20 rule
   * applies).
   */
  readonly critical: number | null;
  /**
   * Modification index of each residual covariance of the scale's one-factor ML model (same order,
   * null where not tested), from the step of the sequential test in which the pair was last in the
   * model; null when the model could not be fitted (docs/decisions/022-engine-modification-indices.md).
   */
  readonly modificationIndices: readonly (readonly (number | null)[])[] | null;
  /** Standardized expected parameter change of each residual covariance (lavaan's sepc.all), same layout. */
  readonly sepc: readonly (readonly (number | null)[])[] | null;
  /** The scale's critical modification index: the χ²(1) quantile at the Bonferroni share of `modificationIndexAlpha` over its pairs. */
  readonly miCritical: number | null;
  /** The same at `modificationIndexNetworkAlpha`: the level a pair the network also links must pass. */
  readonly miNetworkCritical: number | null;
  /**
   * Pairs (local positions, a < b) the sequential test flagged at the network level, in the order
   * flagged, each with its index at that step; the first `miStrictCount` also pass `miCritical`.
   */
  readonly miFlagged: readonly { readonly a: number; readonly b: number; readonly mi: number }[];
  readonly miStrictCount: number;
  /**
   * Uniquenesses of the first one-factor ML model of the sequential test (same order as `items`;
   * null for a member set aside from it), or null when the model could not be fitted. A bootstrap
   * resample starts its ML fits of the scale from them (`LocalDependenceReuse`).
   */
  readonly miUniquenesses: readonly (number | null)[] | null;
}

/** Local-dependence evidence of a wave (methods.md §3b). */
export interface LocalDependenceEvidence {
  /** Scales with four or more usable items (a one-factor model of three items fits exactly, so its residuals carry no information). */
  readonly scales: readonly ScaleResidualEvidence[];
  /** Regularised partial correlations over the usable items (order `usable.length`); null when the network was not estimated. */
  readonly partial: SquareMatrix | null;
  /** Weighted topological overlap over the usable items; null when the network was not estimated. */
  readonly wto: SquareMatrix | null;
  /** The graphical-lasso penalty chosen by the extended BIC (or reused from the full sample); null without a network. */
  readonly penalty: number | null;
}

/** Which evidence made a pair a link of an overlap cluster. */
export type PairRule = 'strong-pair' | 'local-dependence-mi' | 'local-dependence-residual' | 'local-dependence-wto' | 'near-dependency' | 'exact';

/** A pair correlation with its Fisher-z interval. */
export interface PairEvidence {
  /** Indices into items[]. */
  readonly a: number;
  readonly b: number;
  readonly r: number;
  /** Respondents behind r. */
  readonly n: number;
  /**
   * Interval at the settings' confidence level: Fisher's z for Pearson and Spearman, the Wald
   * interval from the polychoric estimator's own standard error (on the z scale) for polychoric;
   * null when n <= 3, |r| = 1 or no standard error exists.
   */
  readonly lower: number | null;
  readonly upper: number | null;
  /** Which interval: `fisher-z` (1/sqrt(n − 3)) or `estimator-se` (the polychoric likelihood's SE). */
  readonly interval?: 'fisher-z' | 'estimator-se';
  /** The estimator's standard error behind an `estimator-se` interval. */
  readonly se?: number | null;
  /** Wording similarity of the two items, null when either wording is unknown. */
  readonly wording: number | null;
  /** Residual correlation after their scale's one-factor model; null across scales or in scales of fewer than four items. */
  readonly residual?: number | null;
  /** Residual minus the scale's mean residual (the relative rule's statistic); null as above. */
  readonly relativeResidual?: number | null;
  /** The scale's critical value for the relative residual; null as above. */
  readonly residualCritical?: number | null;
  /** Weighted topological overlap; null without a network. */
  readonly wto?: number | null;
  /** Regularised partial correlation; null without a network. */
  readonly partial?: number | null;
  /** Modification index of the pair's residual covariance in its scale's one-factor ML model; null as for the residual. */
  readonly mi?: number | null;
  /** The scale's critical modification index; null as above. */
  readonly miCritical?: number | null;
  /** Standardized expected parameter change of that covariance (the residual correlation it would take); null as above. */
  readonly sepc?: number | null;
  /** Rules that fired for this pair (empty for a pair that is only listed). */
  readonly rules?: readonly PairRule[];
}

/** One near-dependency: a dimension with a high condition index and the items it loads. */
export interface DependencyEvidence {
  /** Index of the dimension in `collinearity.conditionIndices`. */
  readonly dimension: number;
  /** null for an exact dependency (zero singular value: an infinite index). */
  readonly conditionIndex: number | null;
  /** Indices into items[] with proportion at or above the threshold, and their proportions. */
  readonly items: readonly number[];
  readonly proportions: readonly number[];
  /**
   * The items (a subset of `items`) whose VIF in the full-sample correlation matrix confirms the
   * dependency (at or above the threshold, or infinite). Only these link items into clusters.
   */
  readonly confirmed: readonly number[];
  /** The intercept's proportion on this dimension. */
  readonly interceptProportion: number;
  /**
   * True when the intercept takes at least the proportion threshold of its variance from this
   * dimension: an item-mean effect of an uncentred coding, not redundancy; it forms no cluster.
   */
  readonly interceptDominated?: boolean;
}

/** An overlap cluster with its evidence, each kind separately. */
export interface OverlapCluster {
  /** Indices into items[], ascending. */
  readonly items: readonly number[];
  /** Strong pairs inside the cluster (|r| at or above the threshold), strongest first. */
  readonly strongPairs: readonly PairEvidence[];
  /** Near-dependencies with at least one confirmed item in the cluster. */
  readonly dependencies: readonly DependencyEvidence[];
  /** Exactly dependent groups (from the correlation matrix's null space) inside the cluster. */
  readonly exactDependencies: readonly (readonly number[])[];
  /** Every pair of cluster items with its r, interval and wording similarity. */
  readonly pairs: readonly PairEvidence[];
  /** The pairs that link the cluster, each with the rules that fired (a subset of `pairs`, with the full evidence). */
  readonly links: readonly PairEvidence[];
  /** Largest |r| among the cluster's pairs, signed. */
  readonly maxR: number;
  /** Condition index of the dimension carrying the largest summed variance proportion of the cluster's items; null without diagnostics. */
  readonly conditionIndex: number | null;
}
