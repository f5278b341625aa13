import { describe, expect, it } from 'vitest';
import { olsRegression, type OlsCoefficient } from '../../src/lib/stats/ols-regression';
import { itemMatrixFromColumns, itemMatrixFromRows, type ItemMatrix } from '../../src/lib/stats/types';
import { collectNumbers, logRelativeError, readReferenceFixture, relativeError } from './reliability-fixtures';

interface LongleyFixture {
  columns: string[];
  rows: number[][];
}
interface LmCase {
  name: string;
  call: string;
  predictors: string[];
  rows: number[][];
  estimates: (number | null)[];
  standardErrors: (number | null)[];
  tValues: (number | null)[];
  pValues: (number | null)[];
  aliased: string[];
  rSquared: number;
  adjRSquared: number;
  sigma: number;
  residualDf: number;
  sumOfSquaredResiduals: number;
  fStatistic: number[];
  fPValue: number;
  auxiliaryRSquared: (number | null)[];
  carVif: number[] | null;
}

const longley = readReferenceFixture<LongleyFixture>('longley-nist.json');
const lmCases = readReferenceFixture<{ cases: LmCase[] }>('ols-lm.json').cases;

// NIST StRD Longley.dat certified values: [estimate, standard error] for b0 … b6 (as quoted in issue 3).
const LONGLEY_CERTIFIED = [
  [-3482258.63459582, 890420.383607373],
  [15.0618722713733, 84.9149257747669],
  [-0.0358191792925910, 0.0334910077722432],
  [-2.02022980381683, 0.488399681651699],
  [-1.03322686717359, 0.214274163161675],
  [-0.0511041056535807, 0.226073200069370],
  [1829.15146461355, 455.478499142212],
] as const;
const LONGLEY_RESIDUAL_SD = 304.854073561965; // NIST StRD Longley.dat certified value
const LONGLEY_R_SQUARED = 0.995479004577296; // NIST StRD Longley.dat certified value

function split(rows: number[][]): { predictors: ItemMatrix; outcome: number[] } {
  const width = rows[0].length;
  return {
    predictors: itemMatrixFromRows(rows.map((row) => row.slice(0, width - 1))),
    outcome: Object.freeze(rows.map((row) => row[width - 1])) as number[],
  };
}

function coefficientsOf(fit: ReturnType<typeof olsRegression>): OlsCoefficient[] {
  return [fit.intercept, ...fit.predictors];
}

describe('olsRegression: NIST StRD Longley', () => {
  const predictors = itemMatrixFromRows(longley.rows.map((row) => row.slice(1)));
  const outcome = Object.freeze(longley.rows.map((row) => row[0]));
  const before = Float64Array.from(predictors.data);
  const fit = olsRegression(predictors, outcome);

  it('has the 16 NIST rows (first and last checked against Longley.dat)', () => {
    expect(longley.rows).toHaveLength(16);
    expect(longley.rows[0]).toEqual([60323, 83, 234289, 2356, 1590, 107608, 1947]); // NIST StRD Longley.dat, first row
    expect(longley.rows[15]).toEqual([70551, 116.9, 554894, 4007, 2827, 130081, 1962]); // NIST StRD Longley.dat, last row
  });

  it('reproduces every certified estimate and standard error with LRE >= 10', () => {
    coefficientsOf(fit).forEach((coefficient, i) => {
      expect(logRelativeError(coefficient.estimate as number, LONGLEY_CERTIFIED[i][0]), `estimate ${i}`).toBeGreaterThanOrEqual(10);
      expect(logRelativeError(coefficient.standardError as number, LONGLEY_CERTIFIED[i][1]), `se ${i}`).toBeGreaterThanOrEqual(10);
    });
  });

  it('reproduces the certified residual SD and R² with LRE >= 10', () => {
    expect(logRelativeError(fit.residualStandardError as number, LONGLEY_RESIDUAL_SD)).toBeGreaterThanOrEqual(10);
    expect(logRelativeError(fit.rSquared as number, LONGLEY_R_SQUARED)).toBeGreaterThanOrEqual(10);
    expect(fit.residualDegreesOfFreedom).toBe(9); // NIST: 16 observations, 7 parameters
    expect(fit.notices).toEqual([]);
  });

  it('does not modify its inputs', () => {
    expect(predictors.data).toEqual(before);
  });
});

describe('olsRegression against R lm()', () => {
  for (const reference of lmCases.filter((c) => c.aliased.length === 0)) {
    it(`matches ${reference.call} at 1e-9`, () => {
      const { predictors, outcome } = split(reference.rows);
      const fit = olsRegression(predictors, outcome);
      const coefficients = coefficientsOf(fit);
      coefficients.forEach((coefficient, i) => {
        // R 4.2.2: coef(summary(lm(...))) columns Estimate, Std. Error, t value, Pr(>|t|)
        expect(relativeError(coefficient.estimate as number, reference.estimates[i] as number), `estimate ${i}`).toBeLessThan(1e-9);
        expect(relativeError(coefficient.standardError as number, reference.standardErrors[i] as number), `se ${i}`).toBeLessThan(1e-9);
        expect(relativeError(coefficient.tStatistic as number, reference.tValues[i] as number), `t ${i}`).toBeLessThan(1e-9);
        expect(relativeError(coefficient.pValue as number, reference.pValues[i] as number), `p ${i}`).toBeLessThan(1e-9);
      });
      expect(relativeError(fit.rSquared as number, reference.rSquared)).toBeLessThan(1e-9); // R: summary(fit)$r.squared
      expect(relativeError(fit.adjustedRSquared as number, reference.adjRSquared)).toBeLessThan(1e-9); // R: summary(fit)$adj.r.squared
      expect(relativeError(fit.residualStandardError as number, reference.sigma)).toBeLessThan(1e-9); // R: summary(fit)$sigma
      expect(relativeError(fit.sumOfSquaredResiduals, reference.sumOfSquaredResiduals)).toBeLessThan(1e-9); // R: sum(residuals(fit)^2)
      expect(fit.residualDegreesOfFreedom).toBe(reference.residualDf); // R: fit$df.residual
      expect(relativeError(fit.modelTest!.fStatistic, reference.fStatistic[0])).toBeLessThan(1e-9); // R: summary(fit)$fstatistic
      expect(fit.modelTest!.numeratorDegreesOfFreedom).toBe(reference.fStatistic[1]);
      expect(relativeError(fit.modelTest!.pValue, reference.fPValue)).toBeLessThan(1e-9); // R: pf(F, df1, df2, lower.tail = FALSE)
    });

    it(`gives car::vif and the auxiliary R² of lm(x_j ~ others) on ${reference.name}`, () => {
      const { predictors, outcome } = split(reference.rows);
      const fit = olsRegression(predictors, outcome);
      fit.predictors.forEach((predictor, j) => {
        expect(relativeError(predictor.varianceInflationFactor as number, reference.carVif![j])).toBeLessThan(1e-6); // R 4.2.2 car 3.1.1: car::vif(fit)
        expect(relativeError(predictor.auxiliaryRSquared as number, reference.auxiliaryRSquared[j] as number)).toBeLessThan(1e-9); // R: summary(lm(x_j ~ others))$r.squared
      });
    });
  }

  it('decomposes each se into sqrt(SSR/(n−k−1)) / (sqrt(SST_j) sqrt(1 − R²_j)) with R²_j from a separate auxiliary fit', () => {
    // Identity (Wooldridge, Introductory Econometrics, §3.4), R²_j computed by olsRegression of x_j on the others
    const reference = lmCases.find((c) => c.name === 'mtcars')!;
    const { predictors, outcome } = split(reference.rows);
    const fit = olsRegression(predictors, outcome);
    const p = predictors.columns;
    for (let j = 0; j < p; j++) {
      const others = Array.from({ length: p }, (_, m) => m).filter((m) => m !== j);
      const auxiliary = olsRegression(
        itemMatrixFromColumns(others.map((m) => predictors.data.subarray(m * predictors.rows, (m + 1) * predictors.rows))),
        predictors.data.subarray(j * predictors.rows, (j + 1) * predictors.rows),
      );
      const predictor = fit.predictors[j];
      const factors = predictor.standardErrorFactors!;
      expect(factors.residualScale).toBe(fit.residualStandardError);
      expect(relativeError(factors.spread ** 2, auxiliary.totalSumOfSquares)).toBeLessThan(1e-12);
      const rebuilt = fit.residualStandardError! / (Math.sqrt(auxiliary.totalSumOfSquares) * Math.sqrt(1 - auxiliary.rSquared!));
      expect(relativeError(rebuilt, predictor.standardError as number)).toBeLessThan(1e-9);
      expect(relativeError(factors.residualScale / (factors.spread * factors.overlap), predictor.standardError as number)).toBeLessThan(1e-12);
    }
  });

  it('permutes its results with the columns', () => {
    const reference = lmCases.find((c) => c.name === 'swiss')!;
    const { predictors, outcome } = split(reference.rows);
    const order = [4, 2, 0, 3, 1];
    const shuffled = itemMatrixFromColumns(order.map((m) => predictors.data.subarray(m * predictors.rows, (m + 1) * predictors.rows)));
    const a = olsRegression(predictors, outcome);
    const b = olsRegression(shuffled, outcome);
    order.forEach((m, position) => {
      expect(relativeError(b.predictors[position].estimate as number, a.predictors[m].estimate as number)).toBeLessThan(1e-12);
      expect(relativeError(b.predictors[position].standardError as number, a.predictors[m].standardError as number)).toBeLessThan(1e-12);
    });
    expect(relativeError(b.intercept.estimate as number, a.intercept.estimate as number)).toBeLessThan(1e-12);
  });
});

describe('olsRegression: rank deficiency and edge cases', () => {
  it('reports the aliased column as lm() does and fits the rest', () => {
    const reference = lmCases.find((c) => c.aliased.length > 0)!;
    const { predictors, outcome } = split(reference.rows);
    const fit = olsRegression(predictors, outcome);
    const aliasedIndex = reference.predictors.indexOf(reference.aliased[0]); // R: names(coef(fit))[is.na(coef(fit))]
    expect(fit.aliasedColumns).toEqual([aliasedIndex]);
    expect(fit.notices).toEqual([expect.objectContaining({ code: 'aliased-column', items: [aliasedIndex, 0, 1] })]);
    const aliasedPredictor = fit.predictors[aliasedIndex];
    expect(aliasedPredictor).toEqual(expect.objectContaining({ aliased: true, estimate: null, standardError: null, pValue: null }));
    coefficientsOf(fit).forEach((coefficient, i) => {
      const expected = reference.estimates[i];
      if (expected === null) return;
      expect(relativeError(coefficient.estimate as number, expected), `estimate ${i}`).toBeLessThan(1e-9); // R 4.2.2: coef(lm(...)) with NA for the aliased term
      expect(relativeError(coefficient.standardError as number, reference.standardErrors[i] as number)).toBeLessThan(1e-9);
    });
    expect(fit.rank).toBe(6);
    expect(fit.residualDegreesOfFreedom).toBe(reference.residualDf); // R: fit$df.residual
    expect(collectNumbers(fit).every(Number.isFinite)).toBe(true);
  });

  it('treats a constant predictor and an exact duplicate as aliased', () => {
    const x1 = [1, 2, 3, 4, 5, 6, 7, 8];
    const x2 = [3, 1, 4, 1, 5, 9, 2, 6];
    const constant = new Array(8).fill(4);
    const y = [2.1, 3.9, 6.2, 7.8, 10.1, 12.2, 13.8, 16.1];
    const fit = olsRegression(itemMatrixFromColumns([x1, constant, x2, x1]), y);
    expect(fit.aliasedColumns).toEqual([1, 3]);
    expect(fit.notices[0]).toEqual(expect.objectContaining({ code: 'aliased-column', items: [1] }));
    expect(fit.notices[1]).toEqual(expect.objectContaining({ code: 'aliased-column', items: [3, 0] }));
    const reduced = olsRegression(itemMatrixFromColumns([x1, x2]), y);
    expect(fit.predictors[2].estimate).toBeCloseTo(reduced.predictors[1].estimate as number, 12);
    expect(collectNumbers(fit).every(Number.isFinite)).toBe(true);
  });

  it('reports a constant outcome: no R², exact fit, no t or p, never NaN', () => {
    const fit = olsRegression(itemMatrixFromColumns([[1, 2, 3, 4, 5], [2, 1, 2, 5, 3]]), [3, 3, 3, 3, 3]);
    expect(fit.rSquared).toBeNull();
    expect(fit.adjustedRSquared).toBeNull();
    expect(fit.modelTest).toBeNull();
    expect(fit.intercept.estimate).toBeCloseTo(3, 14);
    expect(fit.predictors[0].tStatistic).toBeNull();
    expect(fit.notices.map((n) => n.code)).toEqual(['constant-outcome', 'exact-fit']);
    expect(collectNumbers(fit).every(Number.isFinite)).toBe(true);
  });

  it('reports an exact fit with the right coefficients', () => {
    const x1 = [1, 2, 3, 4, 5, 6];
    const x2 = [2, 0, 1, 3, 1, 4];
    const y = x1.map((v, i) => 2 + 3 * v - x2[i]);
    const fit = olsRegression(itemMatrixFromColumns([x1, x2]), y);
    expect(fit.intercept.estimate).toBeCloseTo(2, 12);
    expect(fit.predictors[0].estimate).toBeCloseTo(3, 12);
    expect(fit.predictors[1].estimate).toBeCloseTo(-1, 12);
    expect(fit.rSquared).toBeCloseTo(1, 14);
    expect(fit.predictors[0].pValue).toBeNull();
    expect(fit.notices.map((n) => n.code)).toEqual(['exact-fit']);
  });

  it('reports no residual degrees of freedom when n = k + 1', () => {
    const fit = olsRegression(itemMatrixFromColumns([[1, 2, 4]]), [1, 3, 2]);
    expect(fit.residualDegreesOfFreedom).toBe(1);
    const saturated = olsRegression(itemMatrixFromColumns([[1, 2, 4], [0, 5, 1]]), [1, 3, 2]);
    expect(saturated.residualDegreesOfFreedom).toBe(0);
    expect(saturated.residualStandardError).toBeNull();
    expect(saturated.intercept.standardError).toBeNull();
    expect(saturated.adjustedRSquared).toBeNull();
    expect(saturated.notices.map((n) => n.code)).toEqual(['no-residual-df']);
    expect(collectNumbers(saturated).every(Number.isFinite)).toBe(true);
  });

  it('fits the intercept-only model: the mean, with se = SD/√n', () => {
    const y = [4, 8, 6, 5, 7];
    const fit = olsRegression({ rows: 5, columns: 0, data: new Float64Array(0) }, y);
    // Hand-computed: mean 6, SD √2.5, se √(2.5/5)
    expect(fit.intercept.estimate).toBeCloseTo(6, 14);
    expect(fit.intercept.standardError).toBeCloseTo(Math.sqrt(0.5), 14);
    expect(fit.rSquared).toBe(0);
    expect(fit.modelTest).toBeNull();
  });

  it('refuses missing values and mismatched lengths', () => {
    expect(() => olsRegression(itemMatrixFromColumns([[1, Number.NaN, 3]]), [1, 2, 3])).toThrow(
      /olsRegression: predictor 0 is missing or not finite at row 1; drop incomplete rows first/,
    );
    expect(() => olsRegression(itemMatrixFromColumns([[1, 2, 3]]), [1, 2])).toThrow(/outcome has 2 values for 3 rows/);
    expect(() => olsRegression(itemMatrixFromColumns([[1, 2, 3]]), [1, Infinity, 2])).toThrow(/outcome is missing or not finite at row 1/);
  });
});
