/**
 * The partial-correlation network (graphical lasso, EBIC path) fitted only where it can count.
 * Its wTO enters the pair rules only for pairs of one scale of four or more items (the sequential
 * modification-index test must flag the pair); elsewhere its figures are only reported beside
 * each linked pair. So a wave whose local-dependence evidence has no such scale and in which no
 * pair is linked cannot show the network anywhere, in the full sample or in a bootstrap resample
 * (a resample has no scale the full sample lacks), and it is not fitted: at 100 items its EBIC
 * path is most of such an audit. Everywhere else it is fitted as before, and the audit is the
 * same number for number. docs/decisions/021-bootstrap-resample-decision.md.
 */
import { coreDetectors } from './core-detectors';
import type { EngineSettings } from './engine-settings';
import { MAX_NETWORK_ITEMS } from './engine-settings';
import { localDependenceNetwork, MIN_ITEMS_FOR_RESIDUALS, type LocalDependenceReuse } from './local-dependence';
import { findOverlapClusters } from './overlap-clusters';
import type { EngineEvidence } from './types';

/**
 * Evidence computed without the network, with the network fitted and attached (its partial
 * correlations, wTO and penalty; its warnings after the evidence's own, where
 * `computeEvidence` puts them).
 * @param evidence Evidence from `computeEvidence` with `localDependence: { network: false }`.
 * @param settings EBIC gamma and penalty count.
 * @param reuse The full sample's penalty (bootstrap resamples), or null for the EBIC path.
 * @param onProgress Hears the share of the EBIC path fitted.
 * @returns The evidence with its network (unchanged when it has no local-dependence evidence).
 * References: Friedman, Hastie & Tibshirani 2008; Foygel & Drton 2010; Nowick et al. 2009.
 */
export function attachNetwork(
  evidence: EngineEvidence,
  settings: Pick<EngineSettings, 'ebicGamma' | 'ebicPenaltyCount'>,
  reuse: LocalDependenceReuse | null,
  onProgress?: (fraction: number) => void,
): EngineEvidence {
  const local = evidence.localDependence;
  if (local === null) return evidence;
  const { network, warnings } = localDependenceNetwork(evidence.correlation, evidence.usable, evidence.correlationRows, settings, coreDetectors, reuse, evidence.exactDependencies, onProgress);
  return {
    ...evidence,
    localDependence: { ...local, partial: network?.partial ?? null, wto: network?.wto ?? null, penalty: network?.penalty ?? null },
    warnings: warnings.length === 0 ? evidence.warnings : [...evidence.warnings, ...warnings],
  };
}

/**
 * Whether the network can show anywhere in the audit (see the module comment): some scale has
 * local-dependence evidence, or enough usable items for it (wTO may link its pairs, here or in a
 * resample, and the resamples reuse the penalty), or some pair is linked or some cluster or near-dependency found (their
 * reports carry wTO and the partial correlation), or the wave has more items than the network takes (its warning says so).
 * @param evidence Evidence computed without the network.
 * @param wording Wording similarity in items[] order.
 * @param settings The engine settings (thresholds of the pair rules).
 * @returns False only when fitting the network could not change a number of the audit.
 * References: none (the pair rules of overlap-clusters.ts).
 */
export function networkCanCount(evidence: EngineEvidence, wording: readonly (readonly (number | null)[])[], settings: EngineSettings): boolean {
  const local = evidence.localDependence;
  if (local === null) return false;
  if (local.scales.length > 0 || evidence.usable.length > MAX_NETWORK_ITEMS) return true;
  // A scale large enough for residuals whose one-factor model failed here may fit in a resample,
  // which then needs the full sample's penalty: such a wave keeps its network.
  const members = new Map<string, number>();
  for (const index of evidence.usable) {
    const scale = evidence.items[index].scale;
    if (scale !== null) members.set(scale, (members.get(scale) ?? 0) + 1);
  }
  if ([...members.values()].some((count) => count >= MIN_ITEMS_FOR_RESIDUALS)) return true;
  const found = findOverlapClusters(evidence, wording, settings);
  return found.linkedPairs.length > 0 || found.clusters.length > 0 || found.dependencies.length > 0;
}
