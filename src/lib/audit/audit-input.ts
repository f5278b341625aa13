/**
 * From a built wave (the reader's output, or a stored wave decoded) to what one audit reads:
 * the included respondents' recoded answers, the items with the designer's locks, and the
 * outcome column the settings name. The command line and the server's audit workers share it.
 */
import { includedRows } from '../ingest/build-wave';
import type { ScreeningResult } from '../ingest/screening/screen-respondents';
import type { BuiltWave } from '../ingest/types';
import { selectRespondents } from '../stats/types';
import type { AuditInput } from './run-audit';

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
  readonly screening?: Pick<ScreeningResult, 'itemTypes' | 'rules' | 'proposedExclusions'> | null;
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
    })),
    rowsInWave: wave.respondents,
    excluded: wave.excluded.length,
    outcome,
    ...(options.leftOut ? { leftOut: options.leftOut } : {}),
    ...(options.screening
      ? { screening: { itemTypes: options.screening.itemTypes, rules: options.screening.rules.map(({ code, applied, items, note }) => ({ code, applied, items, note })), proposedExclusions: options.screening.proposedExclusions.length } }
      : {}),
  };
}
