/**
 * Respondents per block of the screening indices, which read each respondent's answers across the
 * items from column-major data: a block's running values stay in the cache while the items are
 * read down their columns. Performance only; the indices are the same for any block size.
 */
export const ROW_BLOCK = 1024;
