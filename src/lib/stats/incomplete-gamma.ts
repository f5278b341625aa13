/**
 * The regularized incomplete gamma functions P(a, x) and Q(a, x) = 1 − P(a, x), each computed
 * directly so that small tail probabilities keep their relative accuracy.
 *
 * For x < a + 1 the power series of P converges fast; otherwise the continued fraction of Q,
 * evaluated by the modified Lentz algorithm. The factor x^a e^(−x) / Γ(a) in front is taken,
 * for a ≥ 10, from Stirling's series in the form sqrt(a/2π) · exp(−a φ(x/a) − remainder),
 * φ(t) = t − 1 − ln t, which avoids cancelling large logarithms.
 *
 * References: Press, Teukolsky, Vetterling & Flannery 2007, Numerical Recipes, 3rd ed., §6.2
 * (series and continued fraction) and §5.2 (modified Lentz algorithm); Abramowitz & Stegun 1964,
 * Handbook of Mathematical Functions, 6.5.29 and 6.5.31; Temme 1994, "Computational aspects of
 * incomplete gamma functions with large complex parameters", for the form of the factor.
 */
import type { DistributionTails } from './incomplete-beta';
import { logGamma, stirlingRemainder } from './log-gamma';
import { LENTZ_TINY, SERIES_MAX_TERMS, SERIES_RELATIVE_TOLERANCE, STIRLING_THRESHOLD } from './tolerances';

/**
 * Lower and upper regularized incomplete gamma functions P(a, x) and Q(a, x).
 * @param a Shape, positive and finite.
 * @param x Point, x ≥ 0 (Infinity allowed).
 * @throws {RangeError} when a is not positive and finite or x is negative or NaN.
 * @throws {Error} when the series or continued fraction does not converge (not expected for
 *   shapes within about 1e10).
 * @returns `{ lower: P(a, x), upper: Q(a, x) }`.
 * References: Press et al. 2007, Numerical Recipes, 3rd ed., §6.2; Abramowitz & Stegun 1964,
 * 6.5.29 and 6.5.31.
 */
export function incompleteGammaTails(a: number, x: number): DistributionTails {
  if (!(a > 0) || !Number.isFinite(a)) throw new RangeError(`incompleteGammaTails: a must be positive and finite, got ${a}`);
  if (!(x >= 0)) throw new RangeError(`incompleteGammaTails: x must be non-negative, got ${x}`);
  if (x === 0) return { lower: 0, upper: 1 };
  if (x === Infinity) return { lower: 1, upper: 0 };
  const front = gammaFrontFactor(a, x);
  if (x < a + 1) {
    const lower = front * lowerGammaSeries(a, x);
    return { lower, upper: 1 - lower };
  }
  const upper = front * upperGammaContinuedFraction(a, x);
  return { lower: 1 - upper, upper };
}

/**
 * The regularized lower incomplete gamma function P(a, x), the gamma(a, 1) distribution function.
 * @param a Shape, positive and finite.
 * @param x Point, x ≥ 0.
 * @throws {RangeError} as {@link incompleteGammaTails}.
 * @returns P(a, x) in [0, 1].
 * References: Press et al. 2007, Numerical Recipes, 3rd ed., §6.2.
 */
export function regularizedLowerGamma(a: number, x: number): number {
  return incompleteGammaTails(a, x).lower;
}

/** x^a e^(−x) / Γ(a). */
function gammaFrontFactor(a: number, x: number): number {
  if (a < STIRLING_THRESHOLD) return Math.exp(a * Math.log(x) - x - logGamma(a));
  const d = (x - a) / a;
  const deviance = d > -0.5 ? d - Math.log1p(d) : d - Math.log(x / a);
  return Math.sqrt(a / (2 * Math.PI)) * Math.exp(-a * deviance - stirlingRemainder(a));
}

/** Σ x^n / (a (a+1) … (a+n)), so that P(a, x) = front · series (A&S 6.5.29). */
function lowerGammaSeries(a: number, x: number): number {
  let denominator = a;
  let term = 1 / a;
  let sum = term;
  for (let n = 1; n <= SERIES_MAX_TERMS; n++) {
    denominator += 1;
    term *= x / denominator;
    sum += term;
    if (Math.abs(term) <= Math.abs(sum) * SERIES_RELATIVE_TOLERANCE) return sum;
  }
  throw new Error(`incompleteGammaTails: series did not converge for a = ${a}, x = ${x}`);
}

/** Continued fraction with Q(a, x) = front · fraction (A&S 6.5.31), modified Lentz method. */
function upperGammaContinuedFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / LENTZ_TINY;
  let d = 1 / b;
  let fraction = d;
  for (let i = 1; i <= SERIES_MAX_TERMS; i++) {
    const numerator = -i * (i - a);
    b += 2;
    d = numerator * d + b;
    if (Math.abs(d) < LENTZ_TINY) d = LENTZ_TINY;
    c = b + numerator / c;
    if (Math.abs(c) < LENTZ_TINY) c = LENTZ_TINY;
    d = 1 / d;
    const step = d * c;
    fraction *= step;
    if (Math.abs(step - 1) <= SERIES_RELATIVE_TOLERANCE) return fraction;
  }
  throw new Error(`incompleteGammaTails: continued fraction did not converge for a = ${a}, x = ${x}`);
}
