/**
 * The one way from a read table to a wave: check the setup once, build once, screen, and apply
 * the exclusions (given, or the screening's proposal). An upload's screening preview, its
 * confirmation, the demo seed, the command line and the tests all go through {@link acceptWave};
 * those that take the proposal as it stands (the seed, the command line, tests) through
 * {@link acceptProposal} (docs/decisions/007-one-way-in-for-waves.md).
 */
import { applyExclusions, buildWave } from './build-wave';
import { proposeSetup } from './propose-setup';
import type { ReadWave } from './read-wave';
import { screenRespondents, type ScreeningOptions, type ScreeningResult } from './screening/screen-respondents';
import type { BuiltWave, ProposedSetup, WaveSetup } from './types';
import { validateSetup, type CheckedSetup } from './validate-setup';
import { WaveRefusal } from './wave-refusal';

/** What the designer (or the caller on their behalf) decided. */
export interface WaveChoice {
  /** The column setup: untrusted JSON is fine, it is checked here (once). */
  readonly setup: unknown;
  /** 0-based respondent rows to leave out of audits (untrusted), or `proposed` for the screening's proposal; none when absent. */
  readonly exclusions?: readonly unknown[] | 'proposed';
  /** Screening settings; the ingest's defaults where absent. */
  readonly screening?: Partial<ScreeningOptions>;
}

/** A wave built under a checked setup, screened, with its exclusions applied. */
export interface AcceptedWave {
  readonly setup: CheckedSetup;
  readonly wave: BuiltWave;
  readonly screening: ScreeningResult;
}

/**
 * Checks a setup against its table, builds the wave once, screens it and applies the exclusions.
 * @param table a table from `readWave`.
 * @param choice the setup, the exclusions and the screening settings.
 * @throws {WaveRefusal} 400 for an invalid setup (see validateSetup) or `invalid-exclusions`;
 *   422 `no-respondents`.
 * @throws {RangeError} for screening settings out of range (see screenRespondents).
 * @returns the checked setup, the wave and its screening.
 * References: Paredown methods.md §1 (preparing the matrix) and §6 (screening).
 */
export function acceptWave(table: ReadWave['table'], choice: WaveChoice): AcceptedWave {
  const setup = validateSetup(table, choice.setup);
  const proposed = choice.exclusions === 'proposed';
  const built = buildWave(table, setup, proposed ? [] : choice.exclusions ?? []);
  const screening = screenRespondents(built, choice.screening);
  if (!proposed) return { setup, wave: built, screening };
  const { excluded, warnings } = applyExclusions(built, screening.proposedExclusions);
  return { setup, wave: { ...built, excluded, warnings }, screening };
}

/** Options of acceptProposal. */
export interface AcceptProposalOptions {
  /** A column (by header) to set as the outcome instead of its proposed role, or null. */
  readonly outcome?: string | null;
  /** Keep every respondent instead of leaving out the ones screening proposes. */
  readonly keepAll?: boolean;
}

/** An accepted proposal: the proposal itself and the wave built under it. */
export interface AcceptedProposal extends AcceptedWave {
  readonly proposal: ProposedSetup;
}

/**
 * Proposes the column setup of a read wave and accepts it as a designer who confirms the
 * proposal would, with the screening's proposed exclusions (unless `keepAll`).
 * @param read the table and codebook from `readWave`.
 * @param options an outcome column, keepAll.
 * @throws {WaveRefusal} 400 `unknown-outcome` when the outcome is not a column; whatever
 *   proposeSetup or acceptWave refuses.
 * @returns the proposal, the checked setup, the wave and its screening.
 * References: Paredown product.md (the designer confirms the proposed setup and exclusions).
 */
export function acceptProposal(read: Pick<ReadWave, 'table' | 'codebook'>, options: AcceptProposalOptions = {}): AcceptedProposal {
  const proposal = proposeSetup(read.table, read.codebook);
  const outcome = options.outcome ?? null;
  if (outcome !== null && !proposal.columns.some((column) => column.column === outcome)) {
    throw new WaveRefusal(400, 'unknown-outcome', `"${outcome}" is not a column of ${read.table.source.fileName}; name the outcome column by its header.`);
  }
  const setup: WaveSetup = outcome === null
    ? proposal
    : { columns: proposal.columns.map((column) => (column.column === outcome ? { ...column, role: 'outcome' } : column)) };
  return { proposal, ...acceptWave(read.table, { setup, exclusions: options.keepAll ? [] : 'proposed' }) };
}
