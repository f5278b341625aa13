/**
 * Pair and dependency evidence keyed by item id, as the audit JSON and the recommendations
 * carry it.
 */
import type { DependencyEvidence, EngineEvidence, PairEvidence } from './types';
import type { DependencyReport, PairReport } from './recommend-cuts';

/**
 * A pair's evidence with item ids in place of indices, for the audit JSON.
 * @param evidence The evidence the pair came from.
 * @param pair The pair (indices into items[]).
 * @returns The same figures keyed by item id.
 * References: Fisher 1921 (the interval it carries).
 */
export function pairReport(evidence: EngineEvidence, pair: PairEvidence): PairReport {
  return {
    items: [evidence.items[pair.a].id, evidence.items[pair.b].id],
    r: pair.r,
    n: pair.n,
    lower: pair.lower,
    upper: pair.upper,
    ...(pair.interval ? { interval: pair.interval } : {}),
    ...(pair.interval === 'estimator-se' ? { se: pair.se ?? null } : {}),
    wording: pair.wording,
    residual: pair.residual ?? null,
    relativeResidual: pair.relativeResidual ?? null,
    residualCritical: pair.residualCritical ?? null,
    wto: pair.wto ?? null,
    partial: pair.partial ?? null,
    mi: pair.mi ?? null,
    miCritical: pair.miCritical ?? null,
    sepc: pair.sepc ?? null,
    rules: [...(pair.rules ?? [])],
  };
}

/**
 * A near-dependency with item ids in place of indices, for the audit JSON.
 * @param evidence The evidence the dependency came from.
 * @param dependency The dependency (indices into items[]).
 * @returns The same figures keyed by item id.
 * References: Belsley, Kuh & Welsch 1980, "Regression Diagnostics", ch. 3.
 */
export function dependencyReport(evidence: EngineEvidence, dependency: DependencyEvidence): DependencyReport {
  return {
    dimension: dependency.dimension,
    conditionIndex: dependency.conditionIndex,
    items: dependency.items.map((index) => evidence.items[index].id),
    proportions: dependency.proportions,
    interceptProportion: dependency.interceptProportion,
    confirmed: dependency.confirmed.map((index) => evidence.items[index].id),
  };
}
