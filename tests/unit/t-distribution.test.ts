import { describe, expect, it } from 'vitest';
import { tCdf, tDensity, tQuantile, tTwoSidedPValue } from '../../src/lib/stats/t-distribution';
import { readReferenceFixture, relativeError } from './reliability-fixtures';

interface Fixture {
  t: { call: string; rows: { t: number; df: number; lower: number; twoSided: number }[] };
  tQuantile: { call: string; rows: { p: number; df: number; value: number }[] };
}
const fixture = readReferenceFixture<Fixture>('distributions.json');

function expectClose(actual: number, expected: number, label: string): void {
  if (expected < 1e-290) expect(actual, label).toBeLessThan(1e-280);
  else expect(relativeError(actual, expected), label).toBeLessThan(1e-10);
}

describe('t distribution', () => {
  it('tCdf and tTwoSidedPValue match R pt over a grid of t and df (1 to 1e5) to 1e-10 relative', () => {
    // R 4.2.2: pt(t, df) and 2 * pt(-abs(t), df), fixtures/reference/distributions.json
    expect(fixture.t.rows.length).toBeGreaterThan(150);
    for (const { t, df, lower, twoSided } of fixture.t.rows) {
      expectClose(tCdf(t, df), lower, `pt(${t}, ${df})`);
      expectClose(tTwoSidedPValue(t, df), twoSided, `two-sided t=${t} df=${df}`);
    }
  });

  it('tQuantile matches R qt to 1e-10 relative', () => {
    // R 4.2.2: qt(p, df), fixtures/reference/distributions.json
    expect(fixture.tQuantile.rows.length).toBeGreaterThan(100);
    for (const { p, df, value } of fixture.tQuantile.rows) {
      expect(relativeError(tQuantile(p, df), value), `qt(${p}, ${df})`).toBeLessThan(1e-10);
    }
    expect(tQuantile(0.5, 7)).toBe(0);
  });

  it('has the Cauchy distribution at df = 1 and a density that integrates to the CDF', () => {
    // Closed form for df = 1: F(t) = ½ + atan(t)/π, f(t) = 1/(π(1 + t²))
    expect(tCdf(2, 1)).toBeCloseTo(0.5 + Math.atan(2) / Math.PI, 15);
    expect(tDensity(2, 1)).toBeCloseTo(1 / (5 * Math.PI), 15);
    // Central difference of the CDF against the density (df = 7, t = 1.3)
    const h = 1e-5;
    expect((tCdf(1.3 + h, 7) - tCdf(1.3 - h, 7)) / (2 * h)).toBeCloseTo(tDensity(1.3, 7), 8);
  });

  it('handles infinite t and refuses invalid input', () => {
    expect(tCdf(Infinity, 3)).toBe(1);
    expect(tCdf(-Infinity, 3)).toBe(0);
    expect(tTwoSidedPValue(Infinity, 3)).toBe(0);
    expect(tTwoSidedPValue(0, 3)).toBe(1);
    expect(() => tCdf(Number.NaN, 3)).toThrow(/tCdf: t must be a number/);
    expect(() => tCdf(1, 0)).toThrow(/degrees of freedom must be positive/);
    expect(() => tTwoSidedPValue(1, Infinity)).toThrow(RangeError);
    expect(() => tQuantile(1, 3)).toThrow(/p must lie strictly between 0 and 1/);
  });
});
