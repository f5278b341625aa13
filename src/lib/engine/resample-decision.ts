/**
 * One bootstrap resample's decision: the recommendations the engine makes on the resampled
 * respondents, reduced to what the stability figures compare (each recommendation's signature and
 * its cluster). It computes only what those depend on, and nothing twice:
 *
 * - the evidence at `decision` detail (no omega, no alpha if deleted, no thresholds for a
 *   residual bootstrap whose critical values are reused from the full sample), with R⁻¹ kept from
 *   the one eigen-decomposition the VIFs need, and Pearson correlations and covariances in one
 *   weighted pass over the distinct respondents drawn (weighted-pearson.ts);
 * - the descriptives, the usable items and the complete rows from the weighted original rows as
 *   well (weighted-item-descriptives.ts, `completeDraws`): the resample's own copy is built only
 *   where a figure still needs it (`deferredSelection`), and on a Pearson wave with pairwise
 *   deletion only the complete rows' copy, for the Belsley-Kuh-Welsch Gram matrix;
 * - each member's "VIF without partners" (keeper score) and `vifAfter` from that inverse by Schur
 *   complement (vif-after-removal.ts) instead of a decomposition per member;
 * - the graphical-lasso network only when its wTO can change whether some pair is linked: wTO
 *   counts only for pairs of one scale with a residual, and a pair's rules are monotone in wTO, so
 *   when every such pair is linked (or not) alike at wTO = 0 and at wTO = 1, the network cannot
 *   change a cluster or a recommendation and is not fitted.
 *
 * The result equals the full decision (tests/unit/engine-resample-decision.test.ts compares it
 * with the earlier path resample by resample).
 */
import { computeEvidence, scaleAlphaOracle } from './compute-evidence';
import type { EngineSettings } from './engine-settings';
import type { LocalDependenceReuse } from './local-dependence';
import { attachNetwork } from './network-when-it-counts';
import { findOverlapClusters, pairLocalFigures, pairRules } from './overlap-clusters';
import { recommendCuts, type Recommendation } from './recommend-cuts';
import type { EngineEvidence, EngineItem } from './types';
import { schurVifAfterRemoval } from './vif-after-removal';
import { deferredSelection, type ItemMatrix } from '../stats/types';

/** What every resample of one bootstrap shares. */
export interface ResampleContext {
  readonly items: readonly EngineItem[];
  readonly settings: EngineSettings;
  /** Wording similarity in items[] order. */
  readonly wording: readonly (readonly (number | null)[])[];
  /** Local-dependence figures reused from the full sample; null: no local-dependence evidence. */
  readonly reuse: LocalDependenceReuse | null;
}

/** What one resample decided. */
export interface ResampleOutcome {
  /** Signature of each recommendation made (`recommendationSignature`). */
  readonly made: readonly string[];
  /** Each recommendation's cluster (item ids). */
  readonly clusters: readonly (readonly string[])[];
  /** The core refused the resample (a RangeError): it makes no recommendation. */
  readonly failed: boolean;
}

/**
 * What identifies a recommendation across resamples: the keeper and the sorted ids of the items
 * changed (dropped, merged or reworded).
 * @param recommendation A recommendation (its keeper and actions).
 * @returns `keeper|id,id,...`.
 * References: none (an identity key, not a method).
 */
export function recommendationSignature(recommendation: Pick<Recommendation, 'keep' | 'actions'>): string {
  const changed = recommendation.actions
    .filter((action) => action.action !== 'keep')
    .map((action) => action.item)
    .sort();
  return `${recommendation.keep}|${changed.join(',')}`;
}

/**
 * Whether the network's wTO can change whether any pair is linked (see the module comment).
 * @param evidence Evidence computed without the network.
 * @param settings The thresholds of the pair rules.
 * @returns True when some pair with a residual is linked at wTO = 1 but not at wTO = 0.
 * References: none (the pair rules of overlap-clusters.ts read at both ends of wTO's range).
 */
export function networkCanDecide(evidence: EngineEvidence, settings: EngineSettings): boolean {
  const local = evidence.localDependence;
  if (local === null) return false;
  const figuresOf = pairLocalFigures(evidence);
  const order = evidence.correlation.order;
  const position = new Map(evidence.usable.map((item, k) => [item, k]));
  for (const scale of local.scales) {
    for (let x = 0; x < scale.items.length; x++) {
      for (let y = x + 1; y < scale.items.length; y++) {
        const a = scale.items[x];
        const b = scale.items[y];
        const figures = figuresOf(a, b);
        if (figures.relativeResidual === null) continue;
        const r = evidence.correlation.data[(position.get(a) as number) * order + (position.get(b) as number)];
        const linkedWithout = pairRules(r, { ...figures, wto: 0 }, settings).length > 0;
        const linkedWith = pairRules(r, { ...figures, wto: 1 }, settings).length > 0;
        if (linkedWithout !== linkedWith) return true;
      }
    }
  }
  return false;
}

/**
 * The engine's decision on one resample (see the module comment for what is computed).
 * @param matrix The audit's respondents × items (recoded, NaN for missing); not modified.
 * @param rows The resample: row indices into `matrix`, one per draw (repeats allowed).
 * @param context Items, settings, wording similarity and the full sample's local-dependence figures.
 * @throws whatever the engine throws other than RangeError (a RangeError marks the resample failed).
 * @returns The signatures and clusters of the recommendations made.
 * References: Efron 1979, "Bootstrap methods: another look at the jackknife"; Horn & Johnson
 * 2013, §0.7.3 (Schur complement; from memory).
 */
export function resampleDecision(matrix: ItemMatrix, rows: ArrayLike<number>, context: ResampleContext): ResampleOutcome {
  const { items, settings, wording, reuse } = context;
  // The resample is copied only if a figure still needs its rows (see `resampleOf`).
  const sample = deferredSelection(matrix, rows);
  try {
    let evidence = computeEvidence(sample, items, settings, {
      detail: 'decision',
      inverse: true,
      resampleOf: { matrix, rows },
      localDependence: reuse === null ? false : { reuse, network: false },
    });
    if (reuse !== null && evidence.localDependence !== null && networkCanDecide(evidence, settings)) evidence = attachNetwork(evidence, settings, reuse);
    const { clusters } = findOverlapClusters(evidence, wording, settings);
    const cuts = recommendCuts(evidence, clusters, settings, scaleAlphaOracle(evidence, sample), schurVifAfterRemoval(evidence));
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
