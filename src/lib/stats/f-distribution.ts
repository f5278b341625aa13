/**
 * Snedecor's F distribution: distribution function and upper tail, from the regularized
 * incomplete beta function, P(F ≤ x) = I_{d₁x/(d₁x+d₂)}(d₁/2, d₂/2).
 *
 * References: Abramowitz & Stegun 1964, Handbook of Mathematical Functions, 26.6.2; Press,
 * Teukolsky, Vetterling & Flannery 2007, Numerical Recipes, 3rd ed., §6.14.
 */
import { incompleteBetaTails, type DistributionTails } from './incomplete-beta';

function fTails(name: string, x: number, numeratorDf: number, denominatorDf: number): DistributionTails {
  if (Number.isNaN(x)) throw new RangeError(`${name}: x must be a number, got NaN`);
  if (!(numeratorDf > 0) || !Number.isFinite(numeratorDf)) {
    throw new RangeError(`${name}: numerator degrees of freedom must be positive and finite, got ${numeratorDf}`);
  }
  if (!(denominatorDf > 0) || !Number.isFinite(denominatorDf)) {
    throw new RangeError(`${name}: denominator degrees of freedom must be positive and finite, got ${denominatorDf}`);
  }
  if (x <= 0) return { lower: 0, upper: 1 };
  const scaled = numeratorDf * x;
  if (!Number.isFinite(scaled)) return { lower: 1, upper: 0 };
  const total = scaled + denominatorDf;
  return incompleteBetaTails(scaled / total, numeratorDf / 2, denominatorDf / 2, denominatorDf / total);
}

/**
 * Distribution function of the F distribution: P(F ≤ x).
 * @param x Point (values ≤ 0 give 0; Infinity gives 1).
 * @param numeratorDf d₁ > 0, finite.
 * @param denominatorDf d₂ > 0, finite.
 * @throws {RangeError} when x is NaN or a degrees of freedom is not positive and finite.
 * @returns P(F ≤ x) in [0, 1].
 * References: Abramowitz & Stegun 1964, 26.6.2.
 */
export function fCdf(x: number, numeratorDf: number, denominatorDf: number): number {
  return fTails('fCdf', x, numeratorDf, denominatorDf).lower;
}

/**
 * Upper tail of the F distribution, P(F > x), the p-value of an F test; computed directly, so
 * small values keep full relative accuracy.
 * @param x Point (values ≤ 0 give 1; Infinity gives 0).
 * @param numeratorDf d₁ > 0, finite.
 * @param denominatorDf d₂ > 0, finite.
 * @throws {RangeError} when x is NaN or a degrees of freedom is not positive and finite.
 * @returns P(F > x) in [0, 1].
 * References: Abramowitz & Stegun 1964, 26.6.2.
 */
export function fUpperTail(x: number, numeratorDf: number, denominatorDf: number): number {
  return fTails('fUpperTail', x, numeratorDf, denominatorDf).upper;
}
