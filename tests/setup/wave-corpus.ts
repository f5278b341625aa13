/**
 * The awkward-file corpus under fixtures/waves/: the shape of its expected.json (written by
 * scripts/make-wave-fixtures.ts) and reading it. Shared by the script that writes the corpus, the
 * readers' test (tests/unit/ingest-corpus.test.ts) and the upload endpoint's test
 * (tests/api/waves-corpus.test.ts). Plain node:fs, no test framework, so the script can import it.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

/** Folder of the corpus files and expected.json. */
export const waveCorpusDirectory = join(import.meta.dirname, '..', '..', 'fixtures', 'waves');

/** Schema name recorded in expected.json. */
export const waveCorpusSchema = 'paredown.wave-corpus/1';

/** A refusal an entry expects: the WaveRefusal's status and code and the step that throws it. */
export interface CorpusRefusal {
  status: 400 | 413 | 422;
  code: string;
  step: 'read' | 'codebook' | 'propose' | 'build';
}

/** A wave an entry expects after reading, proposing and building with the proposal unchanged. */
export interface CorpusWave {
  rows: number;
  items: number;
  /** Warning codes from all steps (compared sorted). */
  warnings: string[];
  itemIds?: string[];
  headers?: string[];
  roles?: Record<string, string>;
  /** Values after building: items from the recoded matrix, outcome/weight/duration columns from theirs; null is missing. */
  cells?: { column: string; row: number; value: number | null }[];
  source?: { format?: string; encoding?: string | null; delimiter?: string | null; decimalSeparator?: string; sheet?: string | null };
}

/** One file of the corpus and what it should give: exactly one of `refused` and `wave`. */
export interface CorpusEntry {
  file: string;
  about: string;
  /** A codebook file beside it, read with readTable and readCodebook. */
  codebook?: string;
  sheet?: string;
  /** Reader limits (readTable's limits; over HTTP, the server's configuration). */
  limits?: Record<string, number>;
  expect: { refused: CorpusRefusal; wave?: never } | { wave: CorpusWave; refused?: never };
}

/** The content of fixtures/waves/expected.json. */
export interface WaveCorpus {
  schema: string;
  generatedBy: string;
  howToRun: string[];
  entries: CorpusEntry[];
}

/**
 * Reads fixtures/waves/expected.json.
 * @throws Error when the file is missing or is not JSON (run `npx tsx scripts/make-wave-fixtures.ts`).
 * @returns The corpus as written by the script (not validated beyond parsing).
 */
export function readWaveCorpus(): WaveCorpus {
  return JSON.parse(readFileSync(join(waveCorpusDirectory, 'expected.json'), 'utf8')) as WaveCorpus;
}
