/**
 * The one reader of a stored wave for the audit and what-if jobs (main thread: it reads the
 * database; the workers get plain data).
 */
import { eq } from 'drizzle-orm';
import { waveItems, type waves } from '../../../db/schema';
import type { Db } from '../../../db/client';
import { auditSetupOf } from '../../audit/audit-input';
import type { ScreeningResult } from '../../ingest';
import { parseStoredSetup } from '../waves/stored-wave';
import type { AuditWorkerJob } from './worker-protocol';

/**
 * The stored wave as an audit or what-if worker reads it: the matrix, the items, the exclusions,
 * the one outcome the settings name (or none) and the setup an audit reports (auditSetupOf).
 * @param db the database.
 * @param wave the wave row.
 * @param matrix its stored matrix.
 * @param outcome the outcome the settings name, or null.
 * @returns the job's wave.
 */
export function storedWaveForJob(db: Db, wave: typeof waves.$inferSelect, matrix: Buffer, outcome: string | null): AuditWorkerJob['wave'] {
  const items = db.select().from(waveItems).where(eq(waveItems.waveId, wave.id)).orderBy(waveItems.position).all();
  const stored = parseStoredSetup(wave.setup, wave.rowCount);
  const outcomes = outcome === null ? [] : (stored.outcomes ?? []).filter((entry) => entry.id === outcome);
  const screening = (wave.screening ?? null) as ScreeningResult | null;
  return {
    matrixBlob: matrix,
    respondents: wave.rowCount,
    excluded: wave.exclusions,
    items: items.map((item) => ({ id: item.itemId, scale: item.scale, reverse: item.reverse, min: item.min ?? Number.NaN, max: item.max ?? Number.NaN, text: item.text })),
    outcomes: outcomes.map(({ id, header, values }) => ({ id, header, values })),
    // The same setup the command line passes: columns left out (with the proposal's reasons),
    // item types and facets, and the screening's rules. Waves stored before screening kept its
    // rules have none to state.
    setup: auditSetupOf(stored.proposal, stored.columns, screening && Array.isArray(screening.rules) ? screening : null),
  };
}
