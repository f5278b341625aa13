import { describe, expect, it } from 'vitest';
import {
  bivariateNormalCdf,
  bivariateNormalCdfFromRule,
  bivariateNormalDensity,
  bivariateNormalDensitySlope,
  bivariateNormalGrid,
  createBivariateNormalRule,
  prepareBivariateNormalRule,
} from '../../src/lib/stats/bivariate-normal-cdf';
import { normalCdf } from '../../src/lib/stats/normal-distribution';
import { readCorrelationFixture, type Provenance } from './correlation-fixtures';

interface BivariateFixture {
  provenance: Provenance;
  cdf: { h: number; k: number; rho: number; plackett: number; tvpack: number }[];
  density: { h: number; k: number; rho: number; density: number }[];
}
const fixture = readCorrelationFixture<BivariateFixture>('correlation-bivariate-normal.json');

describe('bivariateNormalCdf', () => {
  it('matches numerical integration of Plackett’s identity and mvtnorm TVPACK to 1e-13', () => {
    expect(fixture.cdf.length).toBeGreaterThan(500);
    for (const { h, k, rho, plackett, tvpack } of fixture.cdf) {
      const value = bivariateNormalCdf(h, k, rho);
      // R 4.2.2: pnorm(h)*pnorm(k) + integrate(bivariate density in r, 0, rho, rel.tol = 1e-13)$value
      expect(Math.abs(value - plackett), `(${h}, ${k}; ${rho})`).toBeLessThan(1e-13);
      // R 4.2.2, mvtnorm 1.1-3: pmvnorm(upper = c(h, k), corr = ..., algorithm = TVPACK(abseps = 1e-15))
      expect(Math.abs(value - tvpack), `(${h}, ${k}; ${rho})`).toBeLessThan(1e-13);
    }
  });

  it('handles infinite limits and the singular correlations ±1 exactly', () => {
    expect(bivariateNormalCdf(-Infinity, 0.3, 0.5)).toBe(0);
    expect(bivariateNormalCdf(Infinity, 0.3, 0.5)).toBe(normalCdf(0.3));
    expect(bivariateNormalCdf(0.3, Infinity, -0.5)).toBe(normalCdf(0.3));
    expect(bivariateNormalCdf(Infinity, Infinity, 0.9)).toBe(1);
    // rho = 1: X = Y, so P(X <= h, Y <= k) = Φ(min(h, k)); rho = −1: Y = −X.
    expect(bivariateNormalCdf(0.4, -0.2, 1)).toBeCloseTo(normalCdf(-0.2), 15);
    expect(bivariateNormalCdf(0.4, -0.2, -1)).toBeCloseTo(normalCdf(0.4) - normalCdf(0.2), 15);
    expect(bivariateNormalCdf(-0.4, 0.2, -1)).toBe(0);
    // Continuity at the boundary of the |rho| = 1 branch.
    expect(Math.abs(bivariateNormalCdf(0.4, -0.2, 1 - 1e-12) - normalCdf(-0.2))).toBeLessThan(1e-6);
  });

  it('satisfies symmetry and the marginal identity Φ2(h, k; ρ) + Φ2(h, −k; −ρ) = Φ(h)', () => {
    for (const rho of [-0.97, -0.6, -0.1, 0.2, 0.8, 0.95]) {
      for (const [h, k] of [[-1.1, 0.4], [0.7, 2.1], [-2.5, -0.3]]) {
        expect(bivariateNormalCdf(h, k, rho)).toBeCloseTo(bivariateNormalCdf(k, h, rho), 15);
        expect(bivariateNormalCdf(h, k, rho) + bivariateNormalCdf(h, -k, -rho)).toBeCloseTo(normalCdf(h), 14);
      }
    }
  });

  it('refuses NaN limits and correlations outside [−1, 1]', () => {
    expect(() => bivariateNormalCdf(NaN, 0, 0)).toThrow(/limits must not be NaN/);
    expect(() => bivariateNormalCdf(0, 0, 1.01)).toThrow(/rho must be in \[-1, 1\]/);
    expect(() => bivariateNormalCdf(0, 0, NaN)).toThrow(RangeError);
    expect(() => prepareBivariateNormalRule(-2)).toThrow(RangeError);
  });
});

describe('bivariateNormalDensity', () => {
  it('matches mvtnorm dmvnorm to 1e-13 relative', () => {
    for (const { h, k, rho, density } of fixture.density) {
      // R 4.2.2, mvtnorm 1.1-3: dmvnorm(c(h, k), sigma = matrix(c(1, rho, rho, 1), 2))
      expect(Math.abs(bivariateNormalDensity(h, k, rho) - density) / density).toBeLessThan(1e-13);
    }
  });

  it('is the derivative of Φ2 in ρ (Plackett 1954), checked by central differences', () => {
    const step = 1e-5;
    for (const [h, k, rho] of [[0.3, -0.8, 0.1], [-1.2, -0.9, 0.6], [1.5, 0.2, -0.45], [0.1, 0.2, 0.9]]) {
      const difference = (bivariateNormalCdf(h, k, rho + step) - bivariateNormalCdf(h, k, rho - step)) / (2 * step);
      expect(Math.abs(difference - bivariateNormalDensity(h, k, rho))).toBeLessThan(1e-8);
    }
  });

  it('has the closed-form slope in ρ, checked by central differences', () => {
    const step = 1e-6;
    for (const [h, k, rho] of [[0.3, -0.8, 0.1], [-1.2, -0.9, 0.6], [1.5, 0.2, -0.45], [0, 0, 0]]) {
      const difference = (bivariateNormalDensity(h, k, rho + step) - bivariateNormalDensity(h, k, rho - step)) / (2 * step);
      expect(Math.abs(difference - bivariateNormalDensitySlope(h, k, rho))).toBeLessThan(1e-8);
    }
  });

  it('is zero at infinite coordinates and refuses |ρ| = 1', () => {
    expect(bivariateNormalDensity(Infinity, 0, 0.3)).toBe(0);
    expect(bivariateNormalDensitySlope(0, -Infinity, 0.3)).toBe(0);
    expect(() => bivariateNormalDensity(0, 0, 1)).toThrow(/strictly between -1 and 1/);
    expect(() => bivariateNormalDensity(NaN, 0, 0.2)).toThrow(RangeError);
  });
});

describe('bivariateNormalGrid', () => {
  it('equals the scalar functions at every corner, for every quadrature branch', () => {
    const rowLimits = Float64Array.of(-1.3, -0.2, 0.9);
    const columnLimits = Float64Array.of(-0.6, 0.5);
    const margin = (limits: Float64Array) => ({
      limits,
      lower: limits.map((x) => normalCdf(x)),
      upper: limits.map((x) => normalCdf(-x)),
      count: limits.length,
    });
    for (const rho of [-0.95, -0.5, 0.1, 0.6, 0.93]) {
      const stride = 4;
      const out = { cdf: new Float64Array(20), density: new Float64Array(20), slope: new Float64Array(20), offset: 5, stride };
      bivariateNormalGrid(margin(rowLimits), margin(columnLimits), rho, out);
      rowLimits.forEach((h, i) =>
        columnLimits.forEach((k, j) => {
          const at = 5 + i * stride + j;
          expect(out.cdf[at]).toBe(bivariateNormalCdf(h, k, rho));
          expect(out.density[at]).toBeCloseTo(bivariateNormalDensity(h, k, rho), 15);
          expect(out.slope[at]).toBeCloseTo(bivariateNormalDensitySlope(h, k, rho), 13);
        }),
      );
      expect(out.cdf[0]).toBe(0); // untouched outside the layout
    }
    expect(() =>
      bivariateNormalGrid(margin(rowLimits), margin(columnLimits), 1, { cdf: new Float64Array(9), density: new Float64Array(9), slope: new Float64Array(9), offset: 0, stride: 3 }),
    ).toThrow(/strictly between -1 and 1/);
  });

  it('keeps results within the Fréchet bounds', () => {
    const rule = prepareBivariateNormalRule(-0.9999999);
    const value = bivariateNormalCdfFromRule(-3, 2.9, normalCdf(-3), normalCdf(3), normalCdf(2.9), normalCdf(-2.9), rule);
    expect(value).toBeGreaterThanOrEqual(0);
    expect(value).toBeLessThanOrEqual(normalCdf(-3));
  });
});

describe('a rule prepared into a caller-owned buffer', () => {
  // ρ chosen to cross every branch and rule size, in an order that shrinks the rule after a large one.
  const rhos = [0.95, 0.1, -0.999, 0.6, 0, -0.4, 0.8, -1, 1, 0.25, -0.93, -0];

  it('holds, for every ρ, the rule a fresh preparation gives, bit for bit', () => {
    const buffer = createBivariateNormalRule();
    for (const rho of rhos) {
      const fresh = prepareBivariateNormalRule(rho);
      const prepared = prepareBivariateNormalRule(rho, buffer);
      expect(prepared).toBe(buffer);
      expect(Object.is(prepared.rho, fresh.rho) && prepared.branch === fresh.branch && prepared.count === fresh.count && Object.is(prepared.scale, fresh.scale), `rho ${rho}`).toBe(true);
      for (let i = 0; i < fresh.count; i++) {
        expect(Object.is(prepared.weights[i], fresh.weights[i]) && Object.is(prepared.first[i], fresh.first[i]) && Object.is(prepared.second[i], fresh.second[i]), `rho ${rho}, point ${i}`).toBe(true);
      }
      // The same ρ again is answered from the buffer.
      expect(prepareBivariateNormalRule(rho, buffer)).toBe(buffer);
    }
    // The fresh rule's arrays are as long as its Gauss-Legendre rule: 6, 12 or 20 points as |ρ| grows.
    expect([0.1, 0.6, 0.8].map((rho) => prepareBivariateNormalRule(rho).weights.length)).toEqual([6, 12, 20]);
    expect(() => prepareBivariateNormalRule(1.5, buffer)).toThrow(RangeError);
  });

  it('gives the grid the same values as a rule of its own, and the values of the grid loop written out in full', () => {
    const rowLimits = Float64Array.of(-1.7, -0.3, 0.45, 1.2);
    const columnLimits = Float64Array.of(-0.9, 0.2, 1.6);
    const margin = (limits: Float64Array) => ({ limits, lower: limits.map((x) => normalCdf(x)), upper: limits.map((x) => normalCdf(-x)), count: limits.length });
    const buffer = createBivariateNormalRule();
    for (const rho of rhos.filter((value) => Math.abs(value) < 1)) {
      const size = 30;
      const own = { cdf: new Float64Array(size), density: new Float64Array(size), slope: new Float64Array(size), offset: 6, stride: 5 };
      const shared = { ...own, cdf: new Float64Array(size), density: new Float64Array(size), slope: new Float64Array(size), rule: buffer };
      bivariateNormalGrid(margin(rowLimits), margin(columnLimits), rho, own);
      bivariateNormalGrid(margin(rowLimits), margin(columnLimits), rho, shared);
      // The density and its slope as the grid first wrote them, every factor inside the loop.
      const complement = (1 - rho) * (1 + rho);
      const densityScale = 1 / (2 * Math.PI * Math.sqrt(complement));
      const slopeScale = 1 / (complement * complement);
      rowLimits.forEach((h, i) =>
        columnLimits.forEach((k, j) => {
          const at = 6 + i * 5 + j;
          const quadratic = h * h - 2 * rho * h * k + k * k;
          const value = Math.exp(-quadratic / (2 * complement)) * densityScale;
          const slopeValue = value * (rho * complement + h * k * complement - rho * quadratic) * slopeScale;
          expect(Object.is(own.density[at], value) && Object.is(own.slope[at], slopeValue), `rho ${rho}, corner ${i}, ${j}`).toBe(true);
          expect(Object.is(shared.cdf[at], own.cdf[at]) && Object.is(shared.density[at], value) && Object.is(shared.slope[at], slopeValue), `rho ${rho}, corner ${i}, ${j}, shared rule`).toBe(true);
        }),
      );
    }
  });
});
