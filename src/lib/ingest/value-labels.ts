/**
 * Value labels: the codebook's `labels` column (`1=Strongly disagree; 2=Disagree; 9=Don't know`)
 * and how answer texts are compared with labels.
 */
import type { ValueLabel } from './types';

/**
 * The key an answer text is compared by: lower case, curly quotes straightened, white space
 * collapsed, surrounding punctuation dropped. "Strongly  Agree." and "strongly agree" match.
 * @param text an answer text or label.
 * @returns the comparison key.
 * References: The Unicode Consortium 2022, "Unicode Standard Annex #15: Unicode Normalization Forms" (NFKC).
 */
export function labelKey(text: string): string {
  return text
    .normalize('NFKC')
    .toLowerCase()
    .replace(/[\u2018\u2019\u02bc`´]/g, "'")
    .replace(/[\u2013\u2014]/g, '-')
    .replace(/\s+/g, ' ')
    .replace(/^[\s.,;:!?"'()[\]]+|[\s.,;:!?"'()[\]]+$/g, '');
}

/** A value-labels cell that could not be read completely. */
export interface ValueLabelsRead {
  readonly labels: readonly ValueLabel[];
  /** Parts that were not `code=label` with a numeric code, or repeated a code. */
  readonly unreadable: readonly string[];
}

/**
 * Reads a value-labels cell: pairs `code=label` separated by semicolons, vertical bars or line
 * breaks; the code is a number (a decimal point, negative codes allowed), the label any text
 * without those separators. `1=Strongly disagree; 2=Disagree; 3=Neither; 4=Agree; 5=Strongly agree`.
 * @param cell the cell text.
 * @returns the labels in the order given, and the parts that could not be read.
 * References: Paredown docs/decisions/002-reading-waves.md, "Value labels" (the product's own format).
 */
export function parseValueLabels(cell: string): ValueLabelsRead {
  const labels: ValueLabel[] = [];
  const unreadable: string[] = [];
  const seenCodes = new Set<number>();
  for (const part of cell.split(/[;|\r\n]+/)) {
    const trimmed = part.trim();
    if (trimmed === '') continue;
    const match = /^([+-]?\d+(?:\.\d+)?)\s*=\s*(.*\S)\s*$/.exec(trimmed);
    if (!match) {
      unreadable.push(trimmed);
      continue;
    }
    const code = Number(match[1]);
    if (seenCodes.has(code)) {
      unreadable.push(trimmed);
      continue;
    }
    seenCodes.add(code);
    labels.push({ code: code === 0 ? 0 : code, label: match[2] });
  }
  return { labels, unreadable };
}

/**
 * Writes labels back in the format {@link parseValueLabels} reads.
 * @param labels value labels.
 * @returns e.g. `1=Disagree; 2=Agree`.
 * References: Paredown docs/decisions/002-reading-waves.md, "Value labels" (the product's own format).
 */
export function formatValueLabels(labels: readonly ValueLabel[]): string {
  return labels.map((label) => `${label.code}=${label.label}`).join('; ');
}
