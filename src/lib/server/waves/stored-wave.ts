/**
 * What a wave row keeps besides its matrix and items, and the views of it the API sends.
 *
 * The `setup` JSON column holds a {@link StoredWaveSetup}: the current column setup (as proposed,
 * then as confirmed), the proposal with its reasons and profiles, how the file was read, every
 * warning, and the per-respondent columns that are not items (outcomes, weight). The `screening`
 * JSON column holds the ingest's ScreeningResult. docs/decisions/005-storing-waves.md says why.
 *
 * Two audiences: owners and designers may see respondent-level data (flagged rows, ids); every
 * other member gets aggregates only ({@link screeningSummary}, no proposal, no examples).
 */
import type {
  AcceptedWave, BuiltWave, ColumnProposal, ColumnSetup, ItemCounts, ProposedSetup, ReadWave, ScreeningFlag, ScreeningOptions, ScreeningResult, WaveSource, WaveWarning,
} from '../../ingest';
import type { waves } from '../../../db/schema';
import type { ScreeningDetail, ScreeningSummary, StoredSource, WaveSummary } from '../../api/waves';
export type { FlaggedRespondent, FlagSummary, ScreeningDetail, ScreeningSummary, StoredSource, WaveSummary } from '../../api/waves';

/** A wave row as Drizzle reads it. */
export type WaveRow = typeof waves.$inferSelect;

/** Version of the stored setup document written by this module. */
export const STORED_SETUP_VERSION = 1;

/** An outcome column kept with a confirmed wave. */
export interface StoredOutcome {
  readonly id: string;
  readonly header: string;
  /** One value per respondent; null where missing. */
  readonly values: readonly (number | null)[];
  readonly counts: ItemCounts;
}

/** The document in `waves.setup`. */
export interface StoredWaveSetup {
  readonly version: number;
  /** The setup in force: as proposed while the wave is `proposed`, as confirmed afterwards. */
  readonly columns: readonly ColumnSetup[];
  /** The proposal made at upload, with reasons, profiles and counts (examples of ignored columns removed). */
  readonly proposal: readonly ColumnProposal[];
  readonly respondents: number;
  readonly source: StoredSource | null;
  /** Warnings that do not depend on the setup: reading, the codebook, the proposal, the server's own. */
  readonly warnings: readonly WaveWarning[];
  /** Warnings of the wave built under `columns` (a preview while the wave is proposed). */
  readonly buildWarnings: readonly WaveWarning[];
  /** Why the wave has no screening (a proposal without usable items), or null. */
  readonly screeningNote?: string | null;
  /** Confirmed waves: cell counts per item id. */
  readonly itemCounts?: Readonly<Record<string, ItemCounts>>;
  /** Confirmed waves: outcome columns. */
  readonly outcomes?: readonly StoredOutcome[];
  /** Confirmed waves: weights per respondent (null where missing), or null without a weight column. */
  readonly weight?: readonly (number | null)[] | null;
}

/**
 * Removes what a proposal must not carry to the database or the browser: example cells of
 * columns proposed as ignore (they may be e-mail addresses, names or free text).
 * @param proposal the proposed columns.
 * @returns copies with `profile.examples` emptied for ignored columns.
 */
export function withoutIgnoredExamples(proposal: readonly ColumnProposal[]): ColumnProposal[] {
  return proposal.map((column) => (column.role === 'ignore' ? { ...column, profile: { ...column.profile, examples: [] } } : column));
}

/**
 * The setup part of proposals: what validateSetup reads.
 * @param proposal proposed columns.
 * @returns column, role, item and duration unit of each.
 */
export function setupOf(proposal: readonly ColumnSetup[]): ColumnSetup[] {
  return proposal.map((column) => ({ column: column.column, role: column.role, item: column.item, durationUnit: column.durationUnit ?? null }));
}

/**
 * Reads the `setup` column of a wave, including the shape the first demo seed wrote
 * (`{ columns: ColumnProposal[] }` without a version).
 * @param value the parsed JSON of `waves.setup`.
 * @param respondents the wave's row count (used when the document does not say).
 * @returns the document with every field present.
 */
export function parseStoredSetup(value: unknown, respondents: number): StoredWaveSetup {
  const document = (value ?? {}) as Partial<StoredWaveSetup> & { columns?: readonly (ColumnSetup | ColumnProposal)[] };
  const columns = Array.isArray(document.columns) ? document.columns : [];
  const legacyProposal = columns.every((column) => 'reason' in column) ? withoutIgnoredExamples(columns as ColumnProposal[]) : [];
  return {
    version: typeof document.version === 'number' ? document.version : 0,
    columns: setupOf(columns),
    proposal: Array.isArray(document.proposal) ? document.proposal : legacyProposal,
    respondents: typeof document.respondents === 'number' ? document.respondents : respondents,
    source: document.source ?? null,
    warnings: Array.isArray(document.warnings) ? document.warnings : [],
    buildWarnings: Array.isArray(document.buildWarnings) ? document.buildWarnings : [],
    screeningNote: typeof document.screeningNote === 'string' ? document.screeningNote : null,
    itemCounts: document.itemCounts,
    outcomes: document.outcomes,
    weight: document.weight,
  };
}

/**
 * The member-visible summary of a wave row.
 * @param row the wave row.
 * @param stored its parsed setup document.
 * @returns the summary (no respondent-level data).
 */
export function waveSummary(row: WaveRow, stored: StoredWaveSetup): WaveSummary {
  return {
    id: row.id,
    studyId: row.studyId,
    label: row.label,
    status: row.status,
    format: row.format,
    sheet: row.sheet,
    fileName: stored.source?.fileName ?? null,
    codebookName: stored.source?.codebookName ?? null,
    source: stored.source,
    rows: row.rowCount,
    items: row.itemCount,
    excluded: row.exclusions.length,
    createdAt: row.createdAt.toISOString(),
    confirmedAt: row.confirmedAt ? row.confirmedAt.toISOString() : null,
  };
}

/**
 * Screening reduced to counts.
 * @param screening a screening result, or null.
 * @returns the aggregates, or null.
 */
export function screeningSummary(screening: ScreeningResult | null): ScreeningSummary | null {
  if (!screening) return null;
  return {
    respondents: screening.respondents,
    options: screening.options,
    medianDuration: screening.medianDuration,
    flags: screening.flags.map(({ code, threshold, count, message }) => ({ code, threshold, count, message })),
    proposedCount: screening.proposedExclusions.length,
  };
}

/**
 * The flags of each respondent row.
 * @param screening a screening result.
 * @returns a map from 0-based row to its flag codes, in flag order.
 */
export function flagsByRow(screening: ScreeningResult): Map<number, ScreeningFlag['code'][]> {
  const byRow = new Map<number, ScreeningFlag['code'][]>();
  for (const flag of screening.flags) {
    for (const row of flag.respondents) byRow.set(row, [...(byRow.get(row) ?? []), flag.code]);
  }
  return byRow;
}

/**
 * Screening with the flagged respondents (owners and designers only).
 * @param screening a screening result, or null.
 * @param respondentIds ids per row, or null without an id column.
 * @returns the detail, or null.
 */
export function screeningDetail(screening: ScreeningResult | null, respondentIds: readonly string[] | null): ScreeningDetail | null {
  const summary = screeningSummary(screening);
  if (!screening || !summary) return null;
  const flagged = [...flagsByRow(screening).entries()]
    .sort(([a], [b]) => a - b)
    .map(([row, flags]) => ({ row, respondentId: respondentIds?.[row] ?? null, flags, duration: screening.duration?.[row] ?? null }));
  return { ...summary, proposedExclusions: [...screening.proposedExclusions], flagged };
}

/**
 * Warnings without repeats (same code and message), in their first order.
 * @param lists warning lists from the steps of reading.
 * @returns one list.
 */
export function mergeWarnings(...lists: readonly (readonly WaveWarning[])[]): WaveWarning[] {
  const seen = new Set<string>();
  const merged: WaveWarning[] = [];
  for (const warning of lists.flat()) {
    const key = `${warning.code}\u0000${warning.message}`;
    if (seen.has(key)) continue;
    seen.add(key);
    merged.push(warning);
  }
  return merged;
}

/** What the wave_items row and the item view both hold of a built item: its setup, text and value labels. */
export function itemDescription(item: BuiltWave['items'][number]) {
  return {
    header: item.header,
    scale: item.scale,
    reverse: item.reverse,
    min: item.min,
    max: item.max,
    missingCodes: [...item.missingCodes],
    text: item.text,
    valueLabels: item.labels.length > 0 ? Object.fromEntries(item.labels.map((label) => [String(label.code), label.label])) : null,
  };
}

const finiteOrNull = (value: number): number | null => (Number.isFinite(value) ? value : null);

/**
 * What a confirmed wave's setup document keeps of its built wave besides the columns: cell
 * counts per item, the outcome columns and the weights, with missing values as null (JSON).
 * Shared by confirmation and the demo seed, so both store the same shape.
 * @param wave the wave built under the confirmed setup.
 * @returns `itemCounts`, `outcomes` and `weight` of a {@link StoredWaveSetup}.
 * References: docs/decisions/005-storing-waves.md (what a confirmed wave keeps).
 */
export function confirmedParts(wave: BuiltWave): Required<Pick<StoredWaveSetup, 'itemCounts' | 'outcomes' | 'weight'>> {
  return {
    itemCounts: Object.fromEntries(wave.items.map((item): [string, ItemCounts] => [item.id, item.counts])),
    outcomes: wave.outcomes.map(({ id, header, values, counts }) => ({ id, header, values: Array.from(values, finiteOrNull), counts })),
    weight: wave.weight ? Array.from(wave.weight, finiteOrNull) : null,
  };
}

/** The parts of the setup document fixed at upload: the proposal, how the files were read and their warnings. */
export type ProposalParts = Pick<StoredWaveSetup, 'version' | 'columns' | 'proposal' | 'respondents' | 'source' | 'warnings'>;

/**
 * The upload-time parts of a wave's setup document, shared by uploads and the demo seed.
 * @param read the files as read.
 * @param proposal the proposed setup.
 * @param serverWarnings warnings of the server's own (e.g. `file-uploaded-before`).
 * @returns version, columns (the proposal's setup), the proposal without examples of ignored columns, respondents, source, warnings.
 * References: docs/decisions/005-storing-waves.md (what the JSON columns hold).
 */
export function proposalParts(read: Pick<ReadWave, 'source' | 'warnings'>, proposal: ProposedSetup, serverWarnings: readonly WaveWarning[] = []): ProposalParts {
  return {
    version: STORED_SETUP_VERSION,
    columns: setupOf(proposal.columns),
    proposal: withoutIgnoredExamples(proposal.columns),
    respondents: proposal.respondents,
    source: read.source,
    warnings: [...read.warnings, ...proposal.warnings, ...serverWarnings],
  };
}

/**
 * The setup document of a confirmed wave: what was kept at upload, with the confirmed setup, the
 * warnings of the wave built under it and its confirmed parts. Shared by confirmation and the demo seed.
 * @param before the document so far (the stored one of a proposed wave, or the seed's proposal parts).
 * @param accepted the wave accepted under the confirmed setup.
 * @param source how the files were read this time (used when `before` does not say).
 * @returns the document.
 * References: docs/decisions/005-storing-waves.md; docs/decisions/007-one-way-in-for-waves.md.
 */
export function confirmedDocument(before: ProposalParts | StoredWaveSetup, accepted: AcceptedWave, source: StoredSource): StoredWaveSetup {
  return {
    ...before,
    version: STORED_SETUP_VERSION,
    columns: setupOf(accepted.setup.columns),
    source: before.source ?? source,
    buildWarnings: accepted.wave.warnings,
    screeningNote: null,
    ...confirmedParts(accepted.wave),
  };
}
