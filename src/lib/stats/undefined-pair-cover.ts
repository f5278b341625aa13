/**
 * Which items to leave out of a joint correlation matrix so that no pair in it is undefined
 * (planned missingness: two items never answered by the same respondents, or a pair whose
 * common rows show no variation). An undefined correlation is never 0: entering it as 0 can
 * make the matrix indefinite and every statistic that inverts it meaningless. Choosing the
 * fewest items that touch every undefined pair is a minimum vertex cover (NP-hard); the greedy
 * rule takes, again and again, the item in the most undefined pairs still open.
 */
/** Two items, 0-based. */
type ItemPair = readonly [number, number];

/** The items to leave out and the pairs that made them go. */
export interface UndefinedPairCover {
  /** Items to leave out, in the order chosen (0-based, into the matrix's items). */
  readonly leftOut: readonly number[];
  /** For each item left out (same order), the partners of its undefined pairs still open when it was chosen. */
  readonly partners: readonly (readonly number[])[];
}

/**
 * Greedy cover of the undefined pairs: repeatedly leave out the item with the most undefined
 * pairs still open (ties: the item with fewer answers, then the later item, so that the
 * questionnaire's earlier items stay), until no undefined pair is left.
 * @param order Number of items in the matrix.
 * @param pairs Undefined pairs [j, k] (0-based, any order, repeats allowed).
 * @param answered Answers per item (ties go to the item with fewer); omit to break ties by position only.
 * @throws {RangeError} when order is not a non-negative integer, a pair names an item outside
 *   0..order−1 or an item with itself, or `answered` has the wrong length.
 * @returns The items to leave out with their open partners.
 * References: Chvátal 1979, "A greedy heuristic for the set-covering problem", Mathematics of
 *   Operations Research 4:233-235 (the greedy rule and its ln(d)+1 bound on the cover's size).
 */
export function undefinedPairCover(order: number, pairs: readonly ItemPair[], answered?: ArrayLike<number>): UndefinedPairCover {
  if (!Number.isInteger(order) || order < 0) throw new RangeError(`undefinedPairCover: order must be a non-negative integer, got ${order}`);
  if (answered !== undefined && answered.length !== order) throw new RangeError(`undefinedPairCover: answered has ${answered.length} entries for ${order} items`);
  const open: Set<number>[] = Array.from({ length: order }, () => new Set<number>());
  for (const [j, k] of pairs) {
    if (!Number.isInteger(j) || !Number.isInteger(k) || j < 0 || k < 0 || j >= order || k >= order || j === k) {
      throw new RangeError(`undefinedPairCover: the pair [${j}, ${k}] is not a pair of two items among ${order}`);
    }
    open[j].add(k);
    open[k].add(j);
  }
  const leftOut: number[] = [];
  const partners: number[][] = [];
  for (;;) {
    let best = -1;
    for (let j = 0; j < order; j++) {
      if (open[j].size === 0) continue;
      if (best < 0 || open[j].size > open[best].size) {
        best = j;
        continue;
      }
      if (open[j].size === open[best].size) {
        const fewer = answered !== undefined && answered[j] !== answered[best] ? answered[j] < answered[best] : j > best;
        if (fewer) best = j;
      }
    }
    if (best < 0) break;
    const mates = Array.from(open[best]).sort((a, b) => a - b);
    for (const k of mates) open[k].delete(best);
    open[best].clear();
    leftOut.push(best);
    partners.push(mates);
  }
  return { leftOut, partners };
}
