/**
 * Everything the redundancy engine reads from one wave, computed with the numerical core and
 * returned as plain objects in the order of `items[]`: the correlation matrix with its pair n
 * (repaired to the nearest correlation matrix when a pairwise or polychoric matrix is
 * indefinite), the covariance matrix, VIF / tolerance / auxiliary R², eigenvalues and the
 * condition number, Belsley-Kuh-Welsch condition indices and proportions, each scale's alpha,
 * item-rest correlations, alpha if deleted and omega total, and each item's missing rate and
 * floor / ceiling shares.
 *
 * Items that cannot enter a correlation matrix (constant, or fewer than two answers) are left out
 * of every matrix and reported in `warnings`; their per-item statistics are null. The VIF figures
 * come from inflation-evidence.ts, the core's notices become warnings in notice-warnings.ts.
 */
import { alphaIfItemDeleted } from '../stats/alpha-if-item-deleted';
import { belsleyCollinearity, belsleyCollinearityFromMoments } from '../stats/belsley-collinearity';
import { correlationMatrix } from '../stats/correlation-matrix';
import { usableItems, usableItemsFromDescriptives } from '../stats/usable-items';
import { completeDraws, completeRows } from '../stats/complete-rows';
import { covarianceMatrix } from '../stats/covariance-matrix';
import { centeredCrossProducts, crossProductsOfItems, type CenteredCrossProducts } from '../stats/cross-products';
import { cronbachAlpha } from '../stats/cronbach-alpha';
import { emCovariance, EmEstimateRefusal } from '../stats/em-covariance';
import { itemDescriptives } from '../stats/item-descriptives';
import { itemRestCorrelations } from '../stats/item-rest-correlation';
import { minresOneFactor } from '../stats/minres-factor';
import { omegaTotal } from '../stats/omega-total';
import { symmetricEigenvalues } from '../stats/symmetric-eigen';
import { POLYCHORIC_MINIMUM_N, REPAIR_EIGENVALUE_FLOOR, TETRACHORIC_MINIMUM_N } from '../stats/tolerances';
import { deferredSelection, selectItems, selectRespondents, type ItemMatrix, type SquareMatrix } from '../stats/types';
import { undefinedPairCover } from '../stats/undefined-pair-cover';
import { weightedItemDescriptives } from '../stats/weighted-item-descriptives';
import { weightedPearson } from '../stats/weighted-pearson';
import { MAX_EM_ITEMS, type EngineSettings } from './engine-settings';
import type { LocalDependenceDetectors, LocalDependenceReuse, LocalDependenceSettings } from './local-dependence';
import { inflationAndSpectrum, inflationWithInverse } from './inflation-evidence';
import { warningsFromNotices } from './notice-warnings';
import { waveLocalDependence } from './wave-local-dependence';
import { principalSubmatrix } from './principal-submatrix';
import { settleIndefinite } from './settle-indefinite';
import type { ScaleAfterRemoval, ScaleAlphaOracle } from './recommend-cuts';
import type { CollinearityEvidence, EngineEvidence, EngineItem, EngineWarning, ItemDescriptives, ScaleEvidence } from './types';

/** How much `computeEvidence` computes. */
export interface ComputeEvidenceOptions {
  /**
   * `full` (default): everything. `decision`: only what the recommendations depend on (skips
   * omega and alpha if deleted, and takes the faster Gram path for the condition indices), for
   * bootstrap resamples.
   */
  readonly detail?: 'full' | 'decision';
  /**
   * Local-dependence evidence: computed by default with the core's detectors; `false` skips it;
   * `reuse` (bootstrap resamples) takes each scale's critical value and the network penalty from
   * the full sample instead of recomputing them.
   */
  readonly localDependence?:
    | false
    | {
        readonly detectors?: LocalDependenceDetectors;
        readonly reuse?: LocalDependenceReuse | null;
        /** False leaves the network out (a resample fits it only where it can change a decision). */
        readonly network?: boolean;
      };
  /** Also return R⁻¹ as `inverse` when R is well conditioned (bootstrap resamples: VIF after removal by Schur complement). */
  readonly inverse?: boolean;
  /**
   * The matrix is a bootstrap resample of `resampleOf.matrix`, its rows `resampleOf.rows` (row
   * indices into it, one per draw, repeats allowed), drawing row i `weights[i]` times. Figures
   * then come from the weighted original rows instead of passes over the resample: Pearson
   * correlations and covariances in one pass (weighted-pearson.ts); the descriptives, and from
   * them the usable items (weighted-item-descriptives.ts: counts and shares exact, mean and
   * standard deviation up to rounding); the complete rows (`completeDraws`), whose copy alone
   * feeds the Belsley-Kuh-Welsch diagnostics. The matrix itself (`deferredSelection(matrix,
   * rows)` builds it only when read) is read only where a figure still needs it: listwise deletion
   * with a drawn row missing an answer, Spearman and polychoric correlations, an indefinite matrix
   * to settle, the EM moments.
   */
  readonly resampleOf?: { readonly matrix: ItemMatrix; readonly rows: ArrayLike<number> };
  /**
   * Hears the share done (0 to 1) after each step: descriptives, correlations, covariances, VIF,
   * the Belsley-Kuh-Welsch diagnostics, reliability and local dependence. The shares are rough
   * (EVIDENCE_STEP_SHARES); they are there so that a progress bar moves during a long step.
   */
  readonly onProgress?: (fraction: number) => void;
}

/** Where `computeEvidence` reports itself after each step (rough shares of its time on a large wave). */
const EVIDENCE_STEP_SHARES = Object.freeze({ descriptives: 0.1, correlation: 0.4, covariance: 0.5, inflation: 0.6, collinearity: 0.8, reliability: 0.85, localDependence: 1 });

/**
 * Checks the engine's item list against the matrix.
 * @param matrix The recoded matrix.
 * @param items One entry per column.
 * @param caller Name of the public function, for the message.
 * @returns Nothing; returns only when every check passes.
 * References: none (input validation).
 * @throws {RangeError} naming `caller` when the counts differ, an id is empty or repeated, or a
 *   valid range is not finite with min < max.
 */
export function checkEngineItems(matrix: ItemMatrix, items: readonly EngineItem[], caller: string): void {
  if (!Array.isArray(items) || items.length !== matrix.columns) {
    throw new RangeError(`${caller}: items must list one entry per matrix column (${matrix.columns}), got ${Array.isArray(items) ? items.length : 'none'}`);
  }
  const seen = new Set<string>();
  items.forEach((item, j) => {
    if (typeof item.id !== 'string' || item.id.length === 0) throw new RangeError(`${caller}: item ${j} has no id`);
    if (seen.has(item.id)) throw new RangeError(`${caller}: item id "${item.id}" appears twice`);
    seen.add(item.id);
    const { min, max } = item;
    if ((min === null) !== (max === null)) throw new RangeError(`${caller}: item "${item.id}" must give both min and max or neither`);
    if (min !== null && max !== null && !(Number.isFinite(min) && Number.isFinite(max) && min < max)) {
      throw new RangeError(`${caller}: item "${item.id}" has an invalid range ${min} to ${max}`);
    }
  });
}

/** Reliability of each scale from covariance and correlation matrices over `usable` items. */
export interface ScaleReliabilityInput {
  readonly items: readonly EngineItem[];
  /** Indices into items[] of the matrices' items, ascending. */
  readonly usable: readonly number[];
  readonly covariance: SquareMatrix;
  readonly correlation: SquareMatrix;
  readonly detail: 'full' | 'decision';
}

/** Per-scale reliability and per-item item-rest / alpha-if-deleted (items[] order). */
export interface ScaleReliability {
  readonly scales: ScaleEvidence[];
  readonly itemRest: (number | null)[];
  readonly alphaIfDeleted: (number | null)[];
  readonly warnings: EngineWarning[];
}

/**
 * Each scale's raw and standardized alpha (from the covariances), item-rest correlations and
 * alpha if deleted (scales of 2+ and 3+ items), and omega total from one-factor minres loadings
 * of the scale's correlations (scales of 3+ items). Scales are listed in order of first
 * appearance in items[]; a scale keeps its place even when none of its items is usable.
 * @param input Items, the usable indices and the matrices over them, and the detail level.
 * @throws {RangeError} when the matrices do not match the usable items.
 * @returns Scales with reliability, per-item figures and warnings for every null.
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests"; McDonald
 * 1999, "Test Theory: A Unified Treatment" (omega total); Harman & Jones 1966 (minres).
 */
export function scaleReliability(input: ScaleReliabilityInput): ScaleReliability {
  const { items, usable, covariance, correlation, detail } = input;
  if (covariance.order !== usable.length || correlation.order !== usable.length) {
    throw new RangeError(`scaleReliability: matrices of order ${covariance.order} and ${correlation.order} for ${usable.length} usable items`);
  }
  const position = new Map(usable.map((item, k) => [item, k]));
  const itemRest = new Array<number | null>(items.length).fill(null);
  const alphaIfDeleted = new Array<number | null>(items.length).fill(null);
  const warnings: EngineWarning[] = [];
  const scaleIds: string[] = [];
  for (const item of items) if (item.scale !== null && !scaleIds.includes(item.scale)) scaleIds.push(item.scale);

  const scales = scaleIds.map((id): ScaleEvidence => {
    const members = usable.filter((index) => items[index].scale === id);
    const local = members.map((index) => position.get(index) as number);
    if (members.length < 2) {
      warnings.push({ code: 'scale-too-small', items: members.map((index) => items[index].id), message: `Scale ${id} has fewer than two usable items, so its reliability cannot be computed.` });
      return { id, items: members, alpha: null, alphaStd: null, omegaTotal: null };
    }
    const scaleCovariance = principalSubmatrix(covariance, local);
    const alpha = cronbachAlpha(scaleCovariance);
    warnings.push(...warningsFromNotices(alpha.notices, items, members, `Scale ${id}`));
    const rest = itemRestCorrelations(scaleCovariance);
    warnings.push(...warningsFromNotices(rest.notices, items, members, `Scale ${id}`));
    members.forEach((index, k) => {
      itemRest[index] = rest.correlations[k];
    });
    let omega: number | null = null;
    if (detail === 'full') {
      if (members.length >= 3) {
        const deleted = alphaIfItemDeleted(scaleCovariance);
        warnings.push(...warningsFromNotices(deleted.notices, items, members, `Scale ${id}`));
        members.forEach((index, k) => {
          alphaIfDeleted[index] = deleted.alpha[k];
        });
        const factor = minresOneFactor(principalSubmatrix(correlation, local));
        warnings.push(...warningsFromNotices(factor.notices, items, members, `Scale ${id}`));
        if (factor.loadings !== null) {
          const result = omegaTotal(factor.loadings);
          warnings.push(...warningsFromNotices(result.notices, items, members, `Scale ${id}`));
          omega = result.omegaTotal;
        }
      } else {
        warnings.push({ code: 'omega-skipped', items: members.map((index) => items[index].id), message: `Scale ${id} has two usable items: omega and alpha if deleted need at least three.` });
      }
    }
    return { id, items: members, alpha: alpha.alpha, alphaStd: alpha.alphaStandardized, omegaTotal: omega };
  });
  return { scales, itemRest, alphaIfDeleted, warnings };
}

/**
 * Computes the engine's evidence for one wave.
 * @param matrix Recoded respondents × items (reverse-keyed items flipped, missing as NaN); not modified.
 * @param items One entry per column (id, scale, wording, lock, valid range), in column order.
 * @param settings `method` (pearson, spearman, polychoric) and `missing` (pairwise, listwise).
 * @param options `detail`: `full` (default) or `decision` (skips omega and alpha if deleted).
 * @throws {RangeError} when the items do not match the matrix (count, duplicate ids, ranges) or
 *   the core refuses the data (infinite values, an unknown method or policy).
 * @returns The evidence, per-item arrays in items[] order, with warnings for every value that is
 *   null and every repair or exclusion.
 * References: Marquardt 1970 (VIF); Belsley, Kuh & Welsch 1980 (condition indices); Cronbach
 * 1951 (alpha); McDonald 1999 (omega); Higham 2002 (nearest correlation matrix); Terwee et al.
 * 2007 (floor and ceiling).
 */
export function computeEvidence(
  matrix: ItemMatrix,
  items: readonly EngineItem[],
  settings: Pick<EngineSettings, 'method' | 'missing'> & Partial<LocalDependenceSettings>,
  options: ComputeEvidenceOptions = {},
): EngineEvidence {
  checkEngineItems(matrix, items, 'computeEvidence');
  const detail = options.detail ?? 'full';
  const warnings: EngineWarning[] = [];
  const resampleOf = options.resampleOf;
  if (resampleOf !== undefined && (resampleOf.rows.length !== matrix.rows || resampleOf.matrix.columns !== matrix.columns)) {
    throw new RangeError(`computeEvidence: a resample of ${matrix.rows} × ${matrix.columns} drawn as ${resampleOf.rows.length} rows of a matrix of ${resampleOf.matrix.columns} items`);
  }
  const weights = resampleOf === undefined ? null : drawWeights(resampleOf.matrix.rows, resampleOf.rows);
  const ranges = items.map((item) => (item.min === null || item.max === null ? null : { min: item.min, max: item.max }));
  // A resample's descriptives come from the weighted original rows, and its usable items from them.
  const described = resampleOf === undefined || weights === null ? null : weightedItemDescriptives(resampleOf.matrix, weights, { ranges });
  const usableResult = described === null ? usableItems(matrix) : usableItemsFromDescriptives(described);
  warnings.push(...warningsFromNotices(usableResult.notices, items, items.map((_, j) => j)));
  const usable = [...usableResult.usable];

  const descriptives: ItemDescriptives[] = (described ?? itemDescriptives(matrix, { ranges })).map((entry) => ({
    n: entry.n,
    mean: entry.mean,
    sd: entry.standardDeviation,
    missingRate: entry.missingRate,
    floor: entry.floorShare,
    ceiling: entry.ceilingShare,
  }));
  const progress = options.onProgress;
  progress?.(EVIDENCE_STEP_SHARES.descriptives);

  const empty: SquareMatrix = { order: 0, data: new Float64Array(0) };
  const nothing = new Array<null>(items.length).fill(null);
  if (usable.length === 0) {
    warnings.push({ code: 'no-usable-items', items: [], message: 'No item varies, so no correlation, VIF or reliability can be computed.' });
    return {
      items, method: settings.method, missing: settings.missing, rows: matrix.rows, completeData: true, usable,
      correlation: empty, pairN: empty, correlationRows: 0, repaired: false, covariance: empty,
      vif: nothing, tolerance: nothing, r2: nothing, topPartner: nothing, exactDependencies: [], eigenvalues: [], conditionNumber: null,
      collinearity: null, itemRest: nothing, alphaIfDeleted: nothing, scales: [], descriptives, localDependence: null, warnings,
    };
  }

  // The usable items' columns (a resample's copied only when read).
  const columnsOf = (kept: readonly number[]): ItemMatrix =>
    kept.length === items.length ? matrix : resampleOf === undefined ? selectItems(matrix, kept) : deferredSelection(resampleOf.matrix, resampleOf.rows, kept);
  let data = columnsOf(usable);
  const weightedMoments = (columns: readonly number[]) =>
    resampleOf === undefined || weights === null || settings.method !== 'pearson' ? null : weightedPearson(resampleOf.matrix, weights, columns, settings.missing, 'none');
  let moments = weightedMoments(usable);
  // Pearson over complete rows (complete data, or listwise deletion): the centred cross-products
  // XᵀX of the complete rows are taken once and serve the correlation matrix, the covariance
  // matrix and the Belsley-Kuh-Welsch Gram matrix alike (each would otherwise pass over the data
  // again; the figures are bit for bit the same).
  let crossProducts = moments === null ? sharedCrossProducts(data, settings) : undefined;
  let correlation = moments?.correlation ?? correlationMatrix(data, { method: settings.method, missing: settings.missing, repair: 'none', ...(crossProducts ? { crossProducts } : {}) });
  // An undefined correlation (two items never answered together, or no variation where they
  // were) is never entered as 0: the fewest items that leave no undefined pair are set aside.
  for (let round = 0; correlation.undefinedPairs.length > 0 && usable.length > 1 && round < items.length; round++) {
    const answered = usable.map((j) => descriptives[j].n);
    const cover = undefinedPairCover(usable.length, correlation.undefinedPairs, answered);
    const chosen = cover.leftOut.map((k, t) => ({ k, partners: cover.partners[t] })).sort((a, b) => a.k - b.k);
    const names = chosen.map(({ k }) => items[usable[k]].id);
    const detail = chosen.map(({ k, partners }) => `${items[usable[k]].id} (no correlation with ${partners.map((m) => items[usable[m]].id).join(', ')})`);
    warnings.push({
      code: 'correlation-undefined-items-left-out',
      items: names,
      message:
        `${correlation.undefinedPairs.length} item pair(s) have no correlation (fewer than 3 respondents answered both, or one item did not vary where they did), ` +
        `so ${names.length === 1 ? 'one item was' : `${names.length} items were`} left out of the correlation matrix and every statistic built on it: ${detail.join('; ')}. ` +
        'The items were chosen greedily (each time the item in the most undefined pairs) so that as few as possible leave; an undefined correlation is never entered as 0.',
    });
    const gone = new Set(cover.leftOut);
    const keptPositions = usable.map((_, k) => k).filter((k) => !gone.has(k));
    const kept = keptPositions.map((k) => usable[k]);
    usable.splice(0, usable.length, ...kept);
    data = columnsOf(usable);
    moments = weightedMoments(usable);
    // Under listwise deletion fewer items can leave more complete rows: the cross-products are
    // taken again then; otherwise the kept items' rows and columns are theirs.
    if (crossProducts !== undefined) {
      crossProducts = settings.missing === 'listwise' ? sharedCrossProducts(data, settings) : crossProductsOfItems(crossProducts, keptPositions);
    }
    correlation = moments?.correlation ?? correlationMatrix(data, { method: settings.method, missing: settings.missing, repair: 'none', ...(crossProducts ? { crossProducts } : {}) });
  }
  // The complete rows, found once for the completeness flag and the Belsley-Kuh-Welsch diagnostics
  // (infinite values refused as the diagnostics refuse them; a resample's were refused with its
  // descriptives). A resample's are found from the original rows, and only their copy is built.
  const complete =
    crossProducts !== undefined ? undefined : resampleOf === undefined ? completeRows(data, 'belsleyCollinearity') : completeDraws(resampleOf.matrix, resampleOf.rows, usable);
  const completeTaken =
    resampleOf === undefined || complete === undefined ? undefined : deferredSelection(resampleOf.matrix, complete.map((k) => resampleOf.rows[k]), usable);
  const completeData = complete === undefined ? (crossProducts as CenteredCrossProducts).rows === data.rows : complete.length === data.rows;
  // An indefinite matrix (pairwise or polychoric) is smoothed by Bentler & Yuan's (2011) scaling
  // with minimum-trace communalities (Debelak & Tran 2016), which leaves a floor under the
  // smallest eigenvalue, instead of Higham's projection, which leaves it nearly singular and makes
  // every VIF, KMO and condition number explode. A matrix with an exact dependency only is left
  // as it is, so exact copies keep their infinite VIF. The correlations come unrepaired
  // (`repair: 'none'`): Higham's projection runs only when the smoothing declines.
  progress?.(EVIDENCE_STEP_SHARES.correlation);
  const settled = settleIndefinite(correlation, data);
  warnings.push(...warningsFromNotices(settled.notices, items, usable));
  if (settings.method === 'polychoric') warnings.push(...polychoricSampleWarnings(correlation, items, usable));
  const matrixR = settled.matrix;
  const repaired = settled.repaired;
  if (settled.smoothed !== null) warnings.push(...warningsFromNotices(settled.smoothed.notices, items, settled.smoothed.kept.map((k) => usable[k])));
  const covariance = moments?.covariance ?? covarianceMatrix(data, { missing: settings.missing, ...(crossProducts ? { crossProducts } : {}) });
  warnings.push(...warningsFromNotices(covariance.notices, items, usable));
  progress?.(EVIDENCE_STEP_SHARES.covariance);

  const overlap =
    options.inverse === true
      ? inflationWithInverse(matrixR, items, usable, matrixR === correlation.matrix ? correlation.eigenvalues : undefined)
      : inflationAndSpectrum(matrixR, items, usable);
  warnings.push(...overlap.warnings);
  progress?.(EVIDENCE_STEP_SHARES.inflation);

  const collinearity = collinearityEvidence(data, items, usable, warnings, detail, crossProducts, complete, completeTaken);
  progress?.(EVIDENCE_STEP_SHARES.collinearity);
  const reliability = scaleReliability({ items, usable, covariance: covariance.matrix, correlation: matrixR, detail });
  warnings.push(...reliability.warnings);
  progress?.(EVIDENCE_STEP_SHARES.reliability);

  let localDependence: EngineEvidence['localDependence'] = null;
  if (options.localDependence !== false) {
    const local = waveLocalDependence(data, matrixR, items, usable, correlation.rowsUsed, settings, options.localDependence ?? {}, overlap.exactDependencies);
    localDependence = local.evidence;
    warnings.push(...local.warnings);
  }
  progress?.(EVIDENCE_STEP_SHARES.localDependence);

  return {
    items,
    method: settings.method,
    missing: settings.missing,
    rows: matrix.rows,
    completeData,
    usable,
    correlation: matrixR,
    pairN: correlation.n,
    pairStandardErrors: correlation.standardErrors,
    thresholds: correlation.thresholds,
    correlationRows: correlation.rowsUsed,
    repaired,
    covariance: covariance.matrix,
    vif: overlap.vif,
    tolerance: overlap.tolerance,
    r2: overlap.r2,
    topPartner: overlap.topPartner,
    exactDependencies: overlap.exactDependencies,
    ...('inverse' in overlap ? { inverse: overlap.inverse } : {}),
    eigenvalues: overlap.eigenvalues,
    conditionNumber: overlap.conditionNumber,
    collinearity,
    itemRest: reliability.itemRest,
    alphaIfDeleted: reliability.alphaIfDeleted,
    scales: reliability.scales,
    descriptives,
    localDependence,
    warnings,
  };
}

/**
 * Whether a polychoric (tetrachoric for 0/1 items) matrix rests on enough respondents: the
 * smallest pair n against the stated minimum, and negative eigenvalues before repair, the sign
 * that the pairs do not fit together (each estimated on its own from too few answers).
 * @param correlation The polychoric correlation result.
 * @param items All items; `usable` maps the matrix's positions into them.
 * @param usable Indices into items[] of the matrix's items.
 * @returns Zero, one or two warnings (`polychoric-sample-small`, `polychoric-indefinite`).
 * References: Lorenzo-Seva & Ferrando 2021, "Not positive definite correlation matrices in exploratory
 *   item factor analysis: causes, consequences and a proposed solution", Structural Equation Modeling
 *   28:138-147 (from memory); POLYCHORIC_MINIMUM_N and TETRACHORIC_MINIMUM_N (common practice).
 */
export function polychoricSampleWarnings(correlation: ReturnType<typeof correlationMatrix>, items: readonly EngineItem[], usable: readonly number[]): EngineWarning[] {
  const warnings: EngineWarning[] = [];
  const order = correlation.matrix.order;
  if (order < 2) return warnings;
  const binary = (correlation.thresholds ?? []).every((limits) => limits.length === 1);
  const minimum = binary ? TETRACHORIC_MINIMUM_N : POLYCHORIC_MINIMUM_N;
  const kind = binary ? 'tetrachoric' : 'polychoric';
  let smallest = Infinity;
  for (let j = 0; j < order; j++) for (let k = j + 1; k < order; k++) smallest = Math.min(smallest, correlation.n.data[j * order + k]);
  const ids = usable.map((j) => items[j].id);
  if (smallest < minimum) {
    warnings.push({
      code: 'polychoric-sample-small',
      items: ids,
      message: `The ${kind} matrix rests on as few as ${smallest} respondents per pair, below the ${minimum} this audit asks of a ${kind} matrix (README, "Minimum respondents per method"); its correlations are imprecise and may not fit together, so read them with care or use Pearson correlations.`,
    });
  }
  const raw = correlation.unrepaired ?? correlation.matrix;
  const spectrum = correlation.unrepaired === null && correlation.eigenvalues !== undefined ? correlation.eigenvalues : symmetricEigenvalues(raw);
  const negative = Array.from(spectrum).filter((value) => value < -REPAIR_EIGENVALUE_FLOOR).length;
  if (negative > 0) {
    warnings.push({
      code: 'polychoric-indefinite',
      items: ids,
      message: `Before repair the ${kind} matrix had ${negative} negative eigenvalue${negative === 1 ? '' : 's'}: its pairs, each estimated on its own, do not fit one set of respondents, usually because there are too few respondents for the number of items and categories. The figures use the repaired matrix; more respondents, fewer categories (merge sparse ones) or Pearson correlations avoid the repair.`,
    });
  }
  return warnings;
}

/**
 * The centred cross-products of the complete rows of `data` when Pearson correlations come from
 * complete rows only (no missing answer, or listwise deletion) and there are at least two such
 * rows; undefined otherwise (pairwise deletion with missing answers, Spearman, polychoric).
 */
function sharedCrossProducts(data: ItemMatrix, settings: Pick<EngineSettings, 'method' | 'missing'>): CenteredCrossProducts | undefined {
  if (settings.method !== 'pearson') return undefined;
  const complete = completeRows(data);
  if (complete.length < 2) return undefined;
  if (complete.length === data.rows) return centeredCrossProducts(data);
  return settings.missing === 'listwise' ? centeredCrossProducts(selectRespondents(data, complete)) : undefined;
}

/**
 * How often a resample draws each row of the original matrix.
 * @param rows The original matrix's respondents.
 * @param draws Row indices, one per draw.
 * @throws {RangeError} when a draw is outside 0..rows − 1.
 * @returns One count per original row.
 */
function drawWeights(rows: number, draws: ArrayLike<number>): Float64Array {
  const weights = new Float64Array(rows);
  for (let k = 0; k < draws.length; k++) {
    const row = draws[k];
    if (!(Number.isInteger(row) && row >= 0 && row < rows)) throw new RangeError(`computeEvidence: draw ${k} is row ${row}, outside 0..${rows - 1}`);
    weights[row]++;
  }
  return weights;
}

/**
 * Below this share of complete rows the Belsley-Kuh-Welsch diagnostics come from the EM moments of
 * all rows instead of the complete rows. House figure: half.
 */
const EM_COMPLETE_ROW_SHARE = 0.5;

/** Belsley-Kuh-Welsch diagnostics, or null (with a warning) when too few complete rows. */
function collinearityEvidence(
  data: ItemMatrix,
  items: readonly EngineItem[],
  usable: readonly number[],
  warnings: EngineWarning[],
  detail: 'full' | 'decision',
  crossProducts: CenteredCrossProducts | undefined,
  complete: readonly number[] | undefined,
  completeTaken: ItemMatrix | undefined,
): CollinearityEvidence | null {
  // Bootstrap resamples take the Gram-matrix path (one cross-product pass and a small
  // eigen-decomposition): its relative error, about ε·η², is harmless below η = 1e4.
  const path = detail === 'decision' ? 'gram' : 'auto';
  // The complete rows already taken (a resample's) are the very rows the diagnostics would take
  // from `data`, in the same order: the same figures.
  let result =
    completeTaken !== undefined
      ? belsleyCollinearity(completeTaken, { path, completeRows: Array.from({ length: completeTaken.rows }, (_, k) => k) })
      : belsleyCollinearity(data, { path, ...(crossProducts ? { crossProducts } : {}), ...(complete ? { completeRows: complete } : {}) });
  const width = usable.length + 1;
  let fromEm = false;
  // With scattered missing answers the complete rows can be too few (a 54-item wave with 3%
  // missing keeps about 44 of 400): the cross-products then come from the EM estimate of the
  // means and covariances under missing at random, from every row (Dempster, Laird & Rubin 1977).
  const emAffordable = usable.length <= MAX_EM_ITEMS;
  // Why the EM estimate was wanted but could not be made, for the warning (null: not wanted, or made).
  let emRefused: string | null = null;
  if (emAffordable && (result.rowsUsed < width + 1 || (detail === 'full' && result.rowsUsed < EM_COMPLETE_ROW_SHARE * data.rows))) {
    try {
      const em = emCovariance(data);
      result = belsleyCollinearityFromMoments(em.means, em.covariance, em.rows);
      fromEm = true;
    } catch (error) {
      if (!(error instanceof RangeError)) throw error;
      const reason = error instanceof EmEstimateRefusal ? error.reason : null;
      emRefused =
        reason === 'singular'
          ? 'its covariance matrix is singular, as it is when items are exactly linearly dependent (such as a duplicated column)'
          : reason === 'items-without-variance'
            ? 'an item has fewer than two answers or no variation'
            : 'the estimate could not be made';
    }
  }
  if (fromEm) {
    warnings.push({
      code: 'collinearity-from-em',
      items: [],
      message: `Condition indices come from the EM estimate of the items' means and covariances over all ${result.rowsUsed} respondents (missing at random assumed), because few respondents answered every item.`,
    });
  } else if (emRefused !== null && result.rowsUsed >= width + 1) {
    warnings.push({
      code: 'collinearity-complete-rows',
      items: [],
      message: `Condition indices rest on the ${result.rowsUsed} of ${data.rows} respondents who answered every item: the EM estimate from every respondent, used when fewer than half answered every item, was not made because ${emRefused}.`,
    });
  }
  if (result.rowsUsed < width + 1) {
    warnings.push({
      code: 'collinearity-skipped',
      items: [],
      message: `Only ${result.rowsUsed} respondents answered every item, too few for condition indices over ${usable.length} items and an intercept${emAffordable ? (emRefused === null ? '' : ` (the EM estimate from every respondent was not made because ${emRefused})`) : ` (the EM estimate from every respondent is made for at most ${MAX_EM_ITEMS} items)`}; near-dependencies were not checked.`,
    });
    return null;
  }
  warnings.push(...warningsFromNotices(result.notices, items, usable));
  const local = [-1, ...usable];
  return {
    columns: local,
    conditionIndices: result.conditionIndices,
    varianceProportions: result.varianceProportions,
    rowsUsed: result.rowsUsed,
  };
}

/**
 * A reliability oracle for `recommendCuts`: each scale's raw alpha and usable item count after
 * removing a set of items, computed exactly as a fresh `computeEvidence` of the reduced item set
 * would compute it. Under pairwise deletion (or with no missing answer) every covariance depends
 * on its two items only, so the evidence's covariance matrix is read; under listwise deletion
 * with missing answers the complete rows change with the item set, so the covariances are
 * recomputed from the data. Results are cached per removed set.
 * @param evidence The evidence of the full item set.
 * @param matrix The recoded matrix the evidence came from.
 * @throws {RangeError} when the matrix does not match the evidence's items.
 * @returns The oracle.
 * References: Cronbach 1951, "Coefficient alpha and the internal structure of tests".
 */
export function scaleAlphaOracle(evidence: EngineEvidence, matrix: ItemMatrix): ScaleAlphaOracle {
  if (matrix.columns !== evidence.items.length) throw new RangeError(`scaleAlphaOracle: the matrix has ${matrix.columns} items, the evidence ${evidence.items.length}`);
  const cache = new Map<string, ReadonlyMap<string, ScaleAfterRemoval>>();
  const position = new Map(evidence.usable.map((item, k) => [item, k]));
  const fromData = evidence.missing === 'listwise' && !evidence.completeData;
  return (removed) => {
    const key = [...removed].sort((a, b) => a - b).join(',');
    const cached = cache.get(key);
    if (cached !== undefined) return cached;
    const kept = evidence.usable.filter((index) => !removed.has(index));
    let covariance: SquareMatrix;
    let local: Map<number, number>;
    if (fromData && kept.length > 0) {
      covariance = covarianceMatrix(selectItems(matrix, kept), { missing: 'listwise' }).matrix;
      local = new Map(kept.map((item, k) => [item, k]));
    } else {
      covariance = evidence.covariance;
      local = position;
    }
    const result = new Map<string, ScaleAfterRemoval>();
    for (const scale of evidence.scales) {
      const members = scale.items.filter((index) => !removed.has(index));
      const alpha = members.length < 2 ? null : cronbachAlpha(principalSubmatrix(covariance, members.map((index) => local.get(index) as number))).alpha;
      result.set(scale.id, { alpha, items: members.length });
    }
    cache.set(key, result);
    return result;
  };
}
