import { describe, expect, it } from 'vitest';
import { chiSquareCdf, chiSquareUpperTail } from '../../src/lib/stats/chi-square-distribution';
import { readReferenceFixture, relativeError } from './reliability-fixtures';

interface Fixture {
  chiSquare: { call: string; rows: { x: number; df: number; lower: number; upper: number }[] };
}
const fixture = readReferenceFixture<Fixture>('distributions.json');

function expectClose(actual: number, expected: number, label: string): void {
  if (expected < 1e-290) expect(actual, label).toBeLessThan(1e-280);
  else expect(relativeError(actual, expected), label).toBeLessThan(1e-10);
}

describe('chi-square distribution', () => {
  it('matches R pchisq (both tails) for df from 0.5 to 1e4 to 1e-10 relative', () => {
    // R 4.2.2: pchisq(x, df) and pchisq(x, df, lower.tail = FALSE), fixtures/reference/distributions.json
    expect(fixture.chiSquare.rows.length).toBeGreaterThan(100);
    for (const { x, df, lower, upper } of fixture.chiSquare.rows) {
      expectClose(chiSquareCdf(x, df), lower, `pchisq(${x}, ${df})`);
      expectClose(chiSquareUpperTail(x, df), upper, `upper pchisq(${x}, ${df})`);
    }
  });

  it('has the closed form e^(−x/2) for 2 degrees of freedom', () => {
    // Closed form: the chi-square with 2 df is exponential with mean 2
    expect(chiSquareUpperTail(7.5, 2)).toBeCloseTo(Math.exp(-3.75), 15);
  });

  it('handles the ends and refuses invalid input', () => {
    expect(chiSquareCdf(0, 4)).toBe(0);
    expect(chiSquareUpperTail(-2, 4)).toBe(1);
    expect(chiSquareUpperTail(Infinity, 4)).toBe(0);
    expect(() => chiSquareCdf(Number.NaN, 1)).toThrow(/chiSquareCdf: x must be a number/);
    expect(() => chiSquareUpperTail(1, 0)).toThrow(/degrees of freedom must be positive/);
  });
});
