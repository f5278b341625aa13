/**
 * McDonald's omega total from the loadings of a single common factor fitted to the item
 * correlations: ω = (Σλ)² / ((Σλ)² + Σ(1 − λ²)), the share of the variance of the
 * standardized sum score that the common factor explains under the model.
 *
 * References: McDonald 1999, Test Theory: A Unified Treatment (Erlbaum), ch. 6; McDonald 1970,
 * "The theoretical foundations of principal factor analysis, canonical factor analysis, and
 * alpha factor analysis" (British Journal of Mathematical and Statistical Psychology 23:1-21).
 */
import { HEYWOOD_COMMUNALITY } from './tolerances';
import type { NumericalNotice } from './types';

/** Omega total of one scale. */
export interface OmegaTotalResult {
  /** ω in [0, 1]; null (with a notice) when a uniqueness is negative (a Heywood case). */
  readonly omegaTotal: number | null;
  /** Conditions met: `heywood-case`, `degenerate-loadings`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * McDonald's omega total from one-factor loadings (of the correlation matrix, e.g. minres).
 * @param loadings One loading per item, finite; not modified. Reverse-keyed items should be
 *   recoded before factoring, since mixed signs lower (Σλ)².
 * @throws {RangeError} when there are no loadings or a loading is not finite.
 * @returns ω, or null with a `heywood-case` notice when some λ² exceeds 1 (a negative
 *   uniqueness would make ω meaningless) or a `degenerate-loadings` notice when loadings of ±1
 *   cancel out. Never NaN.
 * References: McDonald 1999, Test Theory: A Unified Treatment, ch. 6.
 */
export function omegaTotal(loadings: ArrayLike<number>): OmegaTotalResult {
  if (loadings.length < 1) throw new RangeError('omegaTotal: at least one loading is required');
  let sum = 0;
  let uniqueness = 0;
  const heywood: number[] = [];
  for (let i = 0; i < loadings.length; i++) {
    const loading = loadings[i];
    if (!Number.isFinite(loading)) throw new RangeError(`omegaTotal: loading ${i} is not finite (${loading})`);
    const communality = loading * loading;
    if (communality > HEYWOOD_COMMUNALITY) heywood.push(i);
    sum += loading;
    uniqueness += 1 - communality;
  }
  if (heywood.length > 0) {
    return {
      omegaTotal: null,
      notices: [
        {
          code: 'heywood-case',
          items: heywood,
          message: 'A loading exceeds 1 in absolute value (negative uniqueness), so omega total is undefined.',
        },
      ],
    };
  }
  const common = sum * sum;
  const denominator = common + uniqueness;
  if (!(denominator > 0)) {
    // Only when every |λ| = 1 and the loadings cancel (Σλ = 0): the model has no variance left.
    return {
      omegaTotal: null,
      notices: [
        {
          code: 'degenerate-loadings',
          items: [],
          message: 'The loadings are all ±1 and cancel out, so omega total is undefined.',
        },
      ],
    };
  }
  return { omegaTotal: common / denominator, notices: [] };
}
