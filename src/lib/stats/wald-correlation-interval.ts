/**
 * A confidence interval for a correlation from its estimator's own standard error (for example a
 * polychoric or tetrachoric r and the standard error of its likelihood), built on Fisher's z
 * scale so that the bounds stay inside (−1, 1): `z = atanh(r)`, `se_z = se / (1 − r²)` (the delta
 * method), bounds `tanh(z ± q·se_z)`.
 */
import { normalQuantile } from './normal-distribution';

/** The interval and what it rests on. */
export interface WaldCorrelationInterval {
  readonly lower: number;
  readonly upper: number;
  /** Standard error on the z scale, `se / (1 − r²)`. */
  readonly zStandardError: number;
}

/**
 * Wald interval for a correlation from a given standard error, on Fisher's z scale.
 * @param r The correlation, strictly inside (−1, 1).
 * @param standardError Its standard error (positive, finite).
 * @param confidence Confidence level strictly between 0 and 1 (default 0.95).
 * @throws {RangeError} when r is not inside (−1, 1), the standard error is not positive and finite,
 *   or the confidence is not inside (0, 1).
 * @returns The bounds and the z-scale standard error.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation coefficient"
 *   (Psychometrika 44:443-460; the estimator's asymptotic variance); Fisher 1921, "On the 'probable
 *   error' of a coefficient of correlation deduced from a small sample" (Metron 1:3-32; the z scale);
 *   Rao 1973, "Linear Statistical Inference and its Applications", §6a.2 (the delta method).
 */
export function waldCorrelationInterval(r: number, standardError: number, confidence = 0.95): WaldCorrelationInterval {
  if (!(r > -1 && r < 1)) throw new RangeError(`waldCorrelationInterval: r must lie strictly inside (-1, 1), got ${r}`);
  if (!(standardError > 0 && Number.isFinite(standardError))) throw new RangeError(`waldCorrelationInterval: the standard error must be positive and finite, got ${standardError}`);
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`waldCorrelationInterval: confidence must lie strictly between 0 and 1, got ${confidence}`);
  const z = Math.atanh(r);
  const zStandardError = standardError / (1 - r * r);
  const half = normalQuantile(0.5 + confidence / 2) * zStandardError;
  return { lower: Math.tanh(z - half), upper: Math.tanh(z + half), zStandardError };
}
