import type { ScalePoints } from './types';

/**
 * Thresholds that cut a standard-normal latent response into 5 or 7 ordered categories, before
 * any skew. They are evenly spaced in latent SD units, so the middle categories are the most
 * frequent, as in most agreement scales (5 points: about 7%, 24%, 38%, 24%, 7%).
 */
const BASE_THRESHOLDS: Readonly<Record<ScalePoints, readonly number[]>> = Object.freeze({
  5: Object.freeze([-1.5, -0.5, 0.5, 1.5]),
  7: Object.freeze([-1.75, -1.05, -0.35, 0.35, 1.05, 1.75]),
});

/**
 * The thresholds of one item: the base thresholds moved down by `shift`, so a positive shift
 * pushes answers towards agreement (the skew of most satisfaction surveys).
 * @param points Number of categories, 5 or 7.
 * @param shift Shift towards agreement, latent SD units.
 * @throws {RangeError} when points is not 5 or 7 or shift is not finite.
 * @returns points − 1 increasing thresholds.
 * References: Muthén 1984, "A general structural equation model with dichotomous, ordered
 * categorical, and continuous latent variable indicators" (the threshold model of ordinal items).
 */
export function ordinalThresholds(points: ScalePoints, shift: number): number[] {
  if (points !== 5 && points !== 7) throw new RangeError(`ordinalThresholds: points must be 5 or 7, got ${points}`);
  if (!Number.isFinite(shift)) throw new RangeError(`ordinalThresholds: shift must be finite, got ${shift}`);
  return BASE_THRESHOLDS[points].map((threshold) => threshold - shift);
}

/**
 * The category (1..thresholds.length + 1) a latent response falls into.
 * @param latent The continuous latent response.
 * @param thresholds Increasing thresholds from `ordinalThresholds`.
 * @returns 1 plus the number of thresholds strictly below the latent response.
 * References: Muthén 1984 (threshold model of ordinal items).
 */
export function discretiseLatent(latent: number, thresholds: readonly number[]): number {
  let category = 1;
  for (const threshold of thresholds) if (latent > threshold) category++;
  return category;
}
