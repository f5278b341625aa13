import { describe, expect, it } from 'vitest';
import {
  bivariateNormalCdfFromRule,
  bivariateNormalDensity,
  bivariateNormalGrid,
  createBivariateNormalRule,
  prepareBivariateNormalRule,
  type BivariateGridMargin,
  type BivariateNormalRule,
} from '../../src/lib/stats/bivariate-normal-cdf';
import { BIVARIATE_QUADRATURE_WASM, bivariateQuadratureGrid, quadratureKernelMatches } from '../../src/lib/stats/bivariate-quadrature-kernel';
import { normalCdf } from '../../src/lib/stats/normal-distribution';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { bivariateQuadratureWasmBytes } from '../../scripts/make-bivariate-quadrature-wasm.mjs';

/** A margin of the given limits (with Φ of them and of their negatives). */
function margin(limits: readonly number[]): BivariateGridMargin {
  return {
    limits: Float64Array.from(limits),
    lower: Float64Array.from(limits, (x) => normalCdf(x)),
    upper: Float64Array.from(limits, (x) => normalCdf(-x)),
    count: limits.length,
  };
}

/** A one-node rule (weight 1, first 1, second 0): the kernel's sum at corner (x, 1) is then exp(x · 1 − 0 · ½(x² + 1)) = exp(x). */
const EXP_RULE: BivariateNormalRule = {
  rho: 0.5,
  branch: 0,
  count: 1,
  weights: Float64Array.of(1),
  first: Float64Array.of(1),
  second: Float64Array.of(0),
  scale: 1,
};
const ONE = margin([1]);

/**
 * The kernel's exp at each x (|x| < 1e150), or null when it leaves them to JavaScript (the kernel
 * reads the limits only). With 2(1 − ρ²) taken as +∞ the density's exponents are −0, in range.
 */
function kernelExp(xs: readonly number[]): Float64Array | null {
  const limits = { limits: Float64Array.from(xs), lower: new Float64Array(xs.length), upper: new Float64Array(xs.length), count: xs.length };
  const grid = bivariateQuadratureGrid(limits, ONE, EXP_RULE, 1, Infinity);
  return grid === null ? null : grid.sums.slice(0, xs.length);
}

/** φ2 as bivariateNormalGrid computes it in JavaScript, verbatim. */
function densityInJavaScript(h: number, k: number, rho: number): number {
  const complement = (1 - rho) * (1 + rho);
  const densityScale = 1 / (2 * Math.PI * Math.sqrt(complement));
  const twiceComplement = 2 * complement;
  const twiceRho = 2 * rho;
  const hSquared = h * h;
  const twiceRhoH = twiceRho * h;
  const quadratic = hSquared - twiceRhoH * k + k * k;
  return Math.exp(-quadratic / twiceComplement) * densityScale;
}

/** The double after x (towards +∞), for finite x. */
function nextUp(x: number): number {
  if (x === 0) return Number.MIN_VALUE;
  const bits = new BigInt64Array(Float64Array.of(x).buffer);
  bits[0] += x > 0 ? 1n : -1n;
  return new Float64Array(bits.buffer)[0];
}

/** The double with these high and low 32-bit words. */
function fromWords(high: number, low: number): number {
  return new Float64Array(Uint32Array.of(low, high).buffer)[0];
}

function expectSameAsMathExp(xs: readonly number[]): void {
  const values = kernelExp(xs);
  expect(values).not.toBeNull();
  let differing = 0;
  let first = '';
  xs.forEach((x, i) => {
    if (!Object.is(values![i], Math.exp(x))) {
      if (differing === 0) first = `exp(${x}): kernel ${values![i]}, Math.exp ${Math.exp(x)}`;
      differing++;
    }
  });
  expect(differing, first).toBe(0);
}

describe('bivariate quadrature kernel', () => {
  it('holds the bytes scripts/make-bivariate-quadrature-wasm.mjs assembles', () => {
    expect(Array.from(BIVARIATE_QUADRATURE_WASM)).toEqual(Array.from(bivariateQuadratureWasmBytes()));
  });

  it('computes exp bit for bit as Math.exp on random arguments', () => {
    const random = createSeededRandom(20261203);
    const uniform = Array.from({ length: 200_000 }, () => -50 + 51 * random.next());
    expectSameAsMathExp(uniform);
    // Over the kernel's whole range, denser near 0.
    const wide = Array.from({ length: 200_000 }, () => (random.next() < 0.5 ? -1 : 1) * 706.9 * random.next() ** 4);
    expectSameAsMathExp(wide);
    // Random bit patterns with |x| < 707 (every exponent, from subnormal up).
    const words = Array.from({ length: 200_000 }, () => fromWords(Math.floor(random.next() * 2 ** 32), Math.floor(random.next() * 2 ** 32)));
    expectSameAsMathExp(words.filter((x) => Math.abs(x) < 707));
  });

  it('computes exp bit for bit as Math.exp at the edges of fdlibm’s ranges', () => {
    const edges: number[] = [0, -0, 1, -1, 2, -2, Number.MIN_VALUE, -Number.MIN_VALUE, 2 ** -28, -(2 ** -28), 2 ** -1022, 706.99, -706.99, Math.LN2, -Math.LN2];
    for (const value of [0.5 * Math.LN2, 1.5 * Math.LN2, 2 ** -28, 1]) edges.push(value, -value);
    // Around the high words fdlibm branches on: |x| > 0.5 ln2, |x| < 1.5 ln2, |x| < 2^-28.
    for (const high of [0x3fd62e42, 0x3fd62e43, 0x3ff0a2b1, 0x3ff0a2b2, 0x3e2fffff, 0x3e300000]) {
      for (const low of [0, 1, 0x7fffffff, 0x80000000, 0xffffffff]) edges.push(fromWords(high, low), -fromWords(high, low));
    }
    const around: number[] = [];
    for (const edge of edges) {
      let up = edge;
      let down = edge;
      for (let step = 0; step < 64; step++) {
        up = nextUp(up);
        down = -nextUp(-down);
        around.push(up, down);
      }
    }
    // Multiples of ln2 / 2, where the reduction's integer k changes.
    for (let m = -2038; m <= 2038; m++) around.push((m * Math.LN2) / 2, nextUp((m * Math.LN2) / 2), -nextUp(-(m * Math.LN2) / 2));
    expectSameAsMathExp([...edges, ...around].filter((x) => Math.abs(x) < 707));
  });

  it('checks itself against Math.exp, and sees an exp one unit in the last place off', () => {
    expect(quadratureKernelMatches()).toBe(true);
    expect(quadratureKernelMatches((x) => Math.exp(x) * (1 + Number.EPSILON))).toBe(false);
    // One argument in 64 rounded the other way, as a different exp would.
    let calls = 0;
    expect(quadratureKernelMatches((x) => (calls++ % 64 === 63 ? Math.exp(x) * (1 + Number.EPSILON) : Math.exp(x)))).toBe(false);
  });

  it('leaves arguments of 707 and beyond, and NaN, to JavaScript', () => {
    for (const x of [707, -707, -708, -745.2, 709.8, 800, NaN]) expect(kernelExp([0.5, x, -1]), `exp(${x})`).toBeNull();
    expect(kernelExp([0.5, nextUp(-707), -1])).not.toBeNull();
  });

  it('gives bivariateNormalGrid the very values of bivariateNormalCdfFromRule and of its JavaScript density in branch 0', () => {
    const random = createSeededRandom(7);
    const rule = createBivariateNormalRule();
    let grids = 0;
    for (let trial = 0; trial < 600; trial++) {
      const rowCount = 1 + Math.floor(random.next() * 7);
      const columnCount = 1 + Math.floor(random.next() * 7);
      const spread = trial % 3 === 0 ? 6 : 2.5;
      const limits = (count: number) => Array.from({ length: count }, () => spread * (2 * random.next() - 1)).sort((a, b) => a - b);
      const rows = margin(trial % 50 === 0 ? [0, ...limits(rowCount - 1)] : limits(rowCount));
      const columns = margin(trial % 50 === 0 ? [0, ...limits(columnCount - 1)] : limits(columnCount));
      // |ρ| in all three Gauss-Legendre rules of branch 0 (6, 12 and 20 points), both signs.
      const rho = (random.next() < 0.5 ? -1 : 1) * 0.924 * random.next();
      const prepared = prepareBivariateNormalRule(rho, rule);
      expect(prepared.branch).toBe(0);
      expect(bivariateQuadratureGrid(rows, columns, prepared, 2 * rho, 2 * ((1 - rho) * (1 + rho)))).not.toBeNull();
      grids++;
      const stride = columnCount + 3;
      const size = 2 + rowCount * stride;
      const out = { cdf: new Float64Array(size), density: new Float64Array(size), slope: new Float64Array(size), offset: 2, stride, rule };
      bivariateNormalGrid(rows, columns, rho, out);
      for (let i = 0; i < rowCount; i++) {
        for (let j = 0; j < columnCount; j++) {
          const h = rows.limits[i];
          const k = columns.limits[j];
          const at = 2 + i * stride + j;
          const expected = bivariateNormalCdfFromRule(h, k, rows.lower[i], rows.upper[i], columns.lower[j], columns.upper[j], prepareBivariateNormalRule(rho));
          expect(Object.is(out.cdf[at], expected), `Φ2(${h}, ${k}; ${rho}): grid ${out.cdf[at]}, from rule ${expected}`).toBe(true);
          expect(Object.is(out.density[at], densityInJavaScript(h, k, rho)), `φ2(${h}, ${k}; ${rho})`).toBe(true);
          expect(Math.abs(out.density[at] - bivariateNormalDensity(h, k, rho))).toBeLessThan(1e-15);
        }
      }
    }
    expect(grids).toBe(600);
  });

  it('gives the JavaScript values where an exponent is out of the kernel’s range', () => {
    const rows = margin([-40, 0.3]);
    const columns = margin([-35, 1.2, 2]);
    const rho = 0.6;
    const prepared = prepareBivariateNormalRule(rho);
    expect(bivariateQuadratureGrid(rows, columns, prepared, 2 * rho, 2 * ((1 - rho) * (1 + rho)))).toBeNull();
    const out = { cdf: new Float64Array(6), density: new Float64Array(6), slope: new Float64Array(6), offset: 0, stride: 3 };
    bivariateNormalGrid(rows, columns, rho, out);
    for (let i = 0; i < 2; i++) {
      for (let j = 0; j < 3; j++) {
        const expected = bivariateNormalCdfFromRule(rows.limits[i], columns.limits[j], rows.lower[i], rows.upper[i], columns.lower[j], columns.upper[j], prepared);
        expect(Object.is(out.cdf[i * 3 + j], expected)).toBe(true);
        expect(Object.is(out.density[i * 3 + j], densityInJavaScript(rows.limits[i], columns.limits[j], rho))).toBe(true);
      }
    }
  });
});
