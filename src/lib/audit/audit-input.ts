/**
 * From a built wave (the reader's output, or a stored wave decoded) to what one audit reads:
 * the included respondents' recoded answers, the items with the designer's locks, and the
 * outcome column the settings name. The command line and the server's audit workers share it.
 */
import { includedRows } from '../ingest/build-wave';
import { columnsLeftOut, itemTypeOf } from '../ingest/propose-setup';
import type { ScreeningResult } from '../ingest/screening/screen-respondents';
import type { BuiltWave, ColumnProposal, ColumnSetup, ItemType } from '../ingest/types';
import { selectRespondents, type ItemMatrix } from '../stats/types';
import type { AuditInput, AuditScreeningJson } from './run-audit';

/** Thrown when the settings ask for something the wave does not have (a client's mistake). */
export class AuditInputError extends Error {
  readonly code: string;
  constructor(code: string, message: string) {
    super(message);
    this.name = 'AuditInputError';
    this.code = code;
  }
}

export interface AuditInputOptions {
  /** Outcome column id (one of the wave's outcomes), or null for no outcome model. */
  readonly outcome?: string | null;
  /** Item ids the designer locked (trend or mandated questions): never proposed for cutting. */
  readonly locked?: readonly string[];
  /** Columns of the file left out of the wave, with reasons (`columnsLeftOut` of the ingest). */
  readonly leftOut?: AuditInput['leftOut'];
  /** The screening that proposed the exclusions (its rules and item types go into the audit JSON). */
  readonly screening?: AuditScreeningJson | null;
}

/**
 * How a wave was set up, as far as an audit reports it: the proposal (every column of the file
 * with its proposed role and reason), the setup in force and the screening that proposed the
 * exclusions. The command line has it from the accepted proposal, the server from the stored
 * setup document and screening (storedWaveForJob); both pass it to {@link auditInputFromSetup}.
 * Plain data, so it crosses into an audit worker thread.
 */
export interface AuditSetup {
  readonly proposal: readonly Pick<ColumnProposal, 'column' | 'role' | 'reason'>[];
  readonly columns: readonly { readonly column: string; readonly role: ColumnSetup['role']; readonly item: { readonly id: string; readonly type?: ItemType; readonly facet?: string | null; readonly min?: number; readonly max?: number } | null }[];
  /** The screening's item types, rules and how many exclusions it proposed; null for a wave stored without them. */
  readonly screening: AuditScreeningJson | null;
}

/**
 * The part of a setup an audit carries, reduced to plain data for a job: the proposal's column,
 * role and reason, each column's role and item id, type and facet, the screening's rules.
 * @param proposal the proposed columns (with reasons).
 * @param columns the setup in force.
 * @param screening the screening result, or null.
 * @returns the audit setup.
 */
export function auditSetupOf(
  proposal: readonly Pick<ColumnProposal, 'column' | 'role' | 'reason'>[],
  columns: readonly Pick<ColumnSetup, 'column' | 'role' | 'item'>[],
  screening: (Pick<ScreeningResult, 'itemTypes' | 'rules'> & { readonly proposedExclusions: readonly number[] }) | null,
): AuditSetup {
  return {
    proposal: proposal.map(({ column, role, reason }) => ({ column, role, reason })),
    columns: columns.map(({ column, role, item }) => ({
      column,
      role,
      item: item === null ? null : { id: item.id, min: item.min, max: item.max, ...(item.type ? { type: item.type } : {}), ...(item.facet ? { facet: item.facet } : {}) },
    })),
    screening: screening && Array.isArray(screening.rules) && screening.itemTypes
      ? { itemTypes: { ...screening.itemTypes }, rules: screening.rules.map(({ code, applied, items, note }) => ({ code, applied, items, note })), proposedExclusions: screening.proposedExclusions.length }
      : null,
  };
}

/**
 * The one way from a wave and its setup to an audit input, for the command line and the server
 * alike: the columns the setup leaves out (each a `column-left-out` warning), the screening's
 * rules and item types (the JSON's `screening`), and each item's type and facet from the setup
 * where the wave's items do not carry them (a stored wave's item rows keep neither).
 * @param wave the built or stored wave.
 * @param setup the audit setup ({@link auditSetupOf}).
 * @param options outcome and locked items.
 * @throws {AuditInputError} as {@link auditInputFromWave}.
 * @returns the audit input.
 * References: issue 14 (every column left out is named; screening says which rules it applied).
 */
export function auditInputFromSetup(
  wave: Pick<BuiltWave, 'matrix' | 'items' | 'outcomes' | 'excluded' | 'respondents'>,
  setup: AuditSetup,
  options: Pick<AuditInputOptions, 'outcome' | 'locked'> = {},
): AuditInput {
  const byId = new Map(setup.columns.flatMap((column) => (column.role === 'item' && column.item ? [[column.item.id, column.item] as const] : [])));
  const items = wave.items.map((item) => {
    const fromSetup = byId.get(item.id);
    const type = item.type ?? fromSetup?.type ?? itemTypeOf({ min: item.min, max: item.max });
    const facet = item.facet ?? fromSetup?.facet ?? null;
    return { ...item, type, ...(facet ? { facet } : {}) };
  });
  return auditInputFromWave({ ...wave, items }, {
    ...options,
    leftOut: columnsLeftOut({ columns: setup.proposal as ColumnProposal[] }, { columns: setup.columns as ColumnSetup[] }),
    screening: setup.screening,
  });
}

/**
 * The correlation method an audit should use by default for these items: polychoric (for 0/1
 * items the tetrachoric correlation) when every item is dichotomous or scored 0/1, because phi,
 * the Pearson r of two 0/1 items, is bounded by their margins; Pearson otherwise.
 * @param items the wave's items (range and type).
 * @returns the method and the reason, one sentence.
 * References: Guilford 1965, "Fundamental Statistics in Psychology and Education" (the bound of phi
 *   by the margins; from memory); Olsson 1979, Psychometrika 44:443-460 (polychoric / tetrachoric).
 */
export function proposedCorrelationMethod(items: readonly { readonly min: number; readonly max: number; readonly type?: string }[]): { method: 'pearson' | 'polychoric'; reason: string } {
  const binary = items.filter((item) => item.min === 0 && item.max === 1 && item.type !== 'rating');
  if (items.length > 0 && binary.length === items.length) {
    return { method: 'polychoric', reason: 'Every item is scored 0/1, so the tetrachoric correlation (polychoric on 0/1) is proposed: phi, the Pearson r of 0/1 items, is bounded by their margins.' };
  }
  return { method: 'pearson', reason: 'Rating items: Pearson correlations by default.' };
}

/**
 * Builds the audit input from a wave.
 * @param wave The built wave; its `excluded` respondents are left out.
 * @param options Outcome id and locked item ids.
 * @throws {AuditInputError} when the outcome or a locked item is not in the wave.
 * @returns The audit input.
 */
export function auditInputFromWave(wave: Pick<BuiltWave, 'matrix' | 'items' | 'outcomes' | 'excluded' | 'respondents'>, options: AuditInputOptions = {}): AuditInput {
  const rows = includedRows(wave);
  const locked = new Set(options.locked ?? []);
  const ids = new Set(wave.items.map((item) => item.id));
  const unknown = [...locked].filter((id) => !ids.has(id));
  if (unknown.length > 0) {
    throw new AuditInputError('unknown-locked-item', `Locked item${unknown.length > 1 ? 's' : ''} ${unknown.join(', ')} ${unknown.length > 1 ? 'are' : 'is'} not an item of this wave; lock items by their id as listed in the column setup.`);
  }
  let outcome: AuditInput['outcome'] = null;
  if (options.outcome) {
    const found = wave.outcomes.find((entry) => entry.id === options.outcome || entry.header === options.outcome);
    if (!found) {
      const names = wave.outcomes.map((entry) => entry.id);
      throw new AuditInputError(
        'unknown-outcome',
        `"${options.outcome}" is not an outcome column of this wave${names.length ? ` (outcomes: ${names.join(', ')})` : ' (it has none)'}; mark the column as an outcome in the column setup, or name one that is.`,
      );
    }
    outcome = { id: options.outcome, values: Float64Array.from(rows, (i) => found.values[i]) };
  }
  return {
    matrix: rows.length === wave.matrix.rows ? wave.matrix : selectRespondents(wave.matrix, rows),
    items: wave.items.map((item) => ({
      id: item.id,
      scale: item.scale,
      text: item.text,
      reverse: item.reverse,
      locked: locked.has(item.id),
      min: item.min,
      max: item.max,
      ...(item.type ? { type: item.type } : {}),
      ...(item.facet ? { facet: item.facet } : {}),
    })),
    rowsInWave: wave.respondents,
    excluded: wave.excluded.length,
    outcome,
    ...(options.leftOut ? { leftOut: options.leftOut } : {}),
    ...(options.screening
      ? { screening: options.screening }
      : {}),
  };
}

/**
 * Why an audit would have nothing to compute: fewer than two respondents, or fewer than two items
 * that vary (two different answers) among them. Such an audit is refused before it starts (the
 * command line exits 2, the API answers 422 `nothing-to-compute`) rather than run into a JSON of
 * nulls.
 * @param matrix the wave's recoded answers (column-major, NaN for missing).
 * @param options skipRows: 0-based rows left out of the audit (the exclusions), when the matrix
 *   still holds them; setAside: how many respondents were left out, to name in the sentence
 *   (the length of skipRows by default).
 * @returns one sentence saying why, or null when there is something to compute.
 */
export function nothingToCompute(matrix: ItemMatrix, options: { skipRows?: readonly number[]; setAside?: number } = {}): string | null {
  const skip = new Set(options.skipRows ?? []);
  const rows: number[] = [];
  for (let i = 0; i < matrix.rows; i++) if (!skip.has(i)) rows.push(i);
  const setAside = options.setAside ?? skip.size;
  const aside = setAside > 0 ? ` (${setAside} ${setAside === 1 ? 'was' : 'were'} left out by screening or by hand)` : '';
  if (rows.length < 2) {
    const who = rows.length === 0 ? 'There is no respondent' : 'There is only one respondent';
    return `${who} in the audit${aside}, and an audit compares answers across respondents, so it needs at least two.`;
  }
  let varying = 0;
  for (let j = 0; j < matrix.columns && varying < 2; j++) {
    let first = Number.NaN;
    for (const i of rows) {
      const value = matrix.data[j * matrix.rows + i];
      if (Number.isNaN(value)) continue;
      if (Number.isNaN(first)) first = value;
      else if (value !== first) {
        varying++;
        break;
      }
    }
  }
  if (varying >= 2) return null;
  const some = varying === 0 ? 'No item has' : 'Only one item has';
  return `${some} two different answers among the ${rows.length} respondents in the audit${aside}, so there is nothing to compare; check the column setup and the exclusions.`;
}
