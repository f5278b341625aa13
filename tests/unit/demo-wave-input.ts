/**
 * The demo wave (fixtures/demo) as the engine's tests take it: read and accepted through the one
 * reader and accept path the seed and the command line use, screening applied, no outcome, no
 * item locked.
 */
import { readFileSync } from 'node:fs';
import { auditInputFromWave } from '../../src/lib/audit/audit-input';
import type { AuditInput } from '../../src/lib/audit/run-audit';
import { acceptProposal, readWave } from '../../src/lib/ingest';

/**
 * The demo wave's audit input (recoded matrix and items).
 * @returns The input, as an audit of the demo wave with default settings would get it.
 */
export async function demoWaveInput(): Promise<AuditInput> {
  const read = await readWave({
    fileName: 'library-pilot-1.csv',
    bytes: new Uint8Array(readFileSync(new URL('../../fixtures/demo/library-pilot-1.csv', import.meta.url))),
    codebookName: 'library-codebook.csv',
    codebookBytes: new Uint8Array(readFileSync(new URL('../../fixtures/demo/library-codebook.csv', import.meta.url))),
    sheet: null,
  });
  return auditInputFromWave(acceptProposal(read, { outcome: null, keepAll: false }).wave, { outcome: null, locked: [] });
}
