/**
 * Text that a document format can carry: control characters (which XML 1.0 forbids and a PDF
 * shows as boxes) become spaces, and lone surrogates are dropped. Markup and formula-like text
 * stay as they are: the DOCX writer escapes them and no word processor evaluates them.
 */

// C0 controls except tab and line feed, DEL, C1 controls, and the line/paragraph separators.
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000B-\u001F\u007F-\u009F\u2028\u2029]/g;
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

/**
 * The text with characters a document cannot carry replaced.
 * @param value any text.
 * @returns the printable text.
 */
export function printable(value: string): string {
  return value.replace(CONTROL, ' ').replace(LONE_SURROGATE, '');
}
