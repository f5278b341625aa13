/**
 * Every threshold the readers and the setup guesser use, named, in one place. They are rules of
 * thumb (common practice) unless a source is named; docs/decisions/002-reading-waves.md lists them.
 */

// ── Reading text ───────────────────────────────────────────────────────────────────────────

/** Bytes examined to tell UTF-16 without a byte-order mark by its NUL-byte pattern. */
export const ENCODING_SAMPLE_BYTES = 4096;
/** UTF-16 without BOM: share of 2-byte units whose high byte is NUL (ASCII-heavy text). */
export const UTF16_NUL_SHARE = 0.3;
/** UTF-16 without BOM: fewest 2-byte units examined before the NUL pattern counts. */
export const UTF16_MIN_UNITS = 8;
/** UTF-16 without BOM: largest share of units with a NUL in the other byte (characters U+0100, U+0200, ...). */
export const UTF16_STRAY_NUL_SHARE = 0.05;
/** Share of control characters (other than tab, CR, LF, FF, VT) above which text is called binary. */
export const BINARY_CONTROL_SHARE = 0.01;
/** Characters examined for control characters. */
export const BINARY_SAMPLE_CHARS = 65_536;
/** Rows examined when sniffing the delimiter. */
export const DELIMITER_SAMPLE_ROWS = 50;

// ── Guessing column roles ─────────────────────────────────────────────────────────────────

/** Whole-number answers spanning at most this many steps look like a rating item (0–10 included). */
export const RATING_MAX_SPAN = 10;
/** Share of non-blank cells that must fit a pattern (numbers, e-mails, times) for the column to count as that kind. */
export const PATTERN_SHARE = 0.8;
/** A column with text that fits no answer scale is still read as numbers when at least this share of its cells are numbers. */
export const NUMERIC_MAJORITY = 0.5;
/** Share of non-blank cells that look like e-mail addresses, phone numbers or names to call a column personal data. */
export const PERSONAL_DATA_SHARE = 0.5;
/** Cells examined (evenly spaced) when judging what kind of values a column holds; counts always use every cell. */
export const SAMPLE_CELLS = 2000;
/** Mean length in characters above which text answers are called free text. */
export const FREE_TEXT_MEAN_LENGTH = 20;
/** Distinct texts above which a text column is not a set of answer labels. */
export const MAX_ANSWER_LABELS = 12;
/** Codes commonly used for "don't know", "refused" and "not asked" when they lie outside the answer range. */
export const MISSING_CODE_CANDIDATES: readonly number[] = Object.freeze([
  -999, -99, -98, -97, -9, -8, -7, -3, -2, -1, 8, 9, 66, 77, 88, 96, 97, 98, 99, 666, 777, 888, 997, 998, 999, 9999,
]);
/** Answer texts read as no answer when an item's labels come from a built-in answer scale. */
export const MISSING_ANSWER_TEXTS: readonly string[] = Object.freeze([
  "don't know", 'dont know', 'do not know', 'dk', 'not sure', 'unsure', 'prefer not to say', 'prefer not to answer',
  'refused', 'no answer', 'not applicable', 'n/a', 'na', 'does not apply', "can't say", 'cannot say',
]);
/** Share of a wide column's whole numbers that must lie in the range most items share to propose it as an item anyway. */
export const MODAL_RANGE_SHARE = 0.95;

// ── Building a wave ──────────────────────────────────────────────────────────────────────

/** Fewest respondents for an audit to say anything: a correlation from two respondents is always ±1. */
export const MIN_RESPONDENTS_FOR_AUDIT = 3;

// ── Reading cells (performance only: results are the same for any value) ─────────────────────

/**
 * Distinct cell texts past which a column is no answer scale but ids or free text (columns are
 * coded with every distinct text, so this changes no result; the tests build columns past it).
 */
export const MEMO_CELL_TEXTS = 4096;
/** One-character cells below this character code (ASCII) are remembered by their code rather than their text. */
export const SINGLE_CHARACTER_CODES = 128;
