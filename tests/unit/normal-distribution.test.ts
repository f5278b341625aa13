import { describe, expect, it } from 'vitest';
import { normalCdf, normalDensity, normalQuantile } from '../../src/lib/stats/normal-distribution';
import { readCorrelationFixture, type Provenance } from './correlation-fixtures';

interface NormalFixture {
  provenance: Provenance;
  cdf: { x: number; lower: number; upper: number; density: number }[];
  quantile: { p: number; q: number }[];
}
const fixture = readCorrelationFixture<NormalFixture>('correlation-normal-distribution.json');

/** |a − b| / |b|, or |a − b| when b is 0. */
function relativeError(actual: number, expected: number): number {
  return expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);
}

describe('normalCdf', () => {
  it('matches R pnorm in both tails to 1e-12 relative', () => {
    expect(fixture.cdf.length).toBeGreaterThan(20);
    for (const { x, lower, upper } of fixture.cdf) {
      // R 4.2.2: pnorm(x) and pnorm(x, lower.tail = FALSE); below the smallest normal double
      // (pnorm(-38) is subnormal) only the absolute error is meaningful.
      if (lower >= 1e-300) expect(relativeError(normalCdf(x), lower), `x = ${x}`).toBeLessThan(1e-12);
      else expect(Math.abs(normalCdf(x) - lower), `x = ${x}`).toBeLessThan(1e-310);
      if (upper >= 1e-300) expect(relativeError(normalCdf(-x), upper), `upper x = ${x}`).toBeLessThan(1e-12);
      else expect(Math.abs(normalCdf(-x) - upper), `upper x = ${x}`).toBeLessThan(1e-310);
    }
  });

  it('gives the exact limits and symmetry', () => {
    expect(normalCdf(-Infinity)).toBe(0);
    expect(normalCdf(Infinity)).toBe(1);
    expect(normalCdf(0)).toBe(0.5);
    for (const x of [0.1, 0.9, 1.7, 3.2, 6]) expect(normalCdf(x) + normalCdf(-x)).toBeCloseTo(1, 15);
  });

  it('refuses NaN', () => {
    expect(() => normalCdf(NaN)).toThrow(/normalCdf: x is NaN/);
  });
});

describe('normalDensity', () => {
  it('matches R dnorm to 1e-14 relative', () => {
    for (const { x, density } of fixture.cdf) {
      // R 4.2.2: dnorm(x)
      if (density > 1e-300) expect(relativeError(normalDensity(x), density), `x = ${x}`).toBeLessThan(1e-13);
    }
    expect(normalDensity(Infinity)).toBe(0);
    expect(() => normalDensity(NaN)).toThrow(RangeError);
  });
});

describe('normalQuantile', () => {
  it('matches R qnorm to 1e-12 relative', () => {
    for (const { p, q } of fixture.quantile) {
      // R 4.2.2: qnorm(p)
      expect(relativeError(normalQuantile(p), q), `p = ${p}`).toBeLessThan(1e-12);
    }
  });

  it('inverts normalCdf', () => {
    for (const p of [1e-15, 1e-6, 0.02, 0.3, 0.5, 0.77, 0.999]) expect(relativeError(normalCdf(normalQuantile(p)), p)).toBeLessThan(1e-13);
  });

  it('gives infinite quantiles at 0 and 1 and refuses anything outside [0, 1]', () => {
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(() => normalQuantile(-0.1)).toThrow(/normalQuantile: p must be a probability/);
    expect(() => normalQuantile(1.5)).toThrow(RangeError);
    expect(() => normalQuantile(NaN)).toThrow(RangeError);
  });
});
