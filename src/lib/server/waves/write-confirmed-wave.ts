/**
 * The one writer of a confirmed wave: the row (status, setup document, screening, exclusions,
 * counts, the recoded matrix blob, respondent ids, time of confirmation) and its items, inside the
 * caller's transaction. Used by confirmation (the proposed row is updated) and by the demo seed
 * (the row is inserted confirmed), so both store exactly the same thing
 * (docs/decisions/007-one-way-in-for-waves.md).
 */
import { eq } from 'drizzle-orm';
import { waveItems, waves } from '../../../db/schema';
import { encodeMatrix, type AcceptedWave } from '../../ingest';
import type { Tx } from '../file-store';
import { itemDescription, type StoredWaveSetup } from './stored-wave';

/** Wave items inserted per statement (each binds 11 parameters). */
const ITEM_ROWS_PER_INSERT = 500;

/** The blob's bytes as a Buffer, without copying them. */
function asBuffer(bytes: Uint8Array): Buffer {
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

/** What a wave row holds besides its confirmed parts, for a wave written confirmed from the start (the demo seed). */
export interface NewWaveRow {
  id: string;
  studyId: string;
  label: string;
  fileHash: string;
  codebookHash: string | null;
  format: string;
  sheet: string | null;
  createdBy: string | null;
}

/**
 * Writes a confirmed wave and its items, in the caller's transaction: the wave row first
 * (updated, or inserted for `{ insert }`), then its items replaced.
 * @param tx the transaction.
 * @param target `{ id }` of a proposed wave to update, or `{ insert }` with a new row's own columns.
 * @param document the setup document (see confirmedDocument).
 * @param accepted the wave accepted under the confirmed setup (acceptWave).
 * @param matrixBlob `encodeMatrix(accepted.wave.matrix)` when the reader thread made it already (confirmation); made here otherwise.
 * @throws Error from the database (the caller's transaction then rolls everything back).
 */
export function writeConfirmedWave(tx: Tx, target: { id: string } | { insert: NewWaveRow }, document: StoredWaveSetup, accepted: AcceptedWave, matrixBlob?: Uint8Array): void {
  const { wave, screening } = accepted;
  const confirmed = {
    status: 'confirmed' as const,
    setup: document,
    screening,
    exclusions: [...wave.excluded],
    rowCount: wave.respondents,
    itemCount: wave.items.length,
    matrix: asBuffer(matrixBlob ?? encodeMatrix(wave.matrix)),
    respondentIds: wave.respondentIds ? [...wave.respondentIds] : null,
    confirmedAt: new Date(),
  };
  const id = 'insert' in target ? target.insert.id : target.id;
  if ('insert' in target) tx.insert(waves).values({ ...target.insert, ...confirmed }).run();
  else tx.update(waves).set(confirmed).where(eq(waves.id, id)).run();
  tx.delete(waveItems).where(eq(waveItems.waveId, id)).run();
  const itemRows = wave.items.map((item, position) => ({ waveId: id, position, itemId: item.id, ...itemDescription(item) }));
  // A few hundred rows per statement keeps well inside SQLite's limit on bound parameters.
  for (let start = 0; start < itemRows.length; start += ITEM_ROWS_PER_INSERT) {
    tx.insert(waveItems).values(itemRows.slice(start, start + ITEM_ROWS_PER_INSERT)).run();
  }
}
