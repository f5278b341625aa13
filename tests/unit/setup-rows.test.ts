/**
 * The setup form's rows keep what the proposal knew of an item through the form: its type (the
 * screening rules depend on it) and its content facet (a cut may not empty a facet), and the
 * designer may set or clear the facet (issue 14).
 */
import { describe, expect, it } from 'vitest';
import { rowsFromProposal, setupFromRows } from '../../src/components/upload/setup-rows';
import { proposeSetup, readCodebook, readTable } from '../../src/lib/ingest';

const table = (csv: string, name: string) => readTable(new TextEncoder().encode(csv), name);

describe('setup rows', () => {
  it('carry item type and facet from the proposal to the confirmed setup, and take the designer\'s facet', async () => {
    const codebook = readCodebook(await table('item,scale,type,facet\nQ1,test,scored,algebra\nQ2,test,scored,\nQ3,test,scored,geometry\n', 'codebook.csv'));
    const data = await table('Q1,Q2,Q3\n0,1,1\n1,1,0\n1,0,1\n0,0,1\n1,1,1\n', 'data.csv');
    const rows = rowsFromProposal(proposeSetup(data, codebook).columns);
    expect(rows.map((row) => [row.type, row.facet])).toEqual([['scored', 'algebra'], ['scored', ''], ['scored', 'geometry']]);
    rows[1] = { ...rows[1], facet: ' algebra ' };
    rows[2] = { ...rows[2], facet: '' };
    const setup = setupFromRows(rows);
    expect(setup.ok).toBe(true);
    if (!setup.ok) return;
    expect(setup.columns.map((column) => column.item?.type)).toEqual(['scored', 'scored', 'scored']);
    expect(setup.columns.map((column) => column.item?.facet ?? null)).toEqual(['algebra', 'algebra', null]);
  });
});
