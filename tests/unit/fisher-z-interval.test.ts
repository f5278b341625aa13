import { describe, expect, it } from 'vitest';
import { fisherZInterval } from '../../src/lib/stats/fisher-z-interval';
import { readCorrelationFixture, type Provenance } from './correlation-fixtures';

interface FisherFixture {
  provenance: Provenance;
  cases: { r: number; n: number; confidence: number; lower: number; upper: number; psych: number[] }[];
}
const fixture = readCorrelationFixture<FisherFixture>('correlation-fisher-z.json');

describe('fisherZInterval', () => {
  it('matches the formula in R and psych::r.con to 1e-12', () => {
    expect(fixture.cases.length).toBe(72);
    for (const { r, n, confidence, lower, upper, psych } of fixture.cases) {
      const interval = fisherZInterval(r, n, confidence);
      // R 4.2.2: tanh(atanh(r) + c(-1, 1) * qnorm(0.5 + level/2) / sqrt(n - 3))
      expect(Math.abs(interval.lower - lower), `${r} ${n} ${confidence}`).toBeLessThan(1e-12);
      expect(Math.abs(interval.upper - upper)).toBeLessThan(1e-12);
      // R 4.2.2, psych 2.2.9: r.con(r, n, p = level)
      expect(Math.abs(interval.lower - psych[0])).toBeLessThan(1e-12);
      expect(Math.abs(interval.upper - psych[1])).toBeLessThan(1e-12);
      expect(interval.standardError).toBeCloseTo(1 / Math.sqrt(n - 3), 15);
      expect(interval.lower).toBeLessThanOrEqual(r);
      expect(interval.upper).toBeGreaterThanOrEqual(r);
    }
  });

  it('uses 95% by default and is symmetric on the z scale', () => {
    const interval = fisherZInterval(0.5, 103);
    expect(interval.confidence).toBe(0.95);
    expect(Math.atanh(interval.upper) - interval.z).toBeCloseTo(interval.z - Math.atanh(interval.lower), 12);
    expect(interval.upper - interval.z).not.toBe(0);
  });

  it('gives a degenerate interval, not NaN, for |r| = 1', () => {
    const interval = fisherZInterval(1, 20);
    expect(interval.lower).toBe(1);
    expect(interval.upper).toBe(1);
    expect(fisherZInterval(-1, 20).lower).toBe(-1);
  });

  it('checks its inputs', () => {
    expect(() => fisherZInterval(1.2, 10)).toThrow(/fisherZInterval: r must be in \[-1, 1\]/);
    expect(() => fisherZInterval(0.2, 3)).toThrow(/n must be an integer of at least 4/);
    expect(() => fisherZInterval(0.2, 10.5)).toThrow(RangeError);
    expect(() => fisherZInterval(0.2, 10, 1)).toThrow(/confidence must be strictly between 0 and 1/);
  });
});
