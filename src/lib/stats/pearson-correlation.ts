/**
 * Pearson's product-moment correlation of two vectors over the respondents who answered both
 * (pair-complete rows), computed from centred sums (two passes) for accuracy.
 *
 * References: Pearson 1896, "Mathematical contributions to the theory of evolution. III.
 * Regression, heredity and panmixia" (Phil. Trans. R. Soc. A 187:253-318); Chan, Golub &
 * LeVeque 1983, "Algorithms for computing the sample variance: analysis and recommendations".
 */
import { MIN_ROWS_FOR_CORRELATION } from './tolerances';

/** Why a correlation of a pair does not exist. */
export type UndefinedCorrelationReason = 'too-few-rows' | 'no-variation';

/** A correlation of two vectors over their pair-complete rows. */
export interface PairCorrelation {
  /** The coefficient in [−1, 1], or null when it does not exist (see `undefinedReason`). */
  readonly r: number | null;
  /** Respondents who answered both. */
  readonly n: number;
  /**
   * null when r exists; `too-few-rows` when fewer than MIN_ROWS_FOR_CORRELATION respondents
   * answered both; `no-variation` when either vector is constant over those respondents.
   */
  readonly undefinedReason: UndefinedCorrelationReason | null;
}

/**
 * Checks two vectors for a pairwise statistic: equal length, no infinite values (NaN is a
 * missing answer and allowed).
 * @param x First vector.
 * @param y Second vector.
 * @param caller Name used in error messages.
 * @throws {RangeError} naming the caller when the lengths differ.
 * @throws {RangeError} naming the caller and the position when a value is ±Infinity.
 */
export function checkPairedVectors(x: ArrayLike<number>, y: ArrayLike<number>, caller: string): void {
  if (x.length !== y.length) throw new RangeError(`${caller}: vectors must have equal length, got ${x.length} and ${y.length}`);
  for (let i = 0; i < x.length; i++) {
    if (x[i] === Infinity || x[i] === -Infinity || y[i] === Infinity || y[i] === -Infinity) {
      throw new RangeError(`${caller}: value ${i} is infinite; use NaN for a missing answer`);
    }
  }
}

/**
 * Pearson correlation over the rows where both vectors are observed (not NaN), with means
 * and standard deviations taken over those same rows, as R's
 * `cor(x, y, use = "pairwise.complete.obs")` does.
 * @param x First vector, NaN for missing.
 * @param y Second vector, NaN for missing, same length as x.
 * @throws {RangeError} when the lengths differ or a value is ±Infinity.
 * @returns r (or null with the reason when undefined) and the number of pair-complete rows.
 * References: Pearson 1896, "Mathematical contributions to the theory of evolution. III.
 * Regression, heredity and panmixia".
 */
export function pearsonCorrelation(x: ArrayLike<number>, y: ArrayLike<number>): PairCorrelation {
  checkPairedVectors(x, y, 'pearsonCorrelation');
  return pearsonOfPairComplete(x, y);
}

/**
 * The Pearson kernel without input checks (for callers that checked already): pair-complete
 * rows, two-pass centred sums, constancy detected exactly (all values equal), r clamped to
 * [−1, 1].
 * @param x First vector, NaN for missing, finite otherwise.
 * @param y Second vector of the same length.
 * @returns As `pearsonCorrelation`.
 * References: Chan, Golub & LeVeque 1983, "Algorithms for computing the sample variance:
 * analysis and recommendations".
 */
export function pearsonOfPairComplete(x: ArrayLike<number>, y: ArrayLike<number>): PairCorrelation {
  const length = x.length;
  let n = 0;
  let sumX = 0;
  let sumY = 0;
  let firstX = NaN;
  let firstY = NaN;
  let variesX = false;
  let variesY = false;
  for (let i = 0; i < length; i++) {
    const a = x[i];
    const b = y[i];
    if (a !== a || b !== b) continue;
    if (n === 0) {
      firstX = a;
      firstY = b;
    } else {
      if (a !== firstX) variesX = true;
      if (b !== firstY) variesY = true;
    }
    n++;
    sumX += a;
    sumY += b;
  }
  if (n < MIN_ROWS_FOR_CORRELATION) return { r: null, n, undefinedReason: 'too-few-rows' };
  if (!variesX || !variesY) return { r: null, n, undefinedReason: 'no-variation' };
  const meanX = sumX / n;
  const meanY = sumY / n;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < length; i++) {
    const a = x[i];
    const b = y[i];
    if (a !== a || b !== b) continue;
    const dx = a - meanX;
    const dy = b - meanY;
    sxx += dx * dx;
    syy += dy * dy;
    sxy += dx * dy;
  }
  const r = sxy / Math.sqrt(sxx * syy);
  return { r: r > 1 ? 1 : r < -1 ? -1 : r, n, undefinedReason: null };
}
