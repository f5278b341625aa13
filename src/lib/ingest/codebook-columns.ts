/**
 * The codebook's columns and the header spellings each is recognised by. The product's format
 * (audit-json.md) is `item, scale, reverse, min, max, missing, text`, plus `labels` for value
 * labels, `type` for the item type and `facet` for the content facet an item covers; common spellings from survey tools are accepted too. Headers are compared in lower
 * case with spaces, hyphens and underscores removed.
 */

/** Canonical codebook column names. */
export type CodebookColumn = 'item' | 'scale' | 'reverse' | 'min' | 'max' | 'missing' | 'text' | 'labels' | 'type' | 'facet';

const ALIASES: Readonly<Record<CodebookColumn, readonly string[]>> = {
  item: ['item', 'itemid', 'variable', 'variablename', 'varname', 'column', 'columnname', 'name', 'field'],
  scale: ['scale', 'subscale', 'construct', 'dimension', 'factor', 'domain'],
  reverse: ['reverse', 'reversed', 'reversekeyed', 'reversecoded', 'reversescored', 'rev'],
  min: ['min', 'minimum', 'rangemin', 'low', 'lowest'],
  max: ['max', 'maximum', 'rangemax', 'high', 'highest'],
  missing: ['missing', 'missingcodes', 'missingvalues', 'missings', 'na', 'nacodes'],
  text: ['text', 'wording', 'question', 'questiontext', 'itemtext', 'label', 'description'],
  labels: ['labels', 'valuelabels', 'values', 'answerlabels', 'codes', 'responseoptions', 'options'],
  type: ['type', 'itemtype', 'responsetype', 'itemkind', 'kind'],
  facet: ['facet', 'subfacet', 'content', 'contentarea', 'topic', 'aspect'],
};

/**
 * Key a header is compared by: lower case, without spaces, hyphens, underscores and dots.
 * @param header a header cell.
 * @returns the comparison key, e.g. `missingcodes` for "Missing codes".
 * References: Paredown audit-json.md, codebook columns (the product's own format).
 */
export function headerKey(header: string): string {
  return header.toLowerCase().replace(/[\s_\-.]+/g, '');
}

/**
 * Which codebook column a header names, if any.
 * @param header a header cell.
 * @returns the canonical column name, or null.
 * References: Paredown audit-json.md, codebook columns; docs/decisions/002-reading-waves.md (accepted spellings).
 */
export function codebookColumnOf(header: string): CodebookColumn | null {
  const key = headerKey(header);
  for (const column of Object.keys(ALIASES) as CodebookColumn[]) {
    if (ALIASES[column].includes(key)) return column;
  }
  return null;
}

/**
 * Whether a header row looks like a codebook's: it names an item column and at least two of
 * the others.
 * @param headers the header cells.
 * @returns true for a codebook header.
 * References: Paredown audit-json.md, codebook columns.
 */
export function looksLikeCodebookHeader(headers: readonly string[]): boolean {
  const found = new Set(headers.map(codebookColumnOf).filter((column) => column !== null));
  return found.has('item') && found.size >= 3;
}

/** Sheet names that announce a codebook. */
export const CODEBOOK_SHEET_NAME = /code\s*book|codebook|dictionary|variables|variable list|value labels|item list|metadata|^items$|^labels$/i;
