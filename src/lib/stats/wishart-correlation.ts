/**
 * The Pearson correlation matrix of `rows` independent respondents × `items` independent standard
 * normal items, drawn without drawing the data. The centred cross-product matrix of such data is
 * Wishart with identity scale and `rows − 1` degrees of freedom; Bartlett's decomposition gives it
 * as W = L·Lᵀ with L lower triangular, L_ii = sqrt(χ²(rows − 1 − i)) (i = 0, 1, ...) and
 * independent standard normal values below the diagonal (Odell & Feiveson 1966). The correlation
 * matrix is W scaled to a unit diagonal. The cost is O(items³) per draw and nothing in `rows`.
 *
 * With fewer degrees of freedom than items (rows − 1 < items) W is singular and Bartlett's form
 * does not apply; W is then the Gram matrix of `rows − 1` independent standard normal vectors of
 * length `items`, which is the same Wishart law (Anderson 2003, §7.2), at O(items² · rows).
 *
 * References: Odell & Feiveson 1966, "A numerical procedure to generate a sample covariance
 * matrix" (Journal of the American Statistical Association 61:199-203); Bartlett 1933, "On the
 * theory of statistical regression" (Proceedings of the Royal Society of Edinburgh 53:260-283);
 * Anderson 2003, "An Introduction to Multivariate Statistical Analysis", 3rd ed., ch. 7.
 */
import { chiSquareVariate } from './gamma-variate';
import type { SeededRandom } from './seeded-random';
import type { SquareMatrix } from './types';

/**
 * A draw of the Wishart cross-product matrix in factored form, W = F·Fᵀ, before any product is
 * taken: Bartlett's lower-triangular factor (`columns === items`, `triangular`) or the `columns =
 * rows − 1` normal vectors of a singular Wishart. Drawing the factor consumes the generator; the
 * products and the correlation that follow from it are deterministic.
 */
export interface WishartFactor {
  /** Items: the order of W. */
  readonly items: number;
  /** Columns of F (items for Bartlett's factor, rows − 1 for the Gram form). */
  readonly columns: number;
  /** True for Bartlett's factor: F[i][t] is zero for t > i and is not read. */
  readonly triangular: boolean;
  /** F row-major, `items × columns`: F[i][t] at `i * columns + t`. */
  readonly data: Float64Array;
}

/**
 * One random correlation matrix of normal data of the given size, by Bartlett's decomposition.
 * @param rows Respondents of the data the matrix stands for (at least 2).
 * @param items Items (at least 1).
 * @param random The seeded generator; the same generator state gives the same matrix.
 * @throws {RangeError} when `rows` is not an integer of at least 2 or `items` not a positive integer.
 * @returns The full symmetric correlation matrix, row-major, exactly 1 on the diagonal.
 * References: Odell & Feiveson 1966, "A numerical procedure to generate a sample covariance matrix".
 */
export function wishartCorrelation(rows: number, items: number, random: SeededRandom): SquareMatrix {
  if (!Number.isInteger(rows) || rows < 2) throw new RangeError(`wishartCorrelation: rows must be an integer of at least 2, got ${rows}`);
  if (!Number.isInteger(items) || items < 1) throw new RangeError(`wishartCorrelation: items must be a positive integer, got ${items}`);
  return correlationFromWishartFactor(drawWishartFactor(rows, items, random));
}

/**
 * The random part of `wishartCorrelation` alone: the factor F of W = F·Fᵀ (Bartlett's triangle, or
 * the Gram form's normal vectors when rows − 1 < items). It takes exactly the generator values
 * `wishartCorrelation` takes, so a caller may skip draws by drawing their factors only (the
 * parallel-analysis threads do, to give every draw the same values whatever the thread count).
 * @param rows Respondents of the data the matrix stands for (at least 2).
 * @param items Items (at least 1).
 * @param random The seeded generator.
 * @throws {RangeError} when `rows` is not an integer of at least 2 or `items` not a positive integer.
 * @returns The factor.
 * References: Odell & Feiveson 1966, "A numerical procedure to generate a sample covariance matrix";
 * Anderson 2003, "An Introduction to Multivariate Statistical Analysis", ch. 7.
 */
export function drawWishartFactor(rows: number, items: number, random: SeededRandom): WishartFactor {
  if (!Number.isInteger(rows) || rows < 2) throw new RangeError(`drawWishartFactor: rows must be an integer of at least 2, got ${rows}`);
  if (!Number.isInteger(items) || items < 1) throw new RangeError(`drawWishartFactor: items must be a positive integer, got ${items}`);
  const degrees = rows - 1;
  return degrees >= items ? bartlettFactor(degrees, items, random) : gramVectors(degrees, items, random);
}

/**
 * The correlation matrix of a Wishart draw given in factored form: W = F·Fᵀ scaled to a unit
 * diagonal. Deterministic.
 * @param factor A factor from `drawWishartFactor`.
 * @throws {RangeError} when the factor's data length is not items × columns.
 * @returns The full symmetric correlation matrix, row-major, exactly 1 on the diagonal.
 * References: Odell & Feiveson 1966, "A numerical procedure to generate a sample covariance matrix".
 */
export function correlationFromWishartFactor(factor: WishartFactor): SquareMatrix {
  const { items, columns, data } = factor;
  if (data.length !== items * columns) {
    throw new RangeError(`correlationFromWishartFactor: the factor holds ${data.length} values, expected items × columns = ${items * columns}`);
  }
  const cross = factor.triangular ? bartlettCrossProducts(data, items) : gramCrossProducts(data, columns, items);
  return scaleToCorrelation(cross, items);
}

/** Bartlett's lower-triangular factor L (row i: i normal values, then sqrt(χ²(degrees − i))). */
function bartlettFactor(degrees: number, items: number, random: SeededRandom): WishartFactor {
  // factor[i * items + t], t <= i: row i of L.
  const factor = new Float64Array(items * items);
  for (let i = 0; i < items; i++) {
    const row = i * items;
    for (let t = 0; t < i; t++) factor[row + t] = random.nextNormal();
    factor[row + i] = Math.sqrt(chiSquareVariate(random, degrees - i));
  }
  return { items, columns: items, triangular: true, data: factor };
}

/** W = L·Lᵀ (upper triangle filled, row-major) from Bartlett's triangular factor. */
function bartlettCrossProducts(factor: Float64Array, items: number): Float64Array {
  const cross = new Float64Array(items * items);
  for (let j = 0; j < items; j++) {
    const rowJ = j * items;
    // Four partners k at a time share the loads of row j; each sum still runs over t in order.
    let k = j;
    for (; k + 3 < items; k += 4) {
      const row0 = k * items;
      const row1 = row0 + items;
      const row2 = row1 + items;
      const row3 = row2 + items;
      let sum0 = 0;
      let sum1 = 0;
      let sum2 = 0;
      let sum3 = 0;
      for (let t = 0; t <= j; t++) {
        const value = factor[rowJ + t];
        sum0 += value * factor[row0 + t];
        sum1 += value * factor[row1 + t];
        sum2 += value * factor[row2 + t];
        sum3 += value * factor[row3 + t];
      }
      cross[rowJ + k] = sum0;
      cross[rowJ + k + 1] = sum1;
      cross[rowJ + k + 2] = sum2;
      cross[rowJ + k + 3] = sum3;
    }
    for (; k < items; k++) {
      const rowK = k * items;
      let sum = 0;
      for (let t = 0; t <= j; t++) sum += factor[rowJ + t] * factor[rowK + t];
      cross[rowJ + k] = sum;
    }
  }
  return cross;
}

/** Z: `items` rows of `degrees` independent standard normal values. */
function gramVectors(degrees: number, items: number, random: SeededRandom): WishartFactor {
  const vectors = new Float64Array(items * degrees);
  for (let index = 0; index < vectors.length; index++) vectors[index] = random.nextNormal();
  return { items, columns: degrees, triangular: false, data: vectors };
}

/** W = Z·Zᵀ for Z of `items` rows and `degrees` independent standard normal columns (upper triangle). */
function gramCrossProducts(vectors: Float64Array, degrees: number, items: number): Float64Array {
  const cross = new Float64Array(items * items);
  for (let j = 0; j < items; j++) {
    for (let k = j; k < items; k++) {
      let sum = 0;
      for (let t = 0; t < degrees; t++) sum += vectors[j * degrees + t] * vectors[k * degrees + t];
      cross[j * items + k] = sum;
    }
  }
  return cross;
}

/** r_jk = W_jk / sqrt(W_jj · W_kk), both triangles, 1 on the diagonal, clamped to [−1, 1]. */
function scaleToCorrelation(cross: Float64Array, items: number): SquareMatrix {
  const correlation = new Float64Array(items * items);
  for (let j = 0; j < items; j++) {
    correlation[j * items + j] = 1;
    for (let k = j + 1; k < items; k++) {
      const value = cross[j * items + k] / Math.sqrt(cross[j * items + j] * cross[k * items + k]);
      const r = value > 1 ? 1 : value < -1 ? -1 : value;
      correlation[j * items + k] = r;
      correlation[k * items + j] = r;
    }
  }
  return { order: items, data: correlation };
}
