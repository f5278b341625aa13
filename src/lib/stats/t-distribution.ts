/**
 * Student's t distribution: distribution function, two-sided tail probability, density and
 * quantile, from the regularized incomplete beta function:
 * P(|T| > t) = I_{ν/(ν+t²)}(ν/2, ½).
 *
 * References: Student 1908, "The probable error of a mean" (Biometrika 6:1-25); Abramowitz &
 * Stegun 1964, Handbook of Mathematical Functions, 26.7.1; Press, Teukolsky, Vetterling &
 * Flannery 2007, Numerical Recipes, 3rd ed., §6.14.
 */
import { incompleteBetaTails } from './incomplete-beta';
import { logBeta } from './log-gamma';
import { QUANTILE_MAX_STEPS, QUANTILE_RELATIVE_TOLERANCE } from './tolerances';

function checkDegreesOfFreedom(name: string, degreesOfFreedom: number): void {
  if (!(degreesOfFreedom > 0) || !Number.isFinite(degreesOfFreedom)) {
    throw new RangeError(`${name}: degrees of freedom must be positive and finite, got ${degreesOfFreedom}`);
  }
}

/** P(T > |t|), computed directly for any t (the one-sided tail beyond |t|). */
function tailBeyond(t: number, degreesOfFreedom: number): number {
  const absolute = Math.abs(t);
  if (absolute === Infinity) return 0;
  if (absolute === 0) return 0.5;
  const ratio = absolute / Math.sqrt(degreesOfFreedom);
  const squared = ratio * ratio;
  let x: number;
  let y: number;
  if (Number.isFinite(squared)) {
    x = 1 / (1 + squared);
    y = squared / (1 + squared);
  } else {
    x = 1 / ratio / ratio;
    y = 1 - x;
  }
  return 0.5 * incompleteBetaTails(x, degreesOfFreedom / 2, 0.5, y).lower;
}

/**
 * Distribution function of Student's t: P(T ≤ t).
 * @param t Point (±Infinity allowed).
 * @param degreesOfFreedom ν > 0, finite (need not be an integer).
 * @throws {RangeError} when t is NaN or ν is not positive and finite.
 * @returns P(T ≤ t); the tail that is the smaller keeps full relative accuracy.
 * References: Abramowitz & Stegun 1964, 26.7.1; Press et al. 2007, Numerical Recipes, §6.14.
 */
export function tCdf(t: number, degreesOfFreedom: number): number {
  if (Number.isNaN(t)) throw new RangeError('tCdf: t must be a number, got NaN');
  checkDegreesOfFreedom('tCdf', degreesOfFreedom);
  const tail = tailBeyond(t, degreesOfFreedom);
  return t < 0 ? tail : 1 - tail;
}

/**
 * Two-sided tail probability of Student's t: P(|T| ≥ |t|), the p-value of a t test.
 * @param t Observed t statistic (±Infinity allowed).
 * @param degreesOfFreedom ν > 0, finite.
 * @throws {RangeError} when t is NaN or ν is not positive and finite.
 * @returns P(|T| ≥ |t|) in [0, 1], with full relative accuracy when it is small.
 * References: Abramowitz & Stegun 1964, 26.7.1; Student 1908.
 */
export function tTwoSidedPValue(t: number, degreesOfFreedom: number): number {
  if (Number.isNaN(t)) throw new RangeError('tTwoSidedPValue: t must be a number, got NaN');
  checkDegreesOfFreedom('tTwoSidedPValue', degreesOfFreedom);
  return Math.min(1, 2 * tailBeyond(t, degreesOfFreedom));
}

/**
 * Density of Student's t.
 * @param t Point (±Infinity allowed).
 * @param degreesOfFreedom ν > 0, finite.
 * @throws {RangeError} when t is NaN or ν is not positive and finite.
 * @returns f(t) = (1 + t²/ν)^(−(ν+1)/2) / (sqrt(ν) B(ν/2, ½)).
 * References: Student 1908; Abramowitz & Stegun 1964, 26.7.1.
 */
export function tDensity(t: number, degreesOfFreedom: number): number {
  if (Number.isNaN(t)) throw new RangeError('tDensity: t must be a number, got NaN');
  checkDegreesOfFreedom('tDensity', degreesOfFreedom);
  if (!Number.isFinite(t)) return 0;
  const ratio = t / Math.sqrt(degreesOfFreedom);
  return Math.exp(
    -((degreesOfFreedom + 1) / 2) * Math.log1p(ratio * ratio) -
      0.5 * Math.log(degreesOfFreedom) -
      logBeta(degreesOfFreedom / 2, 0.5),
  );
}

/**
 * Quantile of Student's t: the t with P(T ≤ t) = p. Found by a safeguarded Newton search on
 * the logarithm of the tail probability, bracketed so it cannot diverge.
 * @param p Probability in (0, 1).
 * @param degreesOfFreedom ν > 0, finite.
 * @throws {RangeError} when p is outside (0, 1) or ν is not positive and finite.
 * @throws {Error} when the search does not settle within its step budget (not expected).
 * @returns t with P(T ≤ t) = p, to about 1e-14 relative.
 * References: Press et al. 2007, Numerical Recipes, 3rd ed., §9.4 (safeguarded Newton-Raphson);
 * Abramowitz & Stegun 1964, 26.7.1.
 */
export function tQuantile(p: number, degreesOfFreedom: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`tQuantile: p must lie strictly between 0 and 1, got ${p}`);
  checkDegreesOfFreedom('tQuantile', degreesOfFreedom);
  if (p === 0.5) return 0;
  const target = p < 0.5 ? p : 1 - p;
  const logTarget = Math.log(target);
  // Bracket: tail(low) > target ≥ tail(high).
  let low = 0;
  let high = 1;
  let steps = 0;
  while (tailBeyond(high, degreesOfFreedom) > target) {
    low = high;
    high *= 10;
    if (++steps > QUANTILE_MAX_STEPS) throw new Error(`tQuantile: could not bracket p = ${p} for ν = ${degreesOfFreedom}`);
  }
  let t = low === 0 ? high / 2 : Math.sqrt(low * high);
  for (; steps <= QUANTILE_MAX_STEPS; steps++) {
    const tail = tailBeyond(t, degreesOfFreedom);
    const gap = Math.log(tail) - logTarget; // decreasing in t
    if (gap === 0) return p < 0.5 ? -t : t;
    if (gap > 0) low = t;
    else high = t;
    const slope = -tDensity(t, degreesOfFreedom) / tail;
    let next = t - gap / slope;
    if (!(next > low && next < high)) next = low === 0 ? high / 2 : 0.5 * (low + high);
    if (Math.abs(next - t) <= QUANTILE_RELATIVE_TOLERANCE * Math.abs(next)) return p < 0.5 ? -next : next;
    t = next;
  }
  throw new Error(`tQuantile: search did not settle for p = ${p}, ν = ${degreesOfFreedom}`);
}
