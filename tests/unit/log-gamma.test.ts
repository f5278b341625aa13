import { describe, expect, it } from 'vitest';
import { logBeta, logGamma, stirlingRemainder } from '../../src/lib/stats/log-gamma';
import { readReferenceFixture, relativeError } from './reliability-fixtures';

interface Fixture {
  logGamma: { call: string; rows: { x: number; value: number }[] };
  logBeta: { call: string; rows: { a: number; b: number; value: number }[] };
}
const fixture = readReferenceFixture<Fixture>('distributions.json');

describe('logGamma', () => {
  it('matches R lgamma over a grid to 1e-13 (absolute near the zeros at 1 and 2)', () => {
    // R 4.2.2: lgamma(x), fixtures/reference/distributions.json
    expect(fixture.logGamma.rows.length).toBeGreaterThan(10);
    for (const { x, value } of fixture.logGamma.rows) {
      const error = Math.abs(value) < 1 ? Math.abs(logGamma(x) - value) : relativeError(logGamma(x), value);
      expect(error, `x = ${x}`).toBeLessThan(1e-13);
    }
  });

  it('gives exact small factorials: ln Γ(n) = ln (n − 1)!', () => {
    // Hand-computed: 4! = 24, 9! = 362880, 11! = 39916800
    expect(logGamma(5)).toBeCloseTo(Math.log(24), 13);
    expect(logGamma(10)).toBeCloseTo(Math.log(362880), 12);
    expect(logGamma(12)).toBeCloseTo(Math.log(39916800), 12);
    // Γ(½) = √π (Abramowitz & Stegun 6.1.8)
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 14);
  });

  it('is continuous across the switch from Lanczos to Stirling at 10', () => {
    // Recurrence Γ(x + 1) = x Γ(x) across the switch (Abramowitz & Stegun 6.1.15)
    expect(logGamma(10.25) - logGamma(9.25)).toBeCloseTo(Math.log(9.25), 13);
  });

  it('refuses arguments that are not positive and finite', () => {
    expect(() => logGamma(0)).toThrow(/logGamma: x must be positive/);
    expect(() => logGamma(-1)).toThrow(RangeError);
    expect(() => logGamma(Number.NaN)).toThrow(RangeError);
    expect(() => logGamma(Infinity)).toThrow(RangeError);
    expect(() => stirlingRemainder(5)).toThrow(/at least 10/);
  });
});

describe('logBeta', () => {
  it('matches R lbeta over a grid of shapes from 0.5 to 5000 to 1e-12', () => {
    // R 4.2.2: lbeta(a, b), fixtures/reference/distributions.json
    expect(fixture.logBeta.rows.length).toBeGreaterThan(40);
    for (const { a, b, value } of fixture.logBeta.rows) {
      const error = Math.abs(value) < 1 ? Math.abs(logBeta(a, b) - value) : relativeError(logBeta(a, b), value);
      expect(error, `a = ${a}, b = ${b}`).toBeLessThan(1e-12);
    }
  });

  it('is symmetric and agrees with the gamma form for small shapes', () => {
    // Identity B(a, b) = Γ(a)Γ(b)/Γ(a + b) (Abramowitz & Stegun 6.2.2)
    expect(logBeta(3.5, 700)).toBe(logBeta(700, 3.5));
    expect(logBeta(2.5, 4)).toBeCloseTo(logGamma(2.5) + logGamma(4) - logGamma(6.5), 13);
  });

  it('refuses shapes that are not positive and finite', () => {
    expect(() => logBeta(0, 1)).toThrow(/logBeta: a must be positive/);
    expect(() => logBeta(1, -2)).toThrow(/logBeta: b must be positive/);
  });
});
