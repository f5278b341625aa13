/**
 * The local-dependence evidence of one wave as `computeEvidence` assembles it: each item's latent
 * thresholds for the ordinal residual bootstrap, the engine's settings resolved against their
 * defaults, and the call of `localDependenceEvidence` with the core's detectors (or those a test
 * or a bootstrap resample passes).
 */
import { codeOrdinalItem } from '../stats/polychoric-coding';
import type { ItemMatrix, SquareMatrix } from '../stats/types';
import { coreDetectors } from './core-detectors';
import { DEFAULT_ENGINE_SETTINGS } from './engine-settings';
import { localDependenceEvidence, type LocalDependenceDetectors, type LocalDependenceReuse, type LocalDependenceSettings } from './local-dependence';
import type { EngineItem, EngineWarning, LocalDependenceEvidence } from './types';

/**
 * Latent thresholds of each column (Φ⁻¹ of its cumulative answer shares), so the residual
 * bootstrap draws ordinal items like the wave's; a column with too many values for that
 * (continuous) gets null, and normal draws.
 * @param data The usable columns, recoded (missing as NaN).
 * @param needed Which columns the bootstrap can draw (items in a scale); the others get null
 *   without being read (default all).
 * @returns One list of thresholds (or null) per column.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient" (thresholds from the marginal shares).
 */
export function latentThresholds(data: ItemMatrix, needed: (column: number) => boolean = () => true): (number[] | null)[] {
  return Array.from({ length: data.columns }, (_, k): number[] | null => {
    if (!needed(k)) return null;
    const column = data.data.subarray(k * data.rows, (k + 1) * data.rows);
    try {
      const coded = codeOrdinalItem(column);
      return coded.thresholds.count === 0 ? null : Array.from(coded.thresholds.limits.subarray(0, coded.thresholds.count));
    } catch (error) {
      if (error instanceof RangeError) return null;
      throw error;
    }
  });
}

/**
 * The engine settings the local-dependence evidence reads, each at its default when not given.
 * @param settings Any subset of them.
 * @returns All of them.
 * References: none (bookkeeping).
 */
export function localDependenceSettings(settings: Partial<LocalDependenceSettings>): LocalDependenceSettings {
  const pick = <K extends keyof LocalDependenceSettings>(name: K): LocalDependenceSettings[K] => (settings[name] ?? DEFAULT_ENGINE_SETTINGS[name]) as LocalDependenceSettings[K];
  return {
    residualBootstrapDraws: pick('residualBootstrapDraws'),
    residualCriticalQuantile: pick('residualCriticalQuantile'),
    residualStatistic: pick('residualStatistic'),
    ebicGamma: pick('ebicGamma'),
    ebicPenaltyCount: pick('ebicPenaltyCount'),
    seed: pick('seed'),
    strongPairThreshold: pick('strongPairThreshold'),
    residualRelativeThreshold: pick('residualRelativeThreshold'),
    modificationIndexAlpha: pick('modificationIndexAlpha'),
    modificationIndexNetworkAlpha: pick('modificationIndexNetworkAlpha'),
    modificationIndexMinSepc: pick('modificationIndexMinSepc'),
  };
}

/**
 * The local-dependence evidence of a wave.
 * @param data The usable columns (recoded), in the order of `usable`.
 * @param correlation The audit's correlation matrix over them (repaired if it was indefinite).
 * @param items All items.
 * @param usable Indices into items[] of the matrix's items.
 * @param sampleSize Respondents behind the matrix.
 * @param settings Any of the local-dependence settings (defaults for the rest).
 * @param options Detectors (default the core's), what a bootstrap resample reuses, and whether to fit
 *   the network (false leaves it out: a resample fits it only where it can change a decision).
 * @param exactDependencies Exactly dependent groups (indices into items[]).
 * @throws {RangeError} when the matrix does not match the usable items.
 * @returns The evidence and its warnings.
 * References: see `localDependenceEvidence`.
 */
export function waveLocalDependence(
  data: ItemMatrix,
  correlation: SquareMatrix,
  items: readonly EngineItem[],
  usable: readonly number[],
  sampleSize: number,
  settings: Partial<LocalDependenceSettings>,
  options: { readonly detectors?: LocalDependenceDetectors; readonly reuse?: LocalDependenceReuse | null; readonly network?: boolean },
  exactDependencies: readonly (readonly number[])[],
): { evidence: LocalDependenceEvidence; warnings: EngineWarning[] } {
  return localDependenceEvidence(
    correlation,
    items,
    usable,
    sampleSize,
    localDependenceSettings(settings),
    options.detectors ?? coreDetectors,
    options.reuse ?? null,
    // A resample reuses the critical values and needs no thresholds for the residual bootstrap.
    // Only items in a scale are ever drawn: a wave without scales reads no column for them.
    options.reuse ? null : latentThresholds(data, (k) => items[usable[k]].scale !== null),
    exactDependencies,
    options.network ?? true,
  );
}
