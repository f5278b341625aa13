/**
 * Outcome mode: the driver model before and after a fixed cut, on the same respondents, against
 * R's lm() and Johnson's relative weights scripted in base R, on psych::bfi (an open questionnaire:
 * age on the neuroticism and extraversion items; the cut removes N2 and E2).
 * Fixture: fixtures/reference/outcome-after-cut.json, written by scripts/reference/outcome-after-cut.R.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitOutcomeModel, refitOutcomeAfterCut } from '../../src/lib/audit/outcome-model';
import type { AuditWarningJson } from '../../src/lib/audit/audit-json';

interface RFit {
  terms: string[];
  estimate: number[];
  se: number[];
  t: number[];
  p: number[];
  r2: number;
  adjR2: number;
  ssr: number;
  sigma: number;
  relativeWeights: number[];
  seRatio?: number[];
}
const fixture = JSON.parse(readFileSync('fixtures/reference/outcome-after-cut.json', 'utf8')) as {
  predictors: string[];
  removed: string[];
  rows: number[];
  matrix: (number | null)[][];
  outcomeValues: (number | null)[];
  before: RFit;
  after: RFit;
};

const n = fixture.matrix.length;
const p = fixture.predictors.length;
const data = new Float64Array(n * p);
fixture.matrix.forEach((row, i) => row.forEach((value, j) => (data[j * n + i] = value ?? Number.NaN)));
const input = Object.freeze({
  matrix: { rows: n, columns: p, data },
  ids: fixture.predictors,
  outcome: { id: 'age', values: Float64Array.from(fixture.outcomeValues, (value) => value ?? Number.NaN) },
});
const columns = fixture.predictors.map((_, j) => j);

/** Relative difference, for values that are not near zero. */
const relative = (ours: number | null | undefined, theirs: number) => Math.abs((ours ?? Number.NaN) - theirs) / Math.abs(theirs);

describe('the driver model before and after a cut, against R', () => {
  const warnings: AuditWarningJson[] = [];
  const before = fitOutcomeModel(input, columns, warnings);
  if (!before) throw new Error('the model was skipped');
  const after = refitOutcomeAfterCut(input, columns, before, fixture.removed, warnings);

  it('uses the complete rows R uses', () => {
    // R: which(complete.cases(bfi[, c(N1..E5, age)])) - 1
    expect(before.rows).toEqual(fixture.rows);
    expect(before.n).toBe(fixture.rows.length);
    expect(after.n).toBe(fixture.rows.length);
  });

  it('matches lm() before the cut', () => {
    // R: coef(summary(lm(age ~ ., data = used)))
    before.coefficients.forEach((coefficient, k) => {
      expect(coefficient.term).toBe(fixture.before.terms[k]);
      expect(relative(coefficient.estimate, fixture.before.estimate[k])).toBeLessThan(1e-10);
      expect(relative(coefficient.se, fixture.before.se[k])).toBeLessThan(1e-10);
    });
    expect(relative(before.r2, fixture.before.r2)).toBeLessThan(1e-10); // summary(...)$r.squared
    expect(relative(before.adjR2, fixture.before.adjR2)).toBeLessThan(1e-10); // summary(...)$adj.r.squared
    expect(relative(before.ssr, fixture.before.ssr)).toBeLessThan(1e-10); // sum(residuals^2)
  });

  it('matches lm() after the cut, on the same respondents, with the SE ratios R gives', () => {
    // R: the same lm() without N2 and E2; ratio = after$se / before$se
    expect(after.removed).toEqual(['N2', 'E2']);
    after.coefficients.forEach((coefficient, k) => {
      expect(coefficient.term).toBe(fixture.after.terms[k]);
      expect(relative(coefficient.estimate, fixture.after.estimate[k])).toBeLessThan(1e-10);
      expect(relative(coefficient.se, fixture.after.se[k])).toBeLessThan(1e-10);
      expect(relative(coefficient.seRatio, fixture.after.seRatio![k])).toBeLessThan(1e-10);
    });
    expect(relative(after.r2, fixture.after.r2)).toBeLessThan(1e-10);
  });

  it('matches the relative weights scripted in R, before and after', () => {
    // R: Johnson (2000) in base R, (Lambda^2) %*% beta^2
    const weights = (model: { coefficients: { relativeWeight: number | null }[] }) => model.coefficients.slice(1).map((c) => c.relativeWeight);
    weights(before).forEach((weight, k) => expect(relative(weight, fixture.before.relativeWeights[k])).toBeLessThan(1e-9));
    weights(after).forEach((weight, k) => expect(relative(weight, fixture.after.relativeWeights[k])).toBeLessThan(1e-9));
    // Identity (Johnson 2000): the raw weights add up to R².
    const sum = weights(after).reduce<number>((total, weight) => total + (weight ?? 0), 0);
    expect(sum).toBeCloseTo(after.r2, 12);
  });

  it('splits each standard error into residual scale, spread and overlap, whose product is the SE', () => {
    for (const coefficient of [...before.coefficients.slice(1), ...after.coefficients.slice(1)]) {
      const factors = coefficient.seFactors as { residualScale: number; spread: number; overlap: number };
      // se_j = sqrt(SSR/(n-k-1)) / (sqrt(SST_j) · sqrt(1-R²_j)) (Wooldridge ch. 3), overlap = sqrt(1-R²_j)
      expect(factors.residualScale / (factors.spread * factors.overlap)).toBeCloseTo(coefficient.se!, 12);
      // ... and 1/sqrt(1-R²_j) = sqrt(VIF_j)
      expect(1 / factors.overlap).toBeCloseTo(Math.sqrt(coefficient.vif!), 10);
    }
  });

  it('refuses a cut that removes every predictor', () => {
    expect(() => refitOutcomeAfterCut(input, columns, before, fixture.predictors, [])).toThrow(/removes every predictor/);
  });
});
