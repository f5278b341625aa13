/**
 * Outcome mode: the driver model that a client will later fit (OLS of the outcome on the items),
 * each standard error split into its three factors, and the same model refitted without the items
 * a cut removes, so one can read how much each remaining item's standard error shrinks.
 * Pure: no file, database or framework.
 */
import { principalSubmatrix } from '../engine/principal-submatrix';
import { completeRows } from '../stats/complete-rows';
import { correlationMatrix } from '../stats/correlation-matrix';
import { olsRegression } from '../stats/ols-regression';
import { relativeWeights } from '../stats/relative-weights';
import { selectItems, selectRespondents, type ItemMatrix, type NumericalNotice } from '../stats/types';
import type { AuditCoefficientJson, AuditOutcomeModelJson, AuditWarningJson } from './audit-json';
import { AuditInputError } from './audit-input';

/** What the model is fitted from. */
export interface OutcomeModelInput {
  /** The recoded response matrix (all items of the wave). */
  readonly matrix: ItemMatrix;
  /** Item ids in matrix column order. */
  readonly ids: readonly string[];
  /** The outcome column. */
  readonly outcome: { readonly id: string; readonly values: Float64Array };
}

/** A coefficient after the cut, with its standard error's ratio to the one before. */
export type AfterCutCoefficientJson = AuditCoefficientJson & { seRatio: number | null };

/** The driver model refitted after a cut, on the same respondents as the model before. */
export interface OutcomeAfterCutJson {
  /** The items the cut removed. */
  removed: string[];
  n: number;
  r2: number;
  adjR2: number | null;
  ssr: number;
  sigma: number | null;
  coefficients: AfterCutCoefficientJson[];
}

function noticeWarnings(notices: readonly NumericalNotice[], ids: readonly string[]): AuditWarningJson[] {
  return notices.map((notice) => {
    const items = notice.items.map((k) => ids[k] ?? String(k));
    // The core counts columns ("Predictor 39"); the reader knows items by their ids.
    if (notice.code === 'aliased-column' && items.length > 0) {
      const [item, ...partners] = items;
      const message = `${item} is an exact linear combination of the intercept${partners.length > 0 ? ` and ${partners.join(', ')}` : ' and earlier items'} in the outcome model, so its coefficient cannot be estimated and it is left out of the model.`;
      return { code: notice.code, items, message };
    }
    return { code: notice.code, items, message: notice.message };
  });
}

function withColumn(matrix: ItemMatrix, column: Float64Array): ItemMatrix {
  const data = new Float64Array(matrix.data.length + column.length);
  data.set(matrix.data);
  data.set(column, matrix.data.length);
  return { rows: matrix.rows, columns: matrix.columns + 1, data };
}

/** The fit itself: OLS on the given rows, relative weights from the same rows' correlations. */
function fitOnRows(table: ItemMatrix, rows: readonly number[], predictorIds: readonly string[], warnings: AuditWarningJson[]) {
  const p = predictorIds.length;
  const used = selectRespondents(table, rows);
  const x: ItemMatrix = { rows: used.rows, columns: p, data: used.data.subarray(0, used.rows * p) };
  const y = used.data.subarray(used.rows * p);
  const model = olsRegression(x, y);
  warnings.push(...noticeWarnings(model.notices, predictorIds));

  // Relative weights need an invertible predictor correlation matrix: use the predictors the QR
  // could estimate (aliased ones, such as a duplicated column, carry no weight of their own).
  const estimable = model.predictors.map((predictor, k) => (predictor.aliased ? -1 : k)).filter((k) => k >= 0);
  const withOutcome = correlationMatrix(selectItems(used, [...estimable, p]), { method: 'pearson', missing: 'listwise' }).matrix;
  const q = estimable.length;
  const rxx = principalSubmatrix(withOutcome, estimable.map((_, k) => k));
  const rxy = withOutcome.data.slice(q * (q + 1), q * (q + 1) + q);
  const weights = relativeWeights(rxx, rxy);
  warnings.push(...noticeWarnings(weights.notices, estimable.map((k) => predictorIds[k])));
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
      term: predictorIds[k],
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
    n: model.observations,
    r2: model.rSquared ?? 0,
    adjR2: model.adjustedRSquared,
    ssr: model.sumOfSquaredResiduals,
    sigma: model.residualStandardError,
    coefficients,
  };
}

/**
 * The matrix columns the driver model uses: the named predictors, or every item of the
 * correlation matrix when none is named.
 * @param input the matrix, item ids and outcome column.
 * @param usable matrix columns of the items in the correlation matrix.
 * @param predictors item ids the designer named (empty: all usable items).
 * @throws AuditInputError `unknown-predictor` for an id that is not an item, `predictor-left-out`
 *   for an item that is not in the correlation matrix (constant, or too few answers).
 * @returns the columns, in questionnaire order.
 */
export function outcomePredictorColumns(input: OutcomeModelInput, usable: readonly number[], predictors: readonly string[]): number[] {
  if (predictors.length === 0) return [...usable];
  const unknown = predictors.filter((id) => !input.ids.includes(id));
  if (unknown.length > 0) {
    throw new AuditInputError('unknown-predictor', `${unknown.join(', ')} ${unknown.length === 1 ? 'is not an item' : 'are not items'} of this wave: name the driver model's predictors by their item ids.`);
  }
  const columns = predictors.map((id) => input.ids.indexOf(id)).sort((a, b) => a - b);
  const leftOut = columns.filter((j) => !usable.includes(j)).map((j) => input.ids[j]);
  if (leftOut.length > 0) {
    throw new AuditInputError('predictor-left-out', `${leftOut.join(', ')} cannot be ${leftOut.length === 1 ? 'a predictor' : 'predictors'}: left out of the correlation matrix (see the warnings); name other items.`);
  }
  return columns;
}

/**
 * The outcome model: OLS of the outcome on the given items (items in an exact dependency are
 * aliased by the QR and reported as such) on the respondents with the outcome and every one of
 * those items answered; Johnson's relative weights from the same rows' Pearson correlations.
 * @param input the matrix, item ids and outcome column.
 * @param columns matrix columns of the predictors.
 * @param warnings receives the numerical notices.
 * @throws AuditInputError `outcome-constant` when every respondent with an answer gives the
 *   outcome the same value; `outcome-too-few-rows` when fewer respondents answered the outcome and
 *   every predictor than predictors plus two.
 * @returns the model with the rows it used.
 * References: Wooldridge, Introductory Econometrics, ch. 3 (the standard-error decomposition);
 *   Johnson (2000), A heuristic method for estimating the relative weight of predictor variables
 *   in multiple regression.
 */
export function fitOutcomeModel(input: OutcomeModelInput, columns: readonly number[], warnings: AuditWarningJson[]): AuditOutcomeModelJson & { rows: number[] } {
  const predictorIds = columns.map((j) => input.ids[j]);
  const p = columns.length;
  const observed = input.outcome.values.filter((value) => !Number.isNaN(value));
  if (observed.length > 0 && observed.every((value) => value === observed[0])) {
    throw new AuditInputError('outcome-constant', `The outcome ${input.outcome.id} has the same value (${observed[0]}) for every respondent who answered it, so no model can explain it: choose another outcome or none.`);
  }
  const table = withColumn(selectItems(input.matrix, columns), input.outcome.values);
  const complete = completeRows(table);
  if (complete.length < p + 2) {
    throw new AuditInputError(
      'outcome-too-few-rows',
      `The driver model of ${input.outcome.id} needs more respondents who answered it and every predictor (${complete.length}) than predictors plus two (${p + 2}): name fewer predictors (the predictors setting) or choose no outcome.`,
    );
  }
  const fit = fitOnRows(table, complete, predictorIds, warnings);
  return { outcome: input.outcome.id, ...fit, rows: complete };
}

/**
 * The driver model refitted without the removed items, on the same respondents as the model
 * before (so that every change in a standard error comes from the predictors, not from a change
 * of sample), with each remaining item's standard error as a ratio after/before.
 * @param input the matrix, item ids and outcome column.
 * @param columns matrix columns of the predictors before the cut.
 * @param before the model before the cut, with the rows it used.
 * @param removedIds ids of the items the cut removes (ids outside the model are ignored).
 * @param warnings receives the numerical notices of the refit.
 * @throws RangeError when every predictor would be removed.
 * @returns the model after the cut.
 * References: as fitOutcomeModel.
 */
export function refitOutcomeAfterCut(
  input: OutcomeModelInput,
  columns: readonly number[],
  before: AuditOutcomeModelJson & { rows: readonly number[] },
  removedIds: readonly string[],
  warnings: AuditWarningJson[],
): OutcomeAfterCutJson {
  const removed = new Set(removedIds);
  const kept = columns.filter((j) => !removed.has(input.ids[j]));
  if (kept.length === 0) throw new RangeError('refitOutcomeAfterCut: the cut removes every predictor of the model');
  const table = withColumn(selectItems(input.matrix, kept), input.outcome.values);
  const fit = fitOnRows(table, before.rows, kept.map((j) => input.ids[j]), warnings);
  const seBefore = new Map(before.coefficients.map((coefficient) => [coefficient.term, coefficient.se]));
  return {
    removed: columns.map((j) => input.ids[j]).filter((id) => removed.has(id)),
    ...fit,
    coefficients: fit.coefficients.map((coefficient) => {
      const old = seBefore.get(coefficient.term);
      return { ...coefficient, seRatio: coefficient.se !== null && old !== null && old !== undefined && old > 0 ? coefficient.se / old : null };
    }),
  };
}
