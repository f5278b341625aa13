/**
 * Modification indices (score tests) of the residual covariances left out of a one-factor ML model
 * `Σ = λλ' + Ψ` fitted to a correlation matrix, with each one's expected parameter change (EPC)
 * and its standardized form (SEPC, the EPC over √(ψ_i ψ_j): the residual correlation the freed
 * covariance would take).
 *
 * With W = Σ⁻¹, the fitted parameters b = (λ_1..λ_p, ψ_1..ψ_p) and a = θ_ij (the covariance of
 * items i and j's residuals), the ML discrepancy F = ln|Σ| + tr(SΣ⁻¹) − ln|S| − p has the derivative
 * ∂F/∂θ = tr(W(Σ − S)W ∂Σ/∂θ), and one respondent's expected information is
 * I(θ, φ) = ½ tr(W ∂Σ/∂θ W ∂Σ/∂φ). Each ∂Σ/∂θ is c(uv' + vu') (λ_k: u = e_k, v = λ, c = 1; ψ_k:
 * u = v = e_k, c = ½; θ_ij: u = e_i, v = e_j, c = 1), so every term is a product of entries of W
 * and Wλ. The score test (Sörbom 1989) for θ_ij is
 *   MI = N (∂F/∂θ_ij)² / (4 C),  C = I_aa − I_ab I_bb⁻¹ I_ba,
 * and the EPC is −(∂F/∂θ_ij) / (2 C), both as lavaan's `modindices` computes them (ML, expected
 * information, N in the likelihood).
 */
import { oneFactorMl, type OneFactorMlFit } from './one-factor-ml';
import type { NumericalNotice, SquareMatrix } from './types';

/** The modification index, EPC and SEPC of every residual covariance of a one-factor model. */
export interface ResidualModificationIndices {
  /** The fitted one-factor model. */
  readonly fit: OneFactorMlFit;
  /** Modification index of θ_ij, row-major, 0 on the diagonal; each is χ²(1) under the model. */
  readonly mi: SquareMatrix;
  /** Expected parameter change of θ_ij (a covariance, correlation metric). */
  readonly epc: SquareMatrix;
  /** EPC / √(ψ_i ψ_j): lavaan's `sepc.all` of a residual covariance. */
  readonly sepc: SquareMatrix;
  /** The fit's notices (a Heywood case, no convergence). */
  readonly notices: readonly NumericalNotice[];
}

/** Cholesky factor (lower, row-major) of a symmetric positive definite matrix, or null. */
function cholesky(a: Float64Array, n: number): Float64Array | null {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = a[i * n + j];
      for (let k = 0; k < j; k++) sum -= l[i * n + k] * l[j * n + k];
      if (i === j) {
        if (!(sum > 0)) return null;
        l[i * n + i] = Math.sqrt(sum);
      } else l[i * n + j] = sum / l[j * n + j];
    }
  }
  return l;
}

/** x'A⁻¹x from the Cholesky factor of A (forward substitution only). */
function quadraticInverse(l: Float64Array, n: number, x: Float64Array): number {
  const y = new Float64Array(n);
  let total = 0;
  for (let i = 0; i < n; i++) {
    let sum = x[i];
    for (let k = 0; k < i; k++) sum -= l[i * n + k] * y[k];
    y[i] = sum / l[i * n + i];
    total += y[i] * y[i];
  }
  return total;
}

/** Inverse of a symmetric positive definite matrix through its Cholesky factor, or null. */
function inverseSpd(a: Float64Array, n: number): Float64Array | null {
  const l = cholesky(a, n);
  if (l === null) return null;
  const inverse = new Float64Array(n * n);
  const column = new Float64Array(n);
  const y = new Float64Array(n);
  for (let c = 0; c < n; c++) {
    column.fill(0);
    column[c] = 1;
    for (let i = 0; i < n; i++) {
      let sum = column[i];
      for (let k = 0; k < i; k++) sum -= l[i * n + k] * y[k];
      y[i] = sum / l[i * n + i];
    }
    for (let i = n - 1; i >= 0; i--) {
      let sum = y[i];
      for (let k = i + 1; k < n; k++) sum -= l[k * n + i] * inverse[k * n + c];
      inverse[i * n + c] = sum / l[i * n + i];
    }
  }
  return inverse;
}

/**
 * Modification indices of the residual covariances of the one-factor ML model of a correlation matrix.
 * @param correlation A positive definite correlation matrix of at least 4 items (with three the
 *   model is just identified and a freed residual covariance is not identified).
 * @param n Respondents behind it (an integer of at least 2).
 * @param fit The model already fitted to `correlation` by `oneFactorMl` (optional; fitted here otherwise).
 * @throws {RangeError} when the matrix has fewer than 4 items or is not a positive definite
 *   correlation matrix, or n is not an integer of at least 2 (from `oneFactorMl`).
 * @returns MI, EPC and SEPC per pair, the fit and its notices; a pair whose score test is
 *   degenerate (C ≤ 0, a Heywood case) gets MI 0 and EPC 0.
 * References: Sörbom 1989, "Model modification", Psychometrika 54:371-384; Saris, Satorra & van
 * der Veld 2009, "Testing structural equation models or detection of misspecifications?",
 * Structural Equation Modeling 16:561-582 (SEPC); Rosseel 2012, "lavaan", J. Statistical Software
 * 48(2) (`modindices`, the conventions matched).
 */
export function residualModificationIndices(correlation: SquareMatrix, n: number, fit?: OneFactorMlFit): ResidualModificationIndices {
  const p = correlation.order;
  if (p < 4) throw new RangeError(`residualModificationIndices: a residual covariance of a one-factor model needs at least 4 items, got ${p}`);
  const model = fit ?? oneFactorMl(correlation, n);
  if (model.loadings.length !== p) throw new RangeError(`residualModificationIndices: the fit has ${model.loadings.length} loadings for ${p} items`);
  const lambda = Float64Array.from(model.loadings);
  const psi = Float64Array.from(model.uniquenesses);
  const sigma = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) sigma[i * p + j] = lambda[i] * lambda[j] + (i === j ? psi[i] : 0);
  const mi = new Float64Array(p * p);
  const epc = new Float64Array(p * p);
  const sepc = new Float64Array(p * p);
  const w = inverseSpd(sigma, p);
  if (w === null) return { fit: model, mi: { order: p, data: mi }, epc: { order: p, data: epc }, sepc: { order: p, data: sepc }, notices: model.notices };
  const wl = new Float64Array(p);
  for (let i = 0; i < p; i++) for (let k = 0; k < p; k++) wl[i] += w[i * p + k] * lambda[k];
  let q = 0;
  for (let i = 0; i < p; i++) q += lambda[i] * wl[i];
  // M = W(Σ − S)W, the gradient's kernel.
  const difference = new Float64Array(p * p);
  for (let x = 0; x < p * p; x++) difference[x] = sigma[x] - correlation.data[x];
  const half = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) {
    let sum = 0;
    for (let k = 0; k < p; k++) sum += w[i * p + k] * difference[k * p + j];
    half[i * p + j] = sum;
  }
  const m = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) {
    let sum = 0;
    for (let k = 0; k < p; k++) sum += half[i * p + k] * w[k * p + j];
    m[i * p + j] = sum;
  }
  // Information among the fitted parameters: λ (0..p−1), ψ (p..2p−1).
  const size = 2 * p;
  const info = new Float64Array(size * size);
  for (let k = 0; k < p; k++) {
    for (let l = 0; l < p; l++) {
      // λ_k, λ_l: (e_k'We_l)(λ'Wλ) + (e_k'Wλ)(λ'We_l)
      info[k * size + l] = w[k * p + l] * q + wl[k] * wl[l];
      // λ_k, ψ_l (c = ½): ½·2·(e_k'We_l)(λ'We_l)
      info[k * size + p + l] = w[k * p + l] * wl[l];
      info[(p + l) * size + k] = info[k * size + p + l];
      // ψ_k, ψ_l (c = ¼ each product): ½ W_kl²
      info[(p + k) * size + p + l] = 0.5 * w[k * p + l] ** 2;
    }
  }
  const factor = cholesky(info, size);
  if (factor === null) return { fit: model, mi: { order: p, data: mi }, epc: { order: p, data: epc }, sepc: { order: p, data: sepc }, notices: model.notices };
  const cross = new Float64Array(size);
  for (let i = 0; i < p; i++) {
    for (let j = i + 1; j < p; j++) {
      // θ_ij with λ_k: (e_i'We_k)(e_j'Wλ) + (e_i'Wλ)(e_j'We_k); with ψ_k: W_ik W_jk.
      for (let k = 0; k < p; k++) {
        cross[k] = w[i * p + k] * wl[j] + wl[i] * w[j * p + k];
        cross[p + k] = w[i * p + k] * w[j * p + k];
      }
      const own = w[i * p + i] * w[j * p + j] + w[i * p + j] ** 2;
      const c = own - quadraticInverse(factor, size, cross);
      if (!(c > 1e-12 * own)) continue;
      const gradient = 2 * m[i * p + j];
      const index = (n * gradient * gradient) / (4 * c);
      const change = -gradient / (2 * c);
      const scale = Math.sqrt(psi[i] * psi[j]);
      mi[i * p + j] = mi[j * p + i] = index;
      epc[i * p + j] = epc[j * p + i] = change;
      sepc[i * p + j] = sepc[j * p + i] = scale > 0 ? change / scale : 0;
    }
  }
  return { fit: model, mi: { order: p, data: mi }, epc: { order: p, data: epc }, sepc: { order: p, data: sepc }, notices: model.notices };
}
