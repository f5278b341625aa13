/**
 * What the eigenvalues of a symmetric positive semi-definite matrix say about its inverse:
 * whether it is singular or indefinite, which items make up its null space (exact linear
 * dependencies), and the (pseudo-)inverse `Σ v_k v_kᵀ / λ_k` over the non-null eigenvalues.
 *
 * References: Penrose 1955, "A generalized inverse for matrices" (Proc. Cambridge Phil. Soc.
 * 51:406-413); Golub & Van Loan 2013, "Matrix Computations", 4th ed., §5.5 (rank and the null
 * space from a spectral decomposition).
 */
import type { SymmetricEigenDecomposition } from './symmetric-eigen';
import { EXACT_DEPENDENCY_RELATIVE_EIGENVALUE, NULL_SPACE_MEMBERSHIP } from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** How the spectrum of a symmetric matrix stands. */
export interface SpectrumSummary {
  readonly largest: number;
  readonly smallest: number;
  /** Eigenvalues within ±EXACT_DEPENDENCY_RELATIVE_EIGENVALUE × largest of zero. */
  readonly nullCount: number;
  /** True when an eigenvalue lies below −EXACT_DEPENDENCY_RELATIVE_EIGENVALUE × largest. */
  readonly indefinite: boolean;
  /** True when at least one eigenvalue counts as zero or the matrix is indefinite. */
  readonly singular: boolean;
  /** The absolute threshold used: EXACT_DEPENDENCY_RELATIVE_EIGENVALUE × largest. */
  readonly threshold: number;
}

/**
 * Classifies the eigenvalues of a symmetric matrix against EXACT_DEPENDENCY_RELATIVE_EIGENVALUE.
 * @param values Eigenvalues in descending order (as `symmetricEigen` returns them).
 * @throws {RangeError} when there are no values, one is not finite, or they are not descending.
 * @returns The largest and smallest eigenvalues, how many count as zero, and whether the matrix
 *   is singular or indefinite.
 * References: Golub & Van Loan 2013, "Matrix Computations", 4th ed., §5.5.
 */
export function summarizeSpectrum(values: ArrayLike<number>): SpectrumSummary {
  if (values.length < 1) throw new RangeError('summarizeSpectrum: at least one eigenvalue is required');
  for (let k = 0; k < values.length; k++) {
    if (!Number.isFinite(values[k])) throw new RangeError(`summarizeSpectrum: eigenvalue ${k} is not finite`);
    if (k > 0 && values[k] > values[k - 1]) throw new RangeError('summarizeSpectrum: eigenvalues must be in descending order');
  }
  const largest = values[0];
  const smallest = values[values.length - 1];
  const threshold = EXACT_DEPENDENCY_RELATIVE_EIGENVALUE * Math.max(Math.abs(largest), Number.MIN_VALUE);
  let nullCount = 0;
  for (let k = 0; k < values.length; k++) if (Math.abs(values[k]) <= threshold) nullCount++;
  const indefinite = smallest < -threshold;
  return { largest, smallest, nullCount, indefinite, singular: indefinite || nullCount > 0, threshold };
}

/**
 * Groups of items that are exactly linearly dependent: the items with a non-zero row in the
 * null-space projector `P = N Nᵀ` (N the eigenvectors of the zero eigenvalues), linked into one
 * group when they share a non-zero element of P. P does not depend on which basis of the null
 * space the solver returned, so two separate dependencies stay two groups.
 * @param eigen A symmetric eigen-decomposition (eigenvalues descending).
 * @returns The groups (0-based item indices, ascending; groups ordered by their first item);
 *   empty when no eigenvalue counts as zero.
 * References: Golub & Van Loan 2013, "Matrix Computations", 4th ed., §5.5.
 */
export function exactDependencyGroups(eigen: SymmetricEigenDecomposition): number[][] {
  const { order, values, vectors } = eigen;
  const summary = summarizeSpectrum(values);
  const nullIndices: number[] = [];
  for (let k = 0; k < order; k++) if (Math.abs(values[k]) <= summary.threshold) nullIndices.push(k);
  if (nullIndices.length === 0) return [];

  const link = NULL_SPACE_MEMBERSHIP * NULL_SPACE_MEMBERSHIP;
  const projector = (i: number, j: number): number => {
    let sum = 0;
    for (const k of nullIndices) sum += vectors.data[i * order + k] * vectors.data[j * order + k];
    return sum;
  };
  const members: number[] = [];
  for (let i = 0; i < order; i++) if (projector(i, i) >= link) members.push(i);

  const group = new Map<number, number>();
  const groups: number[][] = [];
  for (const start of members) {
    if (group.has(start)) continue;
    const current: number[] = [];
    const pending = [start];
    group.set(start, groups.length);
    while (pending.length > 0) {
      const item = pending.pop() as number;
      current.push(item);
      for (const other of members) {
        if (!group.has(other) && Math.abs(projector(item, other)) >= link) {
          group.set(other, groups.length);
          pending.push(other);
        }
      }
    }
    groups.push(current.sort((a, b) => a - b));
  }
  return groups;
}

/**
 * One `exact-dependency` notice per group of exactly dependent items.
 * @param groups As returned by `exactDependencyGroups`.
 * @param consequence What the dependency makes impossible, completing the sentence.
 * @returns The notices, in the order of the groups.
 * References: Marquardt 1970, "Generalized inverses, ridge regression, biased linear estimation,
 * and nonlinear estimation" (Technometrics 12:591-612).
 */
export function exactDependencyNotices(groups: readonly (readonly number[])[], consequence: string): NumericalNotice[] {
  return groups.map((items) => ({
    code: 'exact-dependency',
    items: [...items],
    message: `Items at columns ${items.join(', ')} are exactly linearly dependent (each is a linear combination of the others); ${consequence}.`,
  }));
}

/**
 * The inverse `Σ_k v_k v_kᵀ / λ_k` of a non-singular symmetric matrix from its eigen-decomposition.
 * @param eigen A symmetric eigen-decomposition (eigenvalues descending).
 * @returns The inverse (row-major, symmetric), or null when the matrix is singular or indefinite
 *   (see `summarizeSpectrum`).
 * References: Penrose 1955, "A generalized inverse for matrices".
 */
export function spectralInverse(eigen: SymmetricEigenDecomposition): SquareMatrix | null {
  if (summarizeSpectrum(eigen.values).singular) return null;
  const { order, values, vectors } = eigen;
  const scaled = new Float64Array(order * order);
  for (let i = 0; i < order; i++) {
    for (let k = 0; k < order; k++) scaled[i * order + k] = vectors.data[i * order + k] / values[k];
  }
  const inverse = new Float64Array(order * order);
  for (let i = 0; i < order; i++) {
    const rowI = i * order;
    for (let j = i; j < order; j++) {
      const rowJ = j * order;
      let sum = 0;
      for (let k = 0; k < order; k++) sum += scaled[rowI + k] * vectors.data[rowJ + k];
      inverse[rowI + j] = sum;
      inverse[rowJ + i] = sum;
    }
  }
  return { order, data: inverse };
}
