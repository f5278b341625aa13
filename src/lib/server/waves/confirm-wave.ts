/**
 * Confirming a wave's column setup and exclusions. The wave is built again from the stored
 * original (so what is kept is exactly what the file says under the confirmed setup), screened,
 * and stored in ONE transaction: the recoded matrix blob, the items, respondent ids, the setup,
 * the screening and the exclusions, then status `confirmed`. After any failure nothing of it
 * remains and the wave is still `proposed`.
 *
 * A confirmed wave is immutable except for its exclusions, which stay reversible: excluded
 * respondents stay in the stored wave and are only left out of audits
 * (docs/decisions/005-storing-waves.md).
 */
import { eq } from 'drizzle-orm';
import { waveItems, waves } from '../../../db/schema';
import {
  buildWave, checkExclusions, encodeMatrix, screenRespondents, validateSetup, waveSetupSchema,
  type BuiltWave, type ScreeningOptions, type ScreeningResult, type WaveSetup,
} from '../../ingest';
import { logActivity } from '../activity';
import type { CurrentUser } from '../current-user';
import { getDb } from '../db';
import { fail } from '../errors';
import type { StudyRow } from '../guard';
import { readStoredFile, readWaveFiles, serverReadLimits } from './read-wave-files';
import { confirmedParts, itemDescription, parseStoredSetup, setupOf, STORED_SETUP_VERSION, type StoredWaveSetup, type WaveRow } from './stored-wave';
import { assembleView, storedWaveView, type ItemView, type WaveView } from './wave-view';

/** What the designer sends to confirm a wave. */
export interface ConfirmRequest {
  /** The column setup (untrusted; validated against the file). Required while the wave is proposed. */
  setup?: unknown;
  /** 0-based respondent rows to leave out of audits; none when absent (proposed waves). */
  exclusions?: number[];
  /** Screening settings; the defaults of the ingest where absent. */
  screening?: Partial<ScreeningOptions>;
  /** Check and preview only: build and screen, store nothing. */
  dryRun?: boolean;
}

/** The answer of a confirmation (or its dry run). */
export interface ConfirmOutcome {
  /** Whether anything was stored. */
  stored: boolean;
  view: WaveView;
}

/** Wave items inserted per statement (each binds 11 parameters). */
const ITEM_ROWS_PER_INSERT = 500;

function normalisedSetup(setup: unknown): string | null {
  const parsed = waveSetupSchema.safeParse(setup);
  return parsed.success ? JSON.stringify(parsed.data) : null;
}

function itemViews(wave: BuiltWave): ItemView[] {
  return wave.items.map((item, position) => ({ position, id: item.id, ...itemDescription(item), counts: item.counts }));
}

/** The wave built again from its stored files under a setup. */
interface Rebuilt {
  setup: WaveSetup;
  wave: BuiltWave;
  screening: ScreeningResult;
  document: StoredWaveSetup;
}

async function rebuild(row: WaveRow, setup: unknown, exclusions: readonly number[], screeningOptions: Partial<ScreeningOptions>): Promise<Rebuilt> {
  const before = parseStoredSetup(row.setup, row.rowCount);
  const responses = readStoredFile(row.fileHash);
  const codebook = row.codebookHash ? readStoredFile(row.codebookHash) : null;
  const read = await readWaveFiles(
    {
      fileName: before.source?.fileName ?? responses.originalName,
      bytes: responses.bytes,
      codebookName: codebook ? before.source?.codebookName ?? codebook.originalName : null,
      codebookBytes: codebook?.bytes ?? null,
      sheet: row.sheet,
    },
    serverReadLimits(),
  );
  const confirmed = validateSetup(read.table, setup);
  const wave = buildWave(read.table, confirmed, exclusions);
  let screening: ScreeningResult;
  try {
    screening = screenRespondents(wave, screeningOptions);
  } catch (error) {
    if (error instanceof RangeError) throw fail.badRequest(error.message.replace(/^screenRespondents: /, 'Screening: '), 'invalid-screening');
    throw error;
  }
  const document: StoredWaveSetup = {
    ...before,
    version: STORED_SETUP_VERSION,
    columns: setupOf(confirmed.columns),
    source: before.source ?? read.source,
    buildWarnings: wave.warnings,
    screeningNote: null,
    ...confirmedParts(wave),
  };
  return { setup: confirmed, wave, screening, document };
}

function previewRow(row: WaveRow, rebuilt: Rebuilt, status: WaveRow['status']): WaveRow {
  return {
    ...row,
    status,
    setup: rebuilt.document,
    screening: rebuilt.screening,
    exclusions: [...rebuilt.wave.excluded],
    rowCount: rebuilt.wave.respondents,
    itemCount: rebuilt.wave.items.length,
    respondentIds: rebuilt.wave.respondentIds ? [...rebuilt.wave.respondentIds] : null,
  };
}

/**
 * Confirms a proposed wave, changes the exclusions of a confirmed one, or previews either.
 * @param user who confirms.
 * @param study the wave's study (access checked by the guard).
 * @param row the wave.
 * @param request setup, exclusions, screening settings, dry run.
 * @throws HttpError 400 `setup-required` (proposed wave without a setup), `exclusions-required`
 *   (confirmed wave without exclusions), `invalid-screening`; 409 `wave-confirmed` when the
 *   setup or screening of a confirmed wave would change, or another confirmation came first.
 * @throws {WaveRefusal} 400 for an invalid setup or exclusions (see validateSetup, checkExclusions).
 * @returns whether it was stored, and the view of the wave.
 * References: Paredown api.md (PUT /api/waves/{id}/setup); methods.md §6 (screening); docs/decisions/005-storing-waves.md.
 */
export async function confirmWave(user: CurrentUser, study: StudyRow, row: WaveRow, request: ConfirmRequest): Promise<ConfirmOutcome> {
  const db = getDb();
  const dryRun = request.dryRun === true;
  if (row.status === 'confirmed') {
    const stored = parseStoredSetup(row.setup, row.rowCount);
    const storedScreening = row.screening as ScreeningResult | null;
    if (request.setup !== undefined && normalisedSetup(request.setup) !== normalisedSetup({ columns: stored.columns })) {
      throw fail.conflict(`"${row.label}" is confirmed and its column setup can no longer change (audits refer to it); only its exclusions can. Upload the file again as a new wave to set it up differently.`, 'wave-confirmed');
    }
    const options = { ...(storedScreening?.options ?? {}), ...(request.screening ?? {}) };
    if (storedScreening && JSON.stringify(options) !== JSON.stringify(storedScreening.options)) {
      throw fail.conflict(`"${row.label}" is confirmed and its screening settings can no longer change; only its exclusions can.`, 'wave-confirmed');
    }
    if (request.exclusions === undefined) {
      throw fail.badRequest(`"${row.label}" is confirmed: send its exclusions (0-based respondent rows) to change them.`, 'exclusions-required');
    }
    const exclusions = checkExclusions(request.exclusions, row.rowCount);
    const rebuilt = await rebuild(row, { columns: stored.columns }, exclusions, options);
    if (dryRun) return { stored: false, view: assembleView({ row: previewRow(row, rebuilt, 'confirmed'), stored: rebuilt.document, screening: rebuilt.screening, respondentIds: rebuilt.wave.respondentIds, items: storedWaveView(row, true).items, exclusions }, true) };
    db.transaction((tx) => {
      const current = tx.select({ exclusions: waves.exclusions }).from(waves).where(eq(waves.id, row.id)).get();
      if (!current) throw fail.notFound('No such wave among your teams.', 'wave-not-found');
      tx.update(waves).set({ exclusions, setup: { ...stored, buildWarnings: rebuilt.wave.warnings } }).where(eq(waves.id, row.id)).run();
      logActivity(tx, {
        teamId: study.teamId,
        studyId: study.id,
        userId: user.id,
        action: 'wave.exclusions-changed',
        detail: { waveId: row.id, label: row.label, excludedBefore: current.exclusions.length, excludedAfter: exclusions.length },
      });
    });
    return { stored: true, view: storedWaveView(db.select().from(waves).where(eq(waves.id, row.id)).get() as WaveRow, true) };
  }

  if (request.setup === undefined) {
    throw fail.badRequest('Send the column setup to confirm (the proposal\'s columns, changed where needed).', 'setup-required');
  }
  const rebuilt = await rebuild(row, request.setup, request.exclusions ?? [], request.screening ?? {});
  const { wave, screening, document } = rebuilt;
  if (dryRun) {
    return { stored: false, view: assembleView({ row: previewRow(row, rebuilt, 'proposed'), stored: document, screening, respondentIds: wave.respondentIds, items: itemViews(wave), exclusions: wave.excluded }, true) };
  }
  const matrix = Buffer.from(encodeMatrix(wave.matrix));
  db.transaction((tx) => {
    const current = tx.select({ status: waves.status }).from(waves).where(eq(waves.id, row.id)).get();
    if (!current) throw fail.notFound('No such wave among your teams.', 'wave-not-found');
    if (current.status !== 'proposed') throw fail.conflict(`"${row.label}" was confirmed meanwhile; reload it to see its setup.`, 'wave-confirmed');
    tx.update(waves).set({
      status: 'confirmed',
      setup: document,
      screening,
      exclusions: [...wave.excluded],
      rowCount: wave.respondents,
      itemCount: wave.items.length,
      matrix,
      respondentIds: wave.respondentIds ? [...wave.respondentIds] : null,
      confirmedAt: new Date(),
    }).where(eq(waves.id, row.id)).run();
    tx.delete(waveItems).where(eq(waveItems.waveId, row.id)).run();
    const itemRows = wave.items.map((item, position) => ({ waveId: row.id, position, itemId: item.id, ...itemDescription(item) }));
    // A few hundred rows per statement keeps well inside SQLite's limit on bound parameters.
    for (let start = 0; start < itemRows.length; start += ITEM_ROWS_PER_INSERT) {
      tx.insert(waveItems).values(itemRows.slice(start, start + ITEM_ROWS_PER_INSERT)).run();
    }
    logActivity(tx, {
      teamId: study.teamId,
      studyId: study.id,
      userId: user.id,
      action: 'wave.confirmed',
      detail: { waveId: row.id, label: row.label, respondents: wave.respondents, items: wave.items.length, excluded: wave.excluded.length },
    });
  });
  return { stored: true, view: storedWaveView(db.select().from(waves).where(eq(waves.id, row.id)).get() as WaveRow, true) };
}
