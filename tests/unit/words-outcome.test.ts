/**
 * The sentences of outcome mode: the factor they state is sqrt(VIF) (the standard error over what
 * it would be without overlap: se_j = sqrt(SSR/(n-k-1)) / (sqrt(SST_j) sqrt(1-R²_j)), Wooldridge
 * ch. 3), worst first, capped, the rest counted.
 */
import { describe, expect, it } from 'vitest';
import { MAX_OVERLAP_SENTENCES, OVERLAP_SENTENCE_FACTOR, overlapSentence, overlapSentences } from '../../src/lib/words/outcome';

describe('overlap sentences', () => {
  it('states sqrt(VIF) and what the cut does', () => {
    // VIF 5.76 → sqrt = 2.4
    expect(overlapSentence('Q12', Math.sqrt(5.76), null)).toBe("Q12's standard error is 2.4× what it would be if Q12 did not overlap with the other items.");
    expect(overlapSentence('Q12', 2.4, 0.41)).toBe("Q12's standard error is 2.4× what it would be if Q12 did not overlap with the other items; the proposed cut shrinks it to 41% of that.");
    expect(overlapSentence('Q12', 2.4, 1)).toMatch(/leaves it as it is\.$/);
  });

  it('lists only items at or above the factor, worst first, and counts the rest past the cap', () => {
    const threshold = OVERLAP_SENTENCE_FACTOR ** 2;
    const rows: { term: string; vif: number | null; ratioAfterCut: number | null }[] = Array.from({ length: MAX_OVERLAP_SENTENCES + 3 }, (_, k) => ({ term: `q${k}`, vif: threshold + k, ratioAfterCut: null }));
    rows.push({ term: 'calm', vif: threshold - 0.01, ratioAfterCut: null }, { term: 'aliased', vif: null, ratioAfterCut: null });
    const sentences = overlapSentences(rows);
    expect(sentences).toHaveLength(MAX_OVERLAP_SENTENCES + 1);
    expect(sentences[0]).toMatch(new RegExp(`^q${MAX_OVERLAP_SENTENCES + 2}'s`));
    expect(sentences.at(-1)).toBe(`3 more items have a standard error at least ${OVERLAP_SENTENCE_FACTOR}× what it would be without overlap.`);
    expect(sentences.join(' ')).not.toContain('calm');
    expect(overlapSentences([{ term: 'calm', vif: 1.2, ratioAfterCut: null }])).toEqual([]);
  });
});
