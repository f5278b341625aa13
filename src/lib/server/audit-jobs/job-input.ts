/**
 * From a job's stored wave to the audit input, for the audit worker and the what-if worker alike:
 * decode the matrix, and pass the wave with its setup (columns left out, screening, item types,
 * facets) through `auditInputFromSetup`, the function the command line uses too.
 */
import { auditInputFromSetup } from '../../audit/audit-input';
import type { AuditInput } from '../../audit/run-audit';
import { decodeMatrix } from '../../ingest/matrix-blob';
import type { BuiltWave } from '../../ingest/types';
import type { AuditWorkerJob } from './worker-protocol';

/**
 * The audit input of a stored wave.
 * @param wave the job's wave (storedWaveForJob).
 * @param options the outcome and locked items the settings name.
 * @throws {AuditInputError} when the outcome or a locked item is not in the wave.
 * @returns the audit input.
 */
export function auditInputFromJobWave(wave: AuditWorkerJob['wave'], options: { outcome: string | null; locked: readonly string[] }): AuditInput {
  const matrix = decodeMatrix(wave.matrixBlob);
  // auditInputFromWave reads, of each item, id, scale, text, reverse, min and max (type and facet
  // come from the setup), and of each outcome, id, header and values: the stored wave has these.
  const storedWave = {
    matrix,
    items: wave.items,
    outcomes: wave.outcomes.map((outcome) => ({ id: outcome.id, header: outcome.header, values: Float64Array.from(outcome.values, (v) => (v === null ? Number.NaN : v)) })),
    excluded: wave.excluded,
    respondents: wave.respondents,
  } as unknown as Pick<BuiltWave, 'matrix' | 'items' | 'outcomes' | 'excluded' | 'respondents'>;
  return auditInputFromSetup(storedWave, wave.setup, options);
}
