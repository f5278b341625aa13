/**
 * The cautions a reader sees (product.md, "Cautions the product shows where a decision is
 * made"): the sentences beside each recommendation, made from the engine's structured cautions,
 * and the ones the pages show around the proposals. Pure; one home for every copy.
 */
import type { Caution } from '../engine/recommend-cuts';

/**
 * Below this many respondents behind a pair the caution calls the sample small (common practice:
 * at n = 200 a 95% interval for r = .5 still spans about ±.10).
 */
export const SMALL_PAIR_N = 200;

/** A share as a whole percentage, e.g. 0.7 → "70%". */
function percent(value: number): string {
  return `${Math.round(value * 100)}%`;
}

/**
 * The sentence of one caution beside a recommendation.
 * @param caution the engine's structured caution.
 * @returns one sentence.
 */
export function cautionSentence(caution: Caution): string {
  switch (caution.code) {
    case 'overlap-not-proof':
      return 'Statistical overlap is evidence, not proof, that these items ask the same thing: read the wording before deciding.';
    case 'small-sample':
      // "Small" only when it is (SMALL_PAIR_N, common practice: at n = 200 a 95% interval for r = .5 still spans about ±.10).
      return caution.smallestN < SMALL_PAIR_N
        ? `This sample is small (the smallest pair here rests on ${caution.smallestN} respondents): weigh the interval and the stability share.`
        : `The smallest pair here rests on ${caution.smallestN} respondents, so each r is precise; the stability share says how often resampling repeats the decision, and a new sample may still differ.`;
    case 'validated-instrument':
      return "Items from a published, validated instrument must not be shortened or reworded without re-validation and the rights holder's permission.";
    case 'unstable-choice':
      return (
        `Unstable choice: the overlap recurs in ${percent(caution.overlapShare)} of ${caution.resamples} bootstrap resamples, but the same keeper and cut in only ${percent(caution.share)} ` +
        `(threshold ${percent(caution.threshold)}); the items are statistically interchangeable, so choose the one to keep by its wording.`
      );
    case 'unstable':
      return `Unstable: only ${percent(caution.share)} of ${caution.resamples} bootstrap resamples make this same recommendation, and only ${percent(caution.overlapShare)} find this overlap at all (threshold ${percent(caution.threshold)}).`;
  }
}

/** The cautions the pages show where proposals are read and decided (product.md). */
export const pageCautions = Object.freeze({
  /** Said once above the proposals when no shared caution came with them. */
  overlapNotProof: 'Statistical overlap is evidence, not proof, that two items ask the same thing: read the wording before deciding.',
  trendItems: 'Items that carry a trend or a regulatory requirement stay unless their owner releases them: lock them in the audit settings.',
  finalSay: "The final say belongs to the study's methodologist and, where people's data is involved, the team's ethics and data-protection rules.",
  /** The study page, beside the audits. */
  study: "Overlap between items is evidence, not proof, that they ask the same thing. Validated instruments and trend items are not cut without their owner's release.",
  /** The footer of every signed-in page. */
  footer: 'Paredown finds questionnaire items that say the same thing twice. Statistical overlap is evidence, not proof: read the wording before cutting.',
});

/**
 * The cautions every exported document carries (the redundancy memo), product.md's list in full:
 * the memo is read away from the screens that show the others.
 */
export const documentCautions: readonly string[] = Object.freeze([
  'Statistical overlap is evidence, not proof, that two items ask the same thing: the wording decides.',
  "A published, validated instrument must not be shortened or reworded without re-validation and the rights holder's permission; locked items were never proposed for cutting.",
  'Items that carry a trend or a regulatory requirement stay unless their owner releases them.',
  `${pageCautions.finalSay} The memo carries aggregates only.`,
]);

// The decisions workspace (issue 10): where each decision is made.

/** Shown above the decisions, always. */
export const decisionCautions: readonly string[] = [
  'Statistical overlap is evidence, not proof, that two items ask the same thing: read both wordings before you cut.',
  'A proposal that changes across bootstrap resamples is marked unstable; weigh it with care, the more so where its caution says the sample is small.',
  'A published, validated instrument is not shortened or reworded without re-validation and the rights holder’s permission.',
  'Items that carry a trend or a regulatory requirement stay unless their owner releases them; locked items cannot be dropped or merged here.',
  'The final say belongs to the study’s methodologist and the team’s ethics and data-protection rules.',
];

/** Beside a locked item. */
export const lockedCaution = 'Locked: a trend, mandated or validated item. It can be kept or reworded, not dropped or merged, until the lock is released in the study settings.';

/** Beside an unstable recommendation. */
export const unstableCaution = 'Unstable: the bootstrap resamples did not agree on this proposal. Look at the wording and the evidence before accepting it.';

/** Beside a recommendation whose stability is unknown (no bootstrap ran). */
export const unknownStabilityCaution = 'Stability unknown: the audit ran without bootstrap resamples.';

/** Beside an accepted reword that still needs its words. */
export const rewordCaution = 'A reword needs its new wording, which only you can write: decide it on the item below.';
