import { describe, expect, it } from 'vitest';
import { incompleteBetaTails, regularizedIncompleteBeta } from '../../src/lib/stats/incomplete-beta';
import { readReferenceFixture, relativeError } from './reliability-fixtures';

interface Fixture {
  beta: { call: string; rows: { x: number; a: number; b: number; lower: number; upper: number }[] };
}
const fixture = readReferenceFixture<Fixture>('distributions.json');

/** Both tails to 1e-10 relative where R's value is a normal double; tiny values must stay tiny. */
function expectClose(actual: number, expected: number, label: string): void {
  if (expected < 1e-290) expect(actual, label).toBeLessThan(1e-280);
  else expect(relativeError(actual, expected), label).toBeLessThan(1e-10);
}

describe('incompleteBetaTails', () => {
  it('matches R pbeta (both tails) over a grid of x and shapes from 0.5 to 5000 to 1e-10 relative', () => {
    // R 4.2.2: pbeta(x, a, b) and pbeta(x, a, b, lower.tail = FALSE), fixtures/reference/distributions.json
    expect(fixture.beta.rows.length).toBeGreaterThan(400);
    for (const { x, a, b, lower, upper } of fixture.beta.rows) {
      const tails = incompleteBetaTails(x, a, b);
      expectClose(tails.lower, lower, `lower x=${x} a=${a} b=${b}`);
      expectClose(tails.upper, upper, `upper x=${x} a=${a} b=${b}`);
    }
  });

  it('satisfies the reflection I_x(a, b) = 1 − I_{1−x}(b, a) with tails that sum to 1', () => {
    // Identity: Abramowitz & Stegun 26.5.2
    for (const [x, a, b] of [[0.2, 2, 3], [0.7, 0.5, 12], [0.45, 40, 60]]) {
      const direct = incompleteBetaTails(x, a, b);
      const reflected = incompleteBetaTails(1 - x, b, a);
      expect(direct.lower).toBeCloseTo(reflected.upper, 14);
      expect(direct.lower + direct.upper).toBeCloseTo(1, 14);
    }
  });

  it('gives closed forms: I_x(1, 1) = x and I_x(a, 1) = x^a', () => {
    // Closed forms of the beta distribution function (uniform; power law)
    expect(regularizedIncompleteBeta(0.3, 1, 1)).toBeCloseTo(0.3, 14);
    expect(regularizedIncompleteBeta(0.6, 3, 1)).toBeCloseTo(0.216, 14);
  });

  it('handles the end points without computing', () => {
    expect(incompleteBetaTails(0, 2, 3)).toEqual({ lower: 0, upper: 1 });
    expect(incompleteBetaTails(1, 2, 3)).toEqual({ lower: 1, upper: 0 });
  });

  it('refuses invalid input', () => {
    expect(() => incompleteBetaTails(1.5, 1, 1)).toThrow(/x must lie in \[0, 1\]/);
    expect(() => incompleteBetaTails(0.5, 0, 1)).toThrow(/a must be positive/);
    expect(() => incompleteBetaTails(0.5, 1, Infinity)).toThrow(/b must be positive/);
    expect(() => incompleteBetaTails(0.5, 1, 1, 0.4)).toThrow(/complement must equal 1 − x/);
  });
});
