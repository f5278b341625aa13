/**
 * Confirming a wave's column setup and exclusions. A proposed wave is built again from its stored
 * original through the one reader and the one accept path (readWave, acceptWave, in a wave reader
 * thread: wave-readers.ts; so what is kept is exactly what the file says under the confirmed
 * setup, and this thread touches no cell), screened, and written in ONE transaction
 * by the one confirmed-wave writer (write-confirmed-wave.ts): the recoded matrix blob, the items,
 * respondent ids, the setup, the screening and the exclusions, then status `confirmed`. After any
 * failure (or a kill -9) nothing of it remains and the wave is still `proposed`.
 *
 * A confirmed wave is immutable except for its exclusions, which stay reversible: excluded
 * respondents stay in the stored wave and are only left out of audits. Other exclusions are checked
 * against the stored matrix (applyExclusions), without reading the original file again
 * (docs/decisions/005-storing-waves.md, 007-one-way-in-for-waves.md).
 */
import { asc, eq } from 'drizzle-orm';
import { waveItems, waves } from '../../../db/schema';
import {
  applyExclusions, decodeMatrix, waveSetupSchema,
  type AcceptedWave, type BuiltWave, type ScreeningOptions, type ScreeningResult,
} from '../../ingest';
import { logActivity } from '../activity';
import type { CurrentUser } from '../current-user';
import { getDb } from '../db';
import { fail } from '../errors';
import { serverFileStore } from '../file-store';
import type { StudyRow } from '../guard';
import { waveReaders } from './wave-readers';
import { confirmedDocument, itemDescription, parseStoredSetup, type StoredWaveSetup, type WaveRow } from './stored-wave';
import { assembleView, storedWaveView, type ItemView, type WaveView } from './wave-view';
import { writeConfirmedWave } from './write-confirmed-wave';

/**
 * The confirmation's transactions read before they write, so they begin IMMEDIATE: they wait for
 * another process's write lock (the busy timeout) instead of failing with SQLITE_BUSY (a 500) when
 * their first write meets it; SQLite calls no busy handler for a read turning into a write.
 */
const IMMEDIATE = { behavior: 'immediate' } as const;

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

function normalisedSetup(setup: unknown): string | null {
  const parsed = waveSetupSchema.safeParse(setup);
  return parsed.success ? JSON.stringify(parsed.data) : null;
}

function itemViews(wave: BuiltWave): ItemView[] {
  return wave.items.map((item, position) => ({ position, id: item.id, ...itemDescription(item), counts: item.counts }));
}

/** A proposed wave built again from its stored files under the confirmed setup. */
interface Rebuilt {
  accepted: AcceptedWave;
  document: StoredWaveSetup;
  /** The recoded matrix as stored (encodeMatrix), made in the reader thread. */
  matrixBlob: Uint8Array;
}

async function rebuild(row: WaveRow, setup: unknown, exclusions: readonly unknown[], screeningOptions: Partial<ScreeningOptions>): Promise<Rebuilt> {
  const before = parseStoredSetup(row.setup, row.rowCount);
  const db = getDb();
  const store = serverFileStore();
  const responses = store.read(db, row.fileHash);
  const codebook = row.codebookHash ? store.read(db, row.codebookHash) : null;
  const files = {
    fileName: before.source?.fileName ?? responses.originalName,
    bytes: responses.bytes,
    codebookName: codebook ? before.source?.codebookName ?? codebook.originalName : null,
    codebookBytes: codebook?.bytes ?? null,
    sheet: row.sheet,
  };
  let read;
  try {
    read = await waveReaders().accept(files, { setup, exclusions, screening: screeningOptions });
  } catch (error) {
    if (error instanceof RangeError && error.message.startsWith('screenRespondents: ')) {
      throw fail.badRequest(error.message.replace(/^screenRespondents: /, 'Screening: '), 'invalid-screening');
    }
    throw error;
  }
  const { accepted, matrixBlob } = read;
  return { accepted, matrixBlob, document: confirmedDocument(before, accepted, read.source) };
}

/** A confirmed wave under other exclusions, worked out from its stored matrix. */
interface Reexcluded {
  exclusions: number[];
  document: StoredWaveSetup;
}

function reexclude(row: WaveRow, stored: StoredWaveSetup, exclusions: readonly unknown[]): Reexcluded {
  if (!row.matrix) throw new Error(`wave ${row.id} is confirmed but has no stored matrix`);
  const matrix = decodeMatrix(new Uint8Array(row.matrix.buffer, row.matrix.byteOffset, row.matrix.byteLength));
  const items = getDb()
    .select({ id: waveItems.itemId, header: waveItems.header })
    .from(waveItems)
    .where(eq(waveItems.waveId, row.id))
    .orderBy(asc(waveItems.position))
    .all();
  const { excluded, warnings } = applyExclusions({ matrix, items, warnings: stored.buildWarnings }, exclusions);
  return { exclusions: excluded, document: { ...stored, buildWarnings: warnings } };
}

/** What a proposed wave's row would become on confirmation (dry runs). */
function previewRow(row: WaveRow, document: StoredWaveSetup, screening: ScreeningResult, wave: BuiltWave): WaveRow {
  return {
    ...row,
    setup: document,
    screening,
    exclusions: [...wave.excluded],
    rowCount: wave.respondents,
    itemCount: wave.items.length,
    respondentIds: wave.respondentIds ? [...wave.respondentIds] : null,
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
 *   setup or screening of a confirmed wave would change, or another confirmation came first;
 *   503 `readers-busy` when every wave reader is busy and the line is full.
 * @throws {WaveRefusal} 400 for an invalid setup or exclusions (see validateSetup, applyExclusions).
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
    const changed = reexclude(row, stored, request.exclusions);
    const { exclusions } = changed;
    if (dryRun) {
      // Only the exclusions and the warnings that depend on them differ from the stored wave.
      const preview: WaveRow = { ...row, setup: changed.document, exclusions };
      return { stored: false, view: assembleView({ row: preview, stored: changed.document, screening: storedScreening, respondentIds: row.respondentIds, items: storedWaveView(row, true).items, exclusions }, true) };
    }
    db.transaction((tx) => {
      const current = tx.select({ exclusions: waves.exclusions }).from(waves).where(eq(waves.id, row.id)).get();
      if (!current) throw fail.notFound('No such wave among your teams.', 'wave-not-found');
      tx.update(waves).set({ exclusions, setup: changed.document }).where(eq(waves.id, row.id)).run();
      logActivity(tx, {
        teamId: study.teamId,
        studyId: study.id,
        userId: user.id,
        action: 'wave.exclusions-changed',
        detail: { waveId: row.id, label: row.label, excludedBefore: current.exclusions.length, excludedAfter: exclusions.length },
      });
    }, IMMEDIATE);
    return { stored: true, view: storedWaveView(db.select().from(waves).where(eq(waves.id, row.id)).get() as WaveRow, true) };
  }

  if (request.setup === undefined) {
    throw fail.badRequest('Send the column setup to confirm (the proposal\'s columns, changed where needed).', 'setup-required');
  }
  waveReaders().checkRoom();
  const { accepted, document, matrixBlob } = await rebuild(row, request.setup, request.exclusions ?? [], request.screening ?? {});
  const { wave, screening } = accepted;
  if (dryRun) {
    return { stored: false, view: assembleView({ row: previewRow(row, document, screening, wave), stored: document, screening, respondentIds: wave.respondentIds, items: itemViews(wave), exclusions: wave.excluded }, true) };
  }
  db.transaction((tx) => {
    const current = tx.select({ status: waves.status }).from(waves).where(eq(waves.id, row.id)).get();
    if (!current) throw fail.notFound('No such wave among your teams.', 'wave-not-found');
    if (current.status !== 'proposed') throw fail.conflict(`"${row.label}" was confirmed meanwhile; reload it to see its setup.`, 'wave-confirmed');
    writeConfirmedWave(tx, { id: row.id }, document, accepted, matrixBlob);
    logActivity(tx, {
      teamId: study.teamId,
      studyId: study.id,
      userId: user.id,
      action: 'wave.confirmed',
      detail: { waveId: row.id, label: row.label, respondents: wave.respondents, items: wave.items.length, excluded: wave.excluded.length },
    });
  }, IMMEDIATE);
  return { stored: true, view: storedWaveView(db.select().from(waves).where(eq(waves.id, row.id)).get() as WaveRow, true) };
}
