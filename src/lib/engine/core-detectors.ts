/**
 * The local-dependence detectors as the numerical core implements them (src/lib/stats): one-factor
 * minres residuals per scale, the parametric-bootstrap critical value of the relative residual,
 * the EBIC-selected graphical-lasso network and its weighted topological overlap. The engine
 * calls them through `LocalDependenceDetectors` (local-dependence.ts).
 */
import { ebicGlasso } from '../stats/ebic-glasso';
import { graphicalLasso } from '../stats/graphical-lasso';
import { oneFactorMl } from '../stats/one-factor-ml';
import { oneFactorResiduals, residualBootstrap } from '../stats/residual-correlations';
import { residualModificationIndices } from '../stats/residual-modification-indices';
import type { SquareMatrix } from '../stats/types';
import { weightedTopologicalOverlap } from '../stats/weighted-topological-overlap';
import type { LocalDependenceDetectors, ModificationIndexResult, NetworkResult, ScaleResidualResult } from './local-dependence';

/** Signed partial correlations −θ_ij / sqrt(θ_ii θ_jj) of a precision matrix, zero diagonal. */
function partialFromPrecision(precision: SquareMatrix): SquareMatrix {
  const p = precision.order;
  const data = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      if (i === j) continue;
      data[i * p + j] = -precision.data[i * p + j] / Math.sqrt(precision.data[i * p + i] * precision.data[j * p + j]);
    }
  }
  return { order: p, data };
}

/**
 * The core's detectors.
 * References: Harman & Jones 1966 (minres); Yen 1984 (Q3 residuals); Friedman, Hastie &
 * Tibshirani 2008 (graphical lasso); Foygel & Drton 2010 (EBIC); Nowick et al. 2009 (wTO);
 * Sörbom 1989 and Saris, Satorra & van der Veld 2009 (modification indices, SEPC).
 */
export const coreDetectors: LocalDependenceDetectors = Object.freeze({
  scaleResiduals(correlation: SquareMatrix, statistic: 'residual' | 'q3'): ScaleResidualResult {
    const fit = oneFactorResiduals(correlation, { statistic });
    const k = correlation.order;
    const residuals = Array.from({ length: k }, (_, i) => Array.from(fit.residuals.data.subarray(i * k, (i + 1) * k)));
    return { loadings: Array.from(fit.loadings), residuals, meanResidual: fit.meanResidual };
  },
  residualCritical(loadings: readonly number[], sampleSize: number, options: Parameters<LocalDependenceDetectors['residualCritical']>[2]): number | null {
    if (sampleSize < 10) return null;
    const result = residualBootstrap(loadings, Math.round(sampleSize), {
      draws: options.draws,
      seed: options.seed,
      statistic: options.statistic,
      ...(options.thresholds === null ? {} : { thresholds: options.thresholds }),
    });
    // The core reports the 95th and 99th percentiles; any other quantile is read off the sorted draws (type 7).
    if (options.quantile === 0.95) return result.criticalValue95;
    if (options.quantile === 0.99) return result.criticalValue99;
    const sorted = result.maxRelative;
    const h = (sorted.length - 1) * options.quantile;
    const low = Math.floor(h);
    return sorted[low] + (h - low) * ((sorted[Math.min(low + 1, sorted.length - 1)] ?? sorted[low]) - sorted[low]);
  },
  network(
    correlation: SquareMatrix,
    sampleSize: number,
    options: { gamma: number; penaltyCount: number; penalty: number | null; onProgress?: (fraction: number) => void },
  ): NetworkResult | null {
    if (options.penalty !== null) {
      if (options.penalty <= 0) return null;
      const fit = graphicalLasso(correlation, options.penalty);
      const partial = partialFromPrecision(fit.precision);
      const absolute: SquareMatrix = { order: partial.order, data: partial.data.map(Math.abs) };
      return { partial, wto: weightedTopologicalOverlap(absolute), penalty: options.penalty };
    }
    const onProgress = options.onProgress;
    const result = ebicGlasso(correlation, Math.round(sampleSize), {
      gamma: options.gamma,
      penaltyCount: options.penaltyCount,
      ...(onProgress ? { onPenalty: (done: number, total: number) => onProgress(done / total) } : {}),
    });
    return { partial: result.partialCorrelations, wto: weightedTopologicalOverlap(result.absoluteNetwork), penalty: result.penalty };
  },
  modificationIndices(correlation: SquareMatrix, sampleSize: number, start?: readonly (number | null)[] | null): ModificationIndexResult | null {
    try {
      const fit = oneFactorMl(correlation, sampleSize, start === undefined || start === null ? {} : { start });
      const result = residualModificationIndices(correlation, sampleSize, fit);
      // A Heywood case (a uniqueness at the floor) leaves no usable score test for that item's pairs.
      return result.fit.converged ? { mi: result.mi, sepc: result.sepc, uniquenesses: result.fit.uniquenesses } : null;
    } catch (error) {
      if (error instanceof RangeError) return null;
      throw error;
    }
  },
});
