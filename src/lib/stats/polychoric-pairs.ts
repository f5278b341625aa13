/**
 * Many polychoric pairs at once: coded items and a list of pairs packed into typed arrays (a
 * job that can be posted to a worker thread unchanged), and the loop that estimates them with
 * the same per-table estimator as `polychoricCorrelation`.
 *
 * bench/parallel/polychoric-worker.ts (a benchmark's kernel; the audit starts no such thread)
 * runs `estimatePolychoricPairs` in a worker thread from its source text, with the functions it
 * calls; the tuning values travel in `job.tuning`.
 *
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient" (Psychometrika 44:443-460).
 */
import { countPolychoricTable, type OrdinalItem } from './polychoric-coding';
import { estimatePolychoricFromTable, POLYCHORIC_LIMITS, type PolychoricLimits } from './polychoric-correlation';
import { createPolychoricWorkspace } from './polychoric-likelihood';

/**
 * Everything needed to estimate many polychoric pairs, in typed arrays and plain numbers only,
 * so that it can be posted to a worker thread unchanged.
 */
export interface PolychoricPairsJob {
  /** Respondents (length of each item's code run). */
  readonly respondents: number;
  /** Category codes, item j at `j * respondents` (missing = the item's category count). */
  readonly codes: Uint8Array;
  /** Categories of each item. */
  readonly categories: Int32Array;
  /** Where each item's thresholds start in `limits`, `lower` and `upper`. */
  readonly thresholdOffsets: Int32Array;
  /** Thresholds of all items, concatenated; Φ of them; Φ of their negatives. */
  readonly limits: Float64Array;
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  /** Item pairs to estimate, flattened: [a0, b0, a1, b1, ...]. */
  readonly pairs: Int32Array;
  /** Tuning values (POLYCHORIC_LIMITS). */
  readonly tuning: PolychoricLimits;
}

/** Values per pair in the output of `estimatePolychoricPairs`: ρ, SE, status, n, iterations. */
export const POLYCHORIC_PAIR_FIELDS = 5;

/**
 * Packs coded items and a list of pairs into a job for `estimatePolychoricPairs`.
 * @param items Coded items (from `codeOrdinalItem`), all over the same respondents.
 * @param pairs Pairs of item indices, flattened [a0, b0, a1, b1, ...].
 * @throws {RangeError} when the items do not share one number of respondents, or a pair
 *   names an item that does not exist.
 * @returns The job.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient".
 */
export function createPolychoricPairsJob(items: readonly OrdinalItem[], pairs: Int32Array): PolychoricPairsJob {
  const respondents = items.length > 0 ? items[0].codes.length : 0;
  let thresholdTotal = 0;
  items.forEach((item, j) => {
    if (item.codes.length !== respondents) {
      throw new RangeError(`createPolychoricPairsJob: item ${j} has ${item.codes.length} respondents, expected ${respondents}`);
    }
    thresholdTotal += item.thresholds.count;
  });
  for (let p = 0; p < pairs.length; p++) {
    if (!(pairs[p] >= 0 && pairs[p] < items.length)) throw new RangeError(`createPolychoricPairsJob: pair entry ${p} names item ${pairs[p]}, which does not exist`);
  }
  const codes = new Uint8Array(respondents * items.length);
  const categories = new Int32Array(items.length);
  const thresholdOffsets = new Int32Array(items.length);
  const limits = new Float64Array(thresholdTotal);
  const lower = new Float64Array(thresholdTotal);
  const upper = new Float64Array(thresholdTotal);
  let offset = 0;
  items.forEach((item, j) => {
    codes.set(item.codes, j * respondents);
    categories[j] = item.categories.length;
    thresholdOffsets[j] = offset;
    const count = item.thresholds.count;
    limits.set(item.thresholds.limits.subarray(0, count), offset);
    lower.set(item.thresholds.lower.subarray(0, count), offset);
    upper.set(item.thresholds.upper.subarray(0, count), offset);
    offset += count;
  });
  return { respondents, codes, categories, thresholdOffsets, limits, lower, upper, pairs, tuning: POLYCHORIC_LIMITS };
}

/**
 * Estimates every pair of a job, one after the other (the worker threads run this same function
 * on their share of the pairs).
 * @param job From `createPolychoricPairsJob`.
 * @returns POLYCHORIC_PAIR_FIELDS values per pair, in pair order: ρ (NaN when undefined),
 *   standard error (NaN when not available), status (POLYCHORIC_STATUS), n, iterations.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient".
 */
export function estimatePolychoricPairs(job: PolychoricPairsJob): Float64Array {
  const respondents = job.respondents;
  const categories = job.categories;
  const items = categories.length;
  let maxCategories = 2;
  for (let j = 0; j < items; j++) if (categories[j] > maxCategories) maxCategories = categories[j];
  const work = createPolychoricWorkspace(maxCategories);
  const margins = [];
  const codeRuns = [];
  for (let j = 0; j < items; j++) {
    const start = job.thresholdOffsets[j];
    const count = categories[j] > 1 ? categories[j] - 1 : 0;
    margins.push({
      limits: job.limits.subarray(start, start + count),
      lower: job.lower.subarray(start, start + count),
      upper: job.upper.subarray(start, start + count),
      count,
    });
    codeRuns.push(job.codes.subarray(j * respondents, (j + 1) * respondents));
  }
  const pairCount = job.pairs.length / 2;
  const out = new Float64Array(pairCount * 5);
  for (let p = 0; p < pairCount; p++) {
    const a = job.pairs[2 * p];
    const b = job.pairs[2 * p + 1];
    const n = countPolychoricTable(codeRuns[a], categories[a], codeRuns[b], categories[b], respondents, work.table, work.tally);
    const at = p * 5;
    if (categories[a] < 2 || categories[b] < 2) {
      out[at] = NaN;
      out[at + 1] = NaN;
      out[at + 2] = n < job.tuning.minRows ? 3 : 4;
      out[at + 3] = n;
      out[at + 4] = 0;
      continue;
    }
    const estimate = estimatePolychoricFromTable(work.table, margins[a], margins[b], work, job.tuning);
    out[at] = estimate.rho;
    out[at + 1] = estimate.standardError;
    out[at + 2] = estimate.status;
    out[at + 3] = estimate.n;
    out[at + 4] = estimate.iterations;
  }
  return out;
}
