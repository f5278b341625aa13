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
  const degrees = rows - 1;
  const cross = degrees >= items ? bartlettCrossProducts(degrees, items, random) : gramCrossProducts(degrees, items, random);
  return scaleToCorrelation(cross, items);
}

/** W = L·Lᵀ (upper triangle filled, row-major) from Bartlett's triangular factor. */
function bartlettCrossProducts(degrees: number, items: number, random: SeededRandom): Float64Array {
  // factor[i * items + t], t <= i: row i of L.
  const factor = new Float64Array(items * items);
  for (let i = 0; i < items; i++) {
    const row = i * items;
    for (let t = 0; t < i; t++) factor[row + t] = random.nextNormal();
    factor[row + i] = Math.sqrt(chiSquareVariate(random, degrees - i));
  }
  const cross = new Float64Array(items * items);
  for (let j = 0; j < items; j++) {
    const rowJ = j * items;
    for (let k = j; k < items; k++) {
      const rowK = k * items;
      let sum = 0;
      for (let t = 0; t <= j; t++) sum += factor[rowJ + t] * factor[rowK + t];
      cross[rowJ + k] = sum;
    }
  }
  return cross;
}

/** W = Z·Zᵀ for Z of `items` rows and `degrees` independent standard normal columns (upper triangle). */
function gramCrossProducts(degrees: number, items: number, random: SeededRandom): Float64Array {
  const vectors = new Float64Array(items * degrees);
  for (let index = 0; index < vectors.length; index++) vectors[index] = random.nextNormal();
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
