/**
 * The what-if of a cut: for any set of removed items (the engine's proposal or the designer's own
 * decisions), the figures a fresh audit of the remaining items would show: the largest VIF, the
 * correlation matrix's condition number, every scale's alpha and omega with the Spearman-Brown
 * projection of its old alpha to its new length, the number of items removed and the answering
 * time saved.
 *
 * Where every correlation and covariance depends only on its own two items (pairwise deletion,
 * or no missing answer at all) and the matrix needed no repair, the remaining items' matrices are
 * read from the evidence (principal submatrices), which is exactly what a fresh audit computes;
 * otherwise (listwise deletion with missing answers, or a repaired matrix) they are recomputed
 * from the data of the remaining items, an indefinite one smoothed as the audit smooths it
 * (settle-indefinite.ts).
 */
import { correlationMatrix } from '../stats/correlation-matrix';
import { covarianceMatrix } from '../stats/covariance-matrix';
import { spearmanBrown } from '../stats/spearman-brown';
import { selectItems, type ItemMatrix, type SquareMatrix } from '../stats/types';
import { scaleReliability } from './compute-evidence';
import { inflationAndSpectrum } from './inflation-evidence';
import { warningsFromNotices } from './notice-warnings';
import type { EngineSettings } from './engine-settings';
import { facetWarnings } from './facet-coverage';
import { principalSubmatrix } from './principal-submatrix';
import { settleIndefinite } from './settle-indefinite';
import type { EngineEvidence, EngineWarning } from './types';

/** One scale before and after the cut (audit-json `afterCut.scales[]`, with keys added). */
export interface AfterCutScale {
  readonly id: string;
  /** Raw alpha of the remaining items; null with fewer than two or zero total variance. */
  readonly alpha: number | null;
  readonly omegaTotal: number | null;
  /** Usable items left. */
  readonly items: number;
  readonly alphaBefore: number | null;
  readonly omegaBefore: number | null;
  readonly itemsBefore: number;
  /** Spearman-Brown projection of alphaBefore to the new length; null when either is undefined. */
  readonly spearmanBrown: number | null;
}

/** The what-if figures (audit-json `afterCut`, with keys added). */
export interface AfterCut {
  readonly maxVif: number | null;
  readonly conditionNumber: number | null;
  readonly scales: readonly AfterCutScale[];
  readonly itemsRemoved: number;
  readonly minutesSaved: number;
  /** Ids of the removed items, in items[] order. */
  readonly removed: readonly string[];
  /** The answering time per item used for minutesSaved (Paredown's house figure unless set). */
  readonly secondsPerItem: number;
  readonly maxVifBefore: number | null;
  readonly conditionNumberBefore: number | null;
  /** Warnings about the reduced item set (an exact dependency left, a scale too small...). */
  readonly warnings: readonly EngineWarning[];
}

/**
 * The largest VIF among the listed items.
 * @param values VIF per item in items[] order (null: infinite, an exact dependency).
 * @param usable Indices into items[] to look at.
 * @returns The largest VIF, or null when one of them is null or the list is empty.
 * References: Marquardt 1970 (VIF).
 */
export function largestVif(values: readonly (number | null)[], usable: readonly number[]): number | null {
  let largest: number | null = null;
  for (const index of usable) {
    const value = values[index];
    if (value === null) return null;
    largest = largest === null ? value : Math.max(largest, value);
  }
  return largest;
}

/**
 * The what-if figures of removing the given items.
 * @param evidence The evidence of the full item set (from `computeEvidence`).
 * @param matrix The recoded matrix the evidence came from; not modified.
 * @param removedIds Ids of the items to remove (any subset of items[]; locked ones too, since the
 *   designer decides).
 * @param settings `secondsPerItem`: answering time of one item, seconds (Paredown's house figure:
 *   8 s per rating item).
 * @throws {RangeError} when an id is unknown or repeated, the matrix does not match the
 *   evidence, or secondsPerItem is not positive.
 * @returns Max VIF, condition number, each scale's alpha / omega / Spearman-Brown projection,
 *   items removed and minutes saved, with the figures before beside them.
 * References: Marquardt 1970 (VIF); Belsley, Kuh & Welsch 1980 (condition number); Cronbach 1951
 * (alpha); McDonald 1999 (omega total); Spearman 1910 and Brown 1910 (prophecy formula).
 */
export function simulateCut(
  evidence: EngineEvidence,
  matrix: ItemMatrix,
  removedIds: readonly string[],
  settings: Pick<EngineSettings, 'secondsPerItem'>,
): AfterCut {
  if (matrix.columns !== evidence.items.length) throw new RangeError(`simulateCut: the matrix has ${matrix.columns} items, the evidence ${evidence.items.length}`);
  if (!(settings.secondsPerItem > 0 && Number.isFinite(settings.secondsPerItem))) {
    throw new RangeError(`simulateCut: secondsPerItem must be a positive number, got ${settings.secondsPerItem}`);
  }
  const indexOf = new Map(evidence.items.map((item, j) => [item.id, j]));
  const removed = new Set<number>();
  for (const id of removedIds) {
    const index = indexOf.get(id);
    if (index === undefined) throw new RangeError(`simulateCut: "${id}" is not an item of this audit`);
    if (removed.has(index)) throw new RangeError(`simulateCut: "${id}" is listed twice`);
    removed.add(index);
  }
  const kept = evidence.usable.filter((index) => !removed.has(index));
  const warnings: EngineWarning[] = [];
  const { items } = evidence;

  let correlation: SquareMatrix;
  let covariance: SquareMatrix;
  if (kept.length === 0) {
    correlation = { order: 0, data: new Float64Array(0) };
    covariance = correlation;
  } else if (!evidence.repaired && (evidence.missing === 'pairwise' || evidence.completeData)) {
    const position = new Map(evidence.usable.map((item, k) => [item, k]));
    const local = kept.map((index) => position.get(index) as number);
    correlation = principalSubmatrix(evidence.correlation, local);
    covariance = principalSubmatrix(evidence.covariance, local);
  } else {
    // As a fresh audit of these items: unrepaired correlations, then the engine's treatment of an
    // indefinite matrix (smoothing, Higham's projection only when the smoothing declines).
    const data = selectItems(matrix, kept);
    const fresh = correlationMatrix(data, { method: evidence.method, missing: evidence.missing, repair: 'none' });
    const settled = settleIndefinite(fresh, data);
    warnings.push(...warningsFromNotices(settled.notices, items, kept));
    if (settled.smoothed !== null) warnings.push(...warningsFromNotices(settled.smoothed.notices, items, settled.smoothed.kept.map((k) => kept[k])));
    correlation = settled.matrix;
    covariance = covarianceMatrix(data, { missing: evidence.missing }).matrix;
  }

  let maxVif: number | null = null;
  let conditionNumber: number | null = null;
  let reliability = null;
  if (kept.length > 0) {
    const overlap = inflationAndSpectrum(correlation, items, kept);
    warnings.push(...overlap.warnings);
    maxVif = largestVif(overlap.vif, kept);
    conditionNumber = overlap.conditionNumber;
    reliability = scaleReliability({ items, usable: kept, covariance, correlation, detail: 'full' });
    warnings.push(...reliability.warnings);
  } else {
    warnings.push({ code: 'no-usable-items', items: [], message: 'No usable item is left after this cut.' });
  }

  const scales = evidence.scales.map((before): AfterCutScale => {
    const after = reliability?.scales.find((scale) => scale.id === before.id) ?? null;
    const itemsAfter = after === null ? 0 : after.items.length;
    const projectable = before.alpha !== null && before.alpha >= 0 && before.alpha <= 1 && before.items.length > 0 && itemsAfter > 0;
    return {
      id: before.id,
      alpha: after?.alpha ?? null,
      omegaTotal: after?.omegaTotal ?? null,
      items: itemsAfter,
      alphaBefore: before.alpha,
      omegaBefore: before.omegaTotal,
      itemsBefore: before.items.length,
      spearmanBrown: projectable ? spearmanBrown(before.alpha as number, itemsAfter / before.items.length) : null,
    };
  });

  warnings.push(...facetWarnings(items, removed));
  const removedInOrder = [...removed].sort((a, b) => a - b);
  return {
    maxVif,
    conditionNumber,
    scales,
    itemsRemoved: removedInOrder.length,
    minutesSaved: (removedInOrder.length * settings.secondsPerItem) / 60,
    removed: removedInOrder.map((index) => items[index].id),
    secondsPerItem: settings.secondsPerItem,
    maxVifBefore: largestVif(evidence.vif, evidence.usable),
    conditionNumberBefore: evidence.conditionNumber,
    warnings,
  };
}
