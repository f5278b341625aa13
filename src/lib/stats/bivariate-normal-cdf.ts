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
 * likelihood) costs only a few exponentials per point; into a caller's buffer
 * (`createBivariateNormalRule`), the likelihood's many evaluations allocate nothing. In a grid,
 * branch 0's quadrature sums and density exponentials come from a WebAssembly kernel
 * (bivariate-quadrature-kernel.ts), bit for bit the values of the JavaScript expressions.
 *
 * bench/parallel/polychoric-worker.ts (a benchmark's kernel, not the audit) runs these functions
 * in a worker thread from their source text, with the Gauss-Legendre tables of this module it
 * defines beside them; it checks itself on a known value before it answers.
 *
 * References: Genz 2004, "Numerical computation of rectangular bivariate and trivariate normal
 * and t probabilities" (Statistics and Computing 14:251-260); Drezner & Wesolowsky 1990, "On
 * the computation of the bivariate normal integral" (J. Statist. Comput. Simul. 35:101-107);
 * Plackett 1954, "A reduction formula for normal multivariate integrals" (Biometrika 41:351-360).
 */
import { bivariateQuadratureGrid } from './bivariate-quadrature-kernel';
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
 * Genz's Gauss-Legendre rules (BVND): the lower half of the symmetric 6-, 12- and 20-point rules,
 * points in (−1, 0) and their weights. Module constants, so preparing a rule allocates nothing.
 */
const GAUSS_LEGENDRE_WEIGHTS_6 = [0.1713244923791705, 0.3607615730481384, 0.4679139345726904];
const GAUSS_LEGENDRE_POINTS_6 = [-0.9324695142031522, -0.6612093864662647, -0.238619186083197];
const GAUSS_LEGENDRE_WEIGHTS_12 = [0.04717533638651177, 0.1069393259953183, 0.1600783285433464, 0.2031674267230659, 0.2334925365383547, 0.2491470458134029];
const GAUSS_LEGENDRE_POINTS_12 = [-0.9815606342467191, -0.904117256370475, -0.769902674194305, -0.5873179542866171, -0.3678314989981802, -0.1252334085114692];
const GAUSS_LEGENDRE_WEIGHTS_20 = [
  0.01761400713915212, 0.04060142980038694, 0.06267204833410906, 0.08327674157670475, 0.1019301198172404, 0.1181945319615184,
  0.1316886384491766, 0.1420961093183821, 0.1491729864726037, 0.1527533871307259,
];
const GAUSS_LEGENDRE_POINTS_20 = [
  -0.9931285991850949, -0.9639719272779138, -0.9122344282513259, -0.8391169718222188, -0.7463319064601508, -0.636053680726515,
  -0.5108670019508271, -0.3737060887154196, -0.2277858511416451, -0.07652652113349733,
];

/** The most quadrature points a rule uses (the 20-point rule). */
const MAX_RULE_POINTS = 20;

/**
 * The module constants `prepareBivariateNormalRule` and `createBivariateNormalRule` read, by the
 * names their text uses: for code that runs those functions from their source text (a worker
 * thread started from text must define these names beside them).
 */
export const BIVARIATE_NORMAL_RULE_CONSTANTS: Readonly<Record<string, number | readonly number[]>> = Object.freeze({
  GAUSS_LEGENDRE_WEIGHTS_6,
  GAUSS_LEGENDRE_POINTS_6,
  GAUSS_LEGENDRE_WEIGHTS_12,
  GAUSS_LEGENDRE_POINTS_12,
  GAUSS_LEGENDRE_WEIGHTS_20,
  GAUSS_LEGENDRE_POINTS_20,
  MAX_RULE_POINTS,
});

/**
 * A rule owned by its caller and prepared again for each ρ (`prepareBivariateNormalRule(rho, into)`),
 * so that evaluating a grid at many ρ allocates nothing. Its arrays hold room for the largest rule;
 * only the first `count` entries are the rule's.
 */
export interface BivariateNormalRuleBuffer extends BivariateNormalRule {
  rho: number;
  branch: 0 | 1 | 2;
  count: number;
  scale: number;
}

/**
 * An empty rule buffer to prepare rules into (no ρ prepared yet: `rho` is NaN).
 * @returns A buffer with room for the largest Gauss-Legendre rule.
 * References: Genz 2004, "Numerical computation of rectangular bivariate and trivariate normal
 * and t probabilities".
 */
export function createBivariateNormalRule(): BivariateNormalRuleBuffer {
  return {
    rho: NaN,
    branch: 2,
    count: 0,
    weights: new Float64Array(MAX_RULE_POINTS),
    first: new Float64Array(MAX_RULE_POINTS),
    second: new Float64Array(MAX_RULE_POINTS),
    scale: 0,
  };
}

/**
 * Prepares the quadrature for Φ2 at one correlation (Gauss-Legendre points and weights of
 * Genz's BVND routine, mapped for this ρ).
 * @param rho Correlation in [−1, 1].
 * @param into A buffer from `createBivariateNormalRule` to prepare the rule in (and return); when
 *   it already holds this ρ (the same value, Object.is) it is returned as it is. Without it a new
 *   rule is allocated, its arrays as long as the rule chosen for |ρ| (6, 12 or 20 points).
 * @throws {RangeError} when rho is NaN or outside [−1, 1].
 * @returns The prepared rule, to pass to `bivariateNormalCdfFromRule` or `bivariateNormalGrid`.
 * References: Genz 2004, "Numerical computation of rectangular bivariate and trivariate normal
 * and t probabilities".
 */
export function prepareBivariateNormalRule(rho: number, into?: BivariateNormalRuleBuffer): BivariateNormalRule {
  if (!(rho >= -1 && rho <= 1)) throw new RangeError(`prepareBivariateNormalRule: rho must be in [-1, 1], got ${rho}`);
  if (into !== undefined && Object.is(into.rho, rho)) return into;
  const magnitude = Math.abs(rho);
  let halfWeights: readonly number[];
  let halfPoints: readonly number[];
  if (magnitude < 0.3) {
    halfWeights = GAUSS_LEGENDRE_WEIGHTS_6;
    halfPoints = GAUSS_LEGENDRE_POINTS_6;
  } else if (magnitude < 0.75) {
    halfWeights = GAUSS_LEGENDRE_WEIGHTS_12;
    halfPoints = GAUSS_LEGENDRE_POINTS_12;
  } else {
    halfWeights = GAUSS_LEGENDRE_WEIGHTS_20;
    halfPoints = GAUSS_LEGENDRE_POINTS_20;
  }
  const half = halfPoints.length;
  const count = 2 * half;
  const rule: BivariateNormalRuleBuffer =
    into ?? { rho, branch: 2, count, weights: new Float64Array(count), first: new Float64Array(count), second: new Float64Array(count), scale: 0 };
  const weights = rule.weights;
  const first = rule.first;
  const second = rule.second;
  rule.rho = rho;
  if (rho === 0 || magnitude === 1) {
    rule.branch = 2;
    rule.count = 0;
    rule.scale = 0;
    return rule;
  }
  rule.count = count;
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
    rule.branch = 0;
    rule.scale = arcsine / (4 * Math.PI);
    return rule;
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
  rule.branch = 1;
  rule.scale = squareRootComplement;
  return rule;
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
  return withinFrechetBounds(value, lowerH, lowerK);
}

/**
 * Φ2 kept within the bounds its margins allow: max(0, Φ(h) + Φ(k) − 1) ≤ Φ2 ≤ min(Φ(h), Φ(k)),
 * which rounding in the quadrature can overstep; −0 becomes 0.
 * @param value The computed Φ2.
 * @param lowerH Φ(h).
 * @param lowerK Φ(k).
 * @returns The value, clamped.
 * References: Fréchet 1951, "Sur les tableaux de corrélation dont les marges sont données"
 * (Annales de l'Université de Lyon 14:53-77) (the bounds; from memory).
 */
export function withinFrechetBounds(value: number, lowerH: number, lowerK: number): number {
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
  /** Scratch to prepare ρ's quadrature in (`createBivariateNormalRule`); without it each call allocates a rule. */
  readonly rule?: BivariateNormalRuleBuffer;
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
  const rule = prepareBivariateNormalRule(rho, out.rule);
  const complement = (1 - rho) * (1 + rho);
  const densityScale = 1 / (2 * Math.PI * Math.sqrt(complement));
  const slopeScale = 1 / (complement * complement);
  // Factors that do not change along the grid, computed once: each is the very operation (same
  // operands, same order) the expressions below would otherwise repeat at every corner.
  const twiceComplement = 2 * complement;
  const twiceRho = 2 * rho;
  const rhoComplement = rho * complement;
  const { cdf, density, slope, offset, stride } = out;
  const columnLimits = columns.limits;
  const columnLower = columns.lower;
  const columnUpper = columns.upper;
  const columnCount = columns.count;
  // Branch 0's quadrature sums and the density's exponentials of the whole grid from the
  // WebAssembly kernel, bit for bit the sums of bivariateNormalCdfFromRule and the exponentials
  // below (bivariate-quadrature-kernel.ts); null when the kernel leaves the grid to JavaScript.
  // The typeof test is for bench/parallel/polychoric-worker.ts, which runs this function from its
  // text, where the kernel is not defined.
  const kernel =
    rule.branch === 0 && typeof bivariateQuadratureGrid === 'function' ? bivariateQuadratureGrid(rows, columns, rule, twiceRho, twiceComplement) : null;
  const sums = kernel === null ? null : kernel.sums;
  const exponentials = kernel === null ? null : kernel.exponentials;
  const scale = rule.scale;
  for (let i = 0; i < rows.count; i++) {
    const h = rows.limits[i];
    const lowerH = rows.lower[i];
    const upperH = rows.upper[i];
    const hSquared = h * h;
    const twiceRhoH = twiceRho * h;
    const rowStart = offset + i * stride;
    const sumsStart = i * columnCount;
    for (let j = 0; j < columnCount; j++) {
      const k = columnLimits[j];
      const at = rowStart + j;
      if (sums === null) {
        cdf[at] = bivariateNormalCdfFromRule(h, k, lowerH, upperH, columnLower[j], columnUpper[j], rule);
      } else {
        // The rest of bivariateNormalCdfFromRule's branch 0, the same operations in the same order.
        const lowerK = columnLower[j];
        let value = sums[sumsStart + j] * scale;
        value += lowerH * lowerK;
        cdf[at] = withinFrechetBounds(value, lowerH, lowerK);
      }
      // h² − 2ρhk + k², evaluated as ((h·h) − ((2·ρ)·h)·k) + k·k, as written out in full.
      const quadratic = hSquared - twiceRhoH * k + k * k;
      const value = (exponentials === null ? Math.exp(-quadratic / twiceComplement) : exponentials[sumsStart + j]) * densityScale;
      density[at] = value;
      slope[at] = value * (rhoComplement + h * k * complement - rho * quadratic) * slopeScale;
    }
  }
}
