/**
 * The redundancy memo as a format-neutral document: a title, a few facts for the cover and a list
 * of blocks. One builder (`buildMemo`) writes it from a stored audit and the decisions; three
 * renderers read it (DOCX, PDF and the HTML preview), so the three can never say different things.
 * Pure types: safe to import anywhere.
 */

/** Alignment of a table column: text left, numbers right. */
export type ColumnAlign = 'left' | 'right';

/** One column of a memo table. */
export interface MemoColumn {
  readonly label: string;
  readonly align: ColumnAlign;
  /** Relative width (1 = an ordinary column); the renderers share the page width by these. */
  readonly weight?: number;
}

/** The overlap map as a figure: the correlation matrix in display order. */
export interface OverlapMapFigure {
  readonly kind: 'overlap-map';
  /** Item ids in display order. */
  readonly items: readonly string[];
  /** Correlations in display order (items × items); null where a pair has no correlation. */
  readonly matrix: readonly (readonly (number | null)[])[];
  /** Positions (0-based, in display order) where a new scale starts, the first excluded. */
  readonly scaleBreaks: readonly number[];
  /** How the items were ordered, in words. */
  readonly orderedBy: string;
}

/** Eigenvalues of the correlation matrix beside the parallel-analysis line. */
export interface EigenvalueFigure {
  readonly kind: 'eigenvalues';
  /** Observed eigenvalues, descending. */
  readonly observed: readonly number[];
  /** 95th percentiles of random eigenvalues, descending; null when parallel analysis was not run. */
  readonly random95: readonly number[] | null;
}

/** One item's standard error split into the part it would have without overlap and the part overlap adds. */
export interface StandardErrorSplit {
  readonly own: number;
  readonly overlap: number;
}

/** The driver model's standard errors before and after the cut. */
export interface StandardErrorFigure {
  readonly kind: 'standard-errors';
  readonly rows: readonly { readonly term: string; readonly before: StandardErrorSplit | null; readonly after: StandardErrorSplit | null }[];
  /** Whether a cut was refitted (rows then carry `after`, null for a removed item). */
  readonly hasCut: boolean;
}

/** A figure the renderers draw themselves (vector in the PDF, a PNG in the DOCX, SVG in HTML). */
export type MemoFigure = OverlapMapFigure | EigenvalueFigure | StandardErrorFigure;

/** One block of the memo, in reading order. */
export type MemoBlock =
  | { readonly kind: 'heading'; readonly level: 1 | 2 | 3; readonly text: string }
  | { readonly kind: 'paragraph'; readonly text: string; readonly tone?: 'normal' | 'note' }
  | { readonly kind: 'bullets'; readonly items: readonly string[] }
  | { readonly kind: 'facts'; readonly rows: readonly (readonly [string, string])[] }
  | {
      readonly kind: 'table';
      readonly columns: readonly MemoColumn[];
      readonly rows: readonly (readonly string[])[];
      readonly caption?: string;
    }
  | { readonly kind: 'figure'; readonly figure: MemoFigure; readonly caption: string }
  | { readonly kind: 'caution'; readonly items: readonly string[] };

/** The whole memo. */
export interface MemoDocument {
  readonly title: string;
  readonly subtitle: string;
  /** File name without extension, safe on every system (letters, digits, dashes). */
  readonly fileStem: string;
  /** ISO time the memo was generated. */
  readonly generatedAt: string;
  readonly blocks: readonly MemoBlock[];
}
