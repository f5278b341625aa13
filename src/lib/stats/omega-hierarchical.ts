/**
 * Omega hierarchical by the Schmid-Leiman transformation, as psych::omega computes it: the
 * oblique factors' correlations Φ are themselves factored (one minres factor for three or more
 * factors; with two factors both load √φ₁₂, psych's `option = "equal"`), each item's loading on
 * the general factor is g = Λ·γ (pattern loadings times the second-order loadings), and
 *
 *   ω_h = (Σ g)² / V_t,   ω_t = (V_t − Σ (1 − h²)) / V_t,
 *
 * where V_t is the sum of every entry of the correlation matrix (the variance of the
 * standardized total score as observed) and h² the communalities of the k-factor solution.
 * Items whose g loading is negative are reversed first (psych's `flip = TRUE`), which changes V_t;
 * they are reported. This is the observed-variance omega of psych, not the model-implied one
 * (the audit's per-scale omega total is model-implied: see run-audit.ts).
 *
 * References: Schmid & Leiman 1957, "The development of hierarchical factor solutions"
 * (Psychometrika 22:53-61); McDonald 1999, Test Theory, ch. 6; Zinbarg, Revelle, Yovel & Li 2005,
 * "Cronbach's α, Revelle's β, and McDonald's ω_H" (Psychometrika 70:123-133); Revelle,
 * psych::omega and psych::schmid (R package).
 */
import { minresOneFactor } from './minres-factor';
import type { ObliminResult } from './oblimin-rotation';
import type { NumericalNotice, SquareMatrix } from './types';

/** A Schmid-Leiman solution and its omegas. */
export interface OmegaHierarchicalResult {
  /** Each factor's loading on the general (second-order) factor. */
  readonly secondOrder: Float64Array;
  /** Each item's general-factor loading (after the flip: non-negative). */
  readonly general: Float64Array;
  /** Each item's loading on its group factors with the general part taken out, items × factors (row-major, signs of the pattern). */
  readonly group: Float64Array;
  /** 0-based items reversed because their general loading was negative. */
  readonly flipped: readonly number[];
  readonly omegaHierarchical: number;
  readonly omegaTotal: number;
  /** `two-factors` (the general loadings are set equal), `heywood-case` (second order). */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Omega hierarchical and omega total from an oblique solution.
 * @param correlation the correlation matrix the factors were fitted to.
 * @param oblique the oblimin solution (pattern loadings and Φ) of those factors.
 * @param communalities the k-factor communalities h² (unrotated; rotation keeps them).
 * @throws {RangeError} when the sizes disagree or the solution has fewer than two factors.
 * @returns the general and group loadings, ω_h, ω_t and the items reversed.
 * References: Schmid & Leiman 1957; Zinbarg et al. 2005; psych::omega (R).
 */
export function omegaHierarchical(correlation: SquareMatrix, oblique: Pick<ObliminResult, 'items' | 'factors' | 'loadings' | 'factorCorrelations'>, communalities: ArrayLike<number>): OmegaHierarchicalResult {
  const { items: p, factors: k } = oblique;
  if (k < 2) throw new RangeError('omegaHierarchical: needs at least two factors');
  if (correlation.order !== p || communalities.length !== p) throw new RangeError(`omegaHierarchical: ${correlation.order} items in the matrix, ${p} in the loadings, ${communalities.length} communalities`);
  const phi = oblique.factorCorrelations;
  const notices: NumericalNotice[] = [];
  let secondOrder: Float64Array;
  if (k === 2) {
    const root = Math.sqrt(Math.abs(phi[1]));
    secondOrder = Float64Array.of(root, Math.sign(phi[1]) * root);
    notices.push({ code: 'two-factors', items: [], message: 'With two group factors the general factor is not identified; both load it equally (√ of their correlation), as psych::omega does by default.' });
  } else {
    const second = minresOneFactor({ order: k, data: Float64Array.from(phi) });
    secondOrder = second.loadings ?? new Float64Array(k);
    if (second.heywoodItems.length > 0) notices.push({ code: 'heywood-case', items: [], message: 'A group factor loads the general factor at 1 or more (a Heywood case), so omega hierarchical is at its limit.' });
  }
  const general = new Float64Array(p);
  const group = new Float64Array(p * k);
  for (let i = 0; i < p; i++) {
    let sum = 0;
    for (let f = 0; f < k; f++) sum += oblique.loadings[i * k + f] * secondOrder[f];
    general[i] = sum;
    for (let f = 0; f < k; f++) group[i * k + f] = oblique.loadings[i * k + f] * Math.sqrt(Math.max(0, 1 - secondOrder[f] ** 2));
  }
  const key = Array.from(general, (g) => (g < 0 ? -1 : 1));
  const flipped = key.flatMap((sign, i) => (sign < 0 ? [i] : []));
  let total = 0;
  let generalSum = 0;
  let uniqueness = 0;
  for (let i = 0; i < p; i++) {
    general[i] *= key[i];
    generalSum += general[i];
    uniqueness += 1 - communalities[i];
    for (let j = 0; j < p; j++) total += key[i] * key[j] * correlation.data[i * p + j];
  }
  return {
    secondOrder,
    general,
    group,
    flipped,
    omegaHierarchical: (generalSum * generalSum) / total,
    omegaTotal: (total - uniqueness) / total,
    notices,
  };
}
