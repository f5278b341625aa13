import { describe, expect, it } from 'vitest';
import { MEMO_CELL_TEXTS, SAMPLE_CELLS } from '../../src/lib/ingest/ingest-thresholds';
import { sampleCells } from '../../src/lib/ingest/personal-data';
import { columnData, columnsLeftOut, headerWords, parseNumber, proposeSetup, readCodebook, readTable, WaveRefusal, type ColumnProposal, type ProposedSetup } from '../../src/lib/ingest';

const table = (csv: string, name = 'w.csv') => readTable(new TextEncoder().encode(csv), name);
const column = (setup: ProposedSetup, name: string): ColumnProposal => {
  const found = setup.columns.find((proposal) => proposal.column === name);
  if (!found) throw new Error(`no column ${name}`);
  return found;
};
const codes = (setup: ProposedSetup) => setup.warnings.map((warning) => warning.code);

describe('headerWords', () => {
  it('splits camel case and separators into lower-case words', () => {
    expect(headerWords('ResponseId')).toBe('response id');
    expect(headerWords('time_taken (secs)')).toBe('time taken secs');
  });
});

describe('columnData', () => {
  it('profiles a column: blanks, numbers, whole numbers, distinct texts, range, examples', () => {
    return table('id,Q1\nR1,1\nR2,\nR3,2.5\nR4,x\nR5,1\n').then((read) => {
      const data = columnData(read, 1);
      expect(data.profile).toEqual({ nonBlank: 4, blank: 1, numeric: 3, wholeNumbers: 2, distinct: 3, minimum: 1, maximum: 2.5, examples: ['1', '2.5', 'x'] });
      expect(data.texts).toEqual(['x']);
      expect(() => columnData(read, 2)).toThrow(RangeError);
    });
  });

  it('reads each distinct text once to the results of reading every cell, awkward cells and many distinct texts included', () => {
    // Second opinion: the cell-by-cell profile columnData computed before it remembered texts.
    const cells = ['3', ' 3', '3 ', '\u00a03', '3.0', '', ' ', '\t', '9', '1e0', '-1', 'x', ' x', 'Agree', '4', '2.5', '10', '7', '3',
      ...Array.from({ length: 3 * MEMO_CELL_TEXTS }, (_, k) => (k % 2 === 0 ? `R${k}` : String(k % 4)))];
    const headers = ['q'];
    const rows = cells.map((cell) => [cell]);
    const read = { source: { fileName: 'w.csv', format: 'csv' as const, encoding: 'utf-8', delimiter: ',' as const, decimalSeparator: '.' as const, sheet: null, sheets: [] },
      headers, originalHeaders: headers, rows, fileRows: rows.map((_, i) => i + 2), warnings: [], codebookTable: null };
    const filled = cells.map((cell) => cell.trim()).filter((text) => text !== '');
    const numbers = filled.map((text) => parseNumber(text, '.')).filter((value) => !Number.isNaN(value));
    const distinct = [...new Set(filled)];
    const data = columnData(read, 0);
    expect(data.cells).toEqual(cells);
    expect(data.filled).toEqual(filled);
    expect(data.numbers).toEqual(numbers);
    expect(data.distinctNumbers).toEqual([...new Set(numbers)]);
    expect(filled.length).toBeGreaterThan(SAMPLE_CELLS);
    expect(data.filledSample).toEqual(sampleCells(filled));
    expect(data.filledSample.length).toBe(SAMPLE_CELLS);
    expect(data.texts).toEqual(distinct.filter((text) => Number.isNaN(parseNumber(text, '.'))));
    expect(data.profile).toEqual({
      nonBlank: filled.length, blank: cells.length - filled.length, numeric: numbers.length, wholeNumbers: numbers.filter(Number.isInteger).length,
      distinct: distinct.length, minimum: Math.min(...numbers), maximum: Math.max(...numbers), examples: distinct.slice(0, 5),
    });
  });
});

describe('columnData of a column without blanks', () => {
  it('takes the same sample of the filled cells as sampleCells, by position', () => {
    // Second opinion: sampleCells over the trimmed cells (every cell is filled here).
    const cells = Array.from({ length: 5 * SAMPLE_CELLS + 3 }, (_, k) => (k % 7 === 0 ? ` ${k % 5} ` : String(k % 11)));
    const headers = ['q'];
    const rows = cells.map((cell) => [cell]);
    const read = { source: { fileName: 'w.csv', format: 'csv' as const, encoding: 'utf-8', delimiter: ',' as const, decimalSeparator: '.' as const, sheet: null, sheets: [] },
      headers, originalHeaders: headers, rows, fileRows: rows.map((_, i) => i + 2), warnings: [], codebookTable: null };
    const data = columnData(read, 0);
    expect(data.profile.blank).toBe(0);
    expect(data.filledSample).toEqual(sampleCells(cells.map((cell) => cell.trim())));
    expect(data.filledSample.length).toBe(SAMPLE_CELLS);
  });
});

describe('proposeSetup', () => {
  it('gives every column a role and a reason: id, duration, weight, outcome, items, ignore', async () => {
    const setup = proposeSetup(await table([
      'ResponseId,StartDate,Duration (in seconds),weight,Q1,Q2,Q3_r,overall_satisfaction,comments',
      'R_1,2027-03-01 10:00,412,1.2,1,2,5,7,The reading room could open earlier on weekdays',
      'R_2,2027-03-01 10:05,388,0.8,2,3,4,9,',
      'R_3,2027-03-01 10:09,95,1.0,4,4,2,4,Friendly staff and a good choice of new books',
      'R_4,2027-03-01 11:30,640,1.1,5,4,1,8,',
    ].join('\n')));
    expect(setup.respondents).toBe(4);
    expect(setup.columns.map((proposal) => [proposal.column, proposal.role])).toEqual([
      ['ResponseId', 'respondent-id'], ['StartDate', 'ignore'], ['Duration (in seconds)', 'duration'], ['weight', 'weight'],
      ['Q1', 'item'], ['Q2', 'item'], ['Q3_r', 'item'], ['overall_satisfaction', 'outcome'], ['comments', 'ignore'],
    ]);
    for (const proposal of setup.columns) expect(proposal.reason.length, proposal.column).toBeGreaterThan(10);
    expect(column(setup, 'comments').reason).toMatch(/looks like personal data/i);
    expect(column(setup, 'Q3_r').item).toMatchObject({ reverse: true, min: 1, max: 5 });
    // Q2 answers run 2..4 only: widened to the 1..5 most items share.
    expect(column(setup, 'Q2').item).toMatchObject({ min: 1, max: 5 });
    expect(column(setup, 'Q1').counts).toEqual({ answered: 4, blank: 0, declaredMissing: 0, outOfRange: 0, nonNumeric: 0, unmappedLabel: 0, mappedLabel: 0 });
    expect(codes(setup)).toEqual(['personal-data-ignored']);
  });

  it('takes scale, reverse, range, missing codes, text and labels from the codebook and guesses the rest', async () => {
    const data = await table('id,A1,A2,B1\nR1,1,Often,3\nR2,9,Never,2\nR3,3,Always,1\n');
    const codebook = readCodebook(await table('item,scale,reverse,min,max,missing,text,labels\nA1,alpha,yes,1,5,9,First,\nA2,alpha,,,,,Second,1=Never; 2=Sometimes; 3=Always; 4=Often\nZ9,zeta,no,1,5,,Gone,\n'));
    const setup = proposeSetup(data, codebook);
    expect(column(setup, 'A1').item).toEqual({ id: 'A1', scale: 'alpha', reverse: true, min: 1, max: 5, missingCodes: [9], text: 'First', labels: [], missingLabels: [], type: 'rating' });
    expect(column(setup, 'A2').item).toMatchObject({ min: 1, max: 4, labels: [{ code: 1, label: 'Never' }, { code: 2, label: 'Sometimes' }, { code: 3, label: 'Always' }, { code: 4, label: 'Often' }] });
    expect(column(setup, 'A2').labelSource).toBe('codebook');
    expect(column(setup, 'A2').counts?.mappedLabel).toBe(3);
    expect(column(setup, 'B1').reason).toMatch(/rating item/);
    expect(setup.warnings.filter((warning) => warning.code === 'codebook-item-not-in-data').map((warning) => warning.columns)).toEqual([['Z9']]);
  });

  it('maps label answers through the built-in scale most label columns share, and flags them for confirmation', async () => {
    const setup = proposeSetup(await table('id,P,Q\nR1,Agree,Strongly agree\nR2,Disagree,Neither agree nor disagree\nR3,Agree,Agree\nR4,Strongly disagree,Disagree\n'));
    // P alone would fit the 4-point scale; Q needs the 5-point one, which covers both.
    expect(column(setup, 'P').answerScale).toBe('agreement-5');
    expect(column(setup, 'P').item).toMatchObject({ min: 1, max: 5 });
    expect(column(setup, 'P').labelSource).toBe('answer-scale');
    expect(codes(setup)).toEqual(['labels-mapped-by-guess']);
  });

  it('does not use text it cannot map: flags it as unmapped', async () => {
    const setup = proposeSetup(await table('id,colour,Q1\nR1,red,1\nR2,blue,2\nR3,red,3\n'));
    expect(column(setup, 'colour').role).toBe('ignore');
    expect(codes(setup)).toEqual(['labels-unmapped']);
  });

  it('guesses missing codes beyond the range and applies codes most items share (8, 9 after a 1..7 item)', async () => {
    const rows = ['id,A,B,C'];
    const a = [1, 2, 3, 4, 5, 8, 9, 3];
    const c = [1, 2, 3, 4, 5, 6, 7, 8, 9];
    for (let i = 0; i < 9; i++) rows.push(`R${i},${a[i % a.length]},${a[(i + 3) % a.length]},${c[i]}`);
    const setup = proposeSetup(await table(`${rows.join('\n')}\n`));
    expect(column(setup, 'A').item).toMatchObject({ min: 1, max: 5, missingCodes: [8, 9] });
    expect(column(setup, 'C').item).toMatchObject({ min: 1, max: 7, missingCodes: [8, 9] });
    expect(codes(setup)).toEqual(['missing-codes-guessed']);
  });

  it('assumes a range for a constant item and says so; ignores a column too wide for a rating', async () => {
    const setup = proposeSetup(await table('id,K,Q1,Q2,count\nR1,3,1,2,140\nR2,3,5,4,12\nR3,3,2,3,77\n'));
    expect(column(setup, 'K').item).toMatchObject({ min: 1, max: 5 });
    expect(column(setup, 'count').role).toBe('ignore');
    expect(codes(setup)).toEqual(['range-assumed']);
  });

  it('never proposes personal data as an item, even when the codebook lists it', async () => {
    const data = await table('id,contact,Q1\nR1,a@example.org,1\nR2,b@example.org,2\n');
    const setup = proposeSetup(data, readCodebook(await table('item,min,max\ncontact,1,5\nQ1,1,5\n')));
    expect(column(setup, 'contact').role).toBe('ignore');
    // The codebook's word is overruled only for values that can never be stored, and loudly.
    expect(codes(setup)).toEqual(['personal-data-ignored', 'codebook-item-personal-data']);
    expect(setup.warnings[1].columns).toEqual(['contact']);
  });

  it('reads decimal scores with 7+ digits as numbers, never as phone numbers, and the codebook wins', async () => {
    // Scale scores as R's write.csv writes them (15 significant digits) and as SPSS writes them (7 decimals).
    const data = await table('id,S1,S2,S3\nR1,3.3333333,2.66666666666667,1\nR2,4.1666667,3.33333333333333,2\nR3,2.8333333,4,3\nR4,1.5,1.16666666666667,4\n');
    const guessed = proposeSetup(data);
    expect(column(guessed, 'S1').reason).not.toMatch(/personal data/i);
    expect(column(guessed, 'S1').role).toBe('ignore'); // decimals: not a rating item by guess
    const codebook = readCodebook(await table('item,scale\nS1,a\nS2,a\nS3,a\n'));
    const setup = proposeSetup(data, codebook);
    expect(setup.columns.filter((c) => c.role === 'item').map((c) => c.column)).toEqual(['S1', 'S2', 'S3']);
    // Range from every answer, decimals included (1.5..4.1666667 for S1).
    expect(column(setup, 'S1').item).toMatchObject({ min: 1.5, max: 4.1666667 });
    expect(column(setup, 'S1').counts?.answered).toBe(4);
    expect(codes(setup)).not.toContain('personal-data-ignored');
  });

  it('proposes the item type: 0/1 dichotomous, wider ranges rating, the codebook type column wins', async () => {
    const data = await table('id,T1,T2,T3,R1\nA,0,1,1,4\nB,1,1,0,2\nC,1,0,1,5\nD,0,0,0,1\n');
    const guessed = proposeSetup(data);
    expect(['T1', 'T2', 'T3', 'R1'].map((name) => column(guessed, name).item?.type)).toEqual(['dichotomous', 'dichotomous', 'dichotomous', 'rating']);
    const codebook = readCodebook(await table('item,type\nT1,scored\nT2,Test\nT3,\nR1,Likert\n'));
    const setup = proposeSetup(data, codebook);
    expect(['T1', 'T2', 'T3', 'R1'].map((name) => column(setup, name).item?.type)).toEqual(['scored', 'scored', 'dichotomous', 'rating']);
  });

  it('names every column left out with its reason', async () => {
    const data = await table('id,email,notes,Q1,Q2\nR1,a@example.org,x,1,2\nR2,b@example.org,y,2,3\nR3,c@example.org,z,3,1\n');
    const proposal = proposeSetup(data);
    const left = columnsLeftOut(proposal);
    expect(left.map((entry) => entry.column)).toEqual(['email', 'notes']);
    expect(left[0].reason).toMatch(/personal data/);
    const confirmed = { columns: proposal.columns.map((c) => (c.column === 'Q2' ? { ...c, role: 'ignore' as const } : c)) };
    expect(columnsLeftOut(proposal, confirmed).map((entry) => [entry.column, entry.reason])).toContainEqual(['Q2', 'The confirmed setup sets it to ignore.']);
  });

  it('refuses a table without respondents (422) and warns when nothing looks like an item', async () => {
    try {
      proposeSetup(await table('id,Q1\n'));
      throw new Error('expected a refusal');
    } catch (error) {
      expect(error).toBeInstanceOf(WaveRefusal);
      expect((error as WaveRefusal).code).toBe('no-respondents');
    }
    expect(codes(proposeSetup(await table('id,score\nR1,10.5\nR2,3.25\n')))).toEqual(['no-items-proposed']);
  });
});
