/**
 * Recognises columns that hold personal data (e-mail addresses, phone numbers, names, postal
 * or network addresses, dates of birth) or free text, so that they are proposed as ignored and
 * never become items.
 */
import { FREE_TEXT_MEAN_LENGTH, PERSONAL_DATA_SHARE, SAMPLE_CELLS } from './ingest-thresholds';
import { matchAnswerScales } from './answer-scales';
import { parseNumber } from './parse-number';

const EMAIL = /^[^\s@<>()",;:]+@[^\s@<>()",;:]+\.[^\s@<>()",;:.]{2,}$/;
const PHONE = /^\+?[\d\s().\-/]{7,24}$/;
const PERSON_NAME = /^\p{Lu}[\p{L}'’-]+(?:\s+(?:\p{Lu}[\p{L}'’.-]*|van|von|de|der|den|da|di|le|la|du))*\s+\p{Lu}[\p{L}'’-]+$/u;
const DATE_LIKE = /^(\d{4}[-/.]\d{1,2}[-/.]\d{1,2}|\d{1,2}[-/.]\d{1,2}[-/.]\d{2,4})$/;
const IPV4 = /^(?:\d{1,3}\.){3}\d{1,3}$/;
/** A plain decimal number: digits, one decimal point or comma, digits (`3.3333333`, `0,1428571`). */
const PLAIN_DECIMAL = /^-?\d+[.,]\d+$/;

/** Header words (lower case) that name personal data, with what the column holds. */
const PERSONAL_HEADER_WORDS: readonly [RegExp, string][] = [
  [/\b(e-?mail|email ?address|mail)\b/, 'e-mail addresses'],
  [/\b(phone|telephone|tel|mobile|cell ?phone|phone ?number)\b/, 'phone numbers'],
  [/\b(name|first ?name|last ?name|surname|full ?name|given ?name|family ?name|user ?name|username)\b/, 'names'],
  [/\b(address|street|post ?code|postcode|zip ?code|postal ?code)\b/, 'postal addresses'],
  [/\b(ip|ip ?address|ipaddress)\b/, 'network addresses'],
  [/\b(date of birth|dob|birth ?date|birthday)\b/, 'dates of birth'],
  [/\b(ssn|social security|passport|national id|national insurance)\b/, 'identity numbers'],
];

function digitsIn(text: string): number {
  let count = 0;
  for (let i = 0; i < text.length; i++) if (text.charCodeAt(i) >= 48 && text.charCodeAt(i) <= 57) count++;
  return count;
}

/**
 * Whether a cell looks like a phone number: 7 to 15 digits written with a leading `+` or `0`,
 * or grouped by spaces, dashes, dots or brackets. A plain run of digits without a leading zero
 * is not enough (it may be an id), and a date (1990-01-01, 01.02.1990) is not one. Nor is a plain
 * decimal number with one separator (`3.3333333`, `0.1428571`), as statistics programs and
 * spreadsheets write scale scores and sliders: phone numbers grouped by dots have two or more groups.
 * @param cell cell text.
 * @returns true for phone-looking text.
 * References: ITU-T 2010, Recommendation E.164 "The international public telecommunication numbering plan" (at most 15 digits).
 */
export function looksLikePhoneNumber(cell: string): boolean {
  const text = cell.trim();
  if (!PHONE.test(text) || DATE_LIKE.test(text) || PLAIN_DECIMAL.test(text)) return false;
  const digits = digitsIn(text);
  if (digits < 7 || digits > 15) return false;
  return text.startsWith('+') || text.startsWith('0') || /\d[\s().\-/]+\d/.test(text);
}

/**
 * Whether a cell looks like an e-mail address.
 * @param cell cell text.
 * @returns true for `name@example.org`.
 * References: Klensin 2008, RFC 5321 "Simple Mail Transfer Protocol", §4.1.2 (local-part@domain).
 */
export function looksLikeEmail(cell: string): boolean {
  return EMAIL.test(cell.trim());
}

function headerWords(header: string): string {
  return header
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase()
    .replace(/[_\-.:/]+/g, ' ')
    .replace(/\s+/g, ' ')
    .trim();
}

/**
 * At most {@link SAMPLE_CELLS} cells, evenly spaced and in order (all of them when there are fewer).
 * @param cells a column's cells.
 * @returns the sample (the same array when no sampling is needed).
 * References: none published; systematic sampling with a fixed step (Cochran 1977, "Sampling Techniques", ch. 8).
 */
export function sampleCells<T>(cells: readonly T[]): readonly T[] {
  if (cells.length <= SAMPLE_CELLS) return cells;
  return samplePositions(cells.length).map((position) => cells[position]);
}

/**
 * The positions {@link sampleCells} takes from `length` cells: every position when there are at
 * most {@link SAMPLE_CELLS}, else SAMPLE_CELLS evenly spaced ones, ascending.
 * @param length how many cells there are (a whole number >= 0).
 * @returns 0-based positions, ascending.
 * References: none published; systematic sampling with a fixed step (Cochran 1977, "Sampling Techniques", ch. 8).
 */
export function samplePositions(length: number): number[] {
  if (length <= SAMPLE_CELLS) return Array.from({ length }, (_, k) => k);
  const step = length / SAMPLE_CELLS;
  return Array.from({ length: SAMPLE_CELLS }, (_, k) => Math.floor(k * step));
}

/** What kind of personal data or free text a column holds, if any. */
export interface PersonalDataFinding {
  /** e.g. `e-mail addresses`, `phone numbers`, `names`, `free text`. */
  readonly what: string;
  /** Whether the finding rests on the values (e-mails, phone numbers) rather than the header or text length. */
  readonly fromValues: boolean;
}

/**
 * Looks for personal data in a column: values that are mostly e-mail addresses, phone numbers,
 * network addresses or personal names; a header naming such data; or free text (long or mostly
 * distinct answers that are not numbers, and not the options of a built-in answer scale).
 * @param header the column header.
 * @param allCells the column's non-blank cells (trimmed); a sample of them is examined (see {@link sampleCells}).
 * @param decimalSeparator the table's decimal separator.
 * @returns what was found, or null.
 * References: Regulation (EU) 2016/679 (GDPR), Art. 4(1) "personal data" (any information relating to an identifiable person).
 */
export function findPersonalData(header: string, allCells: readonly string[], decimalSeparator: '.' | ','): PersonalDataFinding | null {
  const cells = sampleCells(allCells);
  const n = cells.length;
  if (n > 0) {
    const share = (test: (cell: string) => boolean) => cells.filter(test).length / n;
    if (share(looksLikeEmail) >= PERSONAL_DATA_SHARE) return { what: 'e-mail addresses', fromValues: true };
    if (share(looksLikePhoneNumber) >= PERSONAL_DATA_SHARE) return { what: 'phone numbers', fromValues: true };
    if (share((cell) => IPV4.test(cell)) >= PERSONAL_DATA_SHARE) return { what: 'network addresses', fromValues: true };
  }
  const words = headerWords(header);
  for (const [pattern, what] of PERSONAL_HEADER_WORDS) if (pattern.test(words)) return { what, fromValues: false };
  if (n === 0) return null;
  const text = cells.filter((cell) => Number.isNaN(parseNumber(cell, decimalSeparator)));
  if (text.length / n < PERSONAL_DATA_SHARE) return null;
  const distinctTexts = [...new Set(text)];
  const distinct = distinctTexts.length;
  // Answers such as "Neither agree nor disagree" are long and capitalised but are answer labels.
  if (matchAnswerScales(distinctTexts).length > 0) return null;
  if (text.length >= 2 && text.filter((cell) => PERSON_NAME.test(cell)).length / text.length >= PERSONAL_DATA_SHARE && distinct / text.length >= PERSONAL_DATA_SHARE) {
    return { what: 'names', fromValues: false };
  }
  const meanLength = text.reduce((sum, cell) => sum + cell.length, 0) / text.length;
  if (meanLength >= FREE_TEXT_MEAN_LENGTH) return { what: 'free text', fromValues: false };
  return null;
}
