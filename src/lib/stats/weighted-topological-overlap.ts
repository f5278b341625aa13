/**
 * Weighted topological overlap (wTO) of every pair of nodes in a weighted network: how much two
 * items are tied to each other and to the same other items. With a the absolute edge weights
 * (zero diagonal) and k_i = Σ_u a_iu each node's connectivity,
 *   wTO_ij = (Σ_u a_iu a_uj + a_ij) / (min(k_i, k_j) + 1 − a_ij),
 * which lies in [0, 1] for weights in [0, 1]. Unique Variable Analysis computes it on the
 * absolute partial correlations of the EBIC graphical-lasso network and flags a pair from .25
 * (WTO_FLAG; bands WTO_BANDS).
 *
 * The sum over u runs over every node; with a zero diagonal the terms u = i and u = j vanish.
 * Signed weights are taken in absolute value (the unsigned wTO of Unique Variable Analysis).
 *
 * References: Nowick, Gernat, Almaas & Stubbs 2009 (PNAS 106:22358-22363), for the weighted form; Zhang & Horvath 2005, "A general framework for
 * weighted gene co-expression network analysis" (Statistical Applications in Genetics and
 * Molecular Biology 4:17), for topological overlap; Christensen, Garrido & Golino 2023, "Unique
 * Variable Analysis: A network psychometrics method to detect local dependence" (Multivariate
 * Behavioral Research 58:1165-1182), for its use on items and the .25 flag.
 */
import { checkSymmetricMatrix } from './symmetric-input';
import { UNIT_DIAGONAL_TOLERANCE } from './tolerances';
import type { SquareMatrix } from './types';

/**
 * Weighted topological overlap of every pair of a weighted network.
 * @param network Symmetric matrix of edge weights in [−1, 1] (e.g. `ebicGlasso(...).absoluteNetwork`
 *   or its signed partial correlations); the diagonal is ignored (treated as 0); not modified.
 * @throws {RangeError} when the matrix is empty, not square, not finite or not symmetric.
 * @throws {RangeError} naming the first weight outside [−1, 1].
 * @returns The symmetric wTO matrix with a zero diagonal.
 * References: Nowick et al. 2009, PNAS 106:22358-22363; Christensen, Garrido & Golino 2023,
 * Multivariate Behavioral Research 58:1165-1182.
 */
export function weightedTopologicalOverlap(network: SquareMatrix): SquareMatrix {
  checkSymmetricMatrix(network, 'weightedTopologicalOverlap', 'network', {
    diagonal: (value, i) => {
      if (!Number.isFinite(value)) throw new RangeError(`weightedTopologicalOverlap: element (${i}, ${i}) is not finite`);
    },
    offDiagonal: (value, i, j) => {
      if (Math.abs(value) > 1 + UNIT_DIAGONAL_TOLERANCE) {
        throw new RangeError(`weightedTopologicalOverlap: the weight (${i}, ${j}) is ${value}; weights must lie in [-1, 1] (partial correlations)`);
      }
    },
  });
  const p = network.order;
  const a = new Float64Array(p * p);
  const connectivity = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    let sum = 0;
    for (let j = 0; j < p; j++) {
      if (i === j) continue;
      const weight = Math.min(1, Math.abs(network.data[i * p + j]));
      a[i * p + j] = weight;
      sum += weight;
    }
    connectivity[i] = sum;
  }
  const overlap = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    const rowI = i * p;
    for (let j = i + 1; j < p; j++) {
      const rowJ = j * p;
      let shared = 0;
      for (let u = 0; u < p; u++) shared += a[rowI + u] * a[rowJ + u];
      const weight = a[rowI + j];
      const value = (shared + weight) / (Math.min(connectivity[i], connectivity[j]) + 1 - weight);
      overlap[rowI + j] = value;
      overlap[rowJ + i] = value;
    }
  }
  return { order: p, data: overlap };
}
