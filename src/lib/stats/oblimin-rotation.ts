/**
 * Direct oblimin rotation (γ = 0, quartimin) of a factor loading matrix by the gradient projection
 * algorithm for oblique rotations, as GPArotation::oblimin computes it (GPFoblq with
 * vgQ.oblimin, no Kaiser normalisation, started at the identity).
 *
 * The criterion of the pattern loadings Λ = A (Tᵀ)⁻¹ is Q(Λ) = ¼ Σ (Λ∘Λ) ∘ ((Λ∘Λ) N), N = 11ᵀ − I
 * (each item's squared loadings multiplied across different factors): it is small when every
 * item loads on one factor. T has columns of unit length and Φ = TᵀT is the factor correlation
 * matrix. Each step moves T against the gradient projected on the unit-column constraint, with a
 * step halved until the criterion falls enough (Armijo), as GPFoblq does; it stops when the
 * projected gradient's norm is below OBLIMIN_GRADIENT_TOLERANCE (GPArotation's default is 1e-5),
 * or when no step lowers the criterion any more (the rounding floor; settled when the gradient is
 * below OBLIMIN_STALL_TOLERANCE).
 *
 * Sign and order: as the algorithm leaves them (the identity start keeps the unrotated order);
 * the caller may reorder or reflect factors (a reflection flips a column of Λ and the matching
 * row and column of Φ).
 *
 * References: Jennrich 2002, "A simple general method for oblique rotation" (Psychometrika
 * 67:7-19); Bernaards & Jennrich 2005, "Gradient projection algorithms and software for arbitrary
 * rotation criteria in factor analysis" (Educational and Psychological Measurement 65:676-696);
 * Carroll 1957 / Jennrich & Sampson 1966 (direct quartimin).
 */
import { OBLIMIN_GRADIENT_TOLERANCE, OBLIMIN_MAX_ITERATIONS, OBLIMIN_STALL_TOLERANCE } from './tolerances';
import type { NumericalNotice } from './types';

/** An oblique solution. Matrices are row-major. */
export interface ObliminResult {
  readonly items: number;
  readonly factors: number;
  /** Pattern loadings Λ, items × factors. */
  readonly loadings: Float64Array;
  /** Factor correlations Φ = TᵀT, factors × factors (unit diagonal). */
  readonly factorCorrelations: Float64Array;
  /** Structure loadings ΛΦ (correlations of items with factors), items × factors. */
  readonly structure: Float64Array;
  /** The rotation T (unit columns), factors × factors. */
  readonly rotation: Float64Array;
  readonly criterion: number;
  readonly iterations: number;
  readonly converged: boolean;
  readonly notices: readonly NumericalNotice[];
}

/**
 * Oblimin (γ = 0) rotation of unrotated loadings.
 * @param loadings unrotated loadings, row-major items × factors, finite; not modified.
 * @param items number of items (rows).
 * @param factors number of factors (columns), at least 2.
 * @throws {RangeError} when the sizes do not match, there are fewer than two factors, or a loading is not finite.
 * @returns pattern loadings, factor correlations, structure, the rotation and convergence.
 * References: Bernaards & Jennrich 2005 (GPFoblq); Jennrich 2002.
 */
export function obliminRotation(loadings: ArrayLike<number>, items: number, factors: number): ObliminResult {
  if (!Number.isInteger(items) || !Number.isInteger(factors) || factors < 2 || items < factors) {
    throw new RangeError(`obliminRotation: need at least two factors and as many items, got ${items} items × ${factors} factors`);
  }
  if (loadings.length !== items * factors) throw new RangeError(`obliminRotation: ${loadings.length} loadings for ${items} × ${factors}`);
  for (let i = 0; i < loadings.length; i++) if (!Number.isFinite(loadings[i])) throw new RangeError(`obliminRotation: loading ${i} is not finite`);
  const A = Float64Array.from(loadings);
  const k = factors;
  let T = identity(k);
  let { value: f, pattern: L, gradient } = evaluate(A, T, items, k);
  let alpha = 1;
  let iterations = 0;
  let converged = false;
  for (; iterations <= OBLIMIN_MAX_ITERATIONS; iterations++) {
    // Gp = G − T diag(colSums(T ∘ G)): the gradient projected on the unit-column constraint.
    const projected = new Float64Array(k * k);
    for (let c = 0; c < k; c++) {
      let dot = 0;
      for (let r = 0; r < k; r++) dot += T[r * k + c] * gradient[r * k + c];
      for (let r = 0; r < k; r++) projected[r * k + c] = gradient[r * k + c] - T[r * k + c] * dot;
    }
    let norm = 0;
    for (let i = 0; i < k * k; i++) norm += projected[i] ** 2;
    const s = Math.sqrt(norm);
    if (s < OBLIMIN_GRADIENT_TOLERANCE) {
      converged = true;
      break;
    }
    alpha *= 2;
    let next = T;
    let trial = { value: f, pattern: L, gradient };
    let lowered = false;
    for (let halving = 0; halving <= 10; halving++) {
      const X = new Float64Array(k * k);
      for (let i = 0; i < k * k; i++) X[i] = T[i] - alpha * projected[i];
      for (let c = 0; c < k; c++) {
        let length = 0;
        for (let r = 0; r < k; r++) length += X[r * k + c] ** 2;
        const scale = 1 / Math.sqrt(length);
        for (let r = 0; r < k; r++) X[r * k + c] *= scale;
      }
      next = X;
      trial = evaluate(A, X, items, k);
      if (trial.value < f) lowered = true;
      if (f - trial.value > 0.5 * s * s * alpha) break;
      alpha /= 2;
    }
    if (!lowered) {
      // No step lowers the criterion any more: the rounding floor of the arithmetic is reached
      // (GPFoblq would go on with ever smaller steps until maxit). Settled if the gradient is small.
      converged = s < OBLIMIN_STALL_TOLERANCE;
      break;
    }
    T = next;
    f = trial.value;
    L = trial.pattern;
    gradient = trial.gradient;
  }
  const phi = new Float64Array(k * k);
  for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) {
    let sum = 0;
    for (let r = 0; r < k; r++) sum += T[r * k + a] * T[r * k + b];
    phi[a * k + b] = sum;
  }
  const structure = new Float64Array(items * k);
  for (let i = 0; i < items; i++) for (let b = 0; b < k; b++) {
    let sum = 0;
    for (let a = 0; a < k; a++) sum += L[i * k + a] * phi[a * k + b];
    structure[i * k + b] = sum;
  }
  const notices: NumericalNotice[] = converged
    ? []
    : [{ code: 'not-converged', items: [], message: `Oblimin rotation did not settle within ${OBLIMIN_MAX_ITERATIONS} steps; the loadings are the last iterate.` }];
  return { items, factors: k, loadings: L, factorCorrelations: phi, structure, rotation: T, criterion: f, iterations, converged, notices };
}

/** Criterion, pattern loadings Λ = A (Tᵀ)⁻¹ and the gradient with respect to T, −(Λᵀ Gq T⁻¹)ᵀ. */
function evaluate(A: Float64Array, T: Float64Array, items: number, k: number): { value: number; pattern: Float64Array; gradient: Float64Array } {
  const inverse = invert(T, k);
  // Λ = A · (T⁻¹)ᵀ
  const L = new Float64Array(items * k);
  for (let i = 0; i < items; i++) for (let c = 0; c < k; c++) {
    let sum = 0;
    for (let m = 0; m < k; m++) sum += A[i * k + m] * inverse[c * k + m];
    L[i * k + c] = sum;
  }
  // vgQ.oblimin (γ = 0): X = (Λ∘Λ) N, Gq = Λ ∘ X, f = Σ Λ² ∘ X / 4.
  const Gq = new Float64Array(items * k);
  let value = 0;
  for (let i = 0; i < items; i++) {
    let rowSquares = 0;
    for (let c = 0; c < k; c++) rowSquares += L[i * k + c] ** 2;
    for (let c = 0; c < k; c++) {
      const square = L[i * k + c] ** 2;
      const others = rowSquares - square;
      Gq[i * k + c] = L[i * k + c] * others;
      value += square * others;
    }
  }
  value /= 4;
  // G = −(Λᵀ Gq T⁻¹)ᵀ
  const LtGq = new Float64Array(k * k);
  for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) {
    let sum = 0;
    for (let i = 0; i < items; i++) sum += L[i * k + a] * Gq[i * k + b];
    LtGq[a * k + b] = sum;
  }
  const gradient = new Float64Array(k * k);
  for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) {
    let sum = 0;
    for (let m = 0; m < k; m++) sum += LtGq[a * k + m] * inverse[m * k + b];
    gradient[b * k + a] = -sum;
  }
  return { value, pattern: L, gradient };
}

function identity(k: number): Float64Array {
  const I = new Float64Array(k * k);
  for (let i = 0; i < k; i++) I[i * k + i] = 1;
  return I;
}

/** Inverse of a small square matrix by Gauss-Jordan elimination with partial pivoting. */
function invert(matrix: Float64Array, k: number): Float64Array {
  const a = Float64Array.from(matrix);
  const inverse = identity(k);
  for (let c = 0; c < k; c++) {
    let pivot = c;
    for (let r = c + 1; r < k; r++) if (Math.abs(a[r * k + c]) > Math.abs(a[pivot * k + c])) pivot = r;
    if (a[pivot * k + c] === 0) throw new RangeError('obliminRotation: the rotation became singular (two factors coincide)');
    if (pivot !== c) {
      for (let m = 0; m < k; m++) {
        [a[c * k + m], a[pivot * k + m]] = [a[pivot * k + m], a[c * k + m]];
        [inverse[c * k + m], inverse[pivot * k + m]] = [inverse[pivot * k + m], inverse[c * k + m]];
      }
    }
    const scale = 1 / a[c * k + c];
    for (let m = 0; m < k; m++) {
      a[c * k + m] *= scale;
      inverse[c * k + m] *= scale;
    }
    for (let r = 0; r < k; r++) {
      if (r === c) continue;
      const factor = a[r * k + c];
      if (factor === 0) continue;
      for (let m = 0; m < k; m++) {
        a[r * k + m] -= factor * a[c * k + m];
        inverse[r * k + m] -= factor * inverse[c * k + m];
      }
    }
  }
  return inverse;
}
