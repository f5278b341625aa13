/**
 * Runs every entry of the awkward-file corpus (fixtures/waves/expected.json, written by
 * scripts/make-wave-fixtures.ts) through readTable → readCodebook → proposeSetup → buildWave and
 * checks the expected refusal or wave. Expectations come from how each file was built, stated
 * in the script beside the bytes.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  acceptWave, isWaveRefusal, proposeSetup, readCodebook, readTable, WaveRefusal, type BuiltWave, type Codebook, type ProposedSetup, type WaveTable,
} from '../../src/lib/ingest';
import { readWaveCorpus, waveCorpusDirectory as directory, waveCorpusSchema, type CorpusEntry } from '../setup/wave-corpus';

const corpus = readWaveCorpus();

interface Outcome {
  step: string;
  table?: WaveTable;
  codebook?: Codebook | null;
  proposal?: ProposedSetup;
  wave?: BuiltWave;
  refusal?: WaveRefusal;
}

async function run(entry: CorpusEntry): Promise<Outcome> {
  let step = 'read';
  const outcome: Outcome = { step };
  try {
    const bytes = new Uint8Array(readFileSync(join(directory, entry.file)));
    outcome.table = await readTable(bytes, entry.file, entry.limits ?? {}, entry.sheet ? { sheet: entry.sheet } : {});
    step = 'codebook';
    if (entry.codebook) {
      const codebookTable = await readTable(new Uint8Array(readFileSync(join(directory, entry.codebook))), entry.codebook);
      outcome.codebook = readCodebook(codebookTable);
    } else {
      outcome.codebook = outcome.table.codebookTable ? readCodebook(outcome.table.codebookTable) : null;
    }
    step = 'propose';
    outcome.proposal = proposeSetup(outcome.table, outcome.codebook);
    step = 'build';
    outcome.wave = acceptWave(outcome.table, { setup: outcome.proposal }).wave;
  } catch (error) {
    // Anything but a WaveRefusal is a defect: let it fail the test with its stack.
    if (!isWaveRefusal(error)) throw error;
    outcome.refusal = error;
  }
  outcome.step = step;
  return outcome;
}

function warningCodes(outcome: Outcome): string[] {
  const all = [
    ...(outcome.table?.warnings ?? []),
    ...(outcome.codebook?.warnings ?? []),
    ...(outcome.proposal?.warnings ?? []),
    ...(outcome.wave?.warnings ?? []),
  ];
  return [...new Set(all.map((warning) => warning.code))].sort();
}

describe('the awkward-file corpus', () => {
  it('has at least 28 entries, each file present, each with one kind of expectation', () => {
    expect(corpus.schema).toBe(waveCorpusSchema);
    expect(corpus.entries.length).toBeGreaterThanOrEqual(28);
    for (const entry of corpus.entries) {
      expect(Boolean(entry.expect.refused) !== Boolean(entry.expect.wave)).toBe(true);
      expect(() => readFileSync(join(directory, entry.file))).not.toThrow();
    }
  });

  for (const entry of corpus.entries) {
    it(`${entry.file}: ${entry.about}`, async () => {
      const outcome = await run(entry);
      const { refused, wave: expected } = entry.expect;
      if (refused) {
        expect(outcome.refusal, `expected a refusal, got a wave with warnings ${warningCodes(outcome).join(', ')}`).toBeDefined();
        const refusal = outcome.refusal as WaveRefusal;
        expect({ status: refusal.status, code: refusal.code, step: outcome.step }).toEqual(refused);
        // One plain sentence, no stack trace, in the error shape of api.md.
        expect(refusal.message).toMatch(/^[A-Z"].*[.)]$/s);
        expect(refusal.message).not.toMatch(/\n\s+at /);
        expect(refusal.toJSON()).toEqual({ error: { code: refused.code, message: refusal.message } });
        return;
      }
      expect(outcome.refusal?.message).toBeUndefined();
      const wave = outcome.wave as BuiltWave;
      const table = outcome.table as WaveTable;
      const proposal = outcome.proposal as ProposedSetup;
      expect(wave.respondents).toBe(expected!.rows);
      expect(wave.items.length).toBe(expected!.items);
      expect(wave.matrix.rows).toBe(expected!.rows);
      expect(wave.matrix.columns).toBe(expected!.items);
      expect(wave.matrix.data.length).toBe(expected!.rows * expected!.items);
      expect(warningCodes(outcome)).toEqual([...expected!.warnings].sort());
      if (expected!.itemIds) expect(wave.items.map((item) => item.id)).toEqual(expected!.itemIds);
      if (expected!.headers) expect(table.headers).toEqual(expected!.headers);
      for (const [column, role] of Object.entries(expected!.roles ?? {})) {
        expect(proposal.columns.find((proposed) => proposed.column === column)?.role, column).toBe(role);
      }
      for (const cell of expected!.cells ?? []) {
        let value: number | undefined;
        const k = wave.items.findIndex((item) => item.header === cell.column);
        const outcomeColumn = wave.outcomes.find((candidate) => candidate.header === cell.column);
        const role = proposal.columns.find((proposed) => proposed.column === cell.column)?.role;
        if (k >= 0) value = wave.matrix.data[k * wave.matrix.rows + cell.row];
        else if (outcomeColumn) value = outcomeColumn.values[cell.row];
        else if (role === 'weight') value = wave.weight?.[cell.row];
        else if (role === 'duration') value = wave.duration?.[cell.row];
        expect(value, `${cell.column} row ${cell.row}`).toBeDefined();
        if (cell.value === null) expect(value, `${cell.column} row ${cell.row}`).toBeNaN();
        else expect(value, `${cell.column} row ${cell.row}`).toBeCloseTo(cell.value, 12);
      }
      for (const [key, value] of Object.entries(expected!.source ?? {})) {
        expect(table.source[key as keyof WaveTable['source']], key).toBe(value);
      }
      // Personal data never becomes an item.
      for (const proposed of proposal.columns) {
        if (/personal data/i.test(proposed.reason)) expect(wave.items.some((item) => item.header === proposed.column)).toBe(false);
      }
    });
  }
});
