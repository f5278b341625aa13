/**
 * Shapes passed between the steps of reading a wave: table → codebook → proposed setup →
 * confirmed setup → built wave. Plain objects, strings and typed arrays only, so every step runs
 * unchanged in the server, a worker, the command line and a test, and the proposal can be sent
 * to the setup form as JSON.
 */
import type { ItemMatrix } from '../stats/types';

/** Something the designer should know about the file; never a reason to refuse it. */
export interface WaveWarning {
  /** kebab-case code, e.g. `duplicate-header`, `out-of-range-values`. */
  readonly code: string;
  /** Column headers concerned (as renamed in the table), possibly empty. */
  readonly columns: readonly string[];
  /** One plain sentence. */
  readonly message: string;
}

/** File formats the reader recognises. */
export type TableFormat = 'csv' | 'tsv' | 'txt' | 'xlsx' | 'xls' | 'ods';

/** How the file was read, for the setup form and the stored wave. */
export interface TableSource {
  readonly fileName: string;
  readonly format: TableFormat;
  /** Text formats: the character encoding used (`utf-8`, `utf-16le`, `utf-16be`, `windows-1252`). */
  readonly encoding: string | null;
  /** Text formats: the field delimiter found. */
  readonly delimiter: ',' | ';' | '\t' | '|' | null;
  /** The decimal separator of numbers in the cells (`,` only for text files with decimal commas). */
  readonly decimalSeparator: '.' | ',';
  /** Workbooks: the sheet read, and every sheet's name in workbook order. */
  readonly sheet: string | null;
  readonly sheets: readonly string[];
}

/** How a wave's files were read: the table's source plus where its codebook came from (enough to read them again exactly). */
export interface WaveSource extends TableSource {
  /** The codebook file's name as given, or null. */
  readonly codebookName: string | null;
  /** Where the codebook came from: its own file, a sheet of the workbook, or none. */
  readonly codebookFrom: 'file' | 'sheet' | null;
}

/**
 * One sheet or text file as a rectangle of text cells. The first non-blank row is the header;
 * wholly blank rows are dropped; every row has `headers.length` cells (`''` for blank).
 * Workbook numbers are written in canonical JavaScript form (`String(value)`), so a workbook
 * and a CSV of the same answers give the same cells.
 */
export interface WaveTable {
  readonly source: TableSource;
  /** Unique column names after renaming duplicate and blank headers. */
  readonly headers: readonly string[];
  /** The headers as they stood in the file (trimmed). */
  readonly originalHeaders: readonly string[];
  /** Respondent rows, each `headers.length` cells long. */
  readonly rows: readonly (readonly string[])[];
  /** The 1-based line (text) or row (sheet) number in the file of each respondent row. */
  readonly fileRows: readonly number[];
  readonly warnings: readonly WaveWarning[];
  /** A codebook sheet found in the same workbook, read the same way. */
  readonly codebookTable: WaveTable | null;
}

/** One answer code and its label, e.g. `{ code: 1, label: 'Strongly disagree' }`. */
export interface ValueLabel {
  readonly code: number;
  readonly label: string;
}

/** One row of a codebook; `null` where the column was absent or the cell blank. */
export interface CodebookEntry {
  /** The column header in the data this row describes. */
  readonly item: string;
  readonly scale: string | null;
  readonly reverse: boolean | null;
  readonly min: number | null;
  readonly max: number | null;
  readonly missingCodes: readonly number[] | null;
  readonly text: string | null;
  readonly labels: readonly ValueLabel[] | null;
  /** The codebook's `type` column: rating, scored or dichotomous (absent in older codebooks). */
  readonly type?: ItemType | null;
  /** The codebook's `facet` column: the content facet the item covers (absent in older codebooks). */
  readonly facet?: string | null;
}

/** A read codebook. */
export interface Codebook {
  readonly entries: readonly CodebookEntry[];
  /** Which of the known codebook columns were present (canonical names). */
  readonly columns: readonly string[];
  readonly warnings: readonly WaveWarning[];
}

/** What a column is used for. */
export type ColumnRole = 'item' | 'respondent-id' | 'outcome' | 'duration' | 'weight' | 'ignore';

/**
 * What kind of item a column is, which decides the screening rules that fit it: a `rating` grid
 * (agreement, frequency: long-string and within-person SD rules apply), a `scored` test item
 * (right/wrong or points: a run of identical scores is what a strong performer gives), or a
 * `dichotomous` checklist (yes/no, 0/1).
 */
export type ItemType = 'rating' | 'scored' | 'dichotomous';

/** How an item (or an outcome) is read and recoded. */
export interface ItemSetup {
  /** The item id used by audits (defaults to the header). */
  readonly id: string;
  readonly scale: string | null;
  /** Reverse-keyed: recoded as `min + max − x`. */
  readonly reverse: boolean;
  /** Valid range, inclusive; `min < max`. */
  readonly min: number;
  readonly max: number;
  /** Codes that mean no answer (e.g. 8, 9, 99, −9). */
  readonly missingCodes: readonly number[];
  /** Item wording. */
  readonly text: string | null;
  /** Labels that map answer texts to codes. */
  readonly labels: readonly ValueLabel[];
  /** Answer texts that mean no answer (e.g. "Don't know"). */
  readonly missingLabels: readonly string[];
  /** Item type (default: `dichotomous` for a 0/1 range, else `rating`). */
  readonly type?: ItemType;
  /**
   * The content facet the item covers (e.g. `sleep` within a wellbeing scale), or null. A cut
   * that would leave a facet without items is blocked like any constraint.
   */
  readonly facet?: string | null;
}

/** Units for a duration column holding plain numbers. */
export type DurationUnit = 'seconds' | 'minutes' | 'milliseconds';

/** The confirmed use of one column. */
export interface ColumnSetup {
  /** The column header as in {@link WaveTable.headers}. */
  readonly column: string;
  readonly role: ColumnRole;
  /** Required for items; optional for an outcome (range, codes, labels); null otherwise. */
  readonly item: ItemSetup | null;
  /** Duration columns holding plain numbers: their unit (default seconds). */
  readonly durationUnit?: DurationUnit | null;
}

/** The setup the designer confirms. Columns not listed are ignored. */
export interface WaveSetup {
  readonly columns: readonly ColumnSetup[];
}

/** What happened to the cells of one item when recoded. */
export interface ItemCounts {
  /** Cells with a valid answer. */
  readonly answered: number;
  /** Empty cells. */
  readonly blank: number;
  /** Cells holding a missing code or a missing label. */
  readonly declaredMissing: number;
  /** Numbers outside [min, max] (and not missing codes). */
  readonly outOfRange: number;
  /** Text that is not a number, where the item has no value labels. */
  readonly nonNumeric: number;
  /** Text that matches none of the item's value labels. */
  readonly unmappedLabel: number;
  /** Cells read through a value label. */
  readonly mappedLabel: number;
}

/** What the data of one column look like (for the setup form). */
export interface ColumnProfile {
  readonly nonBlank: number;
  readonly blank: number;
  /** Cells that read as numbers. */
  readonly numeric: number;
  /** Numeric cells that are whole numbers. */
  readonly wholeNumbers: number;
  /** Distinct non-blank cell texts (trimmed). */
  readonly distinct: number;
  readonly minimum: number | null;
  readonly maximum: number | null;
  /** Up to five example cells. */
  readonly examples: readonly string[];
}

/** Where an item's value labels came from. */
export type LabelSource = 'codebook' | 'answer-scale' | 'none';

/** One proposed column: the setup plus why, and what its data look like. */
export interface ColumnProposal extends ColumnSetup {
  /** Why this role was proposed, in words. */
  readonly reason: string;
  readonly profile: ColumnProfile;
  /** Items and outcomes with a setup: the cell counts under the proposed setup. */
  readonly counts: ItemCounts | null;
  /** Items: where the value labels came from; `answer-scale` needs the designer's confirmation. */
  readonly labelSource: LabelSource | null;
  /** Items mapped through a built-in answer scale: its name. */
  readonly answerScale: string | null;
}

/** The setup the product proposes for a table. */
export interface ProposedSetup extends WaveSetup {
  readonly columns: readonly ColumnProposal[];
  readonly respondents: number;
  readonly warnings: readonly WaveWarning[];
}

/** One item of a built wave. */
export interface WaveItem {
  readonly id: string;
  /** The column header it was read from. */
  readonly header: string;
  readonly scale: string | null;
  readonly reverse: boolean;
  readonly min: number;
  readonly max: number;
  readonly missingCodes: readonly number[];
  readonly text: string | null;
  readonly labels: readonly ValueLabel[];
  readonly missingLabels: readonly string[];
  /** Item type from the setup (absent in waves stored before item types existed). */
  readonly type?: ItemType;
  /** Content facet from the setup, or absent. */
  readonly facet?: string | null;
  readonly counts: ItemCounts;
}

/** An outcome column of a built wave. */
export interface WaveOutcome {
  readonly id: string;
  readonly header: string;
  /** Numbers per respondent (recoded when the outcome has a setup); NaN when missing. */
  readonly values: Float64Array;
  readonly counts: ItemCounts;
}

/** A confirmed, checked and recoded wave, ready to store and audit. */
export interface BuiltWave {
  readonly respondents: number;
  readonly items: readonly WaveItem[];
  /** Recoded answers: missing codes and invalid cells NaN, reverse-keyed items flipped. */
  readonly matrix: ItemMatrix;
  /** Answers as numbers before recoding: label codes and missing codes kept, unreadable cells NaN. */
  readonly raw: ItemMatrix;
  /** Respondent ids from the id column, or null when none was chosen. */
  readonly respondentIds: readonly string[] | null;
  /** Completion time in seconds per respondent (NaN when unreadable), or null. */
  readonly duration: Float64Array | null;
  /** Weights per respondent (NaN when unreadable), or null. */
  readonly weight: Float64Array | null;
  readonly outcomes: readonly WaveOutcome[];
  /** 0-based respondent rows left out of audits (they stay in the stored wave). */
  readonly excluded: readonly number[];
  readonly warnings: readonly WaveWarning[];
}
