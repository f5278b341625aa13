/**
 * The Spearman-Brown prophecy: the reliability of a test whose length is changed by a factor m
 * (m = new number of items / old number), assuming the added or removed items are parallel to
 * the existing ones: ρ* = m ρ / (1 + (m − 1) ρ). Its inverse gives the factor needed to reach a
 * target reliability: m = ρ*(1 − ρ) / (ρ(1 − ρ*)).
 *
 * References: Spearman 1910, "Correlation calculated from faulty data" (British Journal of
 * Psychology 3:271-295); Brown 1910, "Some experimental results in the correlation of mental
 * abilities" (British Journal of Psychology 3:296-322).
 */

/**
 * Predicted reliability after changing the test length by a factor m.
 * @param reliability Current reliability ρ, in [0, 1].
 * @param lengthRatio m = new length / current length, positive and finite (0.5 halves the test).
 * @throws {RangeError} when ρ is outside [0, 1] or m is not positive and finite.
 * @returns m ρ / (1 + (m − 1) ρ), in [0, 1].
 * References: Spearman 1910; Brown 1910, British Journal of Psychology 3.
 */
export function spearmanBrown(reliability: number, lengthRatio: number): number {
  if (!(reliability >= 0 && reliability <= 1)) {
    throw new RangeError(`spearmanBrown: reliability must lie in [0, 1], got ${reliability}`);
  }
  if (!(lengthRatio > 0) || !Number.isFinite(lengthRatio)) {
    throw new RangeError(`spearmanBrown: lengthRatio must be positive and finite, got ${lengthRatio}`);
  }
  // 1 + (m − 1)ρ ≥ min(1, m) > 0 on this domain.
  return (lengthRatio * reliability) / (1 + (lengthRatio - 1) * reliability);
}

/**
 * Length factor m needed to move a reliability ρ to a target ρ* (the Spearman-Brown formula
 * solved for m).
 * @param reliability Current reliability ρ, in (0, 1).
 * @param targetReliability Target ρ*, in (0, 1).
 * @throws {RangeError} when either reliability is outside (0, 1).
 * @returns m = ρ*(1 − ρ) / (ρ(1 − ρ*)); below 1 means the test can be shortened.
 * References: Spearman 1910; Brown 1910, British Journal of Psychology 3.
 */
export function spearmanBrownLengthRatio(reliability: number, targetReliability: number): number {
  if (!(reliability > 0 && reliability < 1)) {
    throw new RangeError(`spearmanBrownLengthRatio: reliability must lie strictly between 0 and 1, got ${reliability}`);
  }
  if (!(targetReliability > 0 && targetReliability < 1)) {
    throw new RangeError(
      `spearmanBrownLengthRatio: targetReliability must lie strictly between 0 and 1, got ${targetReliability}`,
    );
  }
  return (targetReliability * (1 - reliability)) / (reliability * (1 - targetReliability));
}
