/**
 * Second step of the polychoric estimator (see polychoric-correlation.ts): the multinomial
 * log-likelihood ℓ(ρ) of a contingency table under the bivariate normal model with fixed
 * thresholds, its analytic first and second derivatives, and the safeguarded Newton search for
 * the maximising ρ, with the scratch arrays they share.
 *
 * The workspace holds everything a likelihood evaluation writes (the grid's arrays, where it
 * writes them, and the bivariate normal rule of the current ρ), so the many evaluations of a
 * matrix allocate nothing. bench/parallel/polychoric-worker.ts (a benchmark's kernel, not the
 * audit) also runs these functions in a worker thread from their source text.
 *
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient" (Psychometrika 44:443-460); Plackett 1954, "A reduction formula for normal
 * multivariate integrals" (Biometrika 41:351-360); Press et al. 2007, "Numerical Recipes",
 * 3rd ed., §9.4.
 */
import { bivariateNormalGrid, createBivariateNormalRule, type BivariateGridMargin, type BivariateNormalRuleBuffer } from './bivariate-normal-cdf';

/** Where a likelihood evaluation has `bivariateNormalGrid` write: the workspace's arrays, laid out per pair. */
export interface PolychoricGridOutput {
  readonly cdf: Float64Array;
  readonly density: Float64Array;
  readonly slope: Float64Array;
  /** Set for each pair: the first interior corner and the row stride. */
  offset: number;
  stride: number;
  /** The bivariate normal rule, prepared again only when ρ changes. */
  readonly rule: BivariateNormalRuleBuffer;
}

/** Scratch arrays for one pair, reused across pairs (sized for the largest item). */
export interface PolychoricWorkspace {
  /** Largest number of categories the workspace serves. */
  readonly maxCategories: number;
  /** Contingency table, row stride maxCategories + 1 (the extra column counts missing answers). */
  readonly table: Float64Array;
  /** Integer scratch for counting a table: four tables of its size (countPolychoricTable). */
  readonly tally: Int32Array;
  /** Corrected copy of the table (same layout). */
  readonly corrected: Float64Array;
  /** Φ2, φ2 and ∂φ2/∂ρ on the threshold grid including the ±∞ borders, stride maxCategories + 1. */
  readonly cdf: Float64Array;
  readonly density: Float64Array;
  readonly slope: Float64Array;
  /** ℓ, ℓ′, ℓ″ and a validity flag (1 when every observed cell has positive probability). */
  readonly derivatives: Float64Array;
  /** cdf, density and slope with their layout and the quadrature rule, handed to `bivariateNormalGrid`. */
  readonly grid: PolychoricGridOutput;
}

/**
 * Allocates the scratch arrays for polychoric work on items of up to `maxCategories` categories.
 * @param maxCategories Largest number of categories of any item (2 to 254).
 * @throws {RangeError} when maxCategories is not an integer from 2 to 254.
 * @returns A workspace for `countPolychoricTable` and `estimatePolychoricFromTable`.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient".
 */
export function createPolychoricWorkspace(maxCategories: number): PolychoricWorkspace {
  if (!Number.isInteger(maxCategories) || maxCategories < 2 || maxCategories > 254) {
    throw new RangeError(`createPolychoricWorkspace: maxCategories must be an integer from 2 to 254, got ${maxCategories}`);
  }
  const side = maxCategories + 1;
  const cdf = new Float64Array(side * side);
  const density = new Float64Array(side * side);
  const slope = new Float64Array(side * side);
  return {
    maxCategories,
    table: new Float64Array(side * side),
    tally: new Int32Array(4 * side * side),
    corrected: new Float64Array(side * side),
    cdf,
    density,
    slope,
    derivatives: new Float64Array(4),
    grid: { cdf, density, slope, offset: 0, stride: 0, rule: createBivariateNormalRule() },
  };
}

/**
 * ℓ(ρ), ℓ′(ρ) and ℓ″(ρ) of a contingency table under the bivariate normal model with fixed
 * thresholds, written into `work.derivatives` as [ℓ, ℓ′, ℓ″, valid]; valid is 0 when a
 * non-empty cell has zero probability at this ρ (ρ too close to ±1), and then ℓ′, ℓ″ are 0.
 * The probabilities stay in the workspace until the next evaluation, so ℓ can be had later
 * from them (`polychoricLogLikelihoodOfGrid`) when a Newton step needs only ℓ′ and ℓ″.
 * @param rho Correlation strictly inside (−1, 1).
 * @param table Cell counts, row stride `columns.count + 2`.
 * @param rows Thresholds of the row item (count = row categories − 1).
 * @param columns Thresholds of the column item.
 * @param work Workspace from `createPolychoricWorkspace`.
 * @param withLogLikelihood False to leave ℓ out (its logarithms): `work.derivatives[0]` is then
 *   NaN. True by default.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient"; Plackett 1954, "A reduction formula for normal multivariate integrals".
 */
export function polychoricLikelihood(
  rho: number,
  table: Float64Array,
  rows: BivariateGridMargin,
  columns: BivariateGridMargin,
  work: PolychoricWorkspace,
  withLogLikelihood: boolean = true,
): void {
  const rowCategories = rows.count + 1;
  const columnCategories = columns.count + 1;
  const stride = columnCategories + 1;
  const cdf = work.cdf;
  const density = work.density;
  const slope = work.slope;
  // Interior corners from the quadrature; borders (±∞ limits) from the margins.
  const grid = work.grid;
  grid.offset = stride + 1;
  grid.stride = stride;
  bivariateNormalGrid(rows, columns, rho, grid);
  for (let j = 0; j <= columnCategories; j++) {
    cdf[j] = 0;
    density[j] = 0;
    slope[j] = 0;
    const last = rowCategories * stride + j;
    cdf[last] = j === 0 ? 0 : j === columnCategories ? 1 : columns.lower[j - 1];
    density[last] = 0;
    slope[last] = 0;
  }
  for (let i = 1; i < rowCategories; i++) {
    const first = i * stride;
    cdf[first] = 0;
    density[first] = 0;
    slope[first] = 0;
    cdf[first + columnCategories] = rows.lower[i - 1];
    density[first + columnCategories] = 0;
    slope[first + columnCategories] = 0;
  }
  let logLikelihood = 0;
  let first = 0;
  let second = 0;
  let valid = 1;
  for (let i = 0; i < rowCategories; i++) {
    const top = i * stride;
    const bottom = top + stride;
    for (let j = 0; j < columnCategories; j++) {
      const count = table[top + j];
      if (count === 0) continue;
      const probability = cdf[bottom + j + 1] - cdf[top + j + 1] - cdf[bottom + j] + cdf[top + j];
      if (!(probability > 0)) {
        valid = 0;
        continue;
      }
      const change = density[bottom + j + 1] - density[top + j + 1] - density[bottom + j] + density[top + j];
      const curvature = slope[bottom + j + 1] - slope[top + j + 1] - slope[bottom + j] + slope[top + j];
      const ratio = change / probability;
      if (withLogLikelihood) logLikelihood += count * Math.log(probability);
      first += count * ratio;
      second += count * (curvature / probability - ratio * ratio);
    }
  }
  const out = work.derivatives;
  out[0] = !withLogLikelihood ? NaN : valid === 1 ? logLikelihood : -Infinity;
  out[1] = valid === 1 ? first : 0;
  out[2] = valid === 1 ? second : 0;
  out[3] = valid;
}

/**
 * ℓ of the table at the ρ of the workspace's last `polychoricLikelihood` evaluation, from the
 * probabilities that evaluation left in `work.cdf`: the same sum, cell by cell in the same order,
 * so the very value that evaluation would have written as ℓ.
 * @param table The cell counts of that evaluation.
 * @param rows Thresholds of the row item (as in that evaluation).
 * @param columns Thresholds of the column item (as in that evaluation).
 * @param work The workspace of that evaluation, not used since.
 * @returns ℓ, or −Infinity when a non-empty cell has no probability.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient".
 */
export function polychoricLogLikelihoodOfGrid(table: Float64Array, rows: BivariateGridMargin, columns: BivariateGridMargin, work: PolychoricWorkspace): number {
  const rowCategories = rows.count + 1;
  const columnCategories = columns.count + 1;
  const stride = columnCategories + 1;
  const cdf = work.cdf;
  let logLikelihood = 0;
  for (let i = 0; i < rowCategories; i++) {
    const top = i * stride;
    const bottom = top + stride;
    for (let j = 0; j < columnCategories; j++) {
      const count = table[top + j];
      if (count === 0) continue;
      const probability = cdf[bottom + j + 1] - cdf[top + j + 1] - cdf[bottom + j] + cdf[top + j];
      if (!(probability > 0)) return -Infinity;
      logLikelihood += count * Math.log(probability);
    }
  }
  return logLikelihood;
}

/** Outcome of the ρ search on one table. */
export interface PolychoricFit {
  /** The maximising ρ (±1 on a boundary). */
  readonly rho: number;
  /** 0: interior maximum; 1 or −1: ℓ still rises at ρ = ±(1 − gap); 2: no convergence. */
  readonly boundary: number;
  /** ℓ″ at ρ (0 on a boundary). */
  readonly secondDerivative: number;
  /** Likelihood evaluations spent. */
  readonly iterations: number;
}

/**
 * Maximises the polychoric log-likelihood of one table over ρ: Newton steps on ℓ′ inside a
 * shrinking bracket, bisection when a step leaves the bracket or ℓ is not concave there, and a
 * probe at ±(1 − boundaryGap): a boundary maximum is declared when ℓ still rises there, or when
 * ℓ there is at least as high as at the converged estimate.
 * @param table Cell counts, row stride `columns.count + 2`.
 * @param rows Thresholds of the row item.
 * @param columns Thresholds of the column item.
 * @param start Starting ρ (e.g. the Pearson r of the codes), clamped into (−0.99, 0.99).
 * @param work Workspace from `createPolychoricWorkspace`.
 * @param tolerance Step size at which the search stops (POLYCHORIC_RHO_TOLERANCE).
 * @param maxIterations Ceiling on evaluations (POLYCHORIC_MAX_ITERATIONS).
 * @param boundaryGap Distance from ±1 of the boundary probe (POLYCHORIC_BOUNDARY_GAP).
 * @param likelihoodSlack Relative slack when ℓ at the boundary probe is compared with ℓ at the
 *   estimate (POLYCHORIC_LIKELIHOOD_RELATIVE_SLACK): at least as high means a boundary maximum.
 * @returns The fit.
 * References: Olsson 1979, "Maximum likelihood estimation of the polychoric correlation
 * coefficient"; Press et al. 2007, "Numerical Recipes", 3rd ed., §9.4 (Newton-Raphson with
 * bisection safeguard).
 */
export function fitPolychoricTable(
  table: Float64Array,
  rows: BivariateGridMargin,
  columns: BivariateGridMargin,
  start: number,
  work: PolychoricWorkspace,
  tolerance: number,
  maxIterations: number,
  boundaryGap: number,
  likelihoodSlack: number,
): PolychoricFit {
  const edge = 1 - boundaryGap;
  let low = -1;
  let high = 1;
  let rho = start > 0.99 ? 0.99 : start < -0.99 ? -0.99 : start;
  const derivatives = work.derivatives;
  let estimate = NaN;
  let curvatureAtEstimate = 0;
  let logLikelihoodAtEstimate = 0;
  let iteration = 0;
  while (iteration < maxIterations) {
    iteration++;
    // ℓ itself is wanted only where the search stops: taken then from the grid this evaluation leaves.
    polychoricLikelihood(rho, table, rows, columns, work, false);
    let next: number;
    if (derivatives[3] === 0) {
      // A non-empty cell has no probability left: ρ is beyond the region the data allow.
      if (rho > 0) high = rho;
      else low = rho;
      next = (low + high) / 2;
    } else {
      const gradient = derivatives[1];
      const curvature = derivatives[2];
      // Near ±1 every density term can underflow, leaving ℓ flat to double precision: the
      // likelihood has reached its limit at the boundary on that side.
      const flat = gradient === 0 && curvature === 0;
      if (gradient === 0 && !flat) {
        estimate = rho;
        curvatureAtEstimate = curvature;
        logLikelihoodAtEstimate = polychoricLogLikelihoodOfGrid(table, rows, columns, work);
        break;
      }
      const rising = gradient > 0 || (flat && rho > 0);
      if (rising) {
        if (rho >= edge) return { rho: 1, boundary: 1, secondDerivative: 0, iterations: iteration };
        low = rho;
      } else {
        if (rho <= -edge) return { rho: -1, boundary: -1, secondDerivative: 0, iterations: iteration };
        high = rho;
      }
      next = curvature < 0 ? rho - gradient / curvature : NaN;
      // A Newton step this small means ρ is the root (to within the step), wherever the
      // rounding put it relative to the bracket.
      if (Math.abs(next - rho) < tolerance) {
        estimate = next;
        curvatureAtEstimate = curvature;
        logLikelihoodAtEstimate = polychoricLogLikelihoodOfGrid(table, rows, columns, work);
        break;
      }
      if (!(next > low && next < high)) {
        if (rising && high === 1) next = edge;
        else if (!rising && low === -1) next = -edge;
        else next = (low + high) / 2;
      }
    }
    if (high - low < tolerance) {
      estimate = next;
      curvatureAtEstimate = derivatives[2];
      logLikelihoodAtEstimate = polychoricLogLikelihoodOfGrid(table, rows, columns, work);
      break;
    }
    rho = next;
  }
  if (Number.isNaN(estimate)) return { rho, boundary: 2, secondDerivative: derivatives[2], iterations: iteration };
  // Confirm the maximum against the boundary on its side: when ℓ still rises toward ±1 ever
  // more slowly, the Newton steps shrink below the tolerance short of the boundary.
  const side = estimate >= 0 ? 1 : -1;
  polychoricLikelihood(side * edge, table, rows, columns, work);
  iteration++;
  if (derivatives[3] === 1 && derivatives[0] >= logLikelihoodAtEstimate - likelihoodSlack * Math.abs(logLikelihoodAtEstimate)) {
    return { rho: side, boundary: side, secondDerivative: 0, iterations: iteration };
  }
  return { rho: estimate, boundary: 0, secondDerivative: curvatureAtEstimate, iterations: iteration };
}
