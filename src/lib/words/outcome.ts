/**
 * Words of outcome mode: the plain sentence for an item whose standard error overlap inflates,
 * and the note on which rows the driver model rests.
 */

/**
 * Items whose standard error overlap inflates at least this much (the factor sqrt(VIF)) get a
 * sentence of their own: 2 means VIF 4 (house figure, just below the common "worth a look" mark
 * of VIF 5, so a reader of a driver model hears of an inflation before it is serious).
 */
export const OVERLAP_SENTENCE_FACTOR = 2;

/** At most this many such sentences are listed, the worst first; the rest are counted. */
export const MAX_OVERLAP_SENTENCES = 8;

/**
 * The sentences for the items overlap hurts, the worst first, at most MAX_OVERLAP_SENTENCES,
 * then one sentence counting the rest.
 * @param rows each item's id, VIF and standard-error ratio after the proposed cut (null: no cut).
 * @returns the sentences (none when no item reaches OVERLAP_SENTENCE_FACTOR).
 */
export function overlapSentences(rows: readonly { term: string; vif: number | null; ratioAfterCut: number | null }[]): string[] {
  const hurt = rows
    .filter((row) => row.vif !== null && Number.isFinite(row.vif) && Math.sqrt(row.vif) >= OVERLAP_SENTENCE_FACTOR)
    .sort((a, b) => (b.vif ?? 0) - (a.vif ?? 0));
  const sentences = hurt.slice(0, MAX_OVERLAP_SENTENCES).map((row) => overlapSentence(row.term, Math.sqrt(row.vif!), row.ratioAfterCut));
  const rest = hurt.length - sentences.length;
  if (rest > 0) sentences.push(`${rest} more ${rest === 1 ? 'item has' : 'items have'} a standard error at least ${OVERLAP_SENTENCE_FACTOR}× what it would be without overlap.`);
  return sentences;
}

function times(factor: number): string {
  return `${factor >= 10 ? factor.toFixed(0) : factor.toFixed(1)}×`;
}

/**
 * The sentence for one item: how much bigger its standard error is because it overlaps with the
 * other items, and, when a cut is proposed, what the cut does to it.
 * @param item the item id.
 * @param inflation sqrt(VIF): the standard error over what it would be without overlap.
 * @param ratioAfterCut the standard error after the proposed cut over before, or null.
 * @returns one sentence.
 */
export function overlapSentence(item: string, inflation: number, ratioAfterCut: number | null): string {
  const base = `${item}'s standard error is ${times(inflation)} what it would be if ${item} did not overlap with the other items`;
  if (ratioAfterCut === null) return `${base}.`;
  const change = ratioAfterCut < 0.995 ? `the proposed cut shrinks it to ${Math.round(ratioAfterCut * 100)}% of that` : 'the proposed cut leaves it as it is';
  return `${base}; ${change}.`;
}

/**
 * Where the driver model's rows come from, said beside it (its VIF and the item table's differ).
 * @param completeRows respondents with the outcome and every predictor answered.
 * @param respondentsUsed respondents in the audit.
 * @param missing the audit's missing-data policy.
 * @returns one sentence.
 */
export function driverModelRowsNote(completeRows: number, respondentsUsed: number, missing: string): string {
  const rows = `The model rests on the ${completeRows} of ${respondentsUsed} respondents who answered the outcome and every item (complete rows)`;
  return missing === 'pairwise' ? `${rows}, so its VIFs can differ from the item table's, which uses every pair's own respondents.` : `${rows}.`;
}
