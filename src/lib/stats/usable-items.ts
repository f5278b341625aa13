/**
 * Which items can enter a correlation matrix: an item needs at least two observed answers that
 * are not all equal. Read from the answers (`usableItems`) or from the items' descriptives
 * (`usableItemsFromDescriptives`, a bootstrap resample's), with one notice per refused item.
 *
 * References: methods.md §1 (constant items cannot enter a correlation matrix).
 */
import { checkItemMatrix } from './item-matrix-input';
import type { ItemDescriptive } from './item-descriptives';
import type { ItemMatrix, NumericalNotice } from './types';

/** Which items can enter a correlation matrix. */
export interface UsableItems {
  /** Indices (0-based) of the items that can enter, in order. */
  readonly usable: readonly number[];
  /** Indices of the items refused. */
  readonly refused: readonly number[];
  /** One notice per refused item: `too-few-values` (fewer than 2 answers) or `constant-item`. */
  readonly notices: readonly NumericalNotice[];
}

/**
 * Which items can enter a correlation matrix: an item needs at least 2 observed values that
 * are not all equal. Refused items are reported, one notice each; the caller drops them
 * (`selectItems`) before correlating.
 * @param matrix Respondents × items, NaN for missing.
 * @throws {RangeError} when the matrix shape is inconsistent or a value is ±Infinity.
 * @returns The usable and refused item indices with the notices.
 * References: methods.md §1 (constant items cannot enter a correlation matrix).
 */
export function usableItems(matrix: ItemMatrix): UsableItems {
  checkItemMatrix(matrix, 'usableItems');
  const { rows, columns, data } = matrix;
  const verdicts = new UsableVerdicts();
  for (let j = 0; j < columns; j++) {
    let observed = 0;
    let first = NaN;
    let varies = false;
    const offset = j * rows;
    for (let i = 0; i < rows; i++) {
      const value = data[offset + i];
      if (value !== value) continue;
      if (observed === 0) first = value;
      else if (value !== first) varies = true;
      observed++;
      // Two answers that differ settle it: the rest of the column cannot change the verdict.
      if (varies) break;
    }
    verdicts.add(j, observed, varies, first);
  }
  return verdicts.result();
}

/**
 * `usableItems` read from the items' descriptives (an item varies when its smallest and largest
 * answers differ): the same verdicts and notices without another pass over the answers, e.g.
 * for a bootstrap resample whose descriptives come from the weighted original rows
 * (`weightedItemDescriptives`).
 * @param descriptives Each item's answers `n` and smallest and largest answers, in item order, as
 *   `itemDescriptives` or `weightedItemDescriptives` return them for the matrix.
 * @throws {RangeError} when there is no item, or an item has answers but no finite smallest and
 *   largest answer.
 * @returns The usable and refused item indices with the notices, as `usableItems` on the matrix.
 * References: methods.md §1 (constant items cannot enter a correlation matrix).
 */
export function usableItemsFromDescriptives(descriptives: readonly Pick<ItemDescriptive, 'n' | 'minimum' | 'maximum'>[]): UsableItems {
  if (descriptives.length < 1) throw new RangeError('usableItemsFromDescriptives: at least one item is required');
  const verdicts = new UsableVerdicts();
  descriptives.forEach(({ n, minimum, maximum }, j) => {
    if (n > 0 && !(Number.isFinite(minimum) && Number.isFinite(maximum))) {
      throw new RangeError(`usableItemsFromDescriptives: item ${j} has ${n} answers but no finite smallest and largest answer`);
    }
    // With fewer than two answers only the count is read (as `usableItems` stops there).
    verdicts.add(j, n >= 2 ? 2 : n, n >= 2 && (minimum as number) < (maximum as number), minimum ?? NaN);
  });
  return verdicts.result();
}

/** The verdicts of `usableItems`, item by item, with their notices (one wording for both ways of finding them). */
class UsableVerdicts {
  private readonly usable: number[] = [];
  private readonly refused: number[] = [];
  private readonly notices: NumericalNotice[] = [];

  /** Item j with `observed` answers (2 stands for two or more), whether they vary, and its first answer. */
  add(j: number, observed: number, varies: boolean, first: number): void {
    if (observed < 2) {
      this.refused.push(j);
      this.notices.push({
        code: 'too-few-values',
        items: [j],
        message:
          observed === 0
            ? 'This item has no answers among the respondents in the audit (respondents set aside by screening do not count), so it cannot be correlated; it is left out.'
            : 'This item has a single answer, too few to correlate; it is left out.',
      });
    } else if (!varies) {
      this.refused.push(j);
      this.notices.push({
        code: 'constant-item',
        items: [j],
        message: `Every respondent gave this item the same answer (${first}), so it has no variance and cannot be correlated; it is left out.`,
      });
    } else {
      this.usable.push(j);
    }
  }

  result(): UsableItems {
    return { usable: this.usable, refused: this.refused, notices: this.notices };
  }
}
