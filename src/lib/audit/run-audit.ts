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
import type { ResampleRunner } from '../engine/bootstrap-stability';
import { attachNetwork, networkCanCount } from '../engine/network-when-it-counts';
import { runEngine } from '../engine/run-engine';
import { wordingSimilarity } from '../engine/wording-similarity';
import { fitOutcomeModel, outcomePredictorColumns, refitOutcomeAfterCut } from './outcome-model';
import { computeEvidence } from '../engine/compute-evidence';
import { principalSubmatrix } from '../engine/principal-submatrix';
import type { EngineEvidence, EngineItem, EngineWarning } from '../engine/types';
import type { Recommendation } from '../engine/recommend-cuts';
import type { AfterCut } from '../engine/simulate-cut';
import { parallelAnalysis } from '../stats/parallel-analysis';
import { polychoricParallelAnalysis } from '../stats/parallel-analysis-polychoric';
import { minresOneFactor } from '../stats/minres-factor';
import { oneFactorMl } from '../stats/one-factor-ml';
import { symmetricEigenvalues } from '../stats/symmetric-eigen';
import { EXACT_DEPENDENCY_RELATIVE_EIGENVALUE, POLYCHORIC_PARALLEL_DEFAULT_ITERATIONS } from '../stats/tolerances';
import { completeRows } from '../stats/complete-rows';
import { AuditInputError } from './audit-input';
import { squareMatrixToRows, type ItemMatrix } from '../stats/types';
import {
  AUDIT_SCHEMA,
  type AuditAfterCutJson,
  type AuditCoefficientJson,
  type AuditItemJson,
  type AuditJson,
  type AuditOutcomeModelJson,
  type AuditRecommendationJson,
  type AuditWarningJson,
  type EarlyCutListJson,
} from './audit-json';
import { exploratoryStructure } from './exploratory-structure';
import { parallelAnalysisThreadCount, randomCorrelationEigenvaluesOnThreads, randomPolychoricEigenvaluesOnThreads } from './random-eigenvalue-threads';
import { deferredResidualCriticals, residualBootstrapThreadCount, residualCriticalsOnThreads, withResidualCriticals } from './residual-bootstrap-threads';
import { engineSettingsOf, resolveAuditSettings, type AuditSettingsRequest } from './settings-table';
import {
  expectedParallelAnalysisSize,
  pearsonParallelAnalysisApplies,
  pearsonParallelJson,
  polychoricParallelAnalysisThresholds,
  polychoricParallelJson,
  respondentsBehind,
  structureStatistics,
} from './structure-statistics';
import { cautionSentence, reasonSentence } from '../words';

/** One item as the audit receives it (from the confirmed column setup). */
export interface AuditItemInput extends EngineItem {
  /** Reverse-keyed in the codebook (the matrix is already recoded). */
  readonly reverse: boolean;
  /** Item type from the setup (rating, scored, dichotomous); absent: from the range. */
  readonly type?: 'rating' | 'scored' | 'dichotomous';
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
  /** Columns of the file the setup left out of the wave, with the reason (each becomes a `column-left-out` warning). */
  readonly leftOut?: readonly { readonly column: string; readonly reason: string }[];
  /** The screening behind the exclusions: which rules were applied to which item types. */
  readonly screening?: AuditScreeningJson | null;
}

/** What the audit JSON says about the screening that chose the excluded respondents. */
export interface AuditScreeningJson {
  readonly itemTypes: Readonly<Record<string, number>>;
  readonly rules: readonly { readonly code: string; readonly applied: boolean; readonly items: number; readonly note: string }[];
  readonly proposedExclusions: number;
}

/**
 * Audit settings: any subset of the settings table (settings-table.ts); anything unset takes its
 * default, and the locked items default to the items the input marks locked.
 */
export type AuditSettings = Readonly<AuditSettingsRequest>;

/** Progress of an audit: a stage name and the overall share done, 0 to 1. */
export type AuditProgress = (stage: string, fraction: number) => void;

/** Share of the evidence stage's bar before the network's EBIC path (which can take most of it on a wave with scales). */
const EVIDENCE_BEFORE_NETWORK = 0.4;

/** Share of the overall progress bar each stage takes (the bootstrap dominates). */
const STAGE_SPAN = Object.freeze({ evidence: [0, 0.2], structure: [0.2, 0.3], engine: [0.3, 0.95], outcome: [0.95, 1] });

/**
 * Runs one audit.
 * @param input The recoded matrix, its items and the outcome column, if any.
 * @param settings Method, missing-data policy, thresholds, constraints, bootstrap size and seed,
 *   outcome; every unset value takes its stated default.
 * @param onProgress Called with the stage and overall fraction done.
 * @param signal Aborts between bootstrap resamples.
 * @param resampleRunner Decides the bootstrap's resamples (the command line's worker threads,
 *   resample-threads.ts); default: on the calling thread. The figures are the same either way.
 * @param onCutList Called once, before the bootstrap, with the early cut list: the recommendations
 *   as the JSON will carry them, stability still null (not called without a bootstrap to wait for).
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
  resampleRunner?: ResampleRunner,
  onCutList?: (cutList: EarlyCutListJson) => void,
): Promise<AuditJson> {
  const lockedItems = input.items.filter((item) => item.locked).map((item) => item.id);
  // The stored shape (settings-table.ts), echoed unchanged as the JSON's `settings`. testFault is
  // accepted here because a test server's stored settings may carry it; the front doors refuse it.
  const resolved = resolveAuditSettings({ ...settings, locked: settings.locked ?? lockedItems }, {}, { allowTestFaults: true });
  const { outcome: outcomeId, parallelIterations } = resolved;
  const engineSettings = engineSettingsOf(resolved);
  if (resolved.locked.length !== new Set(lockedItems).size || lockedItems.some((id) => !resolved.locked.includes(id))) {
    throw new RangeError(`runAudit: the settings lock ${resolved.locked.join(', ') || 'no items'} but the input marks ${lockedItems.join(', ') || 'none'} locked`);
  }
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

  if (engineSettings.missing === 'listwise') refuseListwiseWithoutRows(input);

  // Parallel analysis's draws need only the matrix's order and the respondents behind it, which
  // are known before the evidence except where pairs without a correlation take items out: large
  // draws start on worker threads now, beside the evidence, and are used when the size matches.
  const expected = engineSettings.method === 'polychoric' ? null : expectedParallelAnalysisSize(input.matrix, engineSettings.missing);
  const earlyDraws =
    expected !== null && parallelAnalysisThreadCount(expected.items, parallelIterations) > 0
      ? { ...expected, draws: randomCorrelationEigenvaluesOnThreads(expected.rows, expected.items, parallelIterations, engineSettings.seed) }
      : null;
  // Collected below; this only keeps a thread's failure from counting as unhandled before then.
  earlyDraws?.draws.catch(() => undefined);

  report('evidence', 0);
  // The network only where it can count (network-when-it-counts.ts): the same audit, without a
  // 100-penalty graphical-lasso path no number of it would show.
  // Each scale's residual bootstrap is its own (own seed): when they are large, the evidence only
  // writes them down, they run on worker threads while this thread fits the network, and their
  // critical values are put in after (residual-bootstrap-threads.ts; the same numbers).
  const bootstrapThreads = residualBootstrapThreadCount(input.items.map((item) => item.scale), input.matrix.rows, engineSettings.residualBootstrapDraws);
  const deferred = bootstrapThreads > 0 ? deferredResidualCriticals() : null;
  // The stage's bar: the evidence's own steps to EVIDENCE_BEFORE_NETWORK, then the network's EBIC path.
  const withoutNetwork = computeEvidence(input.matrix, input.items, engineSettings, {
    localDependence: { network: false, ...(deferred ? { detectors: deferred.detectors } : {}) },
    onProgress: (fraction) => report('evidence', EVIDENCE_BEFORE_NETWORK * fraction),
  });
  const criticals = deferred === null ? null : residualCriticalsOnThreads(deferred.jobs, bootstrapThreads);
  // Collected below; this only keeps a thread's failure from counting as unhandled before then.
  criticals?.catch(() => undefined);
  // networkCanCount reads no critical value while they are pending: with scales it answers true
  // before it looks at the pair rules (and without scales there is no critical value to wait for).
  const withNetwork = networkCanCount(withoutNetwork, wordingSimilarity(input.items.map((item) => item.text)), engineSettings)
    ? attachNetwork(withoutNetwork, engineSettings, null, (fraction) => report('evidence', EVIDENCE_BEFORE_NETWORK + (1 - EVIDENCE_BEFORE_NETWORK) * fraction))
    : withoutNetwork;
  const evidence = criticals === null ? withNetwork : withResidualCriticals(withNetwork, await criticals);
  report('evidence', 1);

  report('structure', 0);
  const warnings: AuditWarningJson[] = (input.leftOut ?? []).map((entry) => ({
    code: 'column-left-out',
    items: [entry.column],
    message: `The column "${entry.column}" is not in this audit: ${entry.reason.replace(/\.$/, '')}.`,
  }));
  warnings.push(...[...evidence.warnings].map(plainWarning));
  const ids = input.items.map((item) => item.id);
  const usableIds = evidence.usable.map((j) => ids[j]);
  const dichotomous = input.items.filter((item) => (item.type ?? (item.min === 0 && item.max === 1 ? 'dichotomous' : 'rating')) !== 'rating' && item.min === 0 && item.max === 1);
  if (dichotomous.length > 0 && evidence.method !== 'polychoric') {
    warnings.push({
      code: 'dichotomous-items-pearson',
      items: dichotomous.map((item) => item.id),
      message: `${dichotomous.length} item${dichotomous.length === 1 ? ' is' : 's are'} scored 0/1, and a ${evidence.method} correlation of two 0/1 items (phi) cannot reach 1 unless both have the same share of 1s, so strong overlap may stay hidden; the tetrachoric correlation (method: polychoric) is proposed for such items.`,
    });
  }
  const respondentsForTests = respondentsBehind(evidence, input.matrix);
  // Parallel analysis's random draws: those started above when the size is the one expected,
  // otherwise started now (on worker threads when they are large); collected when the JSON is
  // written, the rest of the audit running meanwhile.
  const pearsonDraws = !pearsonParallelAnalysisApplies(evidence, respondentsForTests)
    ? null
    : earlyDraws !== null && earlyDraws.rows === respondentsForTests && earlyDraws.items === evidence.eigenvalues.length
      ? earlyDraws.draws
      : randomCorrelationEigenvaluesOnThreads(respondentsForTests, evidence.eigenvalues.length, parallelIterations, engineSettings.seed);
  // Collected below; this only keeps a thread's failure from counting as unhandled before then.
  pearsonDraws?.catch(() => undefined);
  // The polychoric variant's draws need the observed thresholds, known only now: its data sets'
  // matrices are estimated on worker threads when they are many (the codes are drawn here first),
  // the rest of the audit running meanwhile; collected when the JSON is written.
  const polychoricThresholds = polychoricParallelAnalysisThresholds(evidence, respondentsForTests);
  const polychoricDrawCount = Math.min(parallelIterations, POLYCHORIC_PARALLEL_DEFAULT_ITERATIONS);
  const polychoricDraws =
    polychoricThresholds === null ? null : randomPolychoricEigenvaluesOnThreads(respondentsForTests, polychoricThresholds, polychoricDrawCount, engineSettings.seed);
  // Collected below; this only keeps a thread's failure from counting as unhandled before then.
  polychoricDraws?.catch(() => undefined);
  const structure = structureStatistics(evidence, respondentsForTests, ids);
  warnings.push(...structure.warnings);
  report('structure', 1);

  const engine = await runEngine(
    evidence,
    input.matrix,
    input.items,
    engineSettings,
    (stage, fraction) => report('engine', stage === 'bootstrap' ? 0.1 + 0.9 * fraction : 0.1 * fraction),
    signal,
    resampleRunner,
    onCutList === undefined ? undefined : (recommendations) => onCutList({ resamples: engineSettings.bootstrap, recommendations: recommendations.map(recommendationJson) }),
  );
  warnings.push(...engine.warnings.map(plainWarning));

  // The exploratory view of a multi-scale wave; its candidates sit behind the same constraints, on top of the proposed cut.
  const removedIndices = engine.afterCut.removed.map((id) => ids.indexOf(id));
  const exploratory = exploratoryStructure(evidence, input.matrix, engine.settings, removedIndices);
  warnings.push(...exploratory.warnings);

  report('outcome', 0);
  const outcomeModel = input.outcome === null || outcomeId === null ? null : outcomeModelWithCut(input, evidence, resolved.predictors, engine.afterCut?.removed ?? [], warnings);
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
      ...(item.facet ? { facet: item.facet } : {}),
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

  const removedIds = new Set(engine.afterCut.removed);
  const modelOf = (members: readonly number[]) => scaleModel(evidence, members, ids);
  const afterCut = afterCutJson(engine.afterCut);
  afterCut.scales = afterCut.scales.map((scale) => {
    const members = evidence.scales.find((entry) => entry.id === scale.id)?.items.filter((j) => !removedIds.has(ids[j])) ?? [];
    return { ...scale, model: modelOf(members) };
  });

  warnings.push(...keyingBalanceWarnings(input.items, evidence.scales.map((scale) => ({ id: scale.id, items: scale.items })), removedIds));

  const collinearity = evidence.collinearity;
  const parallel =
    pearsonDraws !== null
      ? pearsonParallelJson(parallelAnalysis(evidence.eigenvalues, respondentsForTests, { seed: engineSettings.seed, iterations: parallelIterations, randomEigenvalues: await pearsonDraws }))
      : polychoricDraws !== null && polychoricThresholds !== null
        ? polychoricParallelJson(
            polychoricParallelAnalysis(evidence.eigenvalues, respondentsForTests, polychoricThresholds, { seed: engineSettings.seed, iterations: polychoricDrawCount, randomEigenvalues: await polychoricDraws }),
            parallelIterations,
          )
        : null;
  return {
    schema: AUDIT_SCHEMA,
    settings: { ...resolved },
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
    parallelAnalysis: parallel,
    structure: { exploratory: exploratory.view },
    scales: evidence.scales.map((scale) => ({
      id: scale.id,
      items: scale.items.map((j) => ids[j]),
      alpha: scale.alpha,
      alphaStd: scale.alphaStd,
      omegaTotal: scale.omegaTotal,
      basis: {
        alpha: `raw scores: Cronbach's alpha from the item covariances (${evidence.missing}), whatever the correlation method`,
        alphaStd: `the ${evidence.method} correlation matrix (standardized alpha)`,
        omegaTotal: `model-implied omega total, (sum of loadings)² / ((sum of loadings)² + sum of uniquenesses), from one-factor minres loadings on the ${evidence.method} correlation matrix (not psych::omega's observed-variance version)`,
      },
      model: modelOf(scale.items),
    })),
    recommendations: engine.recommendations.map(recommendationJson),
    afterCut,
    clusters: engine.clusters,
    pairs: engine.pairs.map((pair) => ({ ...pair, items: [...pair.items], rules: [...(pair.rules ?? [])] })),
    outcomeModel,
    ...(input.screening ? { screening: { itemTypes: { ...input.screening.itemTypes }, rules: input.screening.rules.map((rule) => ({ ...rule })), proposedExclusions: input.screening.proposedExclusions } } : {}),
    warnings: dedupeWarnings(warnings),
  };
}

/** Fewest complete rows listwise deletion needs for a correlation (as the core's MIN_ROWS_FOR_CORRELATION). */
const LISTWISE_MINIMUM_ROWS = 3;

/**
 * Listwise deletion keeps only the respondents who answered every item; with fewer than three of
 * them no correlation exists, and the audit stops with one sentence saying what to do.
 */
function refuseListwiseWithoutRows(input: AuditInput): void {
  const complete = completeRows(input.matrix).length;
  if (complete >= LISTWISE_MINIMUM_ROWS) return;
  const { rows, columns, data } = input.matrix;
  const missing = input.items.map((item, j) => {
    let count = 0;
    for (let i = 0; i < rows; i++) if (Number.isNaN(data[j * rows + i])) count++;
    return { id: item.id, count };
  });
  const worst = missing.filter((entry) => entry.count > 0).sort((a, b) => b.count - a.count).slice(0, 5);
  const named = worst.map((entry) => `${entry.id} (${entry.count} of ${rows} missing)`).join(', ');
  throw new AuditInputError(
    'no-complete-rows',
    `Listwise deletion keeps only respondents who answered all ${columns} items, and ${complete === 0 ? 'no one did' : `only ${complete} did`}` +
      `${named ? ` (most often unanswered: ${named})` : ''}; use pairwise deletion instead (missing: pairwise; on the command line --missing pairwise).`,
  );
}

/**
 * Keying balance: a scale that has both reverse-keyed and positively keyed items controls
 * acquiescence (agreeing whatever the content); a cut that removes the last items of either
 * keying takes that control away, and is flagged.
 * @param items the audit's items (reverse flag from the setup).
 * @param scales each scale's member indices into items[].
 * @param removed ids of the items the proposed cut removes.
 * @returns one `keying-balance-lost` warning per scale that loses it.
 * References: Paulhus 1991, "Measurement and control of response bias", in Robinson, Shaver &
 *   Wrightsman (eds.), Measures of Personality and Social Psychological Attitudes (balanced keying
 *   against acquiescence; from memory).
 */
export function keyingBalanceWarnings(items: readonly AuditItemInput[], scales: readonly { id: string; items: readonly number[] }[], removed: ReadonlySet<string>): AuditWarningJson[] {
  const warnings: AuditWarningJson[] = [];
  for (const scale of scales) {
    const members = scale.items.map((j) => items[j]);
    const reverse = members.filter((item) => item.reverse);
    const forward = members.filter((item) => !item.reverse);
    if (reverse.length === 0 || forward.length === 0) continue;
    for (const [side, group] of [['reverse-keyed', reverse], ['positively keyed', forward]] as const) {
      if (group.every((item) => removed.has(item.id))) {
        warnings.push({
          code: 'keying-balance-lost',
          items: group.map((item) => item.id),
          message: `The proposed cut removes every ${side} item of scale ${scale.id} (${group.map((item) => item.id).join(', ')}), so the shortened scale can no longer separate agreement with the content from agreeing with anything (acquiescence); keep one of them, or lock it.`,
        });
      }
    }
  }
  return warnings;
}

/** A scale's one-factor measurement model as the audit JSON shows it. */
export interface ScaleModelJson {
  readonly estimator: 'ML' | 'minres';
  readonly correlation: string;
  readonly items: readonly string[];
  /** Respondents the chi-square rests on (listwise: complete rows; pairwise: the smallest pair n). */
  readonly n: number;
  readonly loadings: readonly number[];
  /** Residual correlations, observed minus model-implied, items × items in `items` order. */
  readonly residuals: readonly (readonly number[])[];
  readonly fit: { readonly chisq: number | null; readonly df: number; readonly rmsea: number | null; readonly cfi: number | null; readonly srmr: number };
  readonly note: string;
}

/**
 * One factor per scale on the audit's correlation matrix: maximum likelihood for Pearson data
 * (chi-square, RMSEA, CFI, SRMR as lavaan reports them), minres for Spearman and polychoric
 * matrices (SRMR only: minres gives no chi-square). Null below three items or when the matrix
 * over the scale is not positive definite.
 */
function scaleModel(evidence: EngineEvidence, members: readonly number[], ids: readonly string[]): ScaleModelJson | null {
  const positions = members.map((j) => evidence.usable.indexOf(j)).filter((k) => k >= 0);
  if (positions.length < 3) return null;
  const sub = principalSubmatrix(evidence.correlation, positions);
  const p = sub.order;
  let n = evidence.correlationRows;
  if (evidence.missing === 'pairwise') {
    const order = evidence.pairN.order;
    n = Infinity;
    for (const a of positions) for (const b of positions) if (a !== b) n = Math.min(n, evidence.pairN.data[a * order + b]);
  }
  const itemIds = positions.map((k) => ids[evidence.usable[k]]);
  const rows = (data: Float64Array) => Array.from({ length: p }, (_, i) => Array.from(data.subarray(i * p, (i + 1) * p)));
  // ML needs a positive definite matrix: a scale holding an exact copy of an item is singular, its
  // smallest eigenvalue zero up to rounding, whose sign must not decide the estimator.
  const spectrum = symmetricEigenvalues(sub);
  if (evidence.method === 'pearson' && Number.isFinite(n) && n >= 2 && spectrum[p - 1] > EXACT_DEPENDENCY_RELATIVE_EIGENVALUE * spectrum[0]) {
    const fit = oneFactorMl(sub, n);
    return {
      estimator: 'ML', correlation: 'pearson', items: itemIds, n, loadings: fit.loadings, residuals: rows(fit.residuals.data),
      fit: { chisq: fit.chiSquare, df: fit.degreesOfFreedom, rmsea: fit.rmsea, cfi: fit.cfi, srmr: fit.srmr },
      note: `Maximum likelihood one-factor model on the ${evidence.missing} Pearson correlations; the chi-square uses N = ${n}${evidence.missing === 'pairwise' ? ' (the smallest pair n; ML assumes complete data)' : ''}, as lavaan does (N·F).${fit.degreesOfFreedom === 0 ? ' With three items the model is just identified: df = 0, so it fits exactly and only the loadings inform.' : ''}`,
    };
  }
  const minres = minresOneFactor(sub);
  if (minres.loadings === null) return null;
  const loadings = Array.from(minres.loadings);
  const residuals = new Float64Array(p * p);
  let squares = 0;
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < i; j++) {
      const residual = sub.data[i * p + j] - loadings[i] * loadings[j];
      residuals[i * p + j] = residual;
      residuals[j * p + i] = residual;
      squares += residual * residual;
    }
  }
  return {
    estimator: 'minres', correlation: evidence.method, items: itemIds, n: Number.isFinite(n) ? n : 0, loadings, residuals: rows(residuals),
    fit: { chisq: null, df: (p * (p - 3)) / 2, rmsea: null, cfi: null, srmr: Math.sqrt(squares / ((p * (p + 1)) / 2)) },
    note: `Minres one-factor model on the ${evidence.method} correlation matrix: it gives no chi-square, so RMSEA and CFI are not computed; SRMR over the lower triangle with its diagonal (zero there by construction), as lavaan defines it.`,
  };
}

/**
 * The driver model on the items of the correlation matrix and, when the proposed cut removes any
 * of them, refitted without them on the same respondents (`afterCut`, see outcome-model.ts).
 */
function outcomeModelWithCut(
  input: AuditInput,
  evidence: EngineEvidence,
  predictors: readonly string[],
  removed: readonly string[],
  warnings: AuditWarningJson[],
): AuditOutcomeModelJson {
  const modelInput = { matrix: input.matrix, ids: input.items.map((item) => item.id), outcome: input.outcome! };
  const columns = outcomePredictorColumns(modelInput, evidence.usable, predictors);
  const before = fitOutcomeModel(modelInput, columns, warnings);
  const { rows, ...model } = before;
  const inModel = removed.filter((id) => model.coefficients.some((coefficient) => coefficient.term === id));
  const afterCut = inModel.length > 0 && inModel.length < columns.length ? refitOutcomeAfterCut(modelInput, columns, before, inModel, warnings) : null;
  return {
    ...model,
    completeRows: rows.length,
    afterCut,
    basis: `OLS on the ${rows.length} complete rows (the outcome and every predictor answered); its VIF therefore uses complete rows, while the item table's VIF uses the ${evidence.missing} ${evidence.method} correlation matrix.`,
  };
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
    reason: reasonSentence(recommendation.because),
    cautions: recommendation.cautions.map(cautionSentence),
    because: recommendation.because,
  };
}

function afterCutJson(afterCut: AfterCut): AuditAfterCutJson {
  const { warnings: _warnings, ...rest } = afterCut;
  return { ...rest, scales: afterCut.scales.map((scale) => ({ ...scale })), removed: [...afterCut.removed] };
}

function plainWarning(warning: EngineWarning): AuditWarningJson {
  return { code: warning.code, items: [...warning.items], message: warning.message };
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
