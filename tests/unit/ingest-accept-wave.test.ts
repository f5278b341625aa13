/**
 * The one way in for a wave (docs/decisions/007-one-way-in-for-waves.md): readWave reads the
 * files, acceptWave / acceptProposal check the setup once, build once, screen and apply the
 * exclusions, and applyExclusions works out other exclusions from a stored matrix alone. Used the
 * way an upload (a setup sent back, chosen exclusions) and the command line (the proposal as it
 * stands) use it. Facts about the demo files come from fixtures/demo/README.md.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  acceptProposal, acceptWave, applyExclusions, buildWave, decodeMatrix, encodeMatrix, proposeSetup, readWave, screenRespondents, validateSetup,
  WaveRefusal, type ReadWave, type WaveFiles,
} from '../../src/lib/ingest';

const bytes = (path: string) => new Uint8Array(readFileSync(path));

function demoFiles(overrides: Partial<WaveFiles> = {}): WaveFiles {
  return {
    fileName: 'library-pilot-1.csv', bytes: bytes('fixtures/demo/library-pilot-1.csv'),
    codebookName: 'library-codebook.csv', codebookBytes: bytes('fixtures/demo/library-codebook.csv'), sheet: null,
    ...overrides,
  };
}

function refusal(run: () => unknown): WaveRefusal {
  try {
    run();
  } catch (error) {
    if (error instanceof WaveRefusal) return error;
    throw error;
  }
  throw new Error('expected a WaveRefusal');
}

const text = (csv: string) => new TextEncoder().encode(csv);
const item = (id: string) => ({ id, scale: 'S', reverse: false, min: 1, max: 5, missingCodes: [], text: null, labels: [], missingLabels: [] });

describe('readWave', () => {
  it('reads responses with a codebook file, and a workbook with its codebook sheet', async () => {
    const csv = await readWave(demoFiles());
    expect(csv.source).toMatchObject({ fileName: 'library-pilot-1.csv', format: 'csv', codebookName: 'library-codebook.csv', codebookFrom: 'file' });
    expect(csv.table.rows).toHaveLength(400); // fixtures/demo/README.md: 400 members answered
    // fixtures/demo/README.md: library-pilot-1.xlsx holds the same two tables as the sheets `responses` and `codebook`.
    const workbook = await readWave({ fileName: 'library-pilot-1.xlsx', bytes: bytes('fixtures/demo/library-pilot-1.xlsx'), codebookName: null, codebookBytes: null, sheet: null });
    expect(workbook.source).toMatchObject({ format: 'xlsx', sheet: 'responses', codebookName: null, codebookFrom: 'sheet' });
    expect(workbook.codebook?.entries.length).toBe(csv.codebook?.entries.length);
    const both = await readWave(demoFiles({ fileName: 'library-pilot-1.xlsx', bytes: bytes('fixtures/demo/library-pilot-1.xlsx') }));
    expect(both.source.codebookFrom).toBe('file');
    expect(both.warnings.map((warning) => warning.code)).toContain('codebook-sheet-not-used');
  });

  it('passes refusals through and lets the caller turn other faults into its own error', async () => {
    await expect(readWave(demoFiles({ bytes: new Uint8Array(0) }))).rejects.toMatchObject({ status: 422, code: 'empty-file' });
    // A codebook step that throws something other than a refusal (here: bytes that are not a Uint8Array).
    const broken = demoFiles({ codebookBytes: 'not bytes' as unknown as Uint8Array });
    const marker = new Error('turned by the caller');
    let seen: string | null = null;
    const outcome = await readWave(broken, {}, { unexpected: (fileName) => ((seen = fileName), marker) }).catch((error: unknown) => error);
    expect(outcome).toBe(marker);
    expect(seen).toBe('library-codebook.csv');
    // Without the option the fault passes through unchanged (the command line reports it as an internal fault).
    await expect(readWave(broken)).rejects.toThrow(TypeError);
  });
});

describe('acceptWave (an upload: a setup sent back with chosen exclusions)', () => {
  it('builds exactly what buildWave builds under the checked setup, and screens it', async () => {
    const read = await readWave(demoFiles());
    const proposal = proposeSetup(read.table, read.codebook);
    const sentBack = JSON.parse(JSON.stringify({ columns: proposal.columns })); // as the setup form sends it
    const accepted = acceptWave(read.table, { setup: sentBack, exclusions: [5, 2, 5] });
    const direct = buildWave(read.table, validateSetup(read.table, sentBack), [2, 5]);
    expect(accepted.wave).toEqual(direct);
    expect(accepted.wave.excluded).toEqual([2, 5]);
    expect(accepted.screening).toEqual(screenRespondents(direct));
    expect(accepted.setup.columns.every((column) => !('reason' in column))).toBe(true); // the checked setup, not the proposal
  });

  it('refuses an invalid setup and exclusions that are not rows, with 400', async () => {
    const read = await readWave(demoFiles());
    expect(refusal(() => acceptWave(read.table, { setup: { columns: 'all' } })).code).toBe('invalid-setup');
    const setup = { columns: proposeSetup(read.table, read.codebook).columns };
    expect(refusal(() => acceptWave(read.table, { setup, exclusions: [400] })).code).toBe('invalid-exclusions'); // rows are 0..399
    expect(() => acceptWave(read.table, { setup, screening: { speederShare: 2 } })).toThrow(RangeError);
  });
});

describe('acceptProposal (the command line and the demo seed: the proposal as it stands)', () => {
  it('leaves out the respondents screening proposes, as building with those exclusions does', async () => {
    const read: ReadWave = await readWave(demoFiles());
    const accepted = acceptProposal(read);
    expect(accepted.wave.items).toHaveLength(41); // fixtures/demo/README.md: 41 item columns
    expect(accepted.wave.excluded).toEqual([...accepted.screening.proposedExclusions]);
    // fixtures/demo/README.md: 6 straightliners and 8 speeders are planted; screening flags at least those rows.
    const ids = accepted.wave.excluded.map((row) => accepted.wave.respondentIds?.[row]);
    expect(ids).toEqual(expect.arrayContaining(['270048', '270142', '270172', '270183', '270205', '270266', '270132', '270187', '270233', '270237', '270346', '270355', '270357', '270368']));
    const direct = buildWave(read.table, validateSetup(read.table, accepted.proposal), accepted.screening.proposedExclusions);
    expect(accepted.wave).toEqual(direct); // one build plus applyExclusions = a build with the exclusions
    const keepAll = acceptProposal(read, { keepAll: true });
    expect(keepAll.wave.excluded).toEqual([]);
    expect(keepAll.screening).toEqual(accepted.screening);
  });

  it('sets another column as the outcome when asked, and refuses one that is not a column', async () => {
    const read = await readWave(demoFiles());
    const accepted = acceptProposal(read, { outcome: 'coll_1' });
    expect(accepted.wave.items.map((entry) => entry.id)).not.toContain('coll_1');
    expect(accepted.wave.outcomes.map((outcome) => outcome.id)).toEqual(['coll_1', 'overall_sat']); // file order; overall_sat: fixtures/demo/README.md
    const wrong = refusal(() => acceptProposal(read, { outcome: 'nope' }));
    expect([wrong.status, wrong.code]).toEqual([400, 'unknown-outcome']);
    expect(wrong.message).toMatch(/"nope" is not a column of library-pilot-1\.csv/);
  });
});

describe('applyExclusions on a stored matrix (no original file)', () => {
  // A, B identical; C constant but for row 2; D varies. Hand-made, so the expected warnings are read off the cells.
  const csv = 'A,B,C,D\n1,1,3,1\n2,2,3,2\n3,3,4,3\n4,4,3,5\n5,5,3,4\n';

  it('gives the exclusions and warnings a build with those exclusions gives, in the same order', async () => {
    const read = await readWave({ fileName: 'w.csv', bytes: text(csv), codebookName: null, codebookBytes: null, sheet: null });
    const setup = validateSetup(read.table, { columns: ['A', 'B', 'C', 'D'].map((name) => ({ column: name, role: 'item', item: item(name) })) });
    const everyone = buildWave(read.table, setup);
    // What the database keeps: the matrix blob, the items (id, header) and the build warnings.
    const stored = { matrix: decodeMatrix(encodeMatrix(everyone.matrix)), items: everyone.items.map(({ id, header }) => ({ id, header })), warnings: everyone.warnings };
    for (const exclusions of [[], [2], [2, 0, 1], [0, 1, 3, 4], [4, 2, 2]]) {
      const built = buildWave(read.table, setup, exclusions);
      const changed = applyExclusions(stored, exclusions);
      expect(changed.excluded, JSON.stringify(exclusions)).toEqual(built.excluded);
      expect(changed.warnings, JSON.stringify(exclusions)).toEqual(built.warnings);
    }
    const codes = (exclusions: number[]) => applyExclusions(stored, exclusions).warnings.map((warning) => warning.code);
    expect(codes([])).toEqual(['identical-items']);
    // Leaving out row 2 (0-based) makes C constant: constant-item goes before identical-items, as buildWave writes it.
    expect(codes([2])).toEqual(['constant-item', 'identical-items']);
    // Two respondents left for four items; MIN_RESPONDENTS_FOR_AUDIT is 3 (ingest-thresholds.ts).
    expect(codes([0, 1, 3])).toEqual(['identical-items', 'more-items-than-respondents', 'too-few-respondents']);
  });

  it('refuses rows outside the stored matrix and a matrix that does not fit its items', () => {
    const matrix = { rows: 3, columns: 1, data: Float64Array.from([1, 2, 3]) };
    const items = [{ id: 'A', header: 'A' }];
    expect(refusal(() => applyExclusions({ matrix, items, warnings: [] }, [3])).code).toBe('invalid-exclusions');
    expect(refusal(() => applyExclusions({ matrix, items, warnings: [] }, ['1'])).code).toBe('invalid-exclusions');
    expect(() => applyExclusions({ matrix, items: [], warnings: [] }, [])).toThrow(RangeError);
  });
});
