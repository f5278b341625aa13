import { describe, expect, it } from 'vitest';
import { minresOneFactor } from '../../src/lib/stats/minres-factor';
import { omegaTotal } from '../../src/lib/stats/omega-total';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import { reliabilityFixture } from './reliability-cases';

describe('omegaTotal', () => {
  it.each(reliabilityFixture.cases.map((c) => [c.name, c] as const))(
    'from our minres loadings matches the formula on psych::fa loadings on %s at 0.005',
    (_name, reference) => {
      const loadings = minresOneFactor(squareMatrixFromRows(reference.correlation)).loadings as Float64Array;
      const result = omegaTotal(loadings);
      // R 4.2.2 psych 2.2.9: l <- psych::fa(cor(x), 1, fm = "minres")$loadings; sum(l)^2 / (sum(l)^2 + sum(1 - l^2))
      expect(Math.abs((result.omegaTotal as number) - reference.omega.omegaTotal)).toBeLessThan(0.005);
      expect(result.notices).toEqual([]);
    },
  );

  it('reproduces the R evaluation of the formula on the same loadings exactly', () => {
    for (const reference of reliabilityFixture.cases) {
      const loadings = Object.freeze([...reference.minres.loadings]);
      // R 4.2.2: sum(l)^2 / (sum(l)^2 + sum(1 - l^2)) on psych::fa loadings
      expect(omegaTotal(loadings).omegaTotal).toBeCloseTo(reference.omega.omegaTotal, 13);
    }
  });

  it('gives the hand-computed value for equal loadings', () => {
    // Hand-computed: four loadings of 0.6 → (2.4)² / (5.76 + 4 · 0.64) = 5.76 / 8.32
    expect(omegaTotal([0.6, 0.6, 0.6, 0.6]).omegaTotal).toBeCloseTo(5.76 / 8.32, 15);
  });

  it('reports Heywood loadings and cancelling ±1 loadings as undefined', () => {
    const heywood = omegaTotal([1.2, 0.5, 0.4]);
    expect(heywood.omegaTotal).toBeNull();
    expect(heywood.notices).toEqual([expect.objectContaining({ code: 'heywood-case', items: [0] })]);
    const degenerate = omegaTotal([1, -1]);
    expect(degenerate.omegaTotal).toBeNull();
    expect(degenerate.notices.map((n) => n.code)).toEqual(['degenerate-loadings']);
    expect(omegaTotal([1, 1]).omegaTotal).toBe(1);
  });

  it('refuses empty or non-finite loadings', () => {
    expect(() => omegaTotal([])).toThrow(/omegaTotal: at least one loading/);
    expect(() => omegaTotal([0.5, Number.NaN])).toThrow(/loading 1 is not finite/);
  });
});
