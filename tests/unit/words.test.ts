/**
 * The words a reader sees (src/lib/words): reason sentences and cautions made from the engine's
 * structured output. The expected sentences are the ones the engine itself wrote before the words
 * moved out of it (reasonSentence and standardCautions in src/lib/engine/recommend-cuts.ts and the
 * unstable cautions of run-engine.ts at commit 69996af), so the audit JSON reads exactly as before;
 * the cautions are product.md's ("Cautions the product shows where a decision is made").
 */
import { describe, expect, it } from 'vitest';
import type { CutReason } from '../../src/lib/engine/recommend-cuts';
import { cautionSentence, constraintWords, formatDuration, formatNumber, formatShare, handoffLine, handoffNextStep, listOf, pageCautions, reasonSentence, settingsLine, statusWords } from '../../src/lib/words';

const pair = { items: ['A1', 'A5'] as const, r: 0.9312, n: 211, lower: 0.9104, upper: 0.9473, wording: 0.4 };
const base: CutReason = {
  code: 'strong-pair',
  items: ['A1', 'A5'],
  pair,
  confidenceLevel: 0.95,
  conditionIndex: 41.2,
  keep: 'A1',
  keeperLocked: false,
  merge: [],
  drop: ['A5'],
  reword: [],
  blocked: [],
  vifBefore: 7.46,
  vifAfter: 2.04,
};

describe('reasonSentence', () => {
  it('words a strong pair with its interval, the keeper and the VIF it lowers', () => {
    expect(reasonSentence(base)).toBe(
      "A1 and A5 correlate strongly (r = 0.93, 95% interval 0.91 to 0.95, n = 211); keep A1 (best keeper score) and drop A5, which lowers the cluster's highest VIF from 7.5 to 2.0.",
    );
  });

  it('leaves out an interval that does not exist and a VIF that does not fall', () => {
    expect(reasonSentence({ ...base, pair: { ...pair, r: 1, lower: null, upper: null }, merge: ['A5'], drop: [], keeperLocked: true, vifAfter: 9 })).toBe(
      'A1 and A5 correlate strongly (r = 1.00, n = 211); keep A1 (locked) and merge A5 into it.',
    );
  });

  it('words a larger cluster by its strongest pair, with every kind of change', () => {
    const reason: CutReason = { ...base, code: 'overlap', items: ['A1', 'A2', 'A5', 'A7'], confidenceLevel: 0.9, merge: ['A2'], drop: ['A5'], reword: ['A7'], vifBefore: null };
    expect(reasonSentence(reason)).toBe(
      'A1, A2, A5 and A7 overlap (strongest pair A1-A5, r = 0.93, 90% interval 0.91 to 0.95, n = 211); keep A1 (best keeper score) and merge A2 into it, drop A5 and reword A7 so that it asks something A1 does not.',
    );
  });

  it('words a near or exact dependency, and a cluster where constraints block every change', () => {
    const dependency: CutReason = { ...base, code: 'dependency', items: ['B1', 'B2', 'B3'], pair: null, keep: 'B1', drop: [], blocked: [{ item: 'B2', by: ['min-items', 'alpha-floor'] }, { item: 'B3', by: ['locked'] }] };
    expect(reasonSentence(dependency)).toBe(
      "B1, B2 and B3 are nearly linearly dependent (condition index 41); no change is proposed: B2 stays because its scale would fall below the minimum number of items and a scale's alpha would fall below the floor; B3 stays because it is locked.",
    );
    expect(reasonSentence({ ...dependency, conditionIndex: null, blocked: [], drop: ['B3'], vifBefore: null })).toBe(
      'B1, B2 and B3 are nearly linearly dependent (an exact dependency); keep B1 (best keeper score) and drop B3.',
    );
    expect(reasonSentence({ ...base, blocked: [{ item: 'A6', by: ['cut-cap'] }] })).toMatch(/; A6 stays because the cap on the share of items cut is reached\.$/);
  });

  it('words a cluster formed by local dependence alone with its own sentence, its figures and the evidence that fired (not "nearly linearly dependent")', () => {
    const local: CutReason = {
      ...base,
      code: 'local-dependence',
      items: ['N1', 'N2'],
      pair: { items: ['N1', 'N2'], r: 0.7123, n: 2757, lower: 0.6934, upper: 0.7302, wording: 0.55, mi: 407.61, miCritical: 15.14, sepc: 1.0083, wto: 0.372 },
      keep: 'N2',
      drop: ['N1'],
      evidence: ['local-dependence-mi', 'local-dependence-residual', 'local-dependence-wto'],
      vifBefore: 2.31,
      vifAfter: 1.62,
    };
    expect(reasonSentence(local)).toBe(
      "N1 and N2 share variance beyond their scale's common factor (modification index 407.6 (critical 15.1), expected residual correlation 1.01, wTO 0.37, r = 0.71, 95% interval 0.69 to 0.73, n = 2757), shown by a modification index above its scale's critical value, a residual correlation above its scale's critical value and a large topological overlap in the partial-correlation network; keep N2 (best keeper score) and drop N1, which lowers the cluster's highest VIF from 2.3 to 1.6.",
    );
    expect(reasonSentence({ ...local, items: ['N1', 'N2', 'N3'], evidence: ['local-dependence-mi'] })).toMatch(
      /^N1, N2 and N3 share variance beyond their scale's common factor \(strongest pair N1-N2, modification index 407\.6 .*\), shown by a modification index above its scale's critical value; keep N2/,
    );
    expect(reasonSentence({ ...base, evidence: ['strong-pair', 'near-dependency'] })).toMatch(/n = 211\), shown by a strong correlation and a near-dependency among the items \(condition index\); keep A1/);
  });
});

describe('cautionSentence', () => {
  it('words the standard cautions of product.md', () => {
    expect(cautionSentence({ code: 'overlap-not-proof' })).toBe('Statistical overlap is evidence, not proof, that these items ask the same thing: read the wording before deciding.');
    expect(cautionSentence({ code: 'small-sample', smallestN: 79 })).toBe('This sample is small (the smallest pair here rests on 79 respondents): weigh the interval and the stability share.');
    // 3015 respondents is not small (SMALL_PAIR_N = 200, common practice).
    expect(cautionSentence({ code: 'small-sample', smallestN: 3015 })).toMatch(/^The smallest pair here rests on 3015 respondents, so each r is precise/);
    expect(cautionSentence({ code: 'validated-instrument' })).toBe("Items from a published, validated instrument must not be shortened or reworded without re-validation and the rights holder's permission.");
  });

  it('words the two kinds of instability with their shares', () => {
    const figures = { share: 0.4333, overlapShare: 1, resamples: 30, threshold: 0.7 };
    expect(cautionSentence({ code: 'unstable-choice', ...figures })).toBe(
      'Unstable choice: the overlap recurs in 100% of 30 bootstrap resamples, but the same keeper and cut in only 43% (threshold 70%); the items are statistically interchangeable, so choose the one to keep by its wording.',
    );
    expect(cautionSentence({ code: 'unstable', ...figures, overlapShare: 0.5 })).toBe(
      'Unstable: only 43% of 30 bootstrap resamples make this same recommendation, and only 50% find this overlap at all (threshold 70%).',
    );
  });

  it('keeps the page cautions in one place, each a sentence', () => {
    for (const sentence of Object.values(pageCautions)) expect(sentence).toMatch(/^[A-Z].*\.$/);
    expect(pageCautions.overlapNotProof).toMatch(/evidence, not proof/);
    expect(pageCautions.trendItems).toMatch(/trend or a regulatory requirement/);
  });
});

describe('labels and formats', () => {
  it('formatNumber writes what toLocaleString("en-GB") writes, for any decimals', () => {
    // The reference is the engine's own en-GB text, with the minus sign as U+2212.
    const values = [0, -0, 0.5, -0.5, 0.005, 0.015, 1 / 3, -2 / 3, 12.345, 999.9995, 1234.5678, -98765.4321, 1e7 + 0.25];
    for (const digits of [0, 1, 2, 3, 4]) {
      for (const value of values) {
        const reference = value.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits }).replace('-', '\u2212');
        expect(formatNumber(value, digits)).toBe(reference);
      }
    }
    for (const milliseconds of [0, 49, 950, 12_345, 59_949]) {
      const reference = `${(milliseconds / 1000).toLocaleString('en-GB', { maximumFractionDigits: 1 })} s`;
      expect(formatDuration(milliseconds)).toBe(reference);
    }
    expect(formatDuration(125_000)).toBe('2 min 5 s');
  });

  it('words lists, statuses, constraints, numbers and the settings line', () => {
    expect(listOf(['a'])).toBe('a');
    expect(listOf(['a', 'b', 'c'])).toBe('a, b and c');
    expect(statusWords.running).toBe('Running');
    expect(constraintWords['cut-cap']).toMatch(/cap/);
    expect(formatNumber(-0.5)).toBe('\u22120.50');
    expect(formatNumber(null)).toBe('—');
    expect(formatShare(0.944)).toBe('94%');
    // The formatter is made once per count of decimals: a later call with other decimals gets its own.
    expect(formatNumber(1234.5678, 3)).toBe('1,234.568');
    expect(formatNumber(1234.5678, 1)).toBe('1,234.6');
    expect(formatNumber(-0.004, 2)).toBe('\u22120.00');
    expect(settingsLine({ method: 'spearman', missing: 'listwise', bootstrap: 0, seed: 1, outcome: 'overall' })).toBe('Spearman, listwise deletion · no bootstrap · outcome overall');
  });
});

describe('the handoff on the studies list', () => {
  const published = { latestVersion: { number: 2, programmedAt: null }, review: 'awaiting', undecided: 0 };
  const programmed = { latestVersion: { number: 2, programmedAt: '2026-12-04T10:00:00.000Z' }, review: 'changes_requested', undecided: 0 };
  const unpublished = (undecided: number | null) => ({ latestVersion: null, review: 'none-published', undecided });

  it('says where the handoff stands in one line', () => {
    expect(handoffLine(unpublished(3))).toBe('Nothing published yet');
    expect(handoffLine(published)).toBe('Version 2 · not yet programmed · awaiting the client’s review');
    expect(handoffLine(programmed)).toBe('Version 2 · programmed · changes requested by the client');
    expect(handoffLine({ ...programmed, review: 'approved' })).toBe('Version 2 · programmed · approved by the client');
  });

  it('points each role only at its own next step', () => {
    expect(handoffNextStep(published, 'field_manager', 's 1')).toEqual({ label: 'Version 2 to program', href: '/studies/s%201/field-list' });
    expect(handoffNextStep(published, 'client_reviewer', 's1')).toEqual({ label: 'Version 2 to review', href: '/studies/s1/review' });
    expect(handoffNextStep(published, 'designer', 's1')).toBeNull();
    expect(handoffNextStep(programmed, 'field_manager', 's1')).toBeNull();
    expect(handoffNextStep(programmed, 'client_reviewer', 's1')).toBeNull();
    expect(handoffNextStep(programmed, 'designer', 's1')).toEqual({ label: 'Changes requested', href: '/studies/s1/review' });
    expect(handoffNextStep(programmed, 'owner', 's1')).toEqual({ label: 'Changes requested', href: '/studies/s1/review' });
    expect(handoffNextStep(unpublished(3), 'field_manager', 's1')).toBeNull();
    expect(handoffNextStep(unpublished(3), 'client_reviewer', 's1')).toBeNull();
    // Before the first version, the designers' part: decide, then publish.
    expect(handoffNextStep(unpublished(3), 'designer', 's1')).toEqual({ label: '3 items to decide', href: '/studies/s1/decisions' });
    expect(handoffNextStep(unpublished(1), 'owner', 's1')).toEqual({ label: '1 item to decide', href: '/studies/s1/decisions' });
    expect(handoffNextStep(unpublished(0), 'designer', 's1')).toEqual({ label: 'Ready to publish', href: '/studies/s1' });
    expect(handoffNextStep(unpublished(null), 'designer', 's1')).toBeNull();
  });
});
