/**
 * The redundancy engine's one entry point: from the evidence of a wave to the overlap clusters,
 * the constrained cut list with its evidence, reasons and cautions, the what-if of the proposed
 * cut, and the bootstrap stability of every recommendation. The lead puts `recommendations`,
 * `afterCut` and `warnings` into the audit JSON (audit-json.md); `clusters` feeds the overlap map.
 */
import { bootstrapStability, type EngineProgress, type ResampleRunner } from './bootstrap-stability';
import { resolveEngineSettings, type EngineSettings } from './engine-settings';
import { findOverlapClusters, pairEvidence, pairLocalFigures } from './overlap-clusters';
import { localDependenceReuse } from './local-dependence';
import { dependencyReport, pairReport, recommendCuts, type DependencyReport, type PairReport, type Caution, type Recommendation } from './recommend-cuts';
import { scaleAlphaOracle } from './compute-evidence';
import { simulateCut, type AfterCut } from './simulate-cut';
import type { EngineEvidence, EngineItem, EngineWarning } from './types';
import { wordingSimilarity } from './wording-similarity';
import type { ItemMatrix } from '../stats/types';

/** An overlap cluster with item ids, for the audit JSON and the overlap map. */
export interface ClusterReport {
  readonly items: readonly string[];
  readonly maxR: number;
  readonly conditionIndex: number | null;
  readonly strongPairs: readonly PairReport[];
  readonly dependencies: readonly DependencyReport[];
  readonly exactDependencies: readonly (readonly string[])[];
}

/** What `runEngine` returns. */
export interface EngineResult {
  /** Strongest cluster first; `stability`/`unstable` filled when the bootstrap ran. */
  readonly recommendations: readonly Recommendation[];
  /** The what-if of the proposed cut (drops and merges). */
  readonly afterCut: AfterCut;
  /** Every overlap cluster (items[] order of first item). */
  readonly clusters: readonly ClusterReport[];
  /** The engine's own warnings (the evidence's warnings are in `evidence.warnings`). */
  readonly warnings: readonly EngineWarning[];
  /** The settings used, defaults filled in (store them with the audit). */
  readonly settings: EngineSettings;
  /**
   * Every flagged pair (a rule fired for it, whether or not it ended in a recommendation) with all
   * its evidence: r, interval, n, residual (Q3) and its critical value, wTO, partial correlation,
   * wording similarity and the rules (audit-json `pairs`).
   */
  readonly pairs: readonly PairReport[];
}

/**
 * Runs the redundancy engine on a wave's evidence.
 * @param evidence From `computeEvidence(matrix, items, settings)` with the same method and policy.
 * @param matrix The recoded matrix the evidence came from (for the what-if and the bootstrap); not modified.
 * @param items The same items as `evidence.items` (id order is checked).
 * @param settings Any subset of the engine settings; defaults fill the rest (see engine-settings.ts).
 * @param onProgress Called with (stage, fraction): `clusters`, `recommendations`, `what-if`, `bootstrap`.
 * @param signal Aborts the bootstrap between resamples.
 * @param runner Decides the bootstrap's resamples (e.g. on worker threads); default: on the calling
 *   thread. The stability figures are the same either way.
 * @param onCutList Called once with the recommendations (stability still null) when a bootstrap is
 *   about to check them, so that a caller can show the cut list while the resamples run.
 * @throws {RangeError} when a setting is out of range, the items or matrix do not match the
 *   evidence, or the evidence was computed with another method or missing-data policy.
 * @throws the signal's reason when aborted.
 * @returns Recommendations, the what-if, the clusters, warnings and the resolved settings.
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics"; Cronbach 1951; Efron 1979,
 * "Bootstrap methods: another look at the jackknife"; Salton & Buckley 1988 (wording similarity).
 */
export async function runEngine(
  evidence: EngineEvidence,
  matrix: ItemMatrix,
  items: readonly EngineItem[],
  settings: Partial<EngineSettings> = {},
  onProgress?: EngineProgress,
  signal?: AbortSignal,
  runner?: ResampleRunner,
  onCutList?: (recommendations: readonly Recommendation[]) => void,
): Promise<EngineResult> {
  const resolved = resolveEngineSettings(settings);
  if (resolved.method !== evidence.method || resolved.missing !== evidence.missing) {
    throw new RangeError(`runEngine: the evidence was computed with ${evidence.method}/${evidence.missing}, the settings ask for ${resolved.method}/${resolved.missing}`);
  }
  if (items.length !== evidence.items.length || items.some((item, j) => item.id !== evidence.items[j].id)) {
    throw new RangeError('runEngine: items must be the evidence items, in the same order');
  }
  if (matrix.columns !== items.length || matrix.rows !== evidence.rows) {
    throw new RangeError(`runEngine: the matrix is ${matrix.rows} × ${matrix.columns}, the evidence ${evidence.rows} × ${items.length}`);
  }
  const warnings: EngineWarning[] = [];

  onProgress?.('clusters', 0);
  const wording = wordingSimilarity(items.map((item) => item.text));
  const unknownWording = items.filter((item) => item.text === null || item.text.trim().length === 0).map((item) => item.id);
  if (unknownWording.length > 0) {
    warnings.push({
      code: 'wording-unknown',
      items: unknownWording,
      message: 'These items have no wording in the codebook, so their wording similarity is null and no merge or reword rests on it.',
    });
  }
  if (evidence.repaired) {
    warnings.push({
      code: 'vif-from-repaired-matrix',
      items: [],
      message:
        'The correlation matrix was not positive definite and was smoothed (Bentler-Yuan scaling of the items that carry the inconsistency): VIFs and the VIF check that confirms near-dependencies rest on the smoothed matrix, so weigh them with the pair evidence.',
    });
  }
  const found = findOverlapClusters(evidence, wording, resolved);
  warnings.push(...found.warnings);
  onProgress?.('clusters', 1);

  onProgress?.('recommendations', 0);
  const cuts = recommendCuts(evidence, found.clusters, resolved, scaleAlphaOracle(evidence, matrix));
  onProgress?.('recommendations', 1);

  onProgress?.('what-if', 0);
  const afterCut = simulateCut(evidence, matrix, cuts.removed.map((index) => items[index].id), resolved);
  onProgress?.('what-if', 1);

  let recommendations: Recommendation[] = [...cuts.recommendations];
  if (resolved.bootstrap > 0 && recommendations.length > 0) {
    onCutList?.(recommendations);
    const reuse = evidence.localDependence === null ? null : localDependenceReuse(evidence.localDependence);
    const stability = await bootstrapStability(matrix, items, resolved, wording, recommendations, { onProgress, signal, reuse, ...(runner === undefined ? {} : { runner }) });
    recommendations = recommendations.map((recommendation, k) => {
      const share = stability.shares[k];
      const overlapShare = stability.overlapShares[k];
      const unstable = stability.unstable[k];
      let caution: Caution | null = null;
      if (unstable) {
        const code = overlapShare >= resolved.stabilityThreshold ? 'unstable-choice' : 'unstable';
        caution = { code, share, overlapShare, resamples: stability.resamples, threshold: resolved.stabilityThreshold };
      }
      const cautions = caution === null ? recommendation.cautions : [...recommendation.cautions, caution];
      return { ...recommendation, stability: share, unstable, overlapStability: overlapShare, cautions };
    });
    if (stability.failedResamples > 0) {
      warnings.push({
        code: 'bootstrap-resamples-failed',
        items: [],
        message: `${stability.failedResamples} of ${stability.resamples} bootstrap resamples could not be analysed and count as not repeating any recommendation.`,
      });
    }
  } else if (resolved.bootstrap === 0 && recommendations.length > 0) {
    warnings.push({ code: 'bootstrap-off', items: [], message: 'The bootstrap was turned off, so the stability of each recommendation is null.' });
  }

  const ids = (list: readonly number[]): string[] => list.map((index) => items[index].id);
  const clusters: ClusterReport[] = found.clusters.map((cluster) => ({
    items: ids(cluster.items),
    maxR: cluster.maxR,
    conditionIndex: cluster.conditionIndex,
    strongPairs: cluster.strongPairs.map((pair) => pairReport(evidence, pair)),
    dependencies: cluster.dependencies.map((dependency) => dependencyReport(evidence, dependency)),
    exactDependencies: cluster.exactDependencies.map(ids),
  }));
  const figuresOf = pairLocalFigures(evidence);
  const pairs: PairReport[] = found.linkedPairs.map(({ a, b, rules }) => {
    const figures = figuresOf(a, b);
    return pairReport(evidence, {
      ...pairEvidence(evidence, wording, a, b, resolved.confidenceLevel),
      residual: figures.residual,
      relativeResidual: figures.relativeResidual,
      residualCritical: figures.residualCritical,
      wto: figures.wto,
      partial: figures.partial,
      mi: figures.mi,
      miCritical: figures.miCritical,
      sepc: figures.sepc,
      rules,
    });
  });
  return { recommendations, afterCut, clusters, warnings, settings: resolved, pairs };
}
