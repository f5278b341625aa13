import { describe, expect, it } from 'vitest';
import { buildWave, identicalGroups, includedRows, readTable, validateSetup, WaveRefusal, type WaveSetup, type WaveTable } from '../../src/lib/ingest';

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object' && !ArrayBuffer.isView(value)) {
    for (const inner of Object.values(value as object)) deepFreeze(inner);
    Object.freeze(value);
  }
  return value;
}

const csv = [
  'id,mins,wt,A,B,C,Y',
  'R1,5:30,1.5,1,5,2,7',
  'R2,6:00,0.5,2,4,9,8',
  'R3,0:40,1,3,3,3,x',
  'R4,7:10,-1,Agree,,4,10',
].join('\n');

const item = (id: string, extra: object = {}) => ({ id, scale: 'S', reverse: false, min: 1, max: 5, missingCodes: [9], text: null, labels: [], missingLabels: [], ...extra });
const setup: WaveSetup = {
  columns: [
    { column: 'id', role: 'respondent-id', item: null },
    { column: 'mins', role: 'duration', item: null },
    { column: 'wt', role: 'weight', item: null },
    { column: 'A', role: 'item', item: item('A', { labels: [{ code: 4, label: 'Agree' }] }) },
    { column: 'B', role: 'item', item: item('B', { reverse: true }) },
    { column: 'C', role: 'item', item: item('C') },
    { column: 'Y', role: 'outcome', item: null },
  ],
};

async function load(): Promise<WaveTable> {
  return deepFreeze(await readTable(new TextEncoder().encode(csv), 'w.csv'));
}

describe('buildWave', () => {
  it('builds the recoded and raw matrices column-major, with ids, durations, weights and outcomes', async () => {
    const table = await load();
    const wave = buildWave(table, validateSetup(table, deepFreeze(structuredClone(setup))));
    expect(wave.respondents).toBe(4);
    expect(wave.items.map((entry) => entry.id)).toEqual(['A', 'B', 'C']);
    // Column-major (types.ts): item j of respondent i at data[j * rows + i].
    // A: label "Agree" → 4. B reverse-keyed: x' = (1 + 5) − x (methods.md §1). C: 9 is a missing code.
    expect(Array.from(wave.matrix.data)).toEqual([1, 2, 3, 4, /* B */ 1, 2, 3, NaN, /* C */ 2, NaN, 3, 4]);
    expect(Array.from(wave.raw.data)).toEqual([1, 2, 3, 4, /* B */ 5, 4, 3, NaN, /* C */ 2, 9, 3, 4]);
    expect(wave.respondentIds).toEqual(['R1', 'R2', 'R3', 'R4']);
    // 5:30 = 330 s, 6:00 = 360 s, 0:40 = 40 s, 7:10 = 430 s
    expect(Array.from(wave.duration ?? [])).toEqual([330, 360, 40, 430]);
    expect(Array.from(wave.weight ?? [])).toEqual([1.5, 0.5, 1, NaN]);
    expect(wave.outcomes.map((outcome) => [outcome.id, Array.from(outcome.values)])).toEqual([['Y', [7, 8, NaN, 10]]]);
    expect(wave.outcomes[0].counts.nonNumeric).toBe(1);
    expect(wave.items[1].counts).toEqual({ answered: 3, blank: 1, declaredMissing: 0, outOfRange: 0, nonNumeric: 0, unmappedLabel: 0, mappedLabel: 0 });
    expect(wave.items[2].counts.declaredMissing).toBe(1);
    expect(wave.warnings.map((warning) => warning.code)).toEqual(['weight-unreadable']);
    expect(wave.excluded).toEqual([]);
  });

  it('keeps excluded respondents in the wave and leaves them out of the checks audits depend on', async () => {
    const table = await load();
    const wave = buildWave(table, validateSetup(table, setup), Object.freeze([3, 1, 3]));
    expect(wave.excluded).toEqual([1, 3]);
    expect(wave.matrix.rows).toBe(4);
    expect(includedRows(wave)).toEqual([0, 2]);
    expect(wave.warnings.map((warning) => warning.code)).toEqual(['weight-unreadable', 'more-items-than-respondents', 'too-few-respondents']);
  });

  it('counts out-of-range, non-numeric and unmapped cells, and finds constant and identical items', async () => {
    const table = await readTable(new TextEncoder().encode('A,B,C,D,E\n1,1,3,7,x\n2,2,3,2,Maybe\n3,3,3,1,Agree\n'), 'w.csv');
    const wave = buildWave(table, validateSetup(table, {
      columns: ['A', 'B', 'C', 'D'].map((name) => ({ column: name, role: 'item', item: item(name, { missingCodes: [3] }) }))
        .concat([{ column: 'E', role: 'item', item: item('E', { labels: [{ code: 1, label: 'Agree' }] }) }]),
    }));
    expect(wave.warnings.map((warning) => warning.code)).toEqual([
      'out-of-range-values', 'unmapped-labels', 'constant-item', 'identical-items', 'missing-code-inside-range', 'more-items-than-respondents',
    ]);
    expect(wave.warnings.find((warning) => warning.code === 'identical-items')?.message).toMatch(/A = B/);
    expect(wave.warnings.find((warning) => warning.code === 'constant-item')?.columns).toEqual(['C', 'E']);
  });

  it('refuses a table without respondents (422) and exclusions that are not rows (400)', async () => {
    const empty = await readTable(new TextEncoder().encode('A,B\n'), 'w.csv');
    const table = await load();
    const checked = validateSetup(table, setup);
    const cases: [() => unknown, number, string][] = [
      [() => buildWave(empty, validateSetup(empty, { columns: [{ column: 'A', role: 'item', item: item('A') }] })), 422, 'no-respondents'],
    ];
    cases.push([() => buildWave(table, checked, [4]), 400, 'invalid-exclusions']);
    cases.push([() => buildWave(table, checked, [1.5]), 400, 'invalid-exclusions']);
    for (const [run, status, code] of cases) {
      try {
        run();
        throw new Error(`expected ${code}`);
      } catch (error) {
        expect(error).toBeInstanceOf(WaveRefusal);
        expect([(error as WaveRefusal).status, (error as WaveRefusal).code]).toEqual([status, code]);
      }
    }
  });
});

describe('identicalGroups', () => {
  it('groups items with identical values, missing cells included', () => {
    const matrix = { rows: 2, columns: 5, data: Float64Array.from([1, NaN, 2, 3, 1, NaN, 2, 3, 1, 2]) };
    expect(identicalGroups(matrix)).toEqual([[0, 2], [1, 3]]);
  });
});
