/**
 * The standard bivariate normal distribution with correlation ρ: its distribution function
 * Φ2(h, k; ρ) = P(X ≤ h, Y ≤ k), its density φ2(h, k; ρ), and the slope of the density in ρ.
 *
 * Φ2 follows Genz's double-precision refinement of Drezner & Wesolowsky: for |ρ| < 0.925 it
 * integrates Plackett's identity ∂Φ2/∂ρ = φ2 over arcsin ρ by Gauss-Legendre quadrature (6,
 * 12 or 20 points as |ρ| grows); for |ρ| ≥ 0.925 it integrates the difference from the
 * singular ρ = ±1 limit, with a series removing the integrable singularity. Absolute accuracy
 * is about 1e-15 over the whole plane.
 *
 * The work that depends only on ρ (quadrature nodes mapped to the arcsine scale) is done once
 * by `prepareBivariateNormalRule`, so that a grid of limits at one ρ (the polychoric
 * likelihood) costs only a few exponentials per point.
 *
 * WORKER NOTE: `prepareBivariateNormalRule`, `bivariateNormalCdfFromRule` and
 * `bivariateNormalGrid` also run inside the polychoric worker thread from their source text
 * (see parallel/polychoric-worker.ts). They must stay top-level function declarations
 * that refer only to their own locals, `Math`, typed arrays, each other and `normalCdf`.
 *
 * References: Genz 2004, "Numerical computation of rectangular bivariate and trivariate normal
 * and t probabilities" (Statistics and Computing 14:251-260); Drezner & Wesolowsky 1990, "On
 * the computation of the bivariate normal integral" (J. Statist. Comput. Simul. 35:101-107);
 * Plackett 1954, "A reduction formula for normal multivariate integrals" (Biometrika 41:351-360).
 */
import { normalCdf } from './normal-distribution';

/**
 * What the Φ2 quadrature needs at one ρ, prepared once and reused for many limits.
 * `branch` 0: |ρ| < 0.925 (arcsine quadrature); 1: 0.925 ≤ |ρ| < 1 (singular-limit
 * quadrature); 2: ρ = 0 or |ρ| = 1 (closed form, no quadrature).
 */
export interface BivariateNormalRule {
  readonly rho: number;
  readonly branch: 0 | 1 | 2;
  /** Quadrature points (both halves of the symmetric Gauss-Legendre rule). */
  readonly count: number;
  readonly weights: Float64Array;
  /** Branch 0: sn/(1 − sn²); branch 1: xs = (a(1 ± x))². */
  readonly first: Float64Array;
  /** Branch 0: 1/(1 − sn²); branch 1: √(1 − xs). */
  readonly second: Float64Array;
  /** Branch 0: arcsin(ρ)/(4π); branch 1: √((1 − ρ)(1 + ρ)). */
  readonly scale: number;
}

/**
 * Prepares the quadrature for Φ2 at one correlation (Gauss-Legendre points and weights of
 * Genz's BVND routine, mapped for this ρ).
 * @param rho Correlation in [−1, 1].
 * @throws {RangeError} when rho is NaN or outside [−1, 1].
 * @returns The prepared rule, to pass to `bivariateNormalCdfFromRule` or `bivariateNormalGrid`.
 * References: Genz 2004, "Numerical computation of rectangular bivariate and trivariate normal
 * and t probabilities".
 */
export function prepareBivariateNormalRule(rho: number): BivariateNormalRule {
  if (!(rho >= -1 && rho <= 1)) throw new RangeError(`prepareBivariateNormalRule: rho must be in [-1, 1], got ${rho}`);
  const magnitude = Math.abs(rho);
  let halfWeights: number[];
  let halfPoints: number[];
  if (magnitude < 0.3) {
    halfWeights = [0.1713244923791705, 0.3607615730481384, 0.4679139345726904];
    halfPoints = [-0.9324695142031522, -0.6612093864662647, -0.238619186083197];
  } else if (magnitude < 0.75) {
    halfWeights = [0.04717533638651177, 0.1069393259953183, 0.1600783285433464, 0.2031674267230659, 0.2334925365383547, 0.2491470458134029];
    halfPoints = [-0.9815606342467191, -0.904117256370475, -0.769902674194305, -0.5873179542866171, -0.3678314989981802, -0.1252334085114692];
  } else {
    halfWeights = [
      0.01761400713915212, 0.04060142980038694, 0.06267204833410906, 0.08327674157670475, 0.1019301198172404, 0.1181945319615184,
      0.1316886384491766, 0.1420961093183821, 0.1491729864726037, 0.1527533871307259,
    ];
    halfPoints = [
      -0.9931285991850949, -0.9639719272779138, -0.9122344282513259, -0.8391169718222188, -0.7463319064601508, -0.636053680726515,
      -0.5108670019508271, -0.3737060887154196, -0.2277858511416451, -0.07652652113349733,
    ];
  }
  const half = halfPoints.length;
  const count = 2 * half;
  const weights = new Float64Array(count);
  const first = new Float64Array(count);
  const second = new Float64Array(count);
  if (rho === 0 || magnitude === 1) {
    return { rho, branch: 2, count: 0, weights, first, second, scale: 0 };
  }
  if (magnitude < 0.925) {
    const arcsine = Math.asin(rho);
    for (let i = 0; i < half; i++) {
      for (let side = 0; side < 2; side++) {
        const index = 2 * i + side;
        const sn = Math.sin((arcsine * ((side === 0 ? -1 : 1) * halfPoints[i] + 1)) / 2);
        const inverse = 1 / (1 - sn * sn);
        weights[index] = halfWeights[i];
        first[index] = sn * inverse;
        second[index] = inverse;
      }
    }
    return { rho, branch: 0, count, weights, first, second, scale: arcsine / (4 * Math.PI) };
  }
  const squareRootComplement = Math.sqrt((1 - rho) * (1 + rho));
  const a = squareRootComplement / 2;
  for (let i = 0; i < half; i++) {
    for (let side = 0; side < 2; side++) {
      const index = 2 * i + side;
      const xs = (a * ((side === 0 ? -1 : 1) * halfPoints[i] + 1)) ** 2;
      weights[index] = halfWeights[i];
      first[index] = xs;
      second[index] = Math.sqrt(1 - xs);
    }
  }
  return { rho, branch: 1, count, weights, first, second, scale: squareRootComplement };
}

/**
 * Φ2(h, k; ρ) for finite limits, given the prepared rule and the marginal probabilities
 * (which the caller often knows exactly, e.g. cumulative category shares).
 * @param h First limit (finite).
 * @param k Second limit (finite).
 * @param lowerH Φ(h).
 * @param upperH Φ(−h), computed directly rather than as 1 − Φ(h).
 * @param lowerK Φ(k).
 * @param upperK Φ(−k).
 * @param rule The rule from `prepareBivariateNormalRule(ρ)`.
 * @returns P(X ≤ h, Y ≤ k), kept within the Fréchet bounds [max(0, Φ(h) + Φ(k) − 1), min(Φ(h), Φ(k))].
 * References: Genz 2004, "Numerical computation of rectangular bivariate and trivariate normal
 * and t probabilities" (the BVND routine, applied to −h, −k).
 */
export function bivariateNormalCdfFromRule(
  h: number,
  k: number,
  lowerH: number,
  upperH: number,
  lowerK: number,
  upperK: number,
  rule: BivariateNormalRule,
): number {
  const rho = rule.rho;
  let value = 0;
  if (rule.branch === 0 || (rule.branch === 2 && rho === 0)) {
    if (rule.branch === 0) {
      const halfSumOfSquares = (h * h + k * k) / 2;
      const product = h * k;
      const weights = rule.weights;
      const first = rule.first;
      const second = rule.second;
      let sum = 0;
      for (let i = 0; i < rule.count; i++) sum += weights[i] * Math.exp(first[i] * product - second[i] * halfSumOfSquares);
      value = sum * rule.scale;
    }
    value += lowerH * lowerK;
  } else {
    // Genz's upper-orthant limits H = −h, K = −k, with K flipped for negative ρ.
    const bigH = -h;
    const bigK = rho < 0 ? k : -k;
    if (rule.branch === 1) {
      const complement = (1 - rho) * (1 + rho);
      const a = rule.scale;
      const hk = bigH * bigK;
      const bs = (bigH - bigK) * (bigH - bigK);
      const c = (4 - hk) / 8;
      const d = (12 - hk) / 16;
      let exponent = -(bs / complement + hk) / 2;
      let sum = 0;
      if (exponent > -100) {
        sum = a * Math.exp(exponent) * (1 - (c * (bs - complement) * (1 - (d * bs) / 5)) / 3 + (c * d * complement * complement) / 5);
      }
      if (-hk < 100) {
        const b = Math.sqrt(bs);
        sum -= Math.exp(-hk / 2) * 2.5066282746310002 * normalCdf(-b / a) * b * (1 - (c * bs * (1 - (d * bs) / 5)) / 3);
      }
      const halfA = a / 2;
      const weights = rule.weights;
      const xsValues = rule.first;
      const rsValues = rule.second;
      for (let i = 0; i < rule.count; i++) {
        const xs = xsValues[i];
        const rs = rsValues[i];
        exponent = -(bs / xs + hk) / 2;
        if (exponent > -100) {
          sum += halfA * weights[i] * Math.exp(exponent) * (Math.exp((-hk * (1 - rs)) / (2 * (1 + rs))) / rs - (1 + c * xs * (1 + d * xs)));
        }
      }
      value = -sum / (2 * Math.PI);
    }
    if (rho > 0) {
      value += h < k ? lowerH : lowerK;
    } else {
      value = -value;
      if (bigK > bigH) value += bigH < 0 ? lowerK - upperH : lowerH - upperK;
    }
  }
  const upperBound = lowerH < lowerK ? lowerH : lowerK;
  const lowerBound = lowerH + lowerK - 1;
  if (value > upperBound) value = upperBound;
  if (value < lowerBound) value = lowerBound;
  if (value <= 0) value = 0; // also turns −0 into 0
  return value;
}

/**
 * Bivariate normal distribution function Φ2(h, k; ρ) = P(X ≤ h, Y ≤ k) for standard normal
 * X, Y with correlation ρ, to about 1e-15 absolute accuracy.
 * @param h First limit; ±Infinity allowed.
 * @param k Second limit; ±Infinity allowed.
 * @param rho Correlation in [−1, 1]; ρ = ±1 gives the singular limits Φ(min(h, k)) and
 *   max(0, Φ(h) − Φ(−k)).
 * @throws {RangeError} when h or k is NaN, or rho is NaN or outside [−1, 1].
 * @returns The probability, in [0, 1].
 * References: Genz 2004, "Numerical computation of rectangular bivariate and trivariate normal
 * and t probabilities"; Drezner & Wesolowsky 1990, "On the computation of the bivariate normal
 * integral".
 */
export function bivariateNormalCdf(h: number, k: number, rho: number): number {
  if (Number.isNaN(h) || Number.isNaN(k)) throw new RangeError(`bivariateNormalCdf: limits must not be NaN, got h = ${h}, k = ${k}`);
  if (!(rho >= -1 && rho <= 1)) throw new RangeError(`bivariateNormalCdf: rho must be in [-1, 1], got ${rho}`);
  if (h === -Infinity || k === -Infinity) return 0;
  if (h === Infinity) return normalCdf(k);
  if (k === Infinity) return normalCdf(h);
  return bivariateNormalCdfFromRule(h, k, normalCdf(h), normalCdf(-h), normalCdf(k), normalCdf(-k), prepareBivariateNormalRule(rho));
}

/**
 * Density of the standard bivariate normal distribution,
 * `φ2(h, k; ρ) = exp(−(h² − 2ρhk + k²) / (2(1 − ρ²))) / (2π √(1 − ρ²))`. By Plackett's identity
 * it is also the derivative of Φ2(h, k; ρ) with respect to ρ, which is how the polychoric
 * likelihood uses it.
 * @param h First coordinate; ±Infinity gives 0.
 * @param k Second coordinate; ±Infinity gives 0.
 * @param rho Correlation strictly inside (−1, 1).
 * @throws {RangeError} when h or k is NaN, or rho is NaN or |rho| >= 1.
 * @returns The density.
 * References: Plackett 1954, "A reduction formula for normal multivariate integrals".
 */
export function bivariateNormalDensity(h: number, k: number, rho: number): number {
  if (Number.isNaN(h) || Number.isNaN(k)) throw new RangeError(`bivariateNormalDensity: coordinates must not be NaN, got h = ${h}, k = ${k}`);
  if (!(rho > -1 && rho < 1)) throw new RangeError(`bivariateNormalDensity: rho must be strictly between -1 and 1, got ${rho}`);
  if (!Number.isFinite(h) || !Number.isFinite(k)) return 0;
  const complement = (1 - rho) * (1 + rho);
  return Math.exp(-(h * h - 2 * rho * h * k + k * k) / (2 * complement)) / (2 * Math.PI * Math.sqrt(complement));
}

/**
 * Derivative of the bivariate normal density with respect to ρ (the second derivative of Φ2 in
 * ρ): `φ2 · (ρ(1 − ρ²) + hk(1 − ρ²) − ρ(h² − 2ρhk + k²)) / (1 − ρ²)²`.
 * @param h First coordinate; ±Infinity gives 0.
 * @param k Second coordinate; ±Infinity gives 0.
 * @param rho Correlation strictly inside (−1, 1).
 * @throws {RangeError} when h or k is NaN, or rho is NaN or |rho| >= 1.
 * @returns ∂φ2/∂ρ at (h, k).
 * References: Plackett 1954, "A reduction formula for normal multivariate integrals".
 */
export function bivariateNormalDensitySlope(h: number, k: number, rho: number): number {
  const density = bivariateNormalDensity(h, k, rho);
  if (density === 0) return 0;
  const complement = (1 - rho) * (1 + rho);
  const quadratic = h * h - 2 * rho * h * k + k * k;
  return (density * (rho * complement + h * k * complement - rho * quadratic)) / (complement * complement);
}

/** Finite limits along one side of a grid, with their marginal probabilities. */
export interface BivariateGridMargin {
  /** Finite limits (only the first `count` are used). */
  readonly limits: Float64Array;
  /** Φ(limit). */
  readonly lower: Float64Array;
  /** Φ(−limit), computed directly (or known exactly), not as 1 − Φ(limit). */
  readonly upper: Float64Array;
  /** Number of limits used. */
  readonly count: number;
}

/** Where `bivariateNormalGrid` writes: value (i, j) goes to index `offset + i * stride + j`. */
export interface BivariateGridOutput {
  readonly cdf: Float64Array;
  readonly density: Float64Array;
  readonly slope: Float64Array;
  readonly offset: number;
  readonly stride: number;
}

/**
 * Φ2, φ2 and ∂φ2/∂ρ at every corner (h_i, k_j) of a grid of finite limits, at one ρ: the work
 * the polychoric likelihood repeats at each Newton step. The ρ-dependent quadrature is
 * prepared once for the whole grid.
 * @param rows Limits h_i with Φ(h_i) and Φ(−h_i).
 * @param columns Limits k_j with Φ(k_j) and Φ(−k_j).
 * @param rho Correlation strictly inside (−1, 1).
 * @param out Output arrays and layout; `out.cdf` receives Φ2(h_i, k_j; ρ), `out.density`
 *   φ2(h_i, k_j; ρ) and `out.slope` ∂φ2/∂ρ, each at `offset + i * stride + j`.
 * @throws {RangeError} when rho is not strictly inside (−1, 1).
 * References: Genz 2004, "Numerical computation of rectangular bivariate and trivariate normal
 * and t probabilities"; Plackett 1954, "A reduction formula for normal multivariate integrals".
 */
export function bivariateNormalGrid(rows: BivariateGridMargin, columns: BivariateGridMargin, rho: number, out: BivariateGridOutput): void {
  if (!(rho > -1 && rho < 1)) throw new RangeError(`bivariateNormalGrid: rho must be strictly between -1 and 1, got ${rho}`);
  const rule = prepareBivariateNormalRule(rho);
  const complement = (1 - rho) * (1 + rho);
  const densityScale = 1 / (2 * Math.PI * Math.sqrt(complement));
  const slopeScale = 1 / (complement * complement);
  const { cdf, density, slope, offset, stride } = out;
  const columnLimits = columns.limits;
  const columnLower = columns.lower;
  const columnUpper = columns.upper;
  const columnCount = columns.count;
  for (let i = 0; i < rows.count; i++) {
    const h = rows.limits[i];
    const lowerH = rows.lower[i];
    const upperH = rows.upper[i];
    for (let j = 0; j < columnCount; j++) {
      const k = columnLimits[j];
      const at = offset + i * stride + j;
      cdf[at] = bivariateNormalCdfFromRule(h, k, lowerH, upperH, columnLower[j], columnUpper[j], rule);
      const quadratic = h * h - 2 * rho * h * k + k * k;
      const value = Math.exp(-quadratic / (2 * complement)) * densityScale;
      density[at] = value;
      slope[at] = value * (rho * complement + h * k * complement - rho * quadratic) * slopeScale;
    }
  }
}
