/**
 * What the engine does with an indefinite correlation matrix (pairwise or polychoric): Bentler &
 * Yuan's smoothing, with exact copies set aside so they stay an exact dependency, and Higham's
 * nearest correlation matrix only when the smoothing declines (docs/decisions/009 and 020).
 */
import { repairCorrelationMatrix } from '../stats/nearest-correlation';
import type { CorrelationMatrixResult } from '../stats/correlation-matrix';
import { smoothCorrelationMatrix } from '../stats/smooth-correlation-matrix';
import type { ItemMatrix, NumericalNotice, SquareMatrix } from '../stats/types';
import { principalSubmatrix } from './principal-submatrix';

/** What `settleIndefinite` made of a correlation result. */
export interface SettledCorrelation {
  /** The matrix the engine uses: as computed, smoothed, or (when the smoothing declines) Higham's repair. */
  readonly matrix: SquareMatrix;
  readonly repaired: boolean;
  /** The correlation's notices, with `matrix-indefinite` replaced by the repair's notices when it was repaired, or dropped when smoothed. */
  readonly notices: readonly NumericalNotice[];
  /** The smoothing's notices and the positions (in `data`) of the items it saw, when it smoothed. */
  readonly smoothed: { readonly notices: readonly NumericalNotice[]; readonly kept: readonly number[] } | null;
}

/**
 * The matrix the engine uses for an unrepaired correlation result (`repair: 'none'`). An
 * indefinite one is smoothed by Bentler & Yuan's scaling; exact copies (identical recoded columns)
 * are taken out before smoothing and put back as copies of their source, so they stay an exact
 * dependency (infinite VIF, null, with its warning) instead of being scaled to r = .98
 * (docs/decisions/009). When the smoothing declines (the matrix without its copies is not
 * indefinite), Higham's nearest correlation matrix is taken, with the options and notices
 * `correlationMatrix` would have used. The result is the one of repairing first and smoothing
 * after, without the repair's projections when the smoothing replaces them.
 * @param correlation A `correlationMatrix` or `weightedPearson` result computed with `repair: 'none'`
 *   (so never repaired: its matrix is the raw one, with a `matrix-indefinite` notice when indefinite).
 * @param data The respondents × items the correlations were computed from.
 * @returns The matrix, whether it was changed, and the notices to report.
 * References: Bentler & Yuan 2011 (smoothing); Higham 2002 (nearest correlation matrix).
 */
export function settleIndefinite(correlation: CorrelationMatrixResult, data: ItemMatrix): SettledCorrelation {
  if (!correlation.indefinite) return { matrix: correlation.matrix, repaired: false, notices: correlation.notices, smoothed: null };
  const raw = correlation.matrix;
  const copyOf = exactCopies(data);
  const kept = copyOf.map((source, k) => (source < 0 ? k : -1)).filter((k) => k >= 0);
  const smoothed = smoothCorrelationMatrix(kept.length === raw.order ? raw : principalSubmatrix(raw, kept));
  const others = correlation.notices.filter((notice) => notice.code !== 'matrix-indefinite');
  if (smoothed.smoothed) {
    const matrix = kept.length === raw.order ? smoothed.matrix : withCopies(smoothed.matrix, kept, copyOf);
    return { matrix, repaired: true, notices: others, smoothed: { notices: smoothed.notices, kept } };
  }
  const repair = repairCorrelationMatrix(raw, { method: 'higham' });
  return { matrix: repair.matrix, repaired: repair.repaired, notices: [...others, ...repair.notices], smoothed: null };
}

/** For each column the earlier column it is an exact copy of (same value in every row, missing alike), else -1. */
function exactCopies(data: ItemMatrix): number[] {
  const rows = data.rows;
  const copyOf = new Array<number>(data.columns).fill(-1);
  for (let b = 1; b < data.columns; b++) {
    for (let a = 0; a < b; a++) {
      if (copyOf[a] >= 0) continue;
      let same = true;
      for (let i = 0; i < rows && same; i++) {
        const x = data.data[a * rows + i];
        const y = data.data[b * rows + i];
        same = x === y || (x !== x && y !== y);
      }
      if (same) {
        copyOf[b] = a;
        break;
      }
    }
  }
  return copyOf;
}

/** A matrix over the kept columns expanded to every column, each copy repeating its source's row and column (r = 1 with it). */
function withCopies(matrix: SquareMatrix, kept: readonly number[], copyOf: readonly number[]): SquareMatrix {
  const order = copyOf.length;
  const at = new Map(kept.map((k, x) => [k, x]));
  const source = (k: number): number => at.get(copyOf[k] >= 0 ? copyOf[k] : k) as number;
  const data = new Float64Array(order * order);
  for (let i = 0; i < order; i++) for (let j = 0; j < order; j++) data[i * order + j] = i === j ? 1 : matrix.data[source(i) * matrix.order + source(j)];
  return { order, data };
}
