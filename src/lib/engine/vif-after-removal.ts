/**
 * VIF of items once other items are gone: what the keeper score ("VIF without partners") and a
 * recommendation's `vifAfter` read. Two ways, one answer:
 *
 * - `eigenVifAfterRemoval`: the principal submatrix of the kept items and a new
 *   eigen-decomposition per call (O(p³) each; handles singular matrices: an item in an exact
 *   dependency gets null).
 * - `schurVifAfterRemoval`: from the inverse A = R⁻¹ of the whole matrix, computed once. Removing
 *   a set S leaves as inverse of the reduced matrix the Schur complement
 *   A_{-S,-S} − A_{-S,S} (A_{S,S})⁻¹ A_{S,-S}, so an item's VIF after the removal is
 *   A_ii − A_{i,S} (A_{S,S})⁻¹ A_{S,i}: O(|S|³ + |S|²) per item instead of O(p³). Used where the
 *   inverse exists and is well conditioned (`evidence.inverse`, bootstrap resamples); elsewhere
 *   it falls back to the eigen path.
 */
import { varianceInflation } from '../stats/variance-inflation';
import { principalSubmatrix } from './principal-submatrix';
import type { EngineEvidence } from './types';

/**
 * VIF of each item of `of` (indices into items[], none of them removed) in the correlation matrix
 * of the usable items left after removing `removed` (indices into items[]); null where the VIF
 * does not exist (exact dependency).
 */
export type VifAfterRemoval = (removed: readonly number[], of: readonly number[]) => (number | null)[];

function positionsOf(evidence: EngineEvidence): number[] {
  const position = new Array<number>(evidence.items.length).fill(-1);
  evidence.usable.forEach((item, k) => {
    position[item] = k;
  });
  return position;
}

/**
 * VIF after removal through one eigen-decomposition of the reduced matrix per removed set (kept
 * for the oracle's life: a cluster's keeper score and its recommendation's `vifAfter` often ask
 * about the same set).
 * @param evidence The engine's evidence (its correlation matrix over `usable`).
 * @returns The oracle.
 * References: Marquardt 1970 (VIF as the diagonal of R⁻¹).
 */
export function eigenVifAfterRemoval(evidence: EngineEvidence): VifAfterRemoval {
  const position = positionsOf(evidence);
  const known = new Map<string, { kept: number[]; vif: (number | null)[] }>();
  return (removed, of) => {
    const key = [...new Set(removed)].sort((a, b) => a - b).join(',');
    let entry = known.get(key);
    if (entry === undefined) {
      const gone = new Set(removed);
      const kept = evidence.usable.filter((item) => !gone.has(item));
      const items = varianceInflation(
        principalSubmatrix(
          evidence.correlation,
          kept.map((item) => position[item]),
        ),
      ).items;
      entry = { kept, vif: items.map((item) => item.vif) };
      known.set(key, entry);
    }
    const { kept, vif } = entry;
    return of.map((item) => {
      const k = kept.indexOf(item);
      return k < 0 ? null : vif[k];
    });
  };
}

/**
 * VIF after removal from the inverse of the whole matrix (Schur complement), falling back to
 * `eigenVifAfterRemoval` when the evidence carries no inverse.
 * @param evidence The engine's evidence; `evidence.inverse` is R⁻¹ over `usable` or null.
 * @returns The oracle; equal to the eigen path to rounding (about κ(R)·ε relative).
 * References: Horn & Johnson 2013, "Matrix Analysis", 2nd ed., §0.7.3 (the inverse of a
 * partitioned matrix through the Schur complement; from memory); Marquardt 1970.
 */
export function schurVifAfterRemoval(evidence: EngineEvidence): VifAfterRemoval {
  const inverse = evidence.inverse ?? null;
  if (inverse === null) return eigenVifAfterRemoval(evidence);
  const position = positionsOf(evidence);
  const p = inverse.order;
  const a = inverse.data;
  const fallback = eigenVifAfterRemoval(evidence);
  return (removed, of) => {
    const s = removed.map((item) => position[item]).filter((k) => k >= 0);
    const m = s.length;
    // Cholesky factor of A_SS (positive definite: a principal submatrix of a positive definite inverse).
    const chol = new Float64Array(m * m);
    for (let i = 0; i < m; i++) {
      for (let j = 0; j <= i; j++) {
        let sum = a[s[i] * p + s[j]];
        for (let k = 0; k < j; k++) sum -= chol[i * m + k] * chol[j * m + k];
        chol[i * m + j] = i === j ? Math.sqrt(sum) : sum / chol[j * m + j];
      }
      if (!(chol[i * m + i] > 0)) return fallback(removed, of);
    }
    const y = new Float64Array(m);
    return of.map((item) => {
      const i = position[item];
      if (i < 0) return null;
      // A_ii − ‖L⁻¹ A_{S,i}‖²
      let reduction = 0;
      for (let r = 0; r < m; r++) {
        let sum = a[s[r] * p + i];
        for (let k = 0; k < r; k++) sum -= chol[r * m + k] * y[k];
        y[r] = sum / chol[r * m + r];
        reduction += y[r] * y[r];
      }
      // Mathematically VIF >= 1, as in varianceInflation.
      return Math.max(1, a[i * p + i] - reduction);
    });
  };
}
