/**
 * Condition number of the item correlation matrix, `sqrt(λ_max / λ_min)`: the largest condition
 * index of the centred, standardised data, one figure for how close the items come to a linear
 * dependency. It is the same whichever way an item is keyed.
 *
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics: Identifying Influential Data
 * and Sources of Collinearity", ch. 3; Belsley 1991, "Conditioning Diagnostics: Collinearity and
 * Weak Data in Regression".
 */
import { checkCorrelationMatrix } from './correlation-input';
import { summarizeSpectrum } from './spectral-inverse';
import { symmetricEigenvalues } from './symmetric-eigen';
import type { NumericalNotice, SquareMatrix } from './types';

/** The result of `conditionNumber`. */
export interface ConditionNumberResult {
  /** `sqrt(λ_max / λ_min)`; null when the matrix is singular or indefinite (see notices). */
  readonly value: number | null;
  /** Largest eigenvalue of the matrix. */
  readonly largestEigenvalue: number;
  /** Smallest eigenvalue of the matrix (may be 0 or negative, hence the null value). */
  readonly smallestEigenvalue: number;
  /** `exact-dependency` when singular, `indefinite-matrix` when an eigenvalue is negative. */
  readonly notices: readonly NumericalNotice[];
}

/** Options of `conditionNumber`. */
export interface ConditionNumberOptions {
  /** The eigenvalues of the same matrix in descending order, when already known. Trusted. */
  readonly eigenvalues?: ArrayLike<number>;
}

/**
 * Condition number `sqrt(λ_max / λ_min)` of a correlation matrix.
 * @param correlation The item correlation matrix (square, symmetric, unit diagonal). Not modified.
 * @param options `eigenvalues`: its eigenvalues, descending, to save a decomposition.
 * @throws {RangeError} when the matrix is not a correlation matrix in shape.
 * @throws {RangeError} when `options.eigenvalues` has the wrong length or is not descending.
 * @returns The condition number, or null with a notice when the smallest eigenvalue is zero
 *   (within EXACT_DEPENDENCY_RELATIVE_EIGENVALUE of the largest) or negative.
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics", ch. 3.
 */
export function conditionNumber(correlation: SquareMatrix, options: ConditionNumberOptions = {}): ConditionNumberResult {
  checkCorrelationMatrix(correlation, 'conditionNumber');
  const values = options.eigenvalues ?? symmetricEigenvalues(correlation);
  if (values.length !== correlation.order) {
    throw new RangeError(`conditionNumber: ${values.length} eigenvalues given for a matrix of order ${correlation.order}`);
  }
  const summary = summarizeSpectrum(values);
  const base = { largestEigenvalue: summary.largest, smallestEigenvalue: summary.smallest };
  const everyItem = Array.from({ length: correlation.order }, (_, j) => j);
  if (summary.indefinite) {
    return {
      ...base,
      value: null,
      notices: [
        {
          code: 'indefinite-matrix',
          items: everyItem,
          message: `The correlation matrix has a negative eigenvalue (${summary.smallest.toPrecision(3)}), so its condition number does not exist; repair the matrix first.`,
        },
      ],
    };
  }
  if (summary.singular) {
    return {
      ...base,
      value: null,
      notices: [
        {
          code: 'exact-dependency',
          items: everyItem,
          message: `The correlation matrix is singular (${summary.nullCount} zero eigenvalue(s)), so its condition number is infinite and is reported as null.`,
        },
      ],
    };
  }
  return { ...base, value: Math.sqrt(summary.largest / summary.smallest), notices: [] };
}
