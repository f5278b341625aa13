/**
 * Shapes of the synthetic pilot-wave generator: what a wave is asked to look like (the spec),
 * and what comes back (raw columns as a survey export would have them, a codebook, and the
 * ground truth of everything that was planted). Plain objects only.
 */

/** Number of answer categories of an item (1..points). */
export type ScalePoints = 5 | 7;

/** One item of a scale. */
export interface ItemSpec {
  /** Column name, e.g. `coll_3`. */
  readonly name: string;
  /** Item wording for the codebook. */
  readonly text: string;
  /**
   * When set, the item is a planted near-duplicate of the named item of the same scale: its
   * latent response is the source's plus a little noise (spec `twinNoise`), and it shares the
   * source's thresholds. The source itself must not be a twin.
   */
  readonly twinOf?: string;
  /**
   * Negatively worded: the stored answer is `min + max - x`, and the codebook marks the item
   * reverse-keyed. With `twinOf` this makes a reverse-worded twin.
   */
  readonly reverse?: boolean;
  /**
   * When set, the item is a planted doublet of the named item of the same scale: beyond the
   * common factor, the two latent responses share a component whose covariance (in the
   * standardized latent metric) is `doubletResidual`, so their latent correlation is
   * `loading_a · loading_b + doubletResidual` (the residual correlation a confirmatory model of
   * the latent responses would show). The source must be an ordinary item (no twin, no doublet).
   */
  readonly doubletOf?: string;
  /** Latent residual covariance of a doublet, in (0, 1); required with `doubletOf`. */
  readonly doubletResidual?: number;
  /**
   * When set, the item also loads on another scale's factor (a cross-loading decoy): its latent
   * response is `loading · own factor + crossLoading.loading · other factor + noise` with unit
   * variance. Not redundancy: it must not be flagged.
   */
  readonly crossLoading?: { readonly scale: string; readonly loading: number };
}

/** One scale: a set of items that load on one factor. */
export interface ScaleSpec {
  readonly name: string;
  readonly points: ScalePoints;
  readonly items: readonly ItemSpec[];
  /**
   * This scale's loading range, in place of the wave's `loadingRange` (e.g. [0.84, 0.90] for a
   * highly homogeneous scale, where every pair correlates highly without any redundancy).
   */
  readonly loadingRange?: readonly [number, number];
}

/** A missing code and how often it replaces an answer. */
export interface MissingCodeSpec {
  /** The number the export stores, e.g. 9. Must lie outside 1..points of every scale. */
  readonly code: number;
  /** Meaning, e.g. "prefer not to say". */
  readonly label: string;
  /** Share of an ordinary respondent's item answers replaced by this code, in [0, 0.5]. */
  readonly rate: number;
}

/** An item every respondent answered the same way (zero variance). */
export interface ConstantItemSpec {
  readonly name: string;
  readonly text: string;
  /** Name of the scale it belongs to in the codebook. */
  readonly scale: string;
  /** The one answer everybody gave, within the scale's 1..points. */
  readonly value: number;
}

/** An exact copy of another item's column under a new name (an export glitch). */
export interface DuplicateColumnSpec {
  readonly source: string;
  readonly name: string;
}

/** An outcome column driven by the factors, 0..10. */
export interface OutcomeSpec {
  readonly name: string;
  readonly text: string;
  /** Weight of each scale's factor, one per scale (any real numbers; rescaled internally). */
  readonly weights: readonly number[];
  /** Share of outcome variance left to noise, in [0, 1). */
  readonly noiseShare: number;
}

/** Everything `generateWave` needs. */
export interface WaveSpec {
  /** Number of respondents (rows), at least 10. */
  readonly respondents: number;
  readonly scales: readonly ScaleSpec[];
  /** Common correlation between every two factors, in [0, 0.95]. */
  readonly factorCorrelation: number;
  /** Loadings are drawn uniformly from this range; 0 < low <= high < 1. */
  readonly loadingRange: readonly [number, number];
  /** SD of the noise added to a planted twin's latent response (the source has SD 1), >= 0. */
  readonly twinNoise: number;
  /**
   * Shift of each item's thresholds towards agreement, in latent SD units: each item draws a
   * shift uniformly in [skew / 2, skew]. 0 gives symmetric answers.
   */
  readonly skew: number;
  readonly missingCodes: readonly MissingCodeSpec[];
  /** Share of ordinary respondents' item answers left blank (null), in [0, 0.5]. */
  readonly blankRate: number;
  readonly constantItems: readonly ConstantItemSpec[];
  readonly duplicateColumns: readonly DuplicateColumnSpec[];
  /** Respondents who give one and the same answer to every item. */
  readonly straightliners: number;
  /** Respondents who answer at random in a fraction of the usual time. */
  readonly speeders: number;
  /** Median completion time of an ordinary respondent, seconds. */
  readonly medianDurationSeconds: number;
  readonly idColumn: string;
  readonly durationColumn: string;
  /** First respondent id; ids count up from here. */
  readonly firstRespondentId: number;
  readonly outcome: OutcomeSpec | null;
}

/** One raw column of the export. Codes and missing codes are numbers, blanks are null. */
export interface WaveColumn {
  readonly name: string;
  readonly values: (number | string | null)[];
}

/** One codebook row, in the product's codebook vocabulary. */
export interface CodebookRow {
  readonly item: string;
  /** Scale name; empty for an outcome. */
  readonly scale: string;
  readonly reverse: boolean;
  readonly min: number;
  readonly max: number;
  readonly missing: readonly number[];
  readonly text: string;
}

/** What was planted, for tests and evaluation runs. Respondents are 0-based row indices. */
export interface WaveTruth {
  /**
   * Every pair of items inside a planted near-duplicate cluster (source and twins, including
   * reverse-worded twins), as [earlier item, later item] in column order.
   */
  readonly plantedPairs: readonly (readonly [string, string])[];
  /** Exactly duplicated columns as [source, copy]. */
  readonly duplicates: readonly (readonly [string, string])[];
  /** Planted doublets as [source, doublet] (locally dependent pairs, not near-copies). */
  readonly doublets: readonly (readonly [string, string])[];
  /** Cross-loading decoy items (not redundant; must not be flagged). */
  readonly crossLoadings: readonly string[];
  /** Scales generated with their own loading range (e.g. homogeneous decoy scales). */
  readonly ownLoadingScales: readonly string[];
  /** Reverse-worded twins as [source, reversed twin]. */
  readonly reverseTwins: readonly (readonly [string, string])[];
  readonly constantItems: readonly string[];
  /** Each scale with its items in column order (twins, constants and copies included). */
  readonly scales: readonly { readonly name: string; readonly points: ScalePoints; readonly items: readonly string[] }[];
  readonly straightliners: readonly number[];
  readonly speeders: readonly number[];
  /** Name of the outcome column, or null. */
  readonly outcome: string | null;
}

/** A generated pilot wave. */
export interface SyntheticWave {
  readonly columns: WaveColumn[];
  readonly codebook: CodebookRow[];
  readonly truth: WaveTruth;
}
