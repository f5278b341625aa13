/**
 * VIF, tolerance, R², exact dependencies, eigenvalues and the condition number of the evidence's
 * correlation matrix, in items[] order: from one eigen-decomposition (`inflationAndSpectrum`), or,
 * for bootstrap resamples, from the eigenvalues and a Cholesky inverse (`inflationWithInverse`).
 */
import { choleskyInverse } from '../stats/cholesky-inverse';
import { conditionNumber } from '../stats/condition-number';
import { spectralInverse, summarizeSpectrum } from '../stats/spectral-inverse';
import { symmetricEigen, symmetricEigenvalues, type SymmetricEigenDecomposition } from '../stats/symmetric-eigen';
import type { SquareMatrix } from '../stats/types';
import { varianceInflation, varianceInflationFromInverse, type VarianceInflationResult } from '../stats/variance-inflation';
import { warningsFromNotices } from './notice-warnings';
import type { EngineItem, EngineWarning } from './types';

/**
 * Largest condition number (λmax / λmin) at which `inverse` is returned: the Schur-complement
 * VIF from it then agrees with a fresh decomposition to about κ·ε ≈ 1e-10 relative. House figure.
 */
export const INVERSE_MAX_CONDITION = 1e6;

/** VIF, tolerance, R², exact dependencies, eigenvalues and condition number (one decomposition). */
export interface InflationAndSpectrum {
  readonly vif: (number | null)[];
  readonly tolerance: (number | null)[];
  readonly r2: (number | null)[];
  /** Each usable item's strongest partner by |r| (index into items[]), null outside the matrix. */
  readonly topPartner: ({ readonly index: number; readonly r: number } | null)[];
  readonly exactDependencies: number[][];
  readonly eigenvalues: number[];
  readonly conditionNumber: number | null;
  readonly warnings: EngineWarning[];
  /** The decomposition behind them. */
  readonly eigen: SymmetricEigenDecomposition;
}

/**
 * VIF / tolerance / R² of every usable item and the spectrum of the correlation matrix, from one
 * eigen-decomposition; per-item arrays in items[] order (null outside the matrix).
 * @param correlation Correlation matrix over `usable` (positive semi-definite).
 * @param items All items.
 * @param usable Indices into items[] of the matrix's items.
 * @throws {RangeError} when the matrix is not a correlation matrix of order `usable.length`.
 * @returns The figures with warnings (exact dependencies, a singular matrix).
 * References: Marquardt 1970, "Generalized inverses, ridge regression, biased linear estimation,
 * and nonlinear estimation"; Belsley, Kuh & Welsch 1980, "Regression Diagnostics", ch. 3.
 */
export function inflationAndSpectrum(correlation: SquareMatrix, items: readonly EngineItem[], usable: readonly number[]): InflationAndSpectrum {
  if (correlation.order !== usable.length) throw new RangeError(`inflationAndSpectrum: matrix of order ${correlation.order} for ${usable.length} usable items`);
  const eigen = symmetricEigen(correlation);
  const inflation = varianceInflation(correlation, { eigen });
  return { ...inflationFigures(correlation, items, usable, inflation, eigen.values), eigen };
}

/**
 * As `inflationAndSpectrum`, with R⁻¹ when R is well conditioned (bootstrap resamples, for the
 * VIF after removal by Schur complement), computed without eigenvectors where it can be: the
 * eigenvalues alone (the same values, bit for bit, as the decomposition's) give the spectrum,
 * the condition number and the check; when every eigenvalue is positive and λmax / λmin ≤
 * INVERSE_MAX_CONDITION (so no exact dependency), R⁻¹ comes from the Cholesky factor and the VIFs
 * are its diagonal (equal to the eigen path's up to rounding, order κ·ε). Otherwise the eigen
 * path runs as before and R⁻¹ is null.
 * @param correlation Correlation matrix over `usable` (positive semi-definite).
 * @param items All items.
 * @param usable Indices into items[] of the matrix's items.
 * @param eigenvalues The matrix's eigenvalues (descending, `symmetricEigenvalues`) when already
 *   at hand (the correlation's indefiniteness check), else computed here.
 * @throws {RangeError} as `inflationAndSpectrum`, or when the eigenvalues do not match the order.
 * @returns The figures of `inflationAndSpectrum` (without the decomposition) and `inverse`.
 * References: Marquardt 1970 (VIF); Golub & Van Loan 2013, §4.2 (Cholesky).
 */
export function inflationWithInverse(
  correlation: SquareMatrix,
  items: readonly EngineItem[],
  usable: readonly number[],
  eigenvalues?: Float64Array,
): Omit<InflationAndSpectrum, 'eigen'> & { readonly inverse: SquareMatrix | null } {
  if (correlation.order !== usable.length) throw new RangeError(`inflationWithInverse: matrix of order ${correlation.order} for ${usable.length} usable items`);
  if (eigenvalues !== undefined && eigenvalues.length !== correlation.order) throw new RangeError(`inflationWithInverse: ${eigenvalues.length} eigenvalues for a matrix of order ${correlation.order}`);
  const values = eigenvalues ?? symmetricEigenvalues(correlation);
  const order = values.length;
  if (order > 0 && !summarizeSpectrum(values).singular && values[order - 1] > 0 && values[0] / values[order - 1] <= INVERSE_MAX_CONDITION) {
    const inverse = choleskyInverse(correlation);
    if (inverse !== null) return { ...inflationFigures(correlation, items, usable, varianceInflationFromInverse(correlation, inverse), values), inverse };
  }
  const { eigen, ...figures } = inflationAndSpectrum(correlation, items, usable);
  return { ...figures, inverse: wellConditionedInverse(eigen) };
}

/** The per-item arrays (items[] order), spectrum, condition number and warnings of `inflationAndSpectrum`. */
function inflationFigures(
  correlation: SquareMatrix,
  items: readonly EngineItem[],
  usable: readonly number[],
  inflation: VarianceInflationResult,
  eigenvalues: Float64Array,
): Omit<InflationAndSpectrum, 'eigen'> {
  const condition = conditionNumber(correlation, { eigenvalues });
  const vif = new Array<number | null>(items.length).fill(null);
  const tolerance = new Array<number | null>(items.length).fill(null);
  const r2 = new Array<number | null>(items.length).fill(null);
  const topPartner = new Array<{ index: number; r: number } | null>(items.length).fill(null);
  inflation.items.forEach((entry, k) => {
    vif[usable[k]] = entry.vif;
    tolerance[usable[k]] = entry.tolerance;
    r2[usable[k]] = entry.r2;
    topPartner[usable[k]] = entry.topPartner === null ? null : { index: usable[entry.topPartner.index], r: entry.topPartner.r };
  });
  return {
    vif,
    tolerance,
    r2,
    topPartner,
    exactDependencies: inflation.exactDependencies.map((group) => group.map((k) => usable[k])),
    eigenvalues: Array.from(eigenvalues),
    conditionNumber: condition.value,
    warnings: [...warningsFromNotices(inflation.notices, items, usable), ...warningsFromNotices(condition.notices, items, usable)],
  };
}

/** R⁻¹ (the core's spectral inverse) when every eigenvalue is positive and λmax / λmin ≤ INVERSE_MAX_CONDITION, else null. */
function wellConditionedInverse(eigen: SymmetricEigenDecomposition): SquareMatrix | null {
  const { order, values } = eigen;
  if (order === 0 || !(values[order - 1] > 0) || values[0] / values[order - 1] > INVERSE_MAX_CONDITION) return null;
  return spectralInverse(eigen);
}
