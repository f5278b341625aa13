/**
 * Kaiser-Meyer-Olkin measure of sampling adequacy, overall and per item (MSA): how much of the
 * items' correlation is shared rather than specific to pairs. With S = R⁻¹, the partial (anti-
 * image) correlations are `q_ij = −S_ij / sqrt(S_ii S_jj)`, and over off-diagonal cells
 * `KMO = Σ r² / (Σ r² + Σ q²)`; an item's MSA takes the same sums over its own column. Labels
 * follow Kaiser 1974. The figures do not change when an item is reverse-keyed.
 *
 * References: Kaiser 1970, "A second generation little jiffy" (Psychometrika 35:401-415); Kaiser
 * & Rice 1974, "Little Jiffy, Mark IV" (Educational and Psychological Measurement 34:111-117);
 * Kaiser 1974, "An index of factorial simplicity" (Psychometrika 39:31-36), for the labels.
 */
import { checkCorrelationMatrix } from './correlation-input';
import { exactDependencyGroups, exactDependencyNotices, spectralInverse, summarizeSpectrum } from './spectral-inverse';
import { symmetricEigen, type SymmetricEigenDecomposition } from './symmetric-eigen';
import { KMO_LABEL_BOUNDS } from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** Kaiser's (1974) verbal labels for a KMO or MSA value, best first. */
export type KmoLabel = 'marvelous' | 'meritorious' | 'middling' | 'mediocre' | 'miserable' | 'unacceptable';

/** Sampling adequacy of one item. */
export interface ItemSamplingAdequacy {
  /** The item's MSA in [0, 1]; null when it does not exist (see notices). */
  readonly msa: number | null;
  readonly label: KmoLabel | null;
}

/** The result of `kaiserMeyerOlkin`. */
export interface KaiserMeyerOlkinResult {
  /** Overall KMO in [0, 1]; null when it does not exist (see notices). */
  readonly overall: number | null;
  readonly label: KmoLabel | null;
  /** One entry per item, in the matrix's order. */
  readonly items: readonly ItemSamplingAdequacy[];
  /** `exact-dependency` (R not invertible), `indefinite-matrix`, or `kmo-undefined`. */
  readonly notices: readonly NumericalNotice[];
}

/** Options of `kaiserMeyerOlkin`. */
export interface KaiserMeyerOlkinOptions {
  /** The eigen-decomposition of the same matrix, to reuse. Trusted to belong to it. */
  readonly eigen?: SymmetricEigenDecomposition;
}

/**
 * Kaiser's label for a KMO or MSA value: >= .9 marvelous, >= .8 meritorious, >= .7 middling,
 * >= .6 mediocre, >= .5 miserable, below that unacceptable.
 * @param value A KMO or MSA value in [0, 1].
 * @throws {RangeError} when the value is not a number in [0, 1].
 * @returns The label.
 * References: Kaiser 1974, "An index of factorial simplicity" (Psychometrika 39:31-36).
 */
export function kmoLabel(value: number): KmoLabel {
  if (!(value >= 0 && value <= 1)) throw new RangeError(`kmoLabel: the value must lie in [0, 1], got ${value}`);
  for (const { bound, label } of KMO_LABEL_BOUNDS) if (value >= bound) return label;
  return 'unacceptable';
}

/**
 * Overall KMO and per-item MSA of a correlation matrix.
 * @param correlation The item correlation matrix (square, symmetric, unit diagonal). Not modified.
 * @param options `eigen`: a decomposition of the same matrix to reuse for the inverse.
 * @throws {RangeError} when the matrix is not a correlation matrix in shape.
 * @throws {RangeError} when `options.eigen` has a different order.
 * @returns The overall value and label, one MSA and label per item, and notices. When R is
 *   singular or indefinite there are no partial correlations: every value is null, with the
 *   dependent items named. A value whose sums are all zero (a single item, or items that do not
 *   correlate at all) is null with a `kmo-undefined` notice.
 * References: Kaiser 1970, "A second generation little jiffy"; Kaiser & Rice 1974, "Little Jiffy,
 * Mark IV".
 */
export function kaiserMeyerOlkin(correlation: SquareMatrix, options: KaiserMeyerOlkinOptions = {}): KaiserMeyerOlkinResult {
  checkCorrelationMatrix(correlation, 'kaiserMeyerOlkin');
  const { order, data } = correlation;
  const eigen = options.eigen ?? symmetricEigen(correlation);
  if (eigen.order !== order) throw new RangeError(`kaiserMeyerOlkin: the eigen-decomposition has order ${eigen.order}, the matrix ${order}`);

  const nothing = (notices: NumericalNotice[]): KaiserMeyerOlkinResult => ({
    overall: null,
    label: null,
    items: Array.from({ length: order }, () => ({ msa: null, label: null })),
    notices,
  });
  const summary = summarizeSpectrum(eigen.values);
  if (summary.indefinite) {
    return nothing([
      {
        code: 'indefinite-matrix',
        items: Array.from({ length: order }, (_, j) => j),
        message: `The correlation matrix has a negative eigenvalue (${summary.smallest.toPrecision(3)}), so there are no partial correlations and no KMO; repair the matrix first.`,
      },
    ]);
  }
  const inverse = spectralInverse(eigen);
  if (inverse === null) {
    return nothing(exactDependencyNotices(exactDependencyGroups(eigen), 'the correlation matrix has no inverse, so KMO and MSA are reported as null'));
  }

  const S = inverse.data;
  const columnR2 = new Float64Array(order);
  const columnQ2 = new Float64Array(order);
  for (let i = 0; i < order; i++) {
    for (let j = i + 1; j < order; j++) {
      const r = data[i * order + j];
      const q = S[i * order + j] / Math.sqrt(S[i * order + i] * S[j * order + j]);
      columnR2[i] += r * r;
      columnR2[j] += r * r;
      columnQ2[i] += q * q;
      columnQ2[j] += q * q;
    }
  }
  const notices: NumericalNotice[] = [];
  const undefinedItems: number[] = [];
  let totalR2 = 0;
  let totalQ2 = 0;
  const items: ItemSamplingAdequacy[] = [];
  for (let j = 0; j < order; j++) {
    totalR2 += columnR2[j];
    totalQ2 += columnQ2[j];
    const denominator = columnR2[j] + columnQ2[j];
    if (denominator > 0) {
      const msa = columnR2[j] / denominator;
      items.push({ msa, label: kmoLabel(msa) });
    } else {
      undefinedItems.push(j);
      items.push({ msa: null, label: null });
    }
  }
  if (undefinedItems.length > 0) {
    notices.push({
      code: 'kmo-undefined',
      items: undefinedItems,
      message: `Items at columns ${undefinedItems.join(', ')} correlate with no other item (or stand alone), so their MSA is undefined and is reported as null.`,
    });
  }
  const total = totalR2 + totalQ2;
  if (total === 0) return { overall: null, label: null, items, notices };
  const overall = totalR2 / total;
  return { overall, label: kmoLabel(overall), items, notices };
}
