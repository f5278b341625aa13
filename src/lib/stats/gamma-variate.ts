/**
 * Gamma and chi-square variates from a seeded generator, by Marsaglia & Tsang's squeeze method:
 * for shape a >= 1, with d = a − 1/3 and c = 1/sqrt(9d), a standard normal x gives the candidate
 * d·(1 + c·x)³, accepted by a cheap squeeze or the exact log test (about 2% rejections at worst).
 * A shape below 1 is boosted: Gamma(a) = Gamma(a + 1) · U^(1/a). A chi-square variate with k
 * degrees of freedom is 2 · Gamma(k/2).
 *
 * References: Marsaglia & Tsang 2000, "A simple method for generating gamma variables" (ACM
 * Transactions on Mathematical Software 26:363-372), including the boost for a < 1 (their §6).
 */
import type { SeededRandom } from './seeded-random';

/**
 * A Gamma(shape, 1) variate.
 * @param random The seeded generator (its normal and uniform streams are used).
 * @param shape The shape parameter, positive and finite.
 * @throws {RangeError} when `shape` is not a positive finite number.
 * @returns A positive number with mean `shape` and variance `shape`.
 * References: Marsaglia & Tsang 2000, "A simple method for generating gamma variables".
 */
export function gammaVariate(random: SeededRandom, shape: number): number {
  if (!(shape > 0) || !Number.isFinite(shape)) throw new RangeError(`gammaVariate: shape must be a positive finite number, got ${shape}`);
  if (shape < 1) {
    // Boost (Marsaglia & Tsang 2000, §6); 1 − next() lies in (0, 1], so the power is never 0^(1/a) of a zero draw.
    return gammaVariate(random, shape + 1) * Math.pow(1 - random.next(), 1 / shape);
  }
  const d = shape - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  for (;;) {
    const x = random.nextNormal();
    const base = 1 + c * x;
    if (base <= 0) continue;
    const v = base * base * base;
    const u = 1 - random.next();
    const x2 = x * x;
    if (u < 1 - 0.0331 * x2 * x2) return d * v;
    if (Math.log(u) < 0.5 * x2 + d * (1 - v + Math.log(v))) return d * v;
  }
}

/**
 * A chi-square variate, 2 · Gamma(degrees / 2).
 * @param random The seeded generator.
 * @param degrees Degrees of freedom, positive and finite.
 * @throws {RangeError} when `degrees` is not a positive finite number.
 * @returns A positive number with mean `degrees` and variance `2 · degrees`.
 * References: Marsaglia & Tsang 2000, "A simple method for generating gamma variables".
 */
export function chiSquareVariate(random: SeededRandom, degrees: number): number {
  if (!(degrees > 0) || !Number.isFinite(degrees)) throw new RangeError(`chiSquareVariate: degrees must be a positive finite number, got ${degrees}`);
  return 2 * gammaVariate(random, degrees / 2);
}
