import { describe, expect, it } from 'vitest';
import { parseMissingCodes, parseYesNo, readCodebook, readTable, WaveRefusal } from '../../src/lib/ingest';

const table = (csv: string) => readTable(new TextEncoder().encode(csv), 'codebook.csv');

describe('readCodebook (audit-json.md: item, scale, reverse, min, max, missing, text; plus labels)', () => {
  it('reads every column, with reverse as yes/no and missing codes split by spaces or semicolons', async () => {
    const codebook = readCodebook(await table([
      'item,scale,reverse,min,max,missing,text,labels',
      'Q1,service,no,1,5,8 9,Staff are helpful.,1=Disagree; 5=Agree',
      'Q2,service,Y,1,5,-9;99,Visits frustrate me.,',
      'Q3,,,0,10,,,',
    ].join('\n')));
    expect(codebook.columns).toEqual(['item', 'scale', 'reverse', 'min', 'max', 'missing', 'text', 'labels']);
    expect(codebook.entries).toEqual([
      { item: 'Q1', scale: 'service', reverse: false, min: 1, max: 5, missingCodes: [8, 9], text: 'Staff are helpful.', labels: [{ code: 1, label: 'Disagree' }, { code: 5, label: 'Agree' }] },
      { item: 'Q2', scale: 'service', reverse: true, min: 1, max: 5, missingCodes: [-9, 99], text: 'Visits frustrate me.', labels: null },
      { item: 'Q3', scale: null, reverse: false, min: 0, max: 10, missingCodes: [], text: null, labels: null },
    ]);
    expect(codebook.warnings).toEqual([]);
  });

  it('reads a facet column into the proposed setup and the built wave (issue 14: content coverage)', async () => {
    const { proposeSetup, acceptWave } = await import('../../src/lib/ingest');
    const codebook = readCodebook(await table('item,scale,facet\nQ1,mood,sleep\nQ2,mood,\nQ3,mood,appetite\n'));
    expect(codebook.columns).toEqual(['item', 'scale', 'facet']);
    expect(codebook.entries.map((entry) => entry.facet)).toEqual(['sleep', null, 'appetite']);
    const data = await table('Q1,Q2,Q3\n1,2,3\n2,3,4\n3,4,5\n4,5,1\n5,1,2\n');
    const proposal = proposeSetup(data, codebook);
    expect(proposal.columns.map((column) => column.item?.facet ?? null)).toEqual(['sleep', null, 'appetite']);
    const { wave } = acceptWave(data, { setup: proposal });
    expect(wave.items.map((item) => item.facet ?? null)).toEqual(['sleep', null, 'appetite']);
  });

  it('accepts any subset of columns and common header spellings', async () => {
    const codebook = readCodebook(await table('Variable Name;Reverse-keyed;Question text\nQ1;true;Wording\n'));
    expect(codebook.columns).toEqual(['item', 'reverse', 'text']);
    expect(codebook.entries[0]).toMatchObject({ item: 'Q1', reverse: true, min: null, max: null, missingCodes: null, text: 'Wording' });
  });

  it('warns about cells it cannot read, repeated items and unknown columns, and keeps going', async () => {
    const codebook = readCodebook(await table('item,reverse,min,max,missing,colour\nQ1,maybe,5,1,8 x,red\nQ1,no,1,5,,blue\nQ2,no,low,5,,green\n'));
    expect(codebook.entries.map((entry) => entry.item)).toEqual(['Q1', 'Q2']);
    expect(codebook.entries[0]).toMatchObject({ reverse: null, min: null, max: null, missingCodes: [8] });
    expect(codebook.warnings.map((warning) => warning.code)).toEqual(['codebook-invalid-value', 'codebook-duplicate-item', 'codebook-unknown-column']);
  });

  it('refuses a codebook without an item column or without any item (422)', async () => {
    for (const [csv, code] of [['scale,min\nS,1\n', 'codebook-without-item-column'], ['item,min\n,1\n', 'empty-codebook']]) {
      try {
        readCodebook(await table(csv));
        throw new Error(`expected ${code}`);
      } catch (error) {
        expect(error).toBeInstanceOf(WaveRefusal);
        expect([(error as WaveRefusal).status, (error as WaveRefusal).code]).toEqual([422, code]);
      }
    }
  });
});

describe('parseYesNo and parseMissingCodes', () => {
  it('read yes/no/true/false/1/0/y/n', () => {
    expect(['yes', 'Y', 'TRUE', '1'].map(parseYesNo)).toEqual([true, true, true, true]);
    expect(['no', 'n', 'False', '0', ''].map(parseYesNo)).toEqual([false, false, false, false, false]);
    expect(parseYesNo('perhaps')).toBeNull();
  });

  it('split codes by spaces and semicolons, and by commas only where numbers use a decimal point', () => {
    expect(parseMissingCodes('8; 9 99', '.')).toEqual({ codes: [8, 9, 99], unreadable: [] });
    expect(parseMissingCodes('8, 9', '.')).toEqual({ codes: [8, 9], unreadable: [] });
    expect(parseMissingCodes('8;9,5', ',')).toEqual({ codes: [8, 9.5], unreadable: [] });
  });
});
