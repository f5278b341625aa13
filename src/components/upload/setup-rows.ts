/**
 * The column setup as the form edits it (text in inputs) and back into the setup the API
 * confirms. Pure: no DOM, so the page and a test can share it.
 */
import type { ColumnProposal, ColumnRole, ColumnSetup, ColumnProfile, DurationUnit, ItemCounts, ItemType, ValueLabel } from '../../lib/ingest/types';

/** Roles offered in the form, with the words shown. */
export const roleChoices: readonly { value: ColumnRole; label: string }[] = [
  { value: 'item', label: 'Item' },
  { value: 'respondent-id', label: 'Respondent id' },
  { value: 'outcome', label: 'Outcome' },
  { value: 'duration', label: 'Completion time' },
  { value: 'weight', label: 'Weight' },
  { value: 'ignore', label: 'Ignore' },
];

/** One column as the form holds it. */
export interface SetupRow {
  column: string;
  role: ColumnRole;
  reason: string;
  profile: ColumnProfile;
  counts: ItemCounts | null;
  labelSource: ColumnProposal['labelSource'];
  answerScale: string | null;
  durationUnit: DurationUnit;
  /** Item fields, as typed. */
  id: string;
  scale: string;
  reverse: boolean;
  min: string;
  max: string;
  missing: string;
  text: string;
  /** Content facet (codebook `facet`), '' for none: a cut may not leave a facet empty. */
  facet: string;
  /** Item type as proposed (rating, scored, dichotomous), kept through the form. */
  type: ItemType | null;
  labels: readonly ValueLabel[];
  missingLabels: readonly string[];
  /** Whether the proposal gave this column an item setup (outcomes may go without one). */
  proposedItem: boolean;
}

const show = (value: number | null | undefined): string => (value === null || value === undefined || !Number.isFinite(value) ? '' : String(value));

/**
 * Form rows from the proposed columns.
 * @param columns the proposal's columns.
 * @returns one row per column, in file order.
 */
export function rowsFromProposal(columns: readonly ColumnProposal[]): SetupRow[] {
  return columns.map((column) => ({
    column: column.column,
    role: column.role,
    reason: column.reason,
    profile: column.profile,
    counts: column.counts,
    labelSource: column.labelSource,
    answerScale: column.answerScale,
    durationUnit: column.durationUnit ?? 'seconds',
    id: column.item?.id ?? column.column,
    scale: column.item?.scale ?? '',
    reverse: column.item?.reverse ?? false,
    min: show(column.item?.min ?? column.profile.minimum),
    max: show(column.item?.max ?? column.profile.maximum),
    missing: (column.item?.missingCodes ?? []).join(' '),
    text: column.item?.text ?? '',
    facet: column.item?.facet ?? '',
    type: column.item?.type ?? null,
    labels: column.item?.labels ?? [],
    missingLabels: column.item?.missingLabels ?? [],
    proposedItem: column.item !== null,
  }));
}

function number(text: string): number | null {
  const trimmed = text.trim().replace(',', '.');
  if (trimmed === '') return null;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : null;
}

/**
 * Reads missing codes typed as "8 9", "8; 9" or "-9, 99".
 * @param text the input.
 * @returns the codes, or null when a part is not a number.
 */
export function parseCodes(text: string): number[] | null {
  const parts = text.split(/[\s;,]+/).filter((part) => part !== '');
  const codes: number[] = [];
  for (const part of parts) {
    const value = Number(part);
    if (!Number.isFinite(value)) return null;
    if (!codes.includes(value)) codes.push(value);
  }
  return codes;
}

/**
 * The setup to send from the form rows.
 * @param rows the rows.
 * @returns the setup, or the first problem in words (naming the column).
 */
export function setupFromRows(rows: readonly SetupRow[]): { ok: true; columns: ColumnSetup[] } | { ok: false; message: string } {
  const columns: ColumnSetup[] = [];
  for (const row of rows) {
    const usesItem = row.role === 'item' || (row.role === 'outcome' && (row.proposedItem || row.min.trim() !== '' || row.max.trim() !== ''));
    if (!usesItem) {
      columns.push({ column: row.column, role: row.role, item: null, durationUnit: row.role === 'duration' ? row.durationUnit : null });
      continue;
    }
    const min = number(row.min);
    const max = number(row.max);
    if (min === null || max === null) return { ok: false, message: `${row.column}: give the valid range as two numbers (min and max).` };
    if (!(min < max)) return { ok: false, message: `${row.column}: the minimum (${min}) must be below the maximum (${max}).` };
    const missingCodes = parseCodes(row.missing);
    if (missingCodes === null) return { ok: false, message: `${row.column}: missing codes must be numbers separated by spaces, e.g. "8 9".` };
    const id = row.id.trim();
    if (id === '') return { ok: false, message: `${row.column}: give the item an id.` };
    columns.push({
      column: row.column,
      role: row.role,
      durationUnit: null,
      item: {
        id,
        scale: row.scale.trim() === '' ? null : row.scale.trim(),
        reverse: row.reverse,
        min,
        max,
        missingCodes,
        text: row.text.trim() === '' ? null : row.text.trim(),
        labels: row.labels,
        missingLabels: row.missingLabels,
        ...(row.type ? { type: row.type } : {}),
        ...(row.facet.trim() !== '' ? { facet: row.facet.trim() } : {}),
      },
    });
  }
  return { ok: true, columns };
}
