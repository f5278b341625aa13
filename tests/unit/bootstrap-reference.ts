/**
 * The bootstrap resample as the engine decided it before resample-decision.ts (kept here, and
 * only here, as the reference the faster path is compared with): the whole evidence at
 * `decision` detail with the network always fitted, the alpha oracle, and keeper scores and
 * `vifAfter` from a fresh eigen-decomposition per member. The respondents of resample b are the
 * b-th block of draws from one stream seeded with the settings' seed, as before.
 */
import { computeEvidence, scaleAlphaOracle } from '../../src/lib/engine/compute-evidence';
import type { EngineSettings } from '../../src/lib/engine/engine-settings';
import type { LocalDependenceReuse } from '../../src/lib/engine/local-dependence';
import { findOverlapClusters } from '../../src/lib/engine/overlap-clusters';
import { recommendCuts } from '../../src/lib/engine/recommend-cuts';
import { recommendationSignature, type ResampleOutcome } from '../../src/lib/engine/resample-decision';
import type { EngineItem } from '../../src/lib/engine/types';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { selectRespondents, type ItemMatrix } from '../../src/lib/stats/types';

/** The respondents of each of `resamples` resamples, drawn as bootstrapStability draws them. */
export function referenceResampleRows(rows: number, seed: number, resamples: number): Int32Array[] {
  const random = createSeededRandom(seed);
  return Array.from({ length: resamples }, () => {
    const drawn = new Int32Array(rows);
    for (let i = 0; i < rows; i++) drawn[i] = random.nextInt(rows);
    return drawn;
  });
}

/** One resample decided the earlier way. */
export function referenceResampleDecision(
  matrix: ItemMatrix,
  rows: Int32Array,
  items: readonly EngineItem[],
  settings: EngineSettings,
  wording: readonly (readonly (number | null)[])[],
  reuse: LocalDependenceReuse | null,
): ResampleOutcome {
  const sample = selectRespondents(matrix, rows);
  try {
    const evidence = computeEvidence(sample, items, settings, {
      detail: 'decision',
      localDependence: reuse === null ? false : { reuse },
    });
    const { clusters } = findOverlapClusters(evidence, wording, settings);
    const cuts = recommendCuts(evidence, clusters, settings, scaleAlphaOracle(evidence, sample));
    return {
      made: cuts.recommendations.map(recommendationSignature),
      clusters: cuts.recommendations.map((recommendation) => [...recommendation.cluster]),
      failed: false,
    };
  } catch (error) {
    if (!(error instanceof RangeError)) throw error;
    return { made: [], clusters: [], failed: true };
  }
}
