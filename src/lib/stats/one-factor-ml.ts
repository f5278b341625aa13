/**
 * Maximum likelihood estimation of the one-factor model `R = λλ' + Ψ` for a correlation matrix
 * (the fit of a scale's measurement model), with its fit: chi-square, RMSEA, CFI and SRMR.
 *
 * Jöreskog's concentration: for fixed uniquenesses Ψ the best loadings are
 * `λ = Ψ^½ ω √(θ₁ − 1)`, with θ₁, ω the largest eigenvalue and its vector of `Ψ^-½ R Ψ^-½`, and
 * the discrepancy left is `F(Ψ) = Σ_{m≥2} (θ_m − ln θ_m − 1)` over the other eigenvalues. F is
 * minimised over x = ln ψ by BFGS (gradient `(λ_j² + ψ_j − 1)/ψ_j`) with a backtracking line
 * search. The model is scale-free, so a correlation matrix gives the standardized solution a
 * covariance matrix would.
 *
 * Fit, as lavaan reports it for `estimator = "ML"` (normal likelihood, N in the chi-square):
 * `χ² = N·F`, `df = p(p − 3)/2`; the baseline (independence) model `χ²_b = −N ln|R|`,
 * `df_b = p(p − 1)/2`; `RMSEA = √(max(χ² − df, 0)/(df·N))`; `CFI = 1 − max(χ² − df, 0) /
 * max(χ² − df, χ²_b − df_b, 0)`; SRMR the root mean square of the residual correlations over
 * the p(p + 1)/2 cells of the lower triangle with its diagonal (Bentler's standardized version).
 */
import { choleskyInverse } from './cholesky-inverse';
import { symmetricEigen } from './symmetric-eigen';
import { checkSymmetricMatrix } from './symmetric-input';
import {
  ONE_FACTOR_ML_GRADIENT_TOLERANCE,
  ONE_FACTOR_ML_MAX_ITERATIONS,
  ONE_FACTOR_ML_STAGNATION,
  ONE_FACTOR_ML_UNIQUENESS_FLOOR,
} from './tolerances';
import type { NumericalNotice, SquareMatrix } from './types';

/** The fitted one-factor model and its fit. */
export interface OneFactorMlFit {
  /** Standardized loadings, one per item, signed so that their sum is positive. */
  readonly loadings: readonly number[];
  /** Uniquenesses ψ = 1 − λ² (at the floor for a Heywood case). */
  readonly uniquenesses: readonly number[];
  /** Residual correlations R − (λλ' + Ψ), row-major (0 on the diagonal at an interior optimum). */
  readonly residuals: SquareMatrix;
  /** The minimised discrepancy F_ML. */
  readonly discrepancy: number;
  readonly chiSquare: number;
  readonly degreesOfFreedom: number;
  /** RMSEA, null when df = 0 (a just-identified model, e.g. three items). */
  readonly rmsea: number | null;
  /** CFI, null when the baseline model fits perfectly (all correlations 0). */
  readonly cfi: number | null;
  readonly srmr: number;
  readonly baselineChiSquare: number;
  readonly baselineDegreesOfFreedom: number;
  readonly iterations: number;
  /** Evaluations of the concentrated discrepancy (one eigen-decomposition each), the start's included. */
  readonly evaluations: number;
  readonly converged: boolean;
  /** `heywood-case` (a uniqueness at the floor), `not-converged`. */
  readonly notices: readonly NumericalNotice[];
}

interface Concentrated {
  readonly value: number;
  readonly loadings: Float64Array;
}

/** F(Ψ) and the best loadings for Ψ = exp(x). */
function concentrated(correlation: SquareMatrix, x: Float64Array): Concentrated {
  const p = correlation.order;
  const root = Float64Array.from(x, (value) => Math.exp(value / 2));
  const scaled = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) scaled[i * p + j] = correlation.data[i * p + j] / (root[i] * root[j]);
  // Symmetrise exactly (the division can leave the last bit different).
  for (let i = 0; i < p; i++) for (let j = i + 1; j < p; j++) scaled[j * p + i] = scaled[i * p + j];
  const eigen = symmetricEigen({ order: p, data: scaled });
  let value = 0;
  for (let m = 1; m < p; m++) {
    const theta = eigen.values[m];
    value += theta > 0 ? theta - Math.log(theta) - 1 : Infinity;
  }
  const strength = Math.sqrt(Math.max(eigen.values[0] - 1, 0));
  const loadings = new Float64Array(p);
  for (let i = 0; i < p; i++) loadings[i] = root[i] * eigen.vectors.data[i * p] * strength;
  return { value, loadings };
}

function gradientOf(loadings: Float64Array, x: Float64Array, floor: number): Float64Array {
  const g = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) {
    const psi = Math.exp(x[i]);
    g[i] = (loadings[i] * loadings[i] + psi - 1) / psi;
    // At the floor a push further down is not allowed: project that component out.
    if (x[i] <= floor && g[i] > 0) g[i] = 0;
  }
  return g;
}

/** Options of `oneFactorMl`. */
export interface OneFactorMlOptions {
  /**
   * Uniquenesses to start the search from, one per item (null: Jöreskog's start for that item),
   * for instance those fitted to the same items on the full sample when the matrix is a bootstrap
   * resample's (a warm start: the search reaches the same optimum, to its tolerance, in fewer
   * steps). Each is clamped to [ONE_FACTOR_ML_UNIQUENESS_FLOOR, 0.995] as Jöreskog's start is.
   * With it the search's curvature also starts at Jöreskog's approximate Hessian there (instead
   * of ½·I), so that from a start near the optimum it takes Newton-like steps at once. Without it
   * every item takes Jöreskog's start and the curvature ½·I (the full-sample fit, unchanged).
   */
  readonly start?: readonly (number | null)[];
}

/**
 * Jöreskog's approximation to the Hessian of F in x = ln ψ, inverted: with ω the unit leading
 * eigenvector of Ψ^-½ R Ψ^-½, E(∂²F/∂x_i∂x_j) ≈ (Σ_{m≥2} ω_im ω_jm)² = (δ_ij − ω_i ω_j)², and
 * ω_i² = (λ_i²/ψ_i) / Σ_k λ_k²/ψ_k, so it is read off the concentrated loadings. Null when it
 * cannot be formed (no common factor, λ = 0) or is not positive definite.
 */
function approximateInverseHessian(loadings: Float64Array, x: Float64Array): Float64Array | null {
  const p = x.length;
  const scaled = Float64Array.from(loadings, (value, i) => value / Math.exp(x[i] / 2));
  let total = 0;
  for (let i = 0; i < p; i++) total += scaled[i] * scaled[i];
  if (!(total > 0)) return null;
  const hessian = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      const entry = (i === j ? 1 : 0) - (scaled[i] * scaled[j]) / total;
      hessian[i * p + j] = entry * entry;
    }
  }
  return choleskyInverse({ order: p, data: hessian })?.data ?? null;
}

/**
 * Fits the one-factor model to a correlation matrix by maximum likelihood.
 * @param correlation A positive definite correlation matrix of at least 3 items (unit diagonal).
 * @param n Respondents behind it (at least 2): the chi-square is N·F as lavaan computes it.
 * @param options `start`: uniquenesses to start from, with Jöreskog's approximate Hessian there
 *   (see `OneFactorMlOptions`).
 * @throws {RangeError} when the matrix is not symmetric, has fewer than 3 items, a diagonal
 *   entry is not 1, it is not positive definite (ML needs ln|R|), or n is not an integer ≥ 2.
 * @throws {RangeError} when `start` does not hold one entry per item, each null or in (0, 1].
 * @returns Loadings, uniquenesses, residual correlations, chi-square, df, RMSEA, CFI, SRMR.
 * References: Jöreskog 1967, "Some contributions to maximum likelihood factor analysis",
 *   Psychometrika 32:443-482 (the concentrated likelihood, its gradient and the approximate
 *   Hessian of a warm start); Lawley & Maxwell 1971,
 *   "Factor Analysis as a Statistical Method" (the chi-square); Steiger & Lind 1980 (RMSEA);
 *   Bentler 1990, "Comparative fit indexes in structural models", Psychological Bulletin 107:238-246
 *   (CFI); Bentler 1995, EQS Structural Equations Program Manual (standardized RMR); Rosseel 2012,
 *   "lavaan: An R package for structural equation modeling", J. Statistical Software 48(2) (the
 *   conventions matched: N in the chi-square, SRMR over the lower triangle with its diagonal).
 */
export function oneFactorMl(correlation: SquareMatrix, n: number, options: OneFactorMlOptions = {}): OneFactorMlFit {
  checkSymmetricMatrix(correlation, 'oneFactorMl', 'correlation');
  const p = correlation.order;
  if (p < 3) throw new RangeError(`oneFactorMl: a one-factor model needs at least 3 items, got ${p}`);
  for (let i = 0; i < p; i++) {
    if (Math.abs(correlation.data[i * p + i] - 1) > 1e-12) throw new RangeError(`oneFactorMl: the diagonal must be 1 (a correlation matrix); entry ${i} is ${correlation.data[i * p + i]}`);
  }
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`oneFactorMl: n must be an integer of at least 2, got ${n}`);
  const start = options.start;
  if (start !== undefined) {
    if (start.length !== p) throw new RangeError(`oneFactorMl: start must hold one uniqueness per item (${p}), got ${start.length}`);
    start.forEach((psi, i) => {
      if (psi !== null && !(psi > 0 && psi <= 1)) throw new RangeError(`oneFactorMl: a starting uniqueness must be in (0, 1] or null; entry ${i} is ${psi}`);
    });
  }
  const eigen = symmetricEigen(correlation);
  const spectrum = eigen.values;
  if (!(spectrum[p - 1] > 0)) throw new RangeError(`oneFactorMl: the correlation matrix is not positive definite (smallest eigenvalue ${spectrum[p - 1]}); repair it first`);
  let logDeterminant = 0;
  for (let m = 0; m < p; m++) logDeterminant += Math.log(spectrum[m]);

  const floor = Math.log(ONE_FACTOR_ML_UNIQUENESS_FLOOR);
  // Start (Jöreskog 1967): ψ_j = (1 − 1/(2p)) / [R⁻¹]_jj.
  const inverseDiagonal = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    let sum = 0;
    for (let m = 0; m < p; m++) sum += (eigen.vectors.data[i * p + m] ** 2) / eigen.values[m];
    inverseDiagonal[i] = sum;
  }
  let x = Float64Array.from(inverseDiagonal, (value, i) => Math.max(floor, Math.log(Math.min(0.995, start?.[i] ?? (1 - 0.5 / p) / value))));
  let current = concentrated(correlation, x);
  let evaluations = 1;
  let g = gradientOf(current.loadings, x, floor);
  // Inverse Hessian approximation, started at the identity scaled as Jöreskog's Newton step suggests (about ½).
  let h: Float64Array = new Float64Array(p * p);
  for (let i = 0; i < p; i++) h[i * p + i] = 0.5;
  if (start !== undefined) h = approximateInverseHessian(current.loadings, x) ?? h;
  let iterations = 0;
  let converged = false;
  while (iterations < ONE_FACTOR_ML_MAX_ITERATIONS) {
    let largest = 0;
    for (let i = 0; i < p; i++) largest = Math.max(largest, Math.abs(g[i]));
    if (largest < ONE_FACTOR_ML_GRADIENT_TOLERANCE) {
      converged = true;
      break;
    }
    iterations++;
    const direction = new Float64Array(p);
    for (let i = 0; i < p; i++) {
      let sum = 0;
      for (let j = 0; j < p; j++) sum -= h[i * p + j] * g[j];
      direction[i] = sum;
    }
    let slope = 0;
    for (let i = 0; i < p; i++) slope += direction[i] * g[i];
    if (!(slope < 0)) {
      // Not a descent direction: restart from steepest descent.
      h = new Float64Array(p * p);
      for (let i = 0; i < p; i++) {
        h[i * p + i] = 0.5;
        direction[i] = -0.5 * g[i];
      }
      slope = 0;
      for (let i = 0; i < p; i++) slope += direction[i] * g[i];
    }
    let step = 1;
    let next: Concentrated | null = null;
    let xNext = new Float64Array(p);
    for (let tries = 0; tries < 60; tries++) {
      for (let i = 0; i < p; i++) xNext[i] = Math.min(0, Math.max(floor, x[i] + step * direction[i]));
      const candidate = concentrated(correlation, xNext);
      evaluations++;
      if (candidate.value <= current.value + 1e-4 * step * slope) {
        next = candidate;
        break;
      }
      step /= 2;
    }
    if (next === null) {
      // No decrease possible at machine precision: the optimum is reached.
      converged = true;
      break;
    }
    const gNext = gradientOf(next.loadings, xNext, floor);
    const s = new Float64Array(p);
    const y = new Float64Array(p);
    let sy = 0;
    for (let i = 0; i < p; i++) {
      s[i] = xNext[i] - x[i];
      y[i] = gNext[i] - g[i];
      sy += s[i] * y[i];
    }
    if (sy > 1e-14) {
      // BFGS update of the inverse Hessian: H ← (I − ρ s y') H (I − ρ y s') + ρ s s'.
      const rho = 1 / sy;
      const hy = new Float64Array(p);
      for (let i = 0; i < p; i++) {
        let sum = 0;
        for (let j = 0; j < p; j++) sum += h[i * p + j] * y[j];
        hy[i] = sum;
      }
      let yhy = 0;
      for (let i = 0; i < p; i++) yhy += y[i] * hy[i];
      for (let i = 0; i < p; i++) {
        for (let j = 0; j < p; j++) {
          h[i * p + j] += -rho * (hy[i] * s[j] + s[i] * hy[j]) + (rho * rho * yhy + rho) * s[i] * s[j];
        }
      }
    }
    const decrease = current.value - next.value;
    x = xNext;
    xNext = new Float64Array(p);
    current = next;
    g = gNext;
    // Near the optimum F changes below its rounding error (eigenvalues carry about 1e-15 relative
    // error): a step that gains nothing measurable ends the search.
    if (decrease <= ONE_FACTOR_ML_STAGNATION * Math.max(1, Math.abs(current.value))) {
      converged = true;
      break;
    }
  }

  const loadings = Array.from(current.loadings);
  let sum = 0;
  for (const value of loadings) sum += value;
  if (sum < 0) for (let i = 0; i < p; i++) loadings[i] = -loadings[i];
  const uniquenesses = Array.from(x, (value) => Math.exp(value));
  const residuals = new Float64Array(p * p);
  let squares = 0;
  for (let i = 0; i < p; i++) {
    for (let j = 0; j <= i; j++) {
      const implied = i === j ? loadings[i] * loadings[i] + uniquenesses[i] : loadings[i] * loadings[j];
      const residual = correlation.data[i * p + j] - implied;
      residuals[i * p + j] = residual;
      residuals[j * p + i] = residual;
      squares += residual * residual;
    }
  }
  const srmr = Math.sqrt(squares / ((p * (p + 1)) / 2));
  const discrepancy = Math.max(current.value, 0);
  const chiSquare = n * discrepancy;
  const degreesOfFreedom = (p * (p - 3)) / 2;
  const baselineChiSquare = -n * logDeterminant;
  const baselineDegreesOfFreedom = (p * (p - 1)) / 2;
  const excess = Math.max(chiSquare - degreesOfFreedom, 0);
  const rmsea = degreesOfFreedom > 0 ? Math.sqrt(excess / (degreesOfFreedom * n)) : null;
  const baselineExcess = Math.max(baselineChiSquare - baselineDegreesOfFreedom, excess, 0);
  const cfi = baselineExcess > 0 ? 1 - excess / baselineExcess : null;
  const notices: NumericalNotice[] = [];
  const atFloor = uniquenesses.flatMap((psi, i) => (psi <= ONE_FACTOR_ML_UNIQUENESS_FLOOR * (1 + 1e-9) ? [i] : []));
  if (atFloor.length > 0) {
    notices.push({ code: 'heywood-case', items: atFloor, message: `A uniqueness reached its floor (${ONE_FACTOR_ML_UNIQUENESS_FLOOR}), a Heywood case: the one-factor model does not fit these items as estimated.` });
  }
  if (!converged) {
    notices.push({ code: 'not-converged', items: [], message: `The maximum likelihood fit did not settle within ${ONE_FACTOR_ML_MAX_ITERATIONS} iterations; the figures are the last iterate.` });
  }
  return {
    loadings, uniquenesses, residuals: { order: p, data: residuals }, discrepancy, chiSquare, degreesOfFreedom, rmsea, cfi, srmr,
    baselineChiSquare, baselineDegreesOfFreedom, iterations, evaluations, converged, notices,
  };
}
