import { describe, expect, it } from 'vitest';
import { fCdf, fUpperTail } from '../../src/lib/stats/f-distribution';
import { tTwoSidedPValue } from '../../src/lib/stats/t-distribution';
import { readReferenceFixture, relativeError } from './reliability-fixtures';

interface Fixture {
  f: { call: string; rows: { x: number; df1: number; df2: number; lower: number; upper: number }[] };
}
const fixture = readReferenceFixture<Fixture>('distributions.json');

function expectClose(actual: number, expected: number, label: string): void {
  if (expected < 1e-290) expect(actual, label).toBeLessThan(1e-280);
  else expect(relativeError(actual, expected), label).toBeLessThan(1e-10);
}

describe('F distribution', () => {
  it('matches R pf (both tails) over a grid of x, df1 and df2 to 1e-10 relative', () => {
    // R 4.2.2: pf(x, df1, df2) and pf(x, df1, df2, lower.tail = FALSE), fixtures/reference/distributions.json
    expect(fixture.f.rows.length).toBeGreaterThan(300);
    for (const { x, df1, df2, lower, upper } of fixture.f.rows) {
      expectClose(fCdf(x, df1, df2), lower, `pf(${x}, ${df1}, ${df2})`);
      expectClose(fUpperTail(x, df1, df2), upper, `upper pf(${x}, ${df1}, ${df2})`);
    }
  });

  it('equals the squared t: P(F(1, ν) > t²) = P(|T_ν| > t)', () => {
    // Identity between the F(1, ν) and t_ν distributions
    expect(fUpperTail(2.3 ** 2, 1, 9)).toBeCloseTo(tTwoSidedPValue(2.3, 9), 14);
  });

  it('handles the ends and refuses invalid input', () => {
    expect(fCdf(0, 2, 3)).toBe(0);
    expect(fUpperTail(-1, 2, 3)).toBe(1);
    expect(fUpperTail(Infinity, 2, 3)).toBe(0);
    expect(() => fCdf(Number.NaN, 1, 1)).toThrow(/fCdf: x must be a number/);
    expect(() => fUpperTail(1, 0, 1)).toThrow(/numerator degrees of freedom/);
    expect(() => fUpperTail(1, 1, -3)).toThrow(/denominator degrees of freedom/);
  });
});
