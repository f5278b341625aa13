/**
 * Variance inflation factors of the items: how much each item's overlap with all the others
 * would inflate the variance of its coefficient in a model that used the items as predictors.
 *
 * With R the item correlation matrix, `VIF_j = [R⁻¹]_jj = 1 / (1 − R²_j)`, where R²_j comes from
 * regressing item j on every other item; tolerance is `1 − R²_j = 1 / VIF_j`. The diagonal is read
 * from the eigen-decomposition, `[R⁻¹]_jj = Σ_k v_jk² / λ_k`, which also exposes exact
 * dependencies: when R is singular, an item with a non-zero row in the null space has an
 * infinite VIF (R² = 1), reported as null with an `exact-dependency` notice; for every other item
 * the sum over the non-zero eigenvalues (the pseudo-inverse) is still its exact VIF, because
 * min over x with x_j = 1 of xᵀRx equals 1 / [R⁺]_jj whenever e_j lies in the range of R.
 *
 * References: Marquardt 1970, "Generalized inverses, ridge regression, biased linear estimation,
 * and nonlinear estimation" (Technometrics 12:591-612); Penrose 1955, "A generalized inverse for
 * matrices" (Proc. Cambridge Phil. Soc. 51:406-413).
 */
import { checkCorrelationMatrix } from './correlation-input';
import { exactDependencyGroups, exactDependencyNotices, summarizeSpectrum } from './spectral-inverse';
import { symmetricEigen, type SymmetricEigenDecomposition } from './symmetric-eigen';
import type { NumericalNotice, SquareMatrix } from './types';

/** An item's strongest partner: the other item with the largest |r|. */
export interface TopPartner {
  /** 0-based index of the partner item. */
  readonly index: number;
  /** The (signed) correlation with it. */
  readonly r: number;
}

/** Overlap figures of one item. null marks a value that does not exist (see the notices). */
export interface ItemVarianceInflation {
  /** `[R⁻¹]_jj`, at least 1; null when the item is in an exact dependency or R is indefinite. */
  readonly vif: number | null;
  /** `1 / VIF = 1 − R²`; null with vif. */
  readonly tolerance: number | null;
  /** Squared multiple correlation with all other items; null with vif. */
  readonly r2: number | null;
  /** Strongest partner by |r| (the lower index wins a tie); null for a single item. */
  readonly topPartner: TopPartner | null;
}

/** The result of `varianceInflation`. */
export interface VarianceInflationResult {
  /** One entry per item, in the matrix's order. */
  readonly items: readonly ItemVarianceInflation[];
  /** Groups of exactly dependent items (0-based indices), empty when R is non-singular. */
  readonly exactDependencies: readonly (readonly number[])[];
  /** `exact-dependency` per group, or one `indefinite-matrix` notice. */
  readonly notices: readonly NumericalNotice[];
}

/** Options of `varianceInflation`. */
export interface VarianceInflationOptions {
  /**
   * The eigen-decomposition of the same matrix, when the caller already has it (saves one
   * decomposition). It is trusted to belong to the matrix passed.
   */
  readonly eigen?: SymmetricEigenDecomposition;
}

/**
 * VIF, tolerance and auxiliary R² of every item, its strongest partner, and the exact
 * dependencies that make some VIFs infinite.
 * @param correlation The item correlation matrix (square, symmetric, unit diagonal). Not modified.
 * @param options `eigen`: a decomposition of the same matrix to reuse.
 * @throws {RangeError} when the matrix is not a correlation matrix in shape (see
 *   `checkCorrelationMatrix`).
 * @throws {RangeError} when `options.eigen` has a different order.
 * @returns Per-item figures (null where the value does not exist), the dependent groups and the
 *   notices. Never NaN or Infinity.
 * References: Marquardt 1970, "Generalized inverses, ridge regression, biased linear estimation,
 * and nonlinear estimation" (Technometrics 12:591-612).
 */
export function varianceInflation(correlation: SquareMatrix, options: VarianceInflationOptions = {}): VarianceInflationResult {
  checkCorrelationMatrix(correlation, 'varianceInflation');
  const order = correlation.order;
  const eigen = options.eigen ?? symmetricEigen(correlation);
  if (eigen.order !== order) {
    throw new RangeError(`varianceInflation: the eigen-decomposition has order ${eigen.order}, the matrix ${order}`);
  }
  const partners = strongestPartners(correlation);
  const summary = summarizeSpectrum(eigen.values);

  if (summary.indefinite) {
    const notice: NumericalNotice = {
      code: 'indefinite-matrix',
      items: Array.from({ length: order }, (_, j) => j),
      message: `The correlation matrix is not positive semi-definite (smallest eigenvalue ${summary.smallest.toPrecision(3)}), so no VIF exists; repair the matrix first.`,
    };
    const items = partners.map((topPartner) => ({ vif: null, tolerance: null, r2: null, topPartner }));
    return { items, exactDependencies: [], notices: [notice] };
  }

  const groups = exactDependencyGroups(eigen);
  const dependent = new Set(groups.flat());
  const items: ItemVarianceInflation[] = [];
  for (let j = 0; j < order; j++) {
    if (dependent.has(j)) {
      items.push({ vif: null, tolerance: null, r2: null, topPartner: partners[j] });
      continue;
    }
    let inverseDiagonal = 0;
    for (let k = 0; k < order; k++) {
      if (eigen.values[k] <= summary.threshold) continue;
      const loading = eigen.vectors.data[j * order + k];
      inverseDiagonal += (loading * loading) / eigen.values[k];
    }
    // Mathematically VIF >= 1; a rounding shortfall (1 − 1e-16) is not a negative R².
    const vif = Math.max(1, inverseDiagonal);
    items.push({ vif, tolerance: 1 / vif, r2: 1 - 1 / vif, topPartner: partners[j] });
  }
  const notices = exactDependencyNotices(groups, 'their VIF is infinite and is reported as null');
  return { items, exactDependencies: groups, notices };
}

/**
 * VIF, tolerance and R² of every item from R⁻¹ already at hand (the diagonal), for a matrix known
 * to be positive definite and well conditioned (no exact dependency); top partners as
 * `varianceInflation` finds them. Equal to `varianceInflation` up to the inverse's rounding
 * (tests/unit/cholesky-inverse.test.ts).
 * @param correlation Correlation matrix (positive definite).
 * @param inverse Its inverse, of the same order.
 * @throws {RangeError} when the orders differ or the matrix is not a correlation matrix.
 * @returns As `varianceInflation`, with no exact dependency and no notice.
 * References: Marquardt 1970 (VIF_j = [R⁻¹]_jj).
 */
export function varianceInflationFromInverse(correlation: SquareMatrix, inverse: SquareMatrix): VarianceInflationResult {
  checkCorrelationMatrix(correlation, 'varianceInflationFromInverse');
  const order = correlation.order;
  if (inverse.order !== order) throw new RangeError(`varianceInflationFromInverse: the inverse has order ${inverse.order}, the matrix ${order}`);
  const partners = strongestPartners(correlation);
  const items: ItemVarianceInflation[] = partners.map((topPartner, j) => {
    // Mathematically VIF >= 1; a rounding shortfall (1 − 1e-16) is not a negative R².
    const vif = Math.max(1, inverse.data[j * order + j]);
    return { vif, tolerance: 1 / vif, r2: 1 - 1 / vif, topPartner };
  });
  return { items, exactDependencies: [], notices: [] };
}

/** For each item, the other item with the largest |r| (lower index on ties). */
function strongestPartners(correlation: SquareMatrix): (TopPartner | null)[] {
  const { order, data } = correlation;
  const partners: (TopPartner | null)[] = [];
  for (let j = 0; j < order; j++) {
    let best: TopPartner | null = null;
    for (let k = 0; k < order; k++) {
      if (k === j) continue;
      const r = data[j * order + k];
      if (best === null || Math.abs(r) > Math.abs(best.r)) best = { index: k, r };
    }
    partners.push(best);
  }
  return partners;
}
