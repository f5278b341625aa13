/**
 * The cautions the workspace shows where decisions are made (product.md, "Cautions the product
 * shows where a decision is made"), in ONE place. A shared words module (src/lib/words/) is being
 * written alongside; when it lands these sentences move there and this file re-exports them.
 */

/** Shown above the decisions, always. */
export const decisionCautions: readonly string[] = [
  'Statistical overlap is evidence, not proof, that two items ask the same thing: read both wordings before you cut.',
  'Pilot samples are small: a proposal that changes across bootstrap resamples is marked unstable; weigh it with care.',
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
