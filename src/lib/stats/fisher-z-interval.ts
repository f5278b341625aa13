/**
 * Confidence interval for a correlation by Fisher's z transformation: z = atanh(r) is nearly
 * normal with standard error 1/√(n − 3), so the interval is tanh(z ± q·se) with q the normal
 * quantile of the confidence level.
 *
 * References: Fisher 1921, "On the 'probable error' of a coefficient of correlation deduced
 * from a small sample" (Metron 1:3-32); Fisher 1915, "Frequency distribution of the values of
 * the correlation coefficient in samples from an indefinitely large population" (Biometrika
 * 10:507-521).
 */
import { normalQuantile } from './normal-distribution';

/** A Fisher-z confidence interval for a correlation. */
export interface FisherZInterval {
  readonly r: number;
  readonly n: number;
  readonly confidence: number;
  /** atanh(r); ±Infinity when r = ±1. */
  readonly z: number;
  /** 1/√(n − 3). */
  readonly standardError: number;
  /** Bounds on the correlation scale, lower <= r <= upper (both equal r when |r| = 1). */
  readonly lower: number;
  readonly upper: number;
}

/**
 * Fisher-z confidence interval for a correlation coefficient.
 * @param r The correlation, in [−1, 1].
 * @param n Respondents it rests on: an integer of at least 4.
 * @param confidence Confidence level strictly between 0 and 1 (default 0.95).
 * @throws {RangeError} when r is outside [−1, 1] or NaN, n is not an integer >= 4, or the
 *   confidence level is not strictly between 0 and 1.
 * @returns z, its standard error and the interval bounds.
 * References: Fisher 1921, "On the 'probable error' of a coefficient of correlation deduced
 * from a small sample".
 */
export function fisherZInterval(r: number, n: number, confidence = 0.95): FisherZInterval {
  if (!(r >= -1 && r <= 1)) throw new RangeError(`fisherZInterval: r must be in [-1, 1], got ${r}`);
  if (!Number.isInteger(n) || n < 4) throw new RangeError(`fisherZInterval: n must be an integer of at least 4, got ${n}`);
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`fisherZInterval: confidence must be strictly between 0 and 1, got ${confidence}`);
  const z = Math.atanh(r);
  const standardError = 1 / Math.sqrt(n - 3);
  const halfWidth = normalQuantile(0.5 + confidence / 2) * standardError;
  return { r, n, confidence, z, standardError, lower: Math.tanh(z - halfWidth), upper: Math.tanh(z + halfWidth) };
}
