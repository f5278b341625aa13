/**
 * Agglomerative hierarchical clustering with average linkage (UPGMA) on a dissimilarity matrix,
 * following the nearest-neighbour-list algorithm of Murtagh's HCLUST routine as R's
 * `stats::hclust` runs it, so that merge heights, the merge table and the leaf order (the order
 * a dendrogram draws its leaves in) agree with `hclust(d, method = "average")`, ties included:
 * at each step the pair with the least dissimilarity is merged, the first such pair in
 * row-major order of the upper triangle when several tie; the merged cluster keeps the lower
 * index; the new dissimilarity to every other cluster k is the size-weighted mean
 * (|a|·d(a,k) + |b|·d(b,k)) / (|a| + |b|) (Lance & Williams 1967).
 *
 * The overlap map orders items by this tree on 1 − |r|, so items that move together sit side by
 * side.
 */
import { checkSymmetricMatrix } from './symmetric-input';
import type { SquareMatrix } from './types';

/** The result of a hierarchical clustering, in R's `hclust` conventions. */
export interface HierarchicalClustering {
  /**
   * One row per merge (n − 1 rows), as R's `merge`: a negative entry −j is the single object j
   * (1-based), a positive entry k the cluster made at merge k (1-based). Singletons come first
   * in a row, and two clusters in increasing order.
   */
  readonly merge: readonly (readonly [number, number])[];
  /** The dissimilarity at which each merge happened (R's `height`), non-decreasing for average linkage. */
  readonly height: readonly number[];
  /** The leaf order, 0-based object indices (R's `order` minus 1). */
  readonly order: readonly number[];
}

/**
 * Average-linkage hierarchical clustering.
 * @param dissimilarities A square, symmetric matrix of finite, non-negative dissimilarities
 *   between n objects (the diagonal is ignored); not modified.
 * @throws {RangeError} when the matrix is not square, not symmetric, holds a value that is not
 *   finite, or holds a negative dissimilarity.
 * @returns The merges, their heights and the leaf order. One object gives no merges and the
 *   order [0].
 * References: Murtagh 1985, "Multidimensional Clustering Algorithms" (Physica-Verlag, COMPSTAT series vol. 4),
 * the HCLUST and HCASS2 routines as shipped in R's stats package; Lance & Williams 1967,
 * "A general theory of classificatory sorting strategies: 1. Hierarchical systems" (Computer
 * Journal 9:373-380); Sokal & Michener 1958, "A statistical method for evaluating systematic
 * relationships" (UPGMA).
 */
export function hierarchicalClustering(dissimilarities: SquareMatrix): HierarchicalClustering {
  checkSymmetricMatrix(dissimilarities, 'hierarchicalClustering', 'dissimilarity matrix', {
    diagonal: (value, i) => {
      if (!Number.isFinite(value)) throw new RangeError(`hierarchicalClustering: element (${i}, ${i}) is not finite`);
    },
    offDiagonal: (value, i, j) => {
      if (value < 0) throw new RangeError(`hierarchicalClustering: dissimilarity (${i}, ${j}) is negative (${value}); dissimilarities must be 0 or more`);
    },
  });
  const n = dissimilarities.order;
  if (n === 1) return { merge: [], height: [], order: [0] };

  // Working copy, upper triangle used (i < j), full storage for simple indexing.
  const diss = Float64Array.from(dissimilarities.data);
  const size = new Float64Array(n).fill(1);
  const active = new Uint8Array(n).fill(1);
  const nearest = new Int32Array(n);
  const nearestDistance = new Float64Array(n);
  const mergedA = new Int32Array(n - 1); // 0-based lower index of each merge
  const mergedB = new Int32Array(n - 1);
  const height: number[] = [];

  const redetermineNearest = (i: number) => {
    let best = Number.POSITIVE_INFINITY;
    let at = -1;
    for (let j = i + 1; j < n; j++) {
      if (!active[j]) continue;
      const value = diss[i * n + j];
      if (value < best) {
        best = value;
        at = j;
      }
    }
    nearest[i] = at;
    nearestDistance[i] = best;
  };
  for (let i = 0; i < n - 1; i++) redetermineNearest(i);

  for (let step = 0; step < n - 1; step++) {
    // The least dissimilarity among the nearest-neighbour list (first wins a tie).
    let least = Number.POSITIVE_INFINITY;
    let im = -1;
    let jm = -1;
    for (let i = 0; i < n - 1; i++) {
      if (!active[i] || nearest[i] < 0) continue;
      if (nearestDistance[i] < least) {
        least = nearestDistance[i];
        im = i;
        jm = nearest[i];
      }
    }
    const a = Math.min(im, jm);
    const b = Math.max(im, jm);
    mergedA[step] = a;
    mergedB[step] = b;
    height.push(least);
    active[b] = 0;

    // Lance-Williams update for average linkage; the merged cluster's own nearest neighbour
    // (to its right) is found on the way.
    let best = Number.POSITIVE_INFINITY;
    let at = -1;
    for (let k = 0; k < n; k++) {
      if (!active[k] || k === a) continue;
      // Both triangles are kept equal, so either index reads the same value.
      const value = (size[a] * diss[a * n + k] + size[b] * diss[b * n + k]) / (size[a] + size[b]);
      diss[a * n + k] = value;
      diss[k * n + a] = value;
      if (a < k && value < best) {
        best = value;
        at = k;
      }
    }
    size[a] += size[b];
    nearest[a] = at;
    nearestDistance[a] = best;
    // Only the lists that pointed at either merged cluster are recomputed (as R does).
    for (let i = 0; i < n - 1; i++) {
      if (active[i] && (nearest[i] === a || nearest[i] === b)) redetermineNearest(i);
    }
  }
  return { ...mergeTableAndOrder(n, mergedA, mergedB), height };
}

/**
 * R's HCASS2: the merge table in `hclust`'s signed form and the leaf order of the dendrogram.
 * A cluster is known during the run by its lowest object index; here it is renamed to the
 * number of the merge that made it.
 */
function mergeTableAndOrder(n: number, mergedA: Int32Array, mergedB: Int32Array): { merge: [number, number][]; order: number[] } {
  const steps = n - 1;
  // 1-based object numbers as in the routine; sign flips below.
  const ia = Array.from(mergedA, (v) => v + 1);
  const ib = Array.from(mergedB, (v) => v + 1);
  const iia = [...ia];
  const iib = [...ib];
  for (let i = 0; i < steps - 1; i++) {
    const k = Math.min(ia[i], ib[i]);
    for (let j = i + 1; j < steps; j++) {
      if (ia[j] === k) iia[j] = -(i + 1);
      if (ib[j] === k) iib[j] = -(i + 1);
    }
  }
  const merge: [number, number][] = [];
  for (let i = 0; i < steps; i++) {
    let left = -iia[i];
    let right = -iib[i];
    if (left > 0 && right < 0) [left, right] = [right, left];
    if (left > 0 && right > 0 && left > right) [left, right] = [right, left];
    merge.push([left, right]);
  }
  // The leaf order: expand the last merge, replacing each cluster by its two parts in place.
  const order: number[] = [merge[steps - 1][0], merge[steps - 1][1]];
  for (let i = steps - 1; i >= 1; i--) {
    const at = order.indexOf(i);
    if (at >= 0) order.splice(at, 1, merge[i - 1][0], merge[i - 1][1]);
  }
  return { merge, order: order.map((entry) => -entry - 1) };
}
