/**
 * How alike two items read: cosine similarity of character 3-gram TF-IDF vectors built over the
 * questionnaire's own item texts. No language model and no download: the measure looks only at
 * shared letter sequences, weighted down where a sequence occurs in many items (so a stem every
 * item of a grid shares, such as "how satisfied are you with", counts for little).
 */

/** Length of the character n-grams compared. Three letters catch stems and inflections. */
export const WORDING_GRAM_LENGTH = 3;

/**
 * Lower-cases, strips accents, and reduces every run of characters that are not letters or
 * digits to one space, padded with one space at each end so that word starts and ends form
 * grams of their own.
 */
function normaliseText(text: string): string {
  const folded = text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^\p{L}\p{N}]+/gu, ' ')
    .trim();
  return folded.length === 0 ? '' : ` ${folded} `;
}

/** Counts of each character n-gram in a normalised text. */
function gramCounts(normalised: string): Map<string, number> {
  const counts = new Map<string, number>();
  for (let start = 0; start + WORDING_GRAM_LENGTH <= normalised.length; start++) {
    const gram = normalised.slice(start, start + WORDING_GRAM_LENGTH);
    counts.set(gram, (counts.get(gram) ?? 0) + 1);
  }
  return counts;
}

/**
 * Wording similarity of every pair of items: the cosine of their character 3-gram TF-IDF
 * vectors. Term frequency is sublinear (`1 + ln count`); inverse document frequency is smoothed,
 * `ln((1 + N) / (1 + df)) + 1`, over the N item texts that are present, so a gram every item
 * shares still counts a little and none is divided by zero. Texts are compared after lower-casing,
 * stripping accents and reducing punctuation to spaces.
 *
 * 1 means the same letters in the same proportions (identical wording after normalisation); 0
 * means no three-letter sequence in common. The value describes spelling, not meaning: "easy to
 * use" and "simple to use" share a good deal, a negated twin ("do not help") stays high, and two
 * synonyms share nothing. It is shown as evidence beside the statistics, never as proof.
 *
 * @param texts One wording per item, in items[] order; null, undefined or blank when unknown.
 * @throws {TypeError} when `texts` is not an array or holds something other than a string or null.
 * @returns A symmetric matrix as nested arrays, `[i][j]` in [0, 1]; `null` wherever either item's
 *   wording is unknown (or normalises to nothing), 1 on the diagonal of items with wording.
 * References: Salton & Buckley 1988, "Term-weighting approaches in automatic text retrieval"
 * (Information Processing & Management 24:513-523); Cavnar & Trenkle 1994, "N-gram-based text
 * categorization" (character n-grams).
 */
export function wordingSimilarity(texts: readonly (string | null | undefined)[]): (number | null)[][] {
  if (!Array.isArray(texts)) throw new TypeError('wordingSimilarity: texts must be an array');
  texts.forEach((text, index) => {
    if (text !== null && text !== undefined && typeof text !== 'string') {
      throw new TypeError(`wordingSimilarity: texts[${index}] must be a string or null, got ${typeof text}`);
    }
  });

  const counts = texts.map((text) => (typeof text === 'string' ? gramCounts(normaliseText(text)) : null));
  const present = counts.filter((count): count is Map<string, number> => count !== null && count.size > 0);
  const documentFrequency = new Map<string, number>();
  for (const count of present) for (const gram of count.keys()) documentFrequency.set(gram, (documentFrequency.get(gram) ?? 0) + 1);

  const vectors = counts.map((count) => {
    if (count === null || count.size === 0) return null;
    const weights = new Map<string, number>();
    let squaredNorm = 0;
    for (const [gram, frequency] of count) {
      const inverse = Math.log((1 + present.length) / (1 + (documentFrequency.get(gram) as number))) + 1;
      const weight = (1 + Math.log(frequency)) * inverse;
      weights.set(gram, weight);
      squaredNorm += weight * weight;
    }
    const norm = Math.sqrt(squaredNorm);
    for (const [gram, weight] of weights) weights.set(gram, weight / norm);
    return weights;
  });

  const size = texts.length;
  const result: (number | null)[][] = Array.from({ length: size }, () => new Array<number | null>(size).fill(null));
  for (let i = 0; i < size; i++) {
    const left = vectors[i];
    if (left === null) continue;
    result[i][i] = 1;
    for (let j = i + 1; j < size; j++) {
      const right = vectors[j];
      if (right === null) continue;
      const [small, large] = left.size <= right.size ? [left, right] : [right, left];
      let dot = 0;
      for (const [gram, weight] of small) dot += weight * (large.get(gram) ?? 0);
      const cosine = Math.min(1, Math.max(0, dot));
      result[i][j] = cosine;
      result[j][i] = cosine;
    }
  }
  return result;
}
