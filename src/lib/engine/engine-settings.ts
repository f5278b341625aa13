/**
 * The redundancy engine's settings: every threshold, constraint and house figure it uses, named,
 * with its default and the reason for it. A literal threshold anywhere else in src/lib/engine is
 * a defect. See docs/decisions/003-redundancy-engine.md.
 */
import type { CorrelationMethod, MissingPolicy } from '../stats/types';

/** What the designer (or the audit's stored settings) may set. Every field has a default. */
export interface EngineSettings {
  /** Correlation family for the item matrix. */
  readonly method: CorrelationMethod;
  /** Missing-data policy for everything computed from pairs of items. */
  readonly missing: MissingPolicy;
  /** A pair with |r| at or above this (after reverse-keying) is a strong pair. Default 0.80. */
  readonly strongPairThreshold: number;
  /** A Belsley-Kuh-Welsch dimension with a condition index at or above this can be a near-dependency. Default 30. */
  readonly conditionIndexThreshold: number;
  /** ...when at least two items take this share or more of their coefficient variance from it. Default 0.5. */
  readonly varianceProportionThreshold: number;
  /**
   * An item of a near-dependency links to other items only when its VIF (from the full-sample
   * correlation matrix) is at or above this, or infinite. Default 5 (methods.md §3, "worth a look").
   */
  readonly dependencyVifThreshold: number;
  /** A removed item is merged into the keeper when their |r| is at or above this. Default 0.95. */
  readonly mergeCorrelation: number;
  /** ...or when their wording similarity is at or above this. Default 0.80. */
  readonly mergeWordingSimilarity: number;
  /**
   * No longer decides anything (issue 9: synonyms share few 3-grams, so low wording similarity is
   * no reason to reword); kept so that stored audit settings still resolve. Default 0.30.
   */
  readonly rewordWordingSimilarity: number;
  /** No scale may be cut below this many items. Default 3. */
  readonly minItemsPerScale: number;
  /** No scale's raw alpha may end below this after the cut. Default 0.70 (Nunnally 1978). */
  readonly alphaFloor: number;
  /** No scale's raw alpha may fall by more than this from its value before the cut. Default 0.10 (house figure). */
  readonly maxAlphaDrop: number;
  /** At most this share of the usable items may be cut (dropped or merged). Default 0.25 (house figure). */
  readonly maxCutShare: number;
  /** Answering time of one rating item, seconds, for minutes saved. Default 8 (house figure). */
  readonly secondsPerItem: number;
  /** Number of bootstrap resamples of respondents for stability; 0 turns the check off. Default 200. */
  readonly bootstrap: number;
  /** Seed of the bootstrap's random generator. Default 1. */
  readonly seed: number;
  /** A recommendation made in fewer than this share of resamples is marked unstable. Default 0.70. */
  readonly stabilityThreshold: number;
  /** Coverage of the Fisher-z interval shown beside each pair correlation. Default 0.95. */
  readonly confidenceLevel: number;
  /**
   * Relative residual (residual correlation minus the scale's mean residual) above which a pair
   * is locally dependent when no bootstrap critical value is available. Default 0.20 (Chen &
   * Thissen 1997; Christensen, Makransky & Horton 2017).
   */
  readonly residualRelativeThreshold: number;
  /**
   * The residual statistic: `residual` (r − λλᵀ, psych::fa's residual) or `q3` (the same divided by
   * both uniquenesses' square roots). Default `residual`: on the generated waves (60 per kind, README) the
   * engine with Q3 found about as many doublets (recall .838 vs .829) but made 1.78 recommendations
   * per ten clean waves against 0.94.
   */
  readonly residualStatistic: 'residual' | 'q3';
  /** Draws of the parametric bootstrap that gives each scale's critical value (0, or at least 20; 0 uses the fixed rule). Default 200 (the core's default). */
  readonly residualBootstrapDraws: number;
  /** Quantile of the bootstrap distribution of a scale's largest relative residual taken as its critical value. Default 0.99 (Christensen, Makransky & Horton 2017 tabulate the 95th and 99th; the 99th keeps false alarms on waves with nothing redundant near the ceiling of one per ten waves). */
  readonly residualCriticalQuantile: number;
  /**
   * A relative residual below this share of its critical value is "about zero": a strong pair or a
   * wTO flag then does not count as redundancy on its own. Default 0.5 (house figure).
   */
  readonly residualAboutZeroShare: number;
  /** A pair with weighted topological overlap at or above this is a wTO flag. Default 0.25 (Christensen, Garrido & Golino 2023). */
  readonly wtoThreshold: number;
  /** Gamma of the extended BIC that chooses the graphical-lasso penalty. Default 0.5 (Foygel & Drton 2010). */
  readonly ebicGamma: number;
  /** Penalties on the EBIC path, log-spaced down to 0.01 of the largest. Default 100 (qgraph::EBICglasso). */
  readonly ebicPenaltyCount: number;
  /**
   * A near-dependency on which the intercept takes at least this share of its variance is an
   * item-mean effect of an uncentred coding and forms no cluster. Default 0.5 (the proportion rule
   * of Belsley, Kuh & Welsch 1980 applied to the intercept).
   */
  readonly interceptDominanceThreshold: number;
}

/**
 * The defaults. The house figures (maximum alpha drop 0.10, cut cap 25%, 8 seconds per item,
 * stability share 0.70) are Paredown's own choices, stated in docs/decisions/003 and adjustable
 * per audit; the others come from the sources named beside each field.
 */
export const DEFAULT_ENGINE_SETTINGS: EngineSettings = Object.freeze({
  method: 'pearson',
  missing: 'pairwise',
  strongPairThreshold: 0.8,
  conditionIndexThreshold: 30,
  varianceProportionThreshold: 0.5,
  dependencyVifThreshold: 5,
  mergeCorrelation: 0.95,
  mergeWordingSimilarity: 0.8,
  rewordWordingSimilarity: 0.3,
  minItemsPerScale: 3,
  alphaFloor: 0.7,
  maxAlphaDrop: 0.1,
  maxCutShare: 0.25,
  secondsPerItem: 8,
  bootstrap: 200,
  seed: 1,
  stabilityThreshold: 0.7,
  confidenceLevel: 0.95,
  residualRelativeThreshold: 0.2,
  residualStatistic: 'residual',
  residualBootstrapDraws: 200,
  residualCriticalQuantile: 0.99,
  residualAboutZeroShare: 0.5,
  wtoThreshold: 0.25,
  ebicGamma: 0.5,
  ebicPenaltyCount: 100,
  interceptDominanceThreshold: 0.5,
}) as EngineSettings;

/** Bands of weighted topological overlap (Christensen, Garrido & Golino 2023): small-to-moderate from .20, moderate-to-large from .25, large from .30. Reported beside each pair. */
export const WTO_BANDS = Object.freeze({ small: 0.2, moderate: 0.25, large: 0.3 });

/**
 * Weights of the keeper score (see `keeperScore` in recommend-cuts.ts): how much one unit of
 * missing rate, of share of answers at the scale's ends, and of log VIF count against one unit
 * of item-rest correlation. House figures, stated in docs/decisions/003.
 */
export const KEEPER_SCORE_WEIGHTS = Object.freeze({
  fit: 1,
  missingRate: 1,
  extremeShare: 0.5,
  logVif: 0.05,
});

/**
 * Two keeper scores closer than this are a tie (broken by missing rate, then items[] order), so
 * rounding in a repaired matrix cannot pick between two identical columns.
 */
export const KEEPER_SCORE_TIE = 1e-6;

/**
 * Merges defaults with what the caller sets and checks every value.
 * @param overrides Any subset of the settings.
 * @throws {RangeError} naming the setting when a value is out of its range: thresholds and
 *   shares outside (0, 1], a condition index below 1, a negative or non-integer count, a
 *   non-positive answering time, an unknown method or missing policy.
 * @returns Complete, frozen settings.
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics" (condition index 30, proportion
 * 0.5); Nunnally 1978, "Psychometric Theory" (alpha 0.70).
 */
export function resolveEngineSettings(overrides: Partial<EngineSettings> = {}): EngineSettings {
  const settings: EngineSettings = { ...DEFAULT_ENGINE_SETTINGS, ...overrides };
  const fail = (condition: string): never => {
    throw new RangeError(`resolveEngineSettings: ${condition}`);
  };
  if (!['pearson', 'spearman', 'polychoric'].includes(settings.method)) fail(`method must be pearson, spearman or polychoric, got ${String(settings.method)}`);
  if (!['pairwise', 'listwise'].includes(settings.missing)) fail(`missing must be pairwise or listwise, got ${String(settings.missing)}`);
  const shares: (keyof EngineSettings)[] = [
    'strongPairThreshold',
    'varianceProportionThreshold',
    'mergeCorrelation',
    'mergeWordingSimilarity',
    'rewordWordingSimilarity',
    'alphaFloor',
    'maxAlphaDrop',
    'maxCutShare',
    'stabilityThreshold',
    'residualRelativeThreshold',
    'residualAboutZeroShare',
    'wtoThreshold',
    'interceptDominanceThreshold',
  ];
  for (const key of shares) {
    const value = settings[key] as number;
    if (!(typeof value === 'number' && value >= 0 && value <= 1)) fail(`${key} must be a number in [0, 1], got ${String(value)}`);
  }
  if (!(settings.strongPairThreshold > 0)) fail('strongPairThreshold must be above 0');
  if (!(settings.conditionIndexThreshold >= 1 && Number.isFinite(settings.conditionIndexThreshold))) fail(`conditionIndexThreshold must be a finite number >= 1, got ${settings.conditionIndexThreshold}`);
  if (!(settings.dependencyVifThreshold >= 1 && Number.isFinite(settings.dependencyVifThreshold))) fail(`dependencyVifThreshold must be a finite number >= 1, got ${settings.dependencyVifThreshold}`);
  if (!(settings.confidenceLevel > 0 && settings.confidenceLevel < 1)) fail(`confidenceLevel must lie in (0, 1), got ${settings.confidenceLevel}`);
  if (!(Number.isInteger(settings.minItemsPerScale) && settings.minItemsPerScale >= 1)) fail(`minItemsPerScale must be an integer >= 1, got ${settings.minItemsPerScale}`);
  if (!(Number.isInteger(settings.bootstrap) && settings.bootstrap >= 0)) fail(`bootstrap must be an integer >= 0, got ${settings.bootstrap}`);
  if (!Number.isInteger(settings.seed)) fail(`seed must be an integer, got ${settings.seed}`);
  if (settings.residualStatistic !== 'residual' && settings.residualStatistic !== 'q3') fail(`residualStatistic must be residual or q3, got ${String(settings.residualStatistic)}`);
  if (!(Number.isInteger(settings.residualBootstrapDraws) && settings.residualBootstrapDraws >= 0)) fail(`residualBootstrapDraws must be an integer >= 0, got ${settings.residualBootstrapDraws}`);
  if (!(settings.residualCriticalQuantile > 0 && settings.residualCriticalQuantile < 1)) fail(`residualCriticalQuantile must lie in (0, 1), got ${settings.residualCriticalQuantile}`);
  if (!(Number.isInteger(settings.ebicPenaltyCount) && settings.ebicPenaltyCount >= 2)) fail(`ebicPenaltyCount must be an integer >= 2, got ${settings.ebicPenaltyCount}`);
  if (!(settings.ebicGamma >= 0 && settings.ebicGamma <= 1)) fail(`ebicGamma must lie in [0, 1], got ${settings.ebicGamma}`);
  if (!(settings.secondsPerItem > 0 && Number.isFinite(settings.secondsPerItem))) fail(`secondsPerItem must be a positive number, got ${settings.secondsPerItem}`);
  return Object.freeze(settings);
}
