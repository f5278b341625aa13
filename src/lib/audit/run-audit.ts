/**
 * One audit: from a wave's recoded response matrix and its item setup to the audit JSON
 * (`paredown.audit/1`, ../shared/docs/audit-json.md). The command line, the server's audit
 * workers and the tests all call this function, so an audit reads the same wherever it runs.
 *
 * Order of work: the engine's evidence (descriptives, correlation matrix under the chosen method
 * and missing-data policy, covariance, VIF, eigenvalues, Belsley-Kuh-Welsch, reliability), then
 * the structure statistics that only the report needs (KMO and MSA, Bartlett's test, parallel
 * analysis), then the redundancy engine (clusters, constrained cut list, what-if, bootstrap
 * stability), then the optional outcome model. Pure: no file, database or framework.
 */
import { runEngine } from '../engine/run-engine';
import { computeEvidence } from '../engine/compute-evidence';
import { principalSubmatrix } from '../engine/principal-submatrix';
import { resolveEngineSettings, type EngineSettings } from '../engine/engine-settings';
import type { EngineEvidence, EngineItem, EngineWarning } from '../engine/types';
import type { Recommendation } from '../engine/recommend-cuts';
import type { AfterCut } from '../engine/simulate-cut';
import { bartlettSphericity } from '../stats/bartlett-sphericity';
import { kaiserMeyerOlkin } from '../stats/kmo';
import { olsRegression } from '../stats/ols-regression';
import { parallelAnalysis } from '../stats/parallel-analysis';
import { relativeWeights } from '../stats/relative-weights';
import { completeRows } from '../stats/complete-rows';
import { correlationMatrix } from '../stats/correlation-matrix';
import { selectItems, selectRespondents, squareMatrixToRows, type ItemMatrix, type NumericalNotice } from '../stats/types';
import {
  AUDIT_SCHEMA,
  type AuditAfterCutJson,
  type AuditCoefficientJson,
  type AuditItemJson,
  type AuditJson,
  type AuditOutcomeModelJson,
  type AuditRecommendationJson,
  type AuditWarningJson,
} from './audit-json';

/** One item as the audit receives it (from the confirmed column setup). */
export interface AuditItemInput extends EngineItem {
  /** Reverse-keyed in the codebook (the matrix is already recoded). */
  readonly reverse: boolean;
}

/** What one audit reads. */
export interface AuditInput {
  /** Recoded answers of the respondents included in the audit (excluded ones already left out). */
  readonly matrix: ItemMatrix;
  /** One per matrix column, same order. */
  readonly items: readonly AuditItemInput[];
  /** Respondents in the stored wave, before exclusions. */
  readonly rowsInWave: number;
  /** Respondents the designer excluded (screening). */
  readonly excluded: number;
  /** The outcome column for the outcome model, when the settings name one. */
  readonly outcome: { readonly id: string; readonly values: Float64Array } | null;
}

/** Audit settings: the engine's settings plus the outcome. Anything unset takes its default. */
export interface AuditSettings extends Partial<EngineSettings> {
  readonly outcome?: string | null;
  /** Random data sets for parallel analysis. Default 100. */
  readonly parallelIterations?: number;
}

/** Progress of an audit: a stage name and the overall share done, 0 to 1. */
export type AuditProgress = (stage: string, fraction: number) => void;

/** Share of the overall progress bar each stage takes (the bootstrap dominates). */
const STAGE_SPAN = Object.freeze({ evidence: [0, 0.2], structure: [0.2, 0.3], engine: [0.3, 0.95], outcome: [0.95, 1] });

/**
 * Runs one audit.
 * @param input The recoded matrix, its items and the outcome column, if any.
 * @param settings Method, missing-data policy, thresholds, constraints, bootstrap size and seed,
 *   outcome; every unset value takes its stated default.
 * @param onProgress Called with the stage and overall fraction done.
 * @param signal Aborts between bootstrap resamples.
 * @throws {RangeError} when the items do not match the matrix, a setting is out of range, or the
 *   settings name an outcome that was not supplied.
 * @returns The audit JSON; statistics that do not exist are null with a warning.
 * References: see the functions it composes (methods.md §1-8).
 */
export async function runAudit(
  input: AuditInput,
  settings: AuditSettings = {},
  onProgress?: AuditProgress,
  signal?: AbortSignal,
): Promise<AuditJson> {
  const { outcome: outcomeId = null, parallelIterations = 100, ...engineOverrides } = settings;
  const engineSettings = resolveEngineSettings(engineOverrides);
  if (input.matrix.columns !== input.items.length) {
    throw new RangeError(`runAudit: the matrix has ${input.matrix.columns} columns but ${input.items.length} items were described`);
  }
  if (outcomeId !== null && (input.outcome === null || input.outcome.id !== outcomeId)) {
    throw new RangeError(`runAudit: the settings name the outcome "${outcomeId}" but no such outcome column was supplied`);
  }
  const report = (stage: keyof typeof STAGE_SPAN, fraction: number): void => {
    const [from, to] = STAGE_SPAN[stage];
    onProgress?.(stage, from + (to - from) * Math.min(1, Math.max(0, fraction)));
  };

  report('evidence', 0);
  const evidence = computeEvidence(input.matrix, input.items, engineSettings);
  report('evidence', 1);

  report('structure', 0);
  const warnings: AuditWarningJson[] = [...evidence.warnings].map(plainWarning);
  const ids = input.items.map((item) => item.id);
  const usableIds = evidence.usable.map((j) => ids[j]);
  const respondentsForTests = respondentsBehind(evidence, input.matrix);
  const structure = structureStatistics(evidence, respondentsForTests, engineSettings.seed, parallelIterations, ids);
  warnings.push(...structure.warnings);
  report('structure', 1);

  const engine = await runEngine(
    evidence,
    input.matrix,
    input.items,
    engineSettings,
    (stage, fraction) => report('engine', stage === 'bootstrap' ? 0.1 + 0.9 * fraction : 0.1 * fraction),
    signal,
  );
  warnings.push(...engine.warnings.map(plainWarning));

  report('outcome', 0);
  const outcomeModel = input.outcome === null || outcomeId === null ? null : fitOutcomeModel(input, evidence, warnings);
  report('outcome', 1);

  const items: AuditItemJson[] = input.items.map((item, j) => {
    const local = evidence.usable.indexOf(j);
    const descriptives = evidence.descriptives[j];
    return {
      id: item.id,
      scale: item.scale,
      reverse: item.reverse,
      text: item.text,
      locked: item.locked,
      inMatrix: local >= 0,
      n: descriptives.n,
      mean: descriptives.mean,
      sd: descriptives.sd,
      missingRate: descriptives.missingRate,
      floor: descriptives.floor,
      ceiling: descriptives.ceiling,
      vif: evidence.vif[j],
      tolerance: evidence.tolerance[j],
      r2: evidence.r2[j],
      msa: local >= 0 ? structure.msa[local] : null,
      itemRest: evidence.itemRest[j],
      alphaIfDeleted: evidence.alphaIfDeleted[j],
      topPartner: evidence.topPartner[j] === null ? null : { id: ids[evidence.topPartner[j]!.index], r: evidence.topPartner[j]!.r },
    };
  });

  const collinearity = evidence.collinearity;
  return {
    schema: AUDIT_SCHEMA,
    settings: { ...engineSettings, outcome: outcomeId, parallelIterations },
    input: {
      rows: input.rowsInWave,
      respondentsUsed: input.matrix.rows,
      respondentsExcluded: input.excluded,
      items: input.items.length,
      itemsInMatrix: evidence.usable.length,
    },
    items,
    correlation: {
      method: evidence.method,
      missing: evidence.missing,
      items: usableIds,
      matrix: squareMatrixToRows(evidence.correlation),
      n: squareMatrixToRows(evidence.pairN),
      repaired: evidence.repaired,
    },
    eigenvalues: [...evidence.eigenvalues],
    conditionNumber: evidence.conditionNumber,
    collinearity:
      collinearity === null
        ? null
        : {
            columns: collinearity.columns.map((column) => (column < 0 ? '(intercept)' : ids[column])),
            conditionIndices: collinearity.conditionIndices.map((value) => value ?? null) as number[],
            varianceProportions: collinearity.varianceProportions.map((row) => [...row]),
            rowsUsed: collinearity.rowsUsed,
          },
    kmo: structure.kmo,
    kmoLabel: structure.kmoLabel,
    bartlett: structure.bartlett,
    parallelAnalysis: structure.parallel,
    scales: evidence.scales.map((scale) => ({
      id: scale.id,
      items: scale.items.map((j) => ids[j]),
      alpha: scale.alpha,
      alphaStd: scale.alphaStd,
      omegaTotal: scale.omegaTotal,
    })),
    recommendations: engine.recommendations.map(recommendationJson),
    afterCut: afterCutJson(engine.afterCut),
    clusters: engine.clusters,
    pairs: engine.pairs.map((pair) => ({ ...pair, items: [...pair.items], rules: [...pair.rules] })),
    outcomeModel,
    warnings: dedupeWarnings(warnings),
  };
}

/** Respondents behind the structure tests: complete rows under listwise, every row under pairwise. */
function respondentsBehind(evidence: EngineEvidence, matrix: ItemMatrix): number {
  if (evidence.missing === 'pairwise' || evidence.completeData) return matrix.rows;
  return completeRows(selectItems(matrix, evidence.usable)).length;
}

interface StructureStatistics {
  readonly kmo: number | null;
  readonly kmoLabel: string | null;
  readonly msa: (number | null)[];
  readonly bartlett: AuditJson['bartlett'];
  readonly parallel: AuditJson['parallelAnalysis'];
  readonly warnings: AuditWarningJson[];
}

/**
 * KMO, Bartlett's test and parallel analysis. They need an invertible matrix, so the last item of
 * each exactly dependent group (e.g. a duplicated column) is set aside for them, with a warning;
 * the eigenvalues and parallel analysis use the full matrix.
 */
function structureStatistics(
  evidence: EngineEvidence,
  respondents: number,
  seed: number,
  iterations: number,
  ids: readonly string[],
): StructureStatistics {
  const warnings: AuditWarningJson[] = [];
  const order = evidence.correlation.order;
  const usableIds = evidence.usable.map((j) => ids[j]);
  if (order < 2) {
    warnings.push({ code: 'too-few-items', items: usableIds, message: "Fewer than two items vary, so KMO, Bartlett's test and parallel analysis were skipped." });
    return { kmo: null, kmoLabel: null, msa: new Array(order).fill(null), bartlett: null, parallel: null, warnings };
  }
  const setAside = new Set(evidence.exactDependencies.map((group) => Math.max(...group)));
  const kept = evidence.usable.map((j, local) => ({ j, local })).filter(({ j }) => !setAside.has(j));
  const keptLocal = kept.map(({ local }) => local);
  const keptIds = kept.map(({ j }) => ids[j]);
  if (setAside.size > 0) {
    const names = [...setAside].map((j) => ids[j]);
    warnings.push({
      code: 'set-aside-for-structure',
      items: names,
      message: `${names.join(', ')} ${names.length > 1 ? 'are' : 'is'} an exact copy or combination of other items, so KMO and Bartlett's test are computed without ${names.length > 1 ? 'them' : 'it'}.`,
    });
  }
  const reduced = keptLocal.length === order ? evidence.correlation : principalSubmatrix(evidence.correlation, keptLocal);
  const msa: (number | null)[] = new Array(order).fill(null);
  let kmo: ReturnType<typeof kaiserMeyerOlkin> | null = null;
  let bartlett: ReturnType<typeof bartlettSphericity> | null = null;
  if (reduced.order >= 2) {
    kmo = kaiserMeyerOlkin(reduced);
    warnings.push(...noticeWarnings(kmo.notices, keptIds));
    kmo.items.forEach((entry, k) => {
      msa[keptLocal[k]] = entry.msa;
    });
    bartlett = bartlettSphericity(reduced, respondents);
    warnings.push(...noticeWarnings(bartlett.notices, keptIds));
  }
  let parallel: AuditJson['parallelAnalysis'] = null;
  if (respondents >= 3) {
    const result = parallelAnalysis(evidence.eigenvalues, respondents, { seed, iterations });
    parallel = { observed: [...result.observed], random95: [...result.random95], suggested: result.suggested, iterations: result.iterations, seed: result.seed };
  } else {
    warnings.push({ code: 'parallel-analysis-skipped', items: [], message: 'Parallel analysis needs at least three respondents with answers; it was skipped.' });
  }
  return {
    kmo: kmo?.overall ?? null,
    kmoLabel: kmo?.label ?? null,
    msa,
    bartlett: bartlett === null ? null : { chi2: bartlett.chiSquare, df: bartlett.degreesOfFreedom, p: bartlett.pValue, respondents: bartlett.respondents, items: keptIds.length },
    parallel,
    warnings,
  };
}

/**
 * The outcome model: OLS of the outcome on every item in the correlation matrix (items in an
 * exact dependency are aliased by the QR and reported as such), on the respondents with the
 * outcome and every item answered; Johnson's relative weights from the same rows' Pearson
 * correlations.
 */
function fitOutcomeModel(input: AuditInput, evidence: EngineEvidence, warnings: AuditWarningJson[]): AuditOutcomeModelJson | null {
  const outcome = input.outcome!;
  const ids = evidence.usable.map((j) => input.items[j].id);
  const p = evidence.usable.length;
  const predictorsAndOutcome = selectItems(input.matrix, evidence.usable);
  const table: ItemMatrix = { rows: predictorsAndOutcome.rows, columns: p + 1, data: concat(predictorsAndOutcome.data, outcome.values) };
  const complete = completeRows(table);
  if (complete.length < p + 2) {
    warnings.push({
      code: 'outcome-model-skipped',
      items: [outcome.id],
      message: `The outcome model needs more complete respondents (${complete.length}) than items plus two (${p + 2}); it was skipped.`,
    });
    return null;
  }
  const used = selectRespondents(table, complete);
  const x: ItemMatrix = { rows: used.rows, columns: p, data: used.data.subarray(0, used.rows * p) };
  const y = used.data.subarray(used.rows * p);
  const model = olsRegression(x, y);
  warnings.push(...noticeWarnings(model.notices, ids));

  // Relative weights need an invertible predictor correlation matrix: use the predictors the QR
  // could estimate (aliased ones, such as a duplicated column, carry no weight of their own).
  const estimable = model.predictors.map((predictor, k) => (predictor.aliased ? -1 : k)).filter((k) => k >= 0);
  const withOutcome = correlationMatrix(selectItems(used, [...estimable, p]), { method: 'pearson', missing: 'listwise' }).matrix;
  const q = estimable.length;
  const rxx = principalSubmatrix(withOutcome, estimable.map((_, k) => k));
  const rxy = withOutcome.data.slice(q * (q + 1), q * (q + 1) + q);
  const weights = relativeWeights(rxx, rxy);
  warnings.push(...noticeWarnings(weights.notices, estimable.map((k) => ids[k])));
  const weightOf = new Map<number, number>();
  if (weights.weights !== null) estimable.forEach((k, position) => weightOf.set(k, weights.weights![position]));

  const coefficients: AuditCoefficientJson[] = [
    {
      term: '(intercept)',
      estimate: model.intercept.estimate ?? 0,
      se: model.intercept.standardError,
      t: model.intercept.tStatistic,
      p: model.intercept.pValue,
      vif: null,
      sst: null,
      tolerance: null,
      relativeWeight: null,
    },
    ...model.predictors.map((predictor, k) => ({
      term: ids[k],
      estimate: predictor.estimate ?? 0,
      aliased: predictor.aliased,
      se: predictor.standardError,
      t: predictor.tStatistic,
      p: predictor.pValue,
      vif: predictor.varianceInflationFactor,
      sst: predictor.sumOfSquaresAboutMean,
      tolerance: predictor.tolerance,
      relativeWeight: weightOf.get(k) ?? null,
      seFactors: predictor.standardErrorFactors,
    })),
  ];
  return {
    outcome: outcome.id,
    n: model.observations,
    r2: model.rSquared ?? 0,
    adjR2: model.adjustedRSquared,
    ssr: model.sumOfSquaredResiduals,
    sigma: model.residualStandardError,
    coefficients,
  };
}

function concat(a: Float64Array, b: Float64Array): Float64Array {
  const out = new Float64Array(a.length + b.length);
  out.set(a);
  out.set(b, a.length);
  return out;
}

function recommendationJson(recommendation: Recommendation): AuditRecommendationJson {
  return {
    cluster: [...recommendation.cluster],
    keep: recommendation.keep,
    actions: recommendation.actions.map((action) => ({ ...action, blockedBy: [...action.blockedBy] })),
    evidence: { ...recommendation.evidence },
    stability: recommendation.stability,
    unstable: recommendation.unstable,
    overlapStability: recommendation.overlapStability,
    reason: recommendation.reason,
    cautions: [...recommendation.cautions],
  };
}

function afterCutJson(afterCut: AfterCut): AuditAfterCutJson {
  const { warnings: _warnings, ...rest } = afterCut;
  return { ...rest, scales: afterCut.scales.map((scale) => ({ ...scale })), removed: [...afterCut.removed] };
}

function plainWarning(warning: EngineWarning): AuditWarningJson {
  return { code: warning.code, items: [...warning.items], message: warning.message };
}

function noticeWarnings(notices: readonly NumericalNotice[], ids: readonly string[]): AuditWarningJson[] {
  return notices.map((notice) => ({ code: notice.code, items: notice.items.map((k) => ids[k] ?? String(k)), message: notice.message }));
}

function dedupeWarnings(warnings: readonly AuditWarningJson[]): AuditWarningJson[] {
  const seen = new Set<string>();
  return warnings.filter((warning) => {
    const key = `${warning.code}|${warning.items.join(',')}|${warning.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}
