/**
 * Detection and repair of an indefinite correlation matrix (one with a negative eigenvalue, as a
 * pairwise-deletion matrix can be). Two repairs:
 * - `clip`: set every eigenvalue below a small floor to the floor, rebuild, and rescale to a unit
 *   diagonal (`D^{-1/2} X D^{-1/2}`). One decomposition; not the nearest matrix, but close.
 * - `higham`: the nearest correlation matrix in the Frobenius norm, by alternating projections
 *   onto the matrices whose eigenvalues are at least the floor and onto the unit-diagonal
 *   matrices, with Dykstra's correction; a final clip-and-rescale step makes sure the floor holds.
 * The floor (REPAIR_EIGENVALUE_FLOOR by default) keeps the repaired matrix invertible, so VIF and
 * KMO exist for it.
 *
 * A matrix counts as indefinite when its smallest eigenvalue is below
 * −EXACT_DEPENDENCY_RELATIVE_EIGENVALUE × the largest; a rounding-level negative eigenvalue of a
 * singular matrix is an exact dependency, not something to repair.
 *
 * References: Higham 2002, "Computing the nearest correlation matrix - a problem from finance"
 * (IMA Journal of Numerical Analysis 22:329-343); Dykstra 1983, "An algorithm for restricted
 * least squares regression" (JASA 78:837-842); Rousseeuw & Molenberghs 1993, "Transformation of
 * non positive semidefinite correlation matrices" (Communications in Statistics - Theory and
 * Methods 22:965-984), for eigenvalue clipping.
 */
import { checkCorrelationMatrix } from './correlation-input';
import { summarizeSpectrum } from './spectral-inverse';
import { symmetricEigen, symmetricEigenvalues } from './symmetric-eigen';
import { NEAREST_CORRELATION_MAX_ITERATIONS, NEAREST_CORRELATION_TOLERANCE, REPAIR_EIGENVALUE_FLOOR } from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** How an indefinite correlation matrix is repaired. */
export type CorrelationRepairMethod = 'clip' | 'higham';

/** Options of `repairCorrelationMatrix`. */
export interface CorrelationRepairOptions {
  /** `higham` (default) or `clip`. */
  readonly method?: CorrelationRepairMethod;
  /** Smallest eigenvalue the repaired matrix keeps (default REPAIR_EIGENVALUE_FLOOR), in [0, 1). */
  readonly eigenvalueFloor?: number;
  /** Higham: sweep limit (default NEAREST_CORRELATION_MAX_ITERATIONS). */
  readonly maxIterations?: number;
  /** Higham: relative change per sweep at which to stop (default NEAREST_CORRELATION_TOLERANCE). */
  readonly tolerance?: number;
}

/** The result of `repairCorrelationMatrix`. */
export interface CorrelationRepairResult {
  /** The repaired matrix, or a copy of the input when it needed no repair. */
  readonly matrix: SquareMatrix;
  /** True when the input was indefinite and has been changed. */
  readonly repaired: boolean;
  /** The method used (null when nothing was repaired). */
  readonly method: CorrelationRepairMethod | null;
  /** Smallest eigenvalue of the input. */
  readonly smallestEigenvalueBefore: number;
  /** All eigenvalues of the input (descending), as `symmetricEigenvalues` gives them. */
  readonly eigenvaluesBefore: Float64Array;
  /** Smallest eigenvalue of the returned matrix. */
  readonly smallestEigenvalueAfter: number;
  /** Frobenius norm of (returned − input): how much was changed overall. */
  readonly frobeniusChange: number;
  /** Largest absolute change in any element. */
  readonly largestChange: number;
  /** Higham sweeps used (0 for `clip` or no repair). */
  readonly iterations: number;
  /** False only when Higham's sweeps hit the limit (the result is still a valid correlation matrix). */
  readonly converged: boolean;
  /** `matrix-repaired` when repaired; `repair-not-converged` when the sweep limit was hit. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Detects an indefinite correlation matrix and, if it is one, repairs it.
 * @param correlation Square, symmetric, unit-diagonal matrix (e.g. from pairwise deletion). Not modified.
 * @param options Method, eigenvalue floor, and Higham's sweep limit and tolerance.
 * @throws {RangeError} when the matrix is not a correlation matrix in shape.
 * @throws {RangeError} when the floor is not in [0, 1), the sweep limit not a positive integer or
 *   the tolerance not positive.
 * @returns The matrix to use (repaired or an unchanged copy), whether and how much it changed,
 *   and notices.
 * References: Higham 2002, "Computing the nearest correlation matrix - a problem from finance";
 * Rousseeuw & Molenberghs 1993, "Transformation of non positive semidefinite correlation matrices".
 */
export function repairCorrelationMatrix(correlation: SquareMatrix, options: CorrelationRepairOptions = {}): CorrelationRepairResult {
  checkCorrelationMatrix(correlation, 'repairCorrelationMatrix');
  const method = options.method ?? 'higham';
  const floor = options.eigenvalueFloor ?? REPAIR_EIGENVALUE_FLOOR;
  const maxIterations = options.maxIterations ?? NEAREST_CORRELATION_MAX_ITERATIONS;
  const tolerance = options.tolerance ?? NEAREST_CORRELATION_TOLERANCE;
  if (method !== 'clip' && method !== 'higham') throw new RangeError(`repairCorrelationMatrix: unknown method ${String(method)}`);
  if (!(floor >= 0 && floor < 1)) throw new RangeError(`repairCorrelationMatrix: eigenvalueFloor must lie in [0, 1), got ${floor}`);
  if (!Number.isInteger(maxIterations) || maxIterations < 1) throw new RangeError(`repairCorrelationMatrix: maxIterations must be a positive integer, got ${maxIterations}`);
  if (!(tolerance > 0)) throw new RangeError(`repairCorrelationMatrix: tolerance must be positive, got ${tolerance}`);

  const { order } = correlation;
  const eigenvaluesBefore = symmetricEigenvalues(correlation);
  const before = summarizeSpectrum(eigenvaluesBefore);
  if (!before.indefinite) {
    return {
      matrix: { order, data: Float64Array.from(correlation.data) },
      repaired: false,
      method: null,
      smallestEigenvalueBefore: before.smallest,
      eigenvaluesBefore,
      smallestEigenvalueAfter: before.smallest,
      frobeniusChange: 0,
      largestChange: 0,
      iterations: 0,
      converged: true,
      notices: [],
    };
  }

  let repairedData: Float64Array;
  let iterations = 0;
  let converged = true;
  if (method === 'clip') {
    repairedData = clipAndRescale(correlation, floor);
  } else {
    const outcome = alternatingProjections(correlation, floor, maxIterations, tolerance);
    iterations = outcome.iterations;
    converged = outcome.converged;
    const settled: SquareMatrix = { order, data: outcome.data };
    repairedData = symmetricEigenvalues(settled)[order - 1] < floor ? clipAndRescale(settled, floor) : outcome.data;
  }
  const matrix: SquareMatrix = { order, data: repairedData };
  const after = symmetricEigenvalues(matrix);

  let sumOfSquares = 0;
  let largestChange = 0;
  for (let index = 0; index < repairedData.length; index++) {
    const change = Math.abs(repairedData[index] - correlation.data[index]);
    sumOfSquares += change * change;
    largestChange = Math.max(largestChange, change);
  }
  const frobeniusChange = Math.sqrt(sumOfSquares);
  const everyItem = Array.from({ length: order }, (_, j) => j);
  const notices: NumericalNotice[] = [
    {
      code: 'matrix-repaired',
      items: everyItem,
      message: `The correlation matrix was not positive semi-definite (smallest eigenvalue ${before.smallest.toPrecision(3)}) and was repaired by ${method === 'clip' ? 'eigenvalue clipping' : "Higham's nearest correlation matrix"}; the largest change to a correlation is ${largestChange.toPrecision(3)}.`,
    },
  ];
  if (!converged) {
    notices.push({
      code: 'repair-not-converged',
      items: everyItem,
      message: `The nearest-correlation iteration stopped after ${iterations} sweeps without settling; the result is a valid correlation matrix but may not be the nearest one.`,
    });
  }
  return {
    matrix,
    repaired: true,
    method,
    smallestEigenvalueBefore: before.smallest,
    eigenvaluesBefore,
    smallestEigenvalueAfter: after[order - 1],
    frobeniusChange,
    largestChange,
    iterations,
    converged,
    notices,
  };
}

/** V · max(Λ, floor) · Vᵀ, then scaled to a unit diagonal (symmetric, exactly 1 on the diagonal). */
function clipAndRescale(matrix: SquareMatrix, floor: number): Float64Array {
  const clipped = projectOntoFloor(matrix.data, matrix.order, floor);
  const { order } = matrix;
  const scale = new Float64Array(order);
  for (let i = 0; i < order; i++) scale[i] = 1 / Math.sqrt(clipped[i * order + i]);
  for (let i = 0; i < order; i++) {
    clipped[i * order + i] = 1;
    for (let j = i + 1; j < order; j++) {
      const value = Math.max(-1, Math.min(1, clipped[i * order + j] * scale[i] * scale[j]));
      clipped[i * order + j] = value;
      clipped[j * order + i] = value;
    }
  }
  return clipped;
}

/** Projection onto the symmetric matrices whose eigenvalues are all at least `floor`. */
function projectOntoFloor(data: Float64Array, order: number, floor: number): Float64Array {
  const eigen = symmetricEigen({ order, data });
  const vectors = eigen.vectors.data;
  const scaled = new Float64Array(order * order);
  for (let i = 0; i < order; i++) {
    for (let k = 0; k < order; k++) scaled[i * order + k] = vectors[i * order + k] * Math.max(eigen.values[k], floor);
  }
  const out = new Float64Array(order * order);
  for (let i = 0; i < order; i++) {
    for (let j = i; j < order; j++) {
      let sum = 0;
      for (let k = 0; k < order; k++) sum += scaled[i * order + k] * vectors[j * order + k];
      out[i * order + j] = sum;
      out[j * order + i] = sum;
    }
  }
  return out;
}

/** Higham 2002, algorithm 3.3 (W = I), with the eigenvalue floor in the first projection. */
function alternatingProjections(
  matrix: SquareMatrix,
  floor: number,
  maxIterations: number,
  tolerance: number,
): { data: Float64Array; iterations: number; converged: boolean } {
  const { order } = matrix;
  const size = order * order;
  let y: Float64Array = Float64Array.from(matrix.data);
  let x: Float64Array = new Float64Array(size);
  const correction = new Float64Array(size);
  const r = new Float64Array(size);
  for (let iteration = 1; iteration <= maxIterations; iteration++) {
    for (let index = 0; index < size; index++) r[index] = y[index] - correction[index];
    const nextX = projectOntoFloor(r, order, floor);
    for (let index = 0; index < size; index++) correction[index] = nextX[index] - r[index];
    const nextY = Float64Array.from(nextX);
    for (let i = 0; i < order; i++) nextY[i * order + i] = 1;

    const changeX = relativeDifference(nextX, x, nextX);
    const changeY = relativeDifference(nextY, y, nextY);
    const gap = relativeDifference(nextY, nextX, nextY);
    x = nextX;
    y = nextY;
    if (Math.max(changeX, changeY, gap) <= tolerance) return { data: y, iterations: iteration, converged: true };
  }
  return { data: y, iterations: maxIterations, converged: false };
}

/** ‖a − b‖_F / ‖scale‖_F. */
function relativeDifference(a: Float64Array, b: Float64Array, scale: Float64Array): number {
  let difference = 0;
  let norm = 0;
  for (let index = 0; index < a.length; index++) {
    difference += (a[index] - b[index]) ** 2;
    norm += scale[index] ** 2;
  }
  return Math.sqrt(difference / norm);
}
