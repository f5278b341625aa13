/**
 * Uploading a wave: read the responses (and codebook) with the one reader, propose the column
 * setup and preview the screening under that proposal, all in a wave reader thread
 * (wave-readers.ts: this thread touches no cell), then keep the originals (the file store) and
 * the proposed wave in one transaction. The same upload to the same study again is
 * recognised and answered with the wave already there (docs/decisions/005-storing-waves.md, 007).
 */
import { and, eq, isNull } from 'drizzle-orm';
import { waves } from '../../../db/schema';
import { contentHash, type WaveWarning } from '../../ingest';
import { logActivity } from '../activity';
import type { CurrentUser } from '../current-user';
import { getDb } from '../db';
import { mediaTypeOf, serverFileStore } from '../file-store';
import type { StudyRow } from '../guard';
import { newId } from '../ids';
import type { UploadForm } from './read-upload-form';
import { proposalParts, type StoredWaveSetup, type WaveRow } from './stored-wave';
import { waveReaders } from './wave-readers';
import { storedWaveView, type WaveView } from './wave-view';

/** The outcome of an upload. */
export interface UploadOutcome {
  /** True when the same upload was already in the study: nothing new was stored. */
  duplicate: boolean;
  view: WaveView;
}

function nextPilotLabel(tx: Pick<ReturnType<typeof getDb>, 'select'>, studyId: string): string {
  const labels = new Set(tx.select({ label: waves.label }).from(waves).where(eq(waves.studyId, studyId)).all().map((row) => row.label.toLowerCase()));
  let n = labels.size + 1;
  while (labels.has(`pilot ${n}`)) n++;
  return `Pilot ${n}`;
}

/**
 * Reads an upload, proposes its setup and keeps it as a proposed wave.
 * @param user who uploads.
 * @param study the study (access already checked by the guard).
 * @param form the upload form.
 * @throws {WaveRefusal} whatever the reader refuses (400, 413, 422); nothing is stored then.
 * @throws {HttpError} 503 `readers-busy` when every reader is busy and the line is full.
 * @returns the wave with its proposal, or the wave already holding the same upload (`duplicate`).
 * References: Paredown api.md (POST /api/studies/{id}/waves); docs/decisions/005-storing-waves.md.
 */
export async function uploadWave(user: CurrentUser, study: StudyRow, form: UploadForm): Promise<UploadOutcome> {
  const read = await waveReaders().readUpload({
    fileName: form.file.name, bytes: form.file.bytes, codebookName: form.codebook?.name ?? null, codebookBytes: form.codebook?.bytes ?? null, sheet: form.sheet,
  });
  const { proposal, preview } = read;
  const fileHash = contentHash(form.file.bytes);
  const codebookHash = form.codebook ? contentHash(form.codebook.bytes) : null;
  const sheet = read.source.sheet;

  const db = getDb();
  const result = serverFileStore().transaction(db, (tx, files): { duplicate: boolean; waveId: string } => {
    const sameUpload = tx
      .select({ id: waves.id, label: waves.label, codebookHash: waves.codebookHash })
      .from(waves)
      .where(and(eq(waves.studyId, study.id), eq(waves.fileHash, fileHash), sheet === null ? isNull(waves.sheet) : eq(waves.sheet, sheet)))
      .all();
    const identical = sameUpload.find((wave) => wave.codebookHash === codebookHash);
    if (identical && !form.asNewWave) return { duplicate: true, waveId: identical.id };
    const serverWarnings: WaveWarning[] = sameUpload.length > 0 ? [{
      code: 'file-uploaded-before',
      columns: [],
      message: `This file is already in the study as ${sameUpload.map((wave) => `"${wave.label}"`).join(', ')}; this upload is kept as a separate wave.`,
    }] : [];
    const stored: StoredWaveSetup = { ...proposalParts(read, proposal, serverWarnings), buildWarnings: preview.warnings, screeningNote: preview.note };
    const responsesFile = files.write(form.file.bytes, form.file.name, mediaTypeOf(read.source.format), fileHash);
    const codebookFile = form.codebook && codebookHash !== null
      ? files.write(form.codebook.bytes, form.codebook.name, mediaTypeOf(form.codebook.name), codebookHash)
      : null;
    const id = newId();
    const label = form.label ?? nextPilotLabel(tx, study.id);
    tx.insert(waves).values({
      id,
      studyId: study.id,
      label,
      fileHash: responsesFile.hash,
      codebookHash: codebookFile?.hash ?? null,
      format: read.source.format,
      sheet,
      status: 'proposed',
      setup: stored,
      screening: preview.screening,
      exclusions: [],
      rowCount: proposal.respondents,
      itemCount: proposal.columns.filter((column) => column.role === 'item').length,
      matrix: null,
      respondentIds: preview.respondentIds ? [...preview.respondentIds] : null,
      createdBy: user.id,
    }).run();
    logActivity(tx, {
      teamId: study.teamId,
      studyId: study.id,
      userId: user.id,
      action: 'wave.uploaded',
      detail: { waveId: id, label, fileName: form.file.name, fileHash, codebookName: form.codebook?.name ?? null, rows: proposal.respondents, columns: proposal.columns.length },
    });
    return { duplicate: false, waveId: id };
  });
  const row = db.select().from(waves).where(eq(waves.id, result.waveId)).get() as WaveRow;
  return { duplicate: result.duplicate, view: storedWaveView(row, true) };
}
