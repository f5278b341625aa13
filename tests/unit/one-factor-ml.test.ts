/**
 * One-factor maximum likelihood (Jöreskog 1967) against lavaan 0.6-14:
 * cfa('f =~ ...', data, std.lv = TRUE), standardizedSolution(fit), fitMeasures(fit,
 * c('chisq','df','rmsea','cfi','srmr')), lavResiduals(fit, type = 'cor.bentler')$cov, on
 * HolzingerSwineford1939 (visual, textual, speed, all nine) and psych::bfi A, C, E, N, O
 * (complete cases), each also after dropping one item. Fixture: scripts/reference/real-questionnaires.R
 * → fixtures/reference/real-one-factor.json.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createSeededRandom, oneFactorMl } from '../../src/lib/stats';
import type { SquareMatrix } from '../../src/lib/stats/types';

interface Model {
  data: string; scale: string; items: string[]; n: number; correlation: number[][]; loadings: number[];
  chisq: number; df: number; rmsea: number; cfi: number; srmr: number; residualCorrelations: number[][]; call: string;
}
const fixture = JSON.parse(readFileSync(join(import.meta.dirname, '..', '..', 'fixtures', 'reference', 'real-one-factor.json'), 'utf8')) as { models: Model[] };

describe('oneFactorMl against lavaan', () => {
  for (const model of fixture.models) {
    it(`${model.data} ${model.scale} (n = ${model.n})`, () => {
      const p = model.items.length;
      const fit = oneFactorMl({ order: p, data: Float64Array.from(model.correlation.flat()) }, model.n);
      expect(fit.converged).toBe(true);
      // model.call: standardizedSolution(fit)$est.std for the loadings (lavaan's sign: first loading positive)
      const sign = Math.sign(model.loadings.reduce((a, b) => a + b, 0));
      fit.loadings.forEach((value, k) => expect(value).toBeCloseTo(sign * model.loadings[k], 5));
      // model.call: fitMeasures(fit, c('chisq', 'df', 'rmsea', 'cfi', 'srmr'))
      expect(fit.degreesOfFreedom).toBe(model.df);
      expect(fit.chiSquare).toBeCloseTo(model.chisq, model.chisq > 100 ? 3 : 4);
      if (model.df > 0) {
        expect(fit.rmsea as number).toBeCloseTo(model.rmsea, 6);
        expect(fit.cfi as number).toBeCloseTo(model.cfi, 6);
      } else {
        expect(fit.rmsea).toBeNull();
        expect(fit.cfi as number).toBeCloseTo(model.cfi, 6); // lavaan gives 1 for a just-identified model
      }
      expect(fit.srmr).toBeCloseTo(model.srmr, 6);
      // model.call: lavResiduals(fit, type = 'cor.bentler')$cov
      for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) expect(fit.residuals.data[i * p + j]).toBeCloseTo(model.residualCorrelations[i][j], 5);
    });
  }

  it('fit improves when a locally dependent item leaves (bfi N without N2: CFI .925 → .990 in lavaan)', () => {
    const byScale = (scale: string) => fixture.models.find((model) => model.scale === scale) as Model;
    const fitOf = (model: Model) => oneFactorMl({ order: model.items.length, data: Float64Array.from(model.correlation.flat()) }, model.n);
    const before = fitOf(byScale('N'));
    const after = fitOf(byScale('N without N2'));
    expect(after.cfi as number).toBeGreaterThan(before.cfi as number);
    expect(after.srmr).toBeLessThan(before.srmr);
  });

  it('a warm start reaches the cold start\'s optimum in fewer iterations on bootstrap resamples', () => {
    // A wave of bfi N's size drawn from its correlation (normal respondents, seeded), its full-sample
    // fit, then bootstrap resamples of its respondents each fitted from Jöreskog's start (cold) and
    // from the full sample's uniquenesses (warm), as the audit's bootstrap does.
    const model = fixture.models.find((entry) => entry.scale === 'N') as Model;
    const p = model.items.length;
    const n = model.n;
    const factor = new Float64Array(p * p);
    for (let i = 0; i < p; i++) {
      for (let j = 0; j <= i; j++) {
        let sum = model.correlation[i][j];
        for (let k = 0; k < j; k++) sum -= factor[i * p + k] * factor[j * p + k];
        factor[i * p + j] = i === j ? Math.sqrt(sum) : sum / factor[j * p + j];
      }
    }
    const random = createSeededRandom(20241205);
    const data = new Float64Array(n * p);
    const normals = new Float64Array(p);
    for (let r = 0; r < n; r++) {
      for (let k = 0; k < p; k++) normals[k] = random.nextNormal();
      for (let i = 0; i < p; i++) for (let k = 0; k <= i; k++) data[r * p + i] += factor[i * p + k] * normals[k];
    }
    const correlationOf = (rows: ArrayLike<number>): SquareMatrix => {
      const mean = new Float64Array(p);
      for (let r = 0; r < rows.length; r++) for (let i = 0; i < p; i++) mean[i] += data[rows[r] * p + i] / rows.length;
      const cross = new Float64Array(p * p);
      for (let r = 0; r < rows.length; r++) {
        for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) cross[i * p + j] += (data[rows[r] * p + i] - mean[i]) * (data[rows[r] * p + j] - mean[j]);
      }
      const out = new Float64Array(p * p);
      for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) out[i * p + j] = i === j ? 1 : cross[i * p + j] / Math.sqrt(cross[i * p + i] * cross[j * p + j]);
      return { order: p, data: out };
    };
    const full = oneFactorMl(correlationOf(Array.from({ length: n }, (_, r) => r)), n);
    expect(full.converged).toBe(true);
    let coldIterations = 0;
    let warmIterations = 0;
    let coldEvaluations = 0;
    let warmEvaluations = 0;
    for (let b = 0; b < 20; b++) {
      const rows = Int32Array.from({ length: n }, () => random.nextInt(n));
      const resample = correlationOf(rows);
      const cold = oneFactorMl(resample, n);
      const warm = oneFactorMl(resample, n, { start: Object.freeze([...full.uniquenesses]) });
      expect(cold.converged && warm.converged).toBe(true);
      // The same optimum to the fit's tolerance (the gradient and F's stagnation, both about 1e-8 in the loadings).
      warm.loadings.forEach((value, k) => expect(Math.abs(value - cold.loadings[k])).toBeLessThan(1e-6));
      warm.uniquenesses.forEach((value, k) => expect(Math.abs(value - cold.uniquenesses[k])).toBeLessThan(1e-6));
      expect(Math.abs(warm.chiSquare - cold.chiSquare)).toBeLessThan(1e-6 * Math.max(1, cold.chiSquare));
      expect(warm.iterations).toBeLessThan(cold.iterations);
      coldIterations += cold.iterations;
      warmIterations += warm.iterations;
      coldEvaluations += cold.evaluations;
      warmEvaluations += warm.evaluations;
    }
    // Over the 20 resamples: fewer than half the steps (129 against 274 when written) and fewer
    // than 60% of the evaluations of the discrepancy (159 against 294).
    expect(warmIterations).toBeLessThan(coldIterations / 2);
    expect(warmEvaluations).toBeLessThan(0.6 * coldEvaluations);
  });

  it('a start of all nulls is Jöreskog\'s start with the approximate Hessian: the same optimum', () => {
    const model = fixture.models.find((entry) => entry.scale === 'all nine') as Model;
    const correlation = { order: model.items.length, data: Float64Array.from(model.correlation.flat()) };
    const cold = oneFactorMl(correlation, model.n);
    const nulls = oneFactorMl(correlation, model.n, { start: model.items.map(() => null) });
    nulls.loadings.forEach((value, k) => expect(value).toBeCloseTo(cold.loadings[k], 6));
  });

  it('refuses a start it cannot use', () => {
    const correlation = { order: 3, data: Float64Array.of(1, 0.5, 0.4, 0.5, 1, 0.3, 0.4, 0.3, 1) };
    expect(() => oneFactorMl(correlation, 100, { start: [0.5, 0.5] })).toThrow(/one uniqueness per item/);
    expect(() => oneFactorMl(correlation, 100, { start: [0.5, 0, 0.5] })).toThrow(/in \(0, 1\]/);
    expect(() => oneFactorMl(correlation, 100, { start: [0.5, Number.NaN, null] })).toThrow(/in \(0, 1\]/);
  });

  it('refuses what it cannot fit', () => {
    expect(() => oneFactorMl({ order: 2, data: Float64Array.of(1, 0.5, 0.5, 1) }, 100)).toThrow(RangeError);
    expect(() => oneFactorMl({ order: 3, data: Float64Array.of(1, 1, 1, 1, 1, 1, 1, 1, 1) }, 100)).toThrow(/positive definite/);
    expect(() => oneFactorMl({ order: 3, data: Float64Array.of(2, 0.5, 0.5, 0.5, 1, 0.5, 0.5, 0.5, 1) }, 100)).toThrow(/diagonal/);
  });
});
