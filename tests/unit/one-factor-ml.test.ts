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
import { oneFactorMl } from '../../src/lib/stats';

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

  it('refuses what it cannot fit', () => {
    expect(() => oneFactorMl({ order: 2, data: Float64Array.of(1, 0.5, 0.5, 1) }, 100)).toThrow(RangeError);
    expect(() => oneFactorMl({ order: 3, data: Float64Array.of(1, 1, 1, 1, 1, 1, 1, 1, 1) }, 100)).toThrow(/positive definite/);
    expect(() => oneFactorMl({ order: 3, data: Float64Array.of(2, 0.5, 0.5, 0.5, 1, 0.5, 0.5, 0.5, 1) }, 100)).toThrow(/diagonal/);
  });
});
