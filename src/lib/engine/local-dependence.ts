/**
 * Local-dependence evidence (methods.md §3b): residual correlations after each scale's one-factor
 * model with a parametric-bootstrap critical value for the relative rule, and the weighted
 * topological overlap (wTO) of the EBIC-selected graphical-lasso network of all usable items.
 *
 * The numerical work is the core's (src/lib/stats); this file only decides which matrices go in
 * (each scale's block of the audit's correlation matrix; the whole matrix for the network) and
 * gathers the results per item. The detectors sit behind `LocalDependenceDetectors` so that the
 * engine's rules can be tested with any implementation and the bootstrap can reuse what is too
 * costly to repeat (see `LocalDependenceReuse`).
 */
import { normalQuantile } from '../stats/normal-distribution';
import type { SquareMatrix } from '../stats/types';
import { principalSubmatrix } from './principal-submatrix';
import { MAX_NETWORK_ITEMS } from './engine-settings';
import type { EngineItem, EngineWarning, LocalDependenceEvidence, ScaleResidualEvidence } from './types';

/** Residual correlations of one scale after its one-factor model. */
export interface ScaleResidualResult {
  /** One-factor loadings (scale order), or null when the model could not be fitted. */
  readonly loadings: readonly number[] | null;
  /** Residual matrix r − λλᵀ with zero diagonal (scale order), or null with the loadings. */
  readonly residuals: readonly (readonly number[])[] | null;
  /** Mean off-diagonal residual, or null. */
  readonly meanResidual: number | null;
}

/** The network of all usable items. */
export interface NetworkResult {
  /** Signed regularised partial correlations, zero diagonal. */
  readonly partial: SquareMatrix;
  /** Weighted topological overlap of |partial|. */
  readonly wto: SquareMatrix;
  /** The penalty used. */
  readonly penalty: number;
}

/** The numerical detectors the engine calls (implemented by the core; see `coreDetectors`). */
export interface LocalDependenceDetectors {
  /** One-factor residuals of a scale's correlation block. */
  scaleResiduals(correlation: SquareMatrix, statistic: 'residual' | 'q3'): ScaleResidualResult;
  /**
   * Critical value of a scale's largest relative residual: the given quantile of its distribution
   * over parametric-bootstrap draws of n respondents from the fitted model (seeded). Null when it
   * cannot be computed.
   */
  residualCritical(
    loadings: readonly number[],
    sampleSize: number,
    options: { draws: number; quantile: number; seed: number; thresholds: readonly (readonly number[])[] | null; statistic: 'residual' | 'q3' },
  ): number | null;
  /**
   * EBIC-glasso network and its wTO. With `penalty` set, the network is fitted at that penalty
   * only (no EBIC path). `onProgress`, when given, hears the share of the EBIC path fitted.
   */
  network(
    correlation: SquareMatrix,
    sampleSize: number,
    options: { gamma: number; penaltyCount: number; penalty: number | null; onProgress?: (fraction: number) => void },
  ): NetworkResult | null;
  /**
   * Modification indices and standardized expected parameter changes of the residual covariances
   * of the one-factor ML model of a scale's correlation block (four or more items); null when the
   * model cannot be fitted. `start`, when given, holds uniquenesses (block order, null for
   * Jöreskog's start) to start the ML search from: the same optimum to the fit's tolerance.
   */
  modificationIndices(correlation: SquareMatrix, sampleSize: number, start?: readonly (number | null)[] | null): ModificationIndexResult | null;
}

/** Modification indices of one scale block (both matrices in block order, zero diagonal). */
export interface ModificationIndexResult {
  readonly mi: SquareMatrix;
  readonly sepc: SquareMatrix;
  /** The fitted model's uniquenesses (block order). */
  readonly uniquenesses: readonly number[];
}

/** What a bootstrap resample reuses from the full sample (so a resample stays affordable). */
export interface LocalDependenceReuse {
  /** Each scale's critical value, by scale id. */
  readonly critical: ReadonlyMap<string, number | null>;
  /** The EBIC-selected penalty (the resample fits one network at it). */
  readonly penalty: number | null;
  /**
   * Each scale member's uniqueness in the first one-factor ML model of its scale's sequential
   * modification-index test, by index into items[]: a resample's ML fits start there instead of at
   * Jöreskog's start (fewer iterations to the same optimum).
   */
  readonly uniquenesses: ReadonlyMap<number, number>;
}

/** Settings `localDependenceEvidence` reads. */
export interface LocalDependenceSettings {
  readonly residualBootstrapDraws: number;
  readonly residualCriticalQuantile: number;
  readonly residualStatistic: 'residual' | 'q3';
  readonly ebicGamma: number;
  readonly ebicPenaltyCount: number;
  readonly seed: number;
  readonly strongPairThreshold: number;
  readonly residualRelativeThreshold: number;
  readonly modificationIndexAlpha: number;
  readonly modificationIndexNetworkAlpha: number;
  readonly modificationIndexMinSepc: number;
}

/** Smallest scale whose one-factor residuals carry information (3 items fit exactly). */
export const MIN_ITEMS_FOR_RESIDUALS = 4;

/**
 * The local-dependence evidence of a wave.
 * @param correlation Correlation matrix over `usable` (positive definite for the network).
 * @param items All items.
 * @param usable Indices into items[] of the matrix's items.
 * @param sampleSize Respondents behind the matrix.
 * @param settings Bootstrap draws, quantile, EBIC gamma and seed.
 * @param detectors The numerical detectors.
 * @param reuse When given (bootstrap resamples), critical values and the penalty are taken from it.
 * @param exactDependencies Exactly dependent groups (indices into items[]); their later members stay out of the network.
 * @param thresholds Latent thresholds per usable item (Φ⁻¹ of its cumulative answer shares), for
 *   ordinal bootstrap draws; null entries (or null) give normal draws for the scale.
 * @param withNetwork False leaves the network out (partial, wTO and penalty null); a bootstrap
 *   resample then fits it with `localDependenceNetwork` only when it can change a decision.
 * @throws {RangeError} when the matrix does not match the usable items.
 * @returns The evidence and warnings for whatever could not be computed.
 * References: Yen 1984 (Q3); Christensen, Makransky & Horton 2017 (relative rule, bootstrap
 * critical value); Nowick et al. 2009 (wTO); Friedman, Hastie & Tibshirani 2008; Foygel & Drton 2010.
 */
export function localDependenceEvidence(
  correlation: SquareMatrix,
  items: readonly EngineItem[],
  usable: readonly number[],
  sampleSize: number,
  settings: LocalDependenceSettings,
  detectors: LocalDependenceDetectors,
  reuse: LocalDependenceReuse | null = null,
  thresholds: readonly (readonly number[] | null)[] | null = null,
  exactDependencies: readonly (readonly number[])[] = [],
  withNetwork = true,
): { evidence: LocalDependenceEvidence; warnings: EngineWarning[] } {
  if (correlation.order !== usable.length) throw new RangeError(`localDependenceEvidence: matrix of order ${correlation.order} for ${usable.length} usable items`);
  const warnings: EngineWarning[] = [];
  const position = new Map(usable.map((item, k) => [item, k]));
  const scaleIds: string[] = [];
  for (const index of usable) {
    const scale = items[index].scale;
    if (scale !== null && !scaleIds.includes(scale)) scaleIds.push(scale);
  }
  const scales: ScaleResidualEvidence[] = [];
  scaleIds.forEach((scale, s) => {
    const members = usable.filter((index) => items[index].scale === scale);
    if (members.length < MIN_ITEMS_FOR_RESIDUALS) return;
    const block = principalSubmatrix(correlation, members.map((index) => position.get(index) as number));
    // A near-copy pair becomes the scale's one factor and pushes every other pair's residual up.
    // The later member of each near-copy pair (|r| at or above the strong-pair threshold and
    // standing out of the scale by the relative rule) is left out of the model; its own pairs keep
    // the residuals of the full model.
    const nearCopies = nearCopyMembers(block, settings);
    const full = detectors.scaleResiduals(block, settings.residualStatistic);
    let fit = full;
    if (nearCopies.size > 0 && members.length - nearCopies.size >= MIN_ITEMS_FOR_RESIDUALS) {
      const keptLocal = members.map((_, k) => k).filter((k) => !nearCopies.has(k));
      const reduced = detectors.scaleResiduals(principalSubmatrix(block, keptLocal), settings.residualStatistic);
      if (reduced.loadings !== null && reduced.residuals !== null && full.residuals !== null && full.loadings !== null) {
        const residuals = full.residuals.map((row) => [...row]);
        keptLocal.forEach((a, x) => keptLocal.forEach((b, y) => (residuals[a][b] = (reduced.residuals as number[][])[x][y])));
        const loadings = [...full.loadings];
        keptLocal.forEach((a, x) => (loadings[a] = (reduced.loadings as number[])[x]));
        fit = { loadings, residuals, meanResidual: reduced.meanResidual, criticalLoadings: reduced.loadings } as ScaleResidualResult & { criticalLoadings: readonly number[] };
      }
    }
    if (fit.loadings === null || fit.residuals === null || fit.meanResidual === null) {
      warnings.push({ code: 'residuals-skipped', items: members.map((index) => items[index].id), message: `Scale ${scale}: its one-factor model could not be fitted, so its residual correlations were not checked.` });
      return;
    }
    const criticalLoadings = (fit as { criticalLoadings?: readonly number[] }).criticalLoadings ?? fit.loadings;
    const criticalItems = criticalLoadings === fit.loadings ? members : members.filter((_, k) => !nearCopies.has(k));
    let critical: number | null;
    if (reuse !== null) critical = reuse.critical.get(scale) ?? null;
    else if (settings.residualBootstrapDraws === 0) critical = null;
    else {
      const scaleThresholds = thresholds === null ? null : criticalItems.map((index) => thresholds[position.get(index) as number]);
      critical = detectors.residualCritical(criticalLoadings, sampleSize, {
        draws: settings.residualBootstrapDraws,
        quantile: settings.residualCriticalQuantile,
        seed: settings.seed + s,
        statistic: settings.residualStatistic,
        thresholds: scaleThresholds !== null && scaleThresholds.every((list) => list !== null && list.length > 0) ? (scaleThresholds as number[][]) : null,
      });
    }
    const start = reuse === null ? null : members.map((index) => reuse.uniquenesses.get(index) ?? null);
    const modification = sequentialModificationIndices(block, sampleSize, settings, detectors, nearCopies, start);
    scales.push({ scale, items: members, loadings: fit.loadings, residuals: fit.residuals, meanResidual: fit.meanResidual, critical, ...modification });
  });

  const network = withNetwork ? localDependenceNetwork(correlation, usable, sampleSize, settings, detectors, reuse, exactDependencies) : { network: null, warnings: [] };
  warnings.push(...network.warnings);
  return {
    evidence: { scales, partial: network.network?.partial ?? null, wto: network.network?.wto ?? null, penalty: network.network?.penalty ?? null },
    warnings,
  };
}

/**
 * The partial-correlation network of all usable items and its wTO (the second half of
 * `localDependenceEvidence`, callable on its own so a bootstrap resample fits it only when its
 * rules can change a decision).
 * @param correlation Correlation matrix over `usable`.
 * @param usable Indices into items[] of the matrix's items.
 * @param sampleSize Respondents behind the matrix.
 * @param settings EBIC gamma and penalty count.
 * @param detectors The numerical detectors.
 * @param reuse When given, the network is fitted at its penalty only.
 * @param exactDependencies Exactly dependent groups (indices into items[]); their later members stay out.
 * @param onProgress Hears the share of the EBIC path fitted (a long path takes seconds).
 * @returns The network (null when skipped or not estimable) and the warnings saying why.
 * References: Friedman, Hastie & Tibshirani 2008; Foygel & Drton 2010; Nowick et al. 2009.
 */
export function localDependenceNetwork(
  correlation: SquareMatrix,
  usable: readonly number[],
  sampleSize: number,
  settings: Pick<LocalDependenceSettings, 'ebicGamma' | 'ebicPenaltyCount'>,
  detectors: LocalDependenceDetectors,
  reuse: LocalDependenceReuse | null,
  exactDependencies: readonly (readonly number[])[],
  onProgress?: (fraction: number) => void,
): { network: NetworkResult | null; warnings: EngineWarning[] } {
  const warnings: EngineWarning[] = [];
  const position = new Map(usable.map((item, k) => [item, k]));
  let network: NetworkResult | null = null;
  // An exact copy makes the matrix singular, and the network needs it positive definite: the
  // network is estimated without the later members of each exact dependency (their wTO and
  // partial correlations are then 0, and the exact rule covers them).
  const dropped = new Set<number>();
  for (const group of exactDependencies) for (const item of group.slice(1)) dropped.add(position.get(item) as number);
  const kept = usable.map((_, k) => k).filter((k) => !dropped.has(k));
  if (kept.length > MAX_NETWORK_ITEMS) {
    warnings.push({
      code: 'network-skipped',
      items: [],
      message: `The partial-correlation network is estimated for at most ${MAX_NETWORK_ITEMS} items and this wave has ${kept.length} in the matrix, so weighted topological overlap was not checked; the residual rule and the other evidence still were. Audit the scales in smaller groups to check it.`,
    });
  } else if (kept.length >= 3) {
    try {
      const fitted = detectors.network(dropped.size === 0 ? correlation : principalSubmatrix(correlation, kept), sampleSize, {
        gamma: settings.ebicGamma,
        penaltyCount: settings.ebicPenaltyCount,
        penalty: reuse?.penalty ?? null,
        ...(onProgress ? { onProgress } : {}),
      });
      network = fitted === null || dropped.size === 0 ? fitted : { ...fitted, partial: expand(fitted.partial, kept, usable.length), wto: expand(fitted.wto, kept, usable.length) };
    } catch (error) {
      if (!(error instanceof RangeError)) throw error;
      warnings.push({ code: 'network-skipped', items: [], message: `The partial-correlation network could not be estimated (${error.message}), so weighted topological overlap was not checked.` });
    }
  }
  return { network, warnings };
}

/**
 * The χ²(1) quantile a scale's largest modification index must exceed: the upper
 * α / (number of pairs) point (Bonferroni over the scale's residual covariances).
 * @param items Items in the scale (at least 2).
 * @param alpha Family-wise share of false alarms per scale, in (0, 1).
 * @returns The critical modification index.
 * References: Sörbom 1989 (the modification index is χ²(1) under the model); Bonferroni (Dunn 1961).
 */
export function modificationIndexCritical(items: number, alpha: number): number {
  const pairs = (items * (items - 1)) / 2;
  const z = normalQuantile(1 - alpha / (2 * pairs));
  return z * z;
}

/**
 * Sequential modification-index test of one scale (Sörbom 1989: free one parameter at a time):
 * the pair with the largest index among those whose standardized expected change is at least
 * `modificationIndexMinSepc` (a residual correlation of a size that matters: with thousands of
 * respondents trivial covariances pass any level; Saris, Satorra & van der Veld 2009) is flagged when its index
 * exceeds the scale's critical value at the network level; the later member of the flagged pair is
 * then set aside and the model refitted to the rest, until no index exceeds that critical value or
 * fewer than four items remain. The flags that also pass the strict level come first (the indices
 * at each step are the largest left), so the strict test's flags are a prefix of the sequence. A doublet tilts the one factor toward itself and gives other pairs spurious
 * indices; setting one member aside (as a cut would) removes them. Near-copy members are set
 * aside from the start (the strong-pair rule covers them; with them the model is a Heywood case).
 * With `start` (a bootstrap resample: the full sample's uniquenesses, block order) the first fit
 * starts from it and each refit from the fit before it; without it every fit starts at
 * Jöreskog's start, as on the full sample.
 */
function sequentialModificationIndices(
  block: SquareMatrix,
  sampleSize: number,
  settings: Pick<LocalDependenceSettings, 'modificationIndexAlpha' | 'modificationIndexNetworkAlpha' | 'modificationIndexMinSepc'>,
  detectors: LocalDependenceDetectors,
  setAside: ReadonlySet<number>,
  start: readonly (number | null)[] | null,
): Pick<ScaleResidualEvidence, 'modificationIndices' | 'sepc' | 'miCritical' | 'miNetworkCritical' | 'miFlagged' | 'miStrictCount' | 'miUniquenesses'> {
  const k = block.order;
  const none = { modificationIndices: null, sepc: null, miCritical: null, miNetworkCritical: null, miFlagged: [], miStrictCount: 0, miUniquenesses: null };
  const strict = settings.modificationIndexAlpha;
  const loose = Math.max(strict, settings.modificationIndexNetworkAlpha);
  if (!(strict > 0 && strict < 1 && loose < 1) || sampleSize < 10) return none;
  const miCritical = modificationIndexCritical(k, strict);
  const miNetworkCritical = modificationIndexCritical(k, loose);
  const mi: (number | null)[][] = Array.from({ length: k }, () => new Array<number | null>(k).fill(null));
  const sepc: (number | null)[][] = Array.from({ length: k }, () => new Array<number | null>(k).fill(null));
  const miFlagged: { a: number; b: number; mi: number }[] = [];
  let active = Array.from({ length: k }, (_, x) => x).filter((x) => !setAside.has(x));
  let miUniquenesses: (number | null)[] | null = null;
  // Block position → uniqueness to start the next fit from (a resample only).
  const warm: (number | null)[] | null = start === null ? null : [...start];
  while (active.length >= MIN_ITEMS_FOR_RESIDUALS) {
    const result = detectors.modificationIndices(principalSubmatrix(block, active), Math.round(sampleSize), warm === null ? null : active.map((x) => (warm as (number | null)[])[x]));
    if (result === null) break;
    const m = active.length;
    if (miUniquenesses === null) {
      miUniquenesses = new Array<number | null>(k).fill(null);
      for (let x = 0; x < m; x++) miUniquenesses[active[x]] = result.uniquenesses[x];
    }
    if (warm !== null) for (let x = 0; x < m; x++) warm[active[x]] = result.uniquenesses[x];
    let best: [number, number] | null = null;
    let bestValue = -Infinity;
    for (let x = 0; x < m; x++) {
      for (let y = x + 1; y < m; y++) {
        const value = result.mi.data[x * m + y];
        const change = result.sepc.data[x * m + y];
        mi[active[x]][active[y]] = mi[active[y]][active[x]] = value;
        sepc[active[x]][active[y]] = sepc[active[y]][active[x]] = change;
        if (change >= settings.modificationIndexMinSepc && change > 0 && value > bestValue) {
          bestValue = value;
          best = [active[x], active[y]];
        }
      }
    }
    if (best === null || !(bestValue > miNetworkCritical)) break;
    miFlagged.push({ a: best[0], b: best[1], mi: bestValue });
    const later = best[1];
    active = active.filter((x) => x !== later);
  }
  let miStrictCount = 0;
  while (miStrictCount < miFlagged.length && miFlagged[miStrictCount].mi > miCritical) miStrictCount++;
  return miUniquenesses !== null ? { modificationIndices: mi, sepc, miCritical, miNetworkCritical, miFlagged, miStrictCount, miUniquenesses } : none;
}

/** Local positions of the later member of each near-copy pair of a scale block. */
function nearCopyMembers(block: SquareMatrix, settings: LocalDependenceSettings): Set<number> {
  const k = block.order;
  const r = (a: number, b: number): number => block.data[a * k + b];
  const later = new Set<number>();
  for (let a = 0; a < k; a++) {
    for (let b = a + 1; b < k; b++) {
      if (later.has(a) || later.has(b) || Math.abs(r(a, b)) < settings.strongPairThreshold || k < 3) continue;
      let sum = 0;
      for (let c = 0; c < k; c++) if (c !== a && c !== b) sum += (r(a, c) + r(b, c)) / 2;
      if (r(a, b) - sum / (k - 2) >= settings.residualRelativeThreshold) later.add(b);
    }
  }
  return later;
}

/** A matrix over `kept` positions written into a zero matrix of the full order. */
function expand(matrix: SquareMatrix, kept: readonly number[], order: number): SquareMatrix {
  const data = new Float64Array(order * order);
  kept.forEach((i, x) => kept.forEach((j, y) => (data[i * order + j] = matrix.data[x * matrix.order + y])));
  return { order, data };
}

/**
 * What a bootstrap resample reuses from the full-sample evidence.
 * @param evidence The full-sample local-dependence evidence.
 * @returns Critical values by scale, the selected penalty and the members' ML uniquenesses.
 * References: none (bookkeeping).
 */
export function localDependenceReuse(evidence: LocalDependenceEvidence): LocalDependenceReuse {
  const uniquenesses = new Map<number, number>();
  for (const scale of evidence.scales) {
    scale.items.forEach((item, k) => {
      const psi = scale.miUniquenesses?.[k] ?? null;
      if (psi !== null) uniquenesses.set(item, psi);
    });
  }
  return { critical: new Map(evidence.scales.map((scale) => [scale.scale, scale.critical])), penalty: evidence.penalty, uniquenesses };
}
