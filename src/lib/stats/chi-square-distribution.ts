/**
 * The chi-square distribution: distribution function and upper tail, from the regularized
 * incomplete gamma function, P(χ² ≤ x) = P(ν/2, x/2).
 *
 * References: Abramowitz & Stegun 1964, Handbook of Mathematical Functions, 26.4.19; Press,
 * Teukolsky, Vetterling & Flannery 2007, Numerical Recipes, 3rd ed., §6.14.
 */
import type { DistributionTails } from './incomplete-beta';
import { incompleteGammaTails } from './incomplete-gamma';

function chiSquareTails(name: string, x: number, degreesOfFreedom: number): DistributionTails {
  if (Number.isNaN(x)) throw new RangeError(`${name}: x must be a number, got NaN`);
  if (!(degreesOfFreedom > 0) || !Number.isFinite(degreesOfFreedom)) {
    throw new RangeError(`${name}: degrees of freedom must be positive and finite, got ${degreesOfFreedom}`);
  }
  if (x <= 0) return { lower: 0, upper: 1 };
  return incompleteGammaTails(degreesOfFreedom / 2, x / 2);
}

/**
 * Distribution function of the chi-square distribution: P(χ² ≤ x).
 * @param x Point (values ≤ 0 give 0; Infinity gives 1).
 * @param degreesOfFreedom ν > 0, finite (need not be an integer).
 * @throws {RangeError} when x is NaN or ν is not positive and finite.
 * @returns P(χ² ≤ x) in [0, 1].
 * References: Abramowitz & Stegun 1964, 26.4.19.
 */
export function chiSquareCdf(x: number, degreesOfFreedom: number): number {
  return chiSquareTails('chiSquareCdf', x, degreesOfFreedom).lower;
}

/**
 * Upper tail of the chi-square distribution, P(χ² > x), the p-value of a chi-square test;
 * computed directly, so small values keep full relative accuracy.
 * @param x Point (values ≤ 0 give 1; Infinity gives 0).
 * @param degreesOfFreedom ν > 0, finite.
 * @throws {RangeError} when x is NaN or ν is not positive and finite.
 * @returns P(χ² > x) in [0, 1].
 * References: Abramowitz & Stegun 1964, 26.4.19.
 */
export function chiSquareUpperTail(x: number, degreesOfFreedom: number): number {
  return chiSquareTails('chiSquareUpperTail', x, degreesOfFreedom).upper;
}
