/**
 * Issue 14 (real questionnaires), the audit's side: columns left out are named, undefined
 * correlations (planned missingness) never enter as 0, listwise deletion without complete rows
 * ends in one sentence, and core messages name items by id. Data are generated here with a
 * seeded one-factor model (our own generator: loadings .7, normal errors, rounded to 1..5).
 */
import { describe, expect, it } from 'vitest';
import { AuditInputError } from '../../src/lib/audit/audit-input';
import { runAudit, type AuditInput } from '../../src/lib/audit/run-audit';
import { namePositions } from '../../src/lib/engine/notice-warnings';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { itemMatrixFromColumns } from '../../src/lib/stats/types';

function oneFactorItems(rows: number, items: number, seed: number): Float64Array[] {
  const random = createSeededRandom(seed);
  const factor = Array.from({ length: rows }, () => random.nextNormal());
  return Array.from({ length: items }, () =>
    Float64Array.from(factor, (f) => Math.min(5, Math.max(1, Math.round(3 + 0.7 * f + 0.7 * random.nextNormal())))),
  );
}

function inputOf(columns: Float64Array[], ids: string[], extra: Partial<AuditInput> = {}): AuditInput {
  return {
    matrix: itemMatrixFromColumns(columns),
    items: ids.map((id) => ({ id, scale: 'S', text: null, locked: false, min: 1, max: 5, reverse: false })),
    rowsInWave: columns[0].length,
    excluded: 0,
    outcome: null,
    ...extra,
  };
}

describe('planned missingness: two blocks never answered together', () => {
  // Items C1-C4 asked of all 300; A1-A2 only of rows 0-179 (form A), B1-B2 only of rows 180-299 (form B).
  const columns = oneFactorItems(300, 8, 14);
  for (const j of [4, 5]) for (let i = 180; i < 300; i++) columns[j][i] = Number.NaN;
  for (const j of [6, 7]) for (let i = 0; i < 180; i++) columns[j][i] = Number.NaN;
  const ids = ['C1', 'C2', 'C3', 'C4', 'A1', 'A2', 'B1', 'B2'];

  it('leaves the fewest items out of the joint matrix, names them and their partners, and never enters 0', async () => {
    const audit = await runAudit(inputOf(columns, ids), { missing: 'pairwise', bootstrap: 0 });
    const warning = audit.warnings.find((entry) => entry.code === 'correlation-undefined-items-left-out');
    // B1 and B2 (120 answers each) leave rather than A1 and A2 (180 each): the same count, fewer answers.
    expect(warning?.items).toEqual(['B1', 'B2']);
    expect(warning?.message).toMatch(/B1 \(no correlation with A1, A2\)/);
    expect(warning?.message).toMatch(/greedily/);
    expect(audit.correlation.items).toEqual(['C1', 'C2', 'C3', 'C4', 'A1', 'A2']);
    expect(audit.items.find((item) => item.id === 'B1')?.inMatrix).toBe(false);
    expect(audit.warnings.filter((entry) => /are entered as 0/.test(entry.message)).map((entry) => entry.message)).toEqual([]);
    // Every off-diagonal r is a real estimate (generated with loadings .7: all clearly positive).
    for (const row of audit.correlation.matrix) for (const r of row) expect(r).toBeGreaterThan(0.2);
    const vifs = audit.items.flatMap((item) => (item.vif === null ? [] : [item.vif]));
    expect(Math.max(...vifs)).toBeLessThan(5);
  });

  it('listwise deletion with no complete row: one sentence saying to use pairwise, items by id', async () => {
    let caught: unknown = null;
    try {
      await runAudit(inputOf(columns, ids), { missing: 'listwise', bootstrap: 0 });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(AuditInputError);
    const message = (caught as Error).message;
    expect(message).toMatch(/pairwise/);
    expect(message).toMatch(/B1 \(180 of 300 missing\)/);
    expect(message).not.toMatch(/item \d|bartlett|positive integer/i);
    expect(message.split('. ').length).toBe(1);
  });
});

describe('columns left out and the screening rules', () => {
  it('names every column left out in the warnings, with its reason, and echoes the screening rules', async () => {
    const columns = oneFactorItems(120, 4, 3);
    const audit = await runAudit(
      inputOf(columns, ['Q1', 'Q2', 'Q3', 'Q4'], {
        leftOut: [{ column: 'score', reason: 'Numbers with decimals (1.5 to 4.1666667), not a rating item.' }, { column: 'email', reason: 'Looks like personal data (e-mail addresses); it is never used as an item.' }],
        screening: { itemTypes: { rating: 4, scored: 0, dichotomous: 0 }, rules: [{ code: 'long-string', applied: true, items: 4, note: 'Long string: applied to all 4 items (rating grid).' }], proposedExclusions: 0 },
      }),
      { bootstrap: 0 },
    );
    const left = audit.warnings.filter((entry) => entry.code === 'column-left-out');
    expect(left.map((entry) => entry.items[0])).toEqual(['score', 'email']);
    expect(left[0].message).toBe('The column "score" is not in this audit: Numbers with decimals (1.5 to 4.1666667), not a rating item.');
    expect((audit.screening as { rules: { code: string }[] }).rules[0].code).toBe('long-string');
  });
});

describe('namePositions', () => {
  it('turns the core positions into item ids', () => {
    const ids = ['Q01', 'Q02', 'Q03'];
    expect(namePositions('The matrix is singular (item 2 depends on the items before it).', ids)).toBe('The matrix is singular (item Q03 depends on the items before it).');
    expect(namePositions('Predictor 1 is a linear combination', ids)).toBe('Predictor Q02 is a linear combination');
    expect(namePositions('Items at columns 0, 2 correlate with no other item', ids)).toBe('Items Q01, Q03 correlate with no other item');
    expect(namePositions('the intercept, item column 1 hold only zeros', ids)).toBe('the intercept, item Q02 hold only zeros');
  });
});

describe('a scored 0/1 test under polychoric (tetrachoric) correlations: psych::lsat6', async () => {
  // scripts/reference/real-questionnaires.R → fixtures/reference/real-screening.json (the data only)
  const { readFileSync } = await import('node:fs');
  const real = JSON.parse(readFileSync('fixtures/reference/real-screening.json', 'utf8')) as { lsat6: { items: string[]; rows: number[][] } };
  const { itemMatrixFromRows } = await import('../../src/lib/stats/types');
  const { proposedCorrelationMethod } = await import('../../src/lib/audit/audit-input');
  const matrix = itemMatrixFromRows(real.lsat6.rows);
  const items = real.lsat6.items.map((id) => ({ id, scale: 'LSAT6', text: null, locked: false, min: 0, max: 1, reverse: false }));
  const base: AuditInput = { matrix, items, rowsInWave: matrix.rows, excluded: 0, outcome: null };

  it('proposes the tetrachoric correlation for 0/1 items, and warns when Pearson (phi) is used', async () => {
    expect(proposedCorrelationMethod(items).method).toBe('polychoric');
    expect(proposedCorrelationMethod([...items, { min: 1, max: 5 }]).method).toBe('pearson');
    const pearson = await runAudit(base, { method: 'pearson', bootstrap: 0 });
    expect(pearson.warnings.find((entry) => entry.code === 'dichotomous-items-pearson')?.items).toEqual(real.lsat6.items);
    expect((pearson.parallelAnalysis as unknown as { correlation: string }).correlation).toBe('pearson');
  });

  it('runs parallel analysis on polychoric random data, labels alpha and omega, and warns that 1000 is few for tetrachoric', async () => {
    const audit = await runAudit(base, { method: 'polychoric', bootstrap: 0, parallelIterations: 100 });
    const pa = audit.parallelAnalysis as unknown as { correlation: string; iterations: number; note: string; suggested: number };
    expect(pa.correlation).toBe('polychoric');
    expect(pa.iterations).toBe(20); // POLYCHORIC_PARALLEL_DEFAULT_ITERATIONS: fewer draws, said in the note
    expect(pa.note).toMatch(/instead of 100/);
    // psych::fa.parallel(lsat7, cor = 'poly') retains 1 component (real-parallel-poly.json); lsat6 is the same kind of five-item test.
    expect(pa.suggested).toBe(1);
    expect(audit.warnings.some((entry) => entry.code === 'dichotomous-items-pearson')).toBe(false);
    // 1000 respondents < TETRACHORIC_MINIMUM_N? No: 1000 ≥ 400, so no small-sample warning.
    expect(audit.warnings.some((entry) => entry.code === 'polychoric-sample-small')).toBe(false);
    const basis = (audit.scales[0] as unknown as { basis: Record<string, string> }).basis;
    expect(basis.alpha).toMatch(/raw scores/);
    expect(basis.omegaTotal).toMatch(/model-implied omega total.*polychoric/);
  });

  it('warns where a tetrachoric matrix rests on too few respondents', async () => {
    const few = itemMatrixFromRows(real.lsat6.rows.filter((_, i) => i % 10 === 0));
    const audit = await runAudit({ ...base, matrix: few, rowsInWave: few.rows }, { method: 'polychoric', bootstrap: 0 });
    const warning = audit.warnings.find((entry) => entry.code === 'polychoric-sample-small');
    expect(warning?.message).toMatch(/as few as 100 respondents per pair, below the 400 this audit asks of a tetrachoric matrix/);
  });
});

describe('the measurement model per scale, before and after the cut', () => {
  it('fits one factor by ML on Pearson data, and the fit improves once the planted twin is cut', async () => {
    const { oneFactorMl } = await import('../../src/lib/stats/one-factor-ml');
    const columns = oneFactorItems(400, 6, 21);
    const random = createSeededRandom(5);
    // Q6 is Q5 said twice in other words: Q5 plus a little noise (a locally dependent pair).
    columns[5] = Float64Array.from(columns[4], (value) => Math.min(5, Math.max(1, value + (random.next() < 0.1 ? (random.next() < 0.5 ? -1 : 1) : 0))));
    const audit = await runAudit(inputOf(columns, ['Q1', 'Q2', 'Q3', 'Q4', 'Q5', 'Q6']), { missing: 'listwise', bootstrap: 0 });
    const model = (audit.scales[0] as unknown as { model: { estimator: string; n: number; loadings: number[]; fit: { chisq: number; df: number; cfi: number; srmr: number } } }).model;
    expect(model.estimator).toBe('ML');
    expect(model.fit.df).toBe(9);
    // The same figures as the core on the audit's own matrix (the core is checked against lavaan in one-factor-ml.test.ts).
    const direct = oneFactorMl({ order: 6, data: Float64Array.from(audit.correlation.matrix.flat()) }, 400);
    expect(model.fit.chisq).toBeCloseTo(direct.chiSquare, 8);
    model.loadings.forEach((value, k) => expect(value).toBeCloseTo(direct.loadings[k], 8));
    expect(audit.afterCut?.itemsRemoved).toBe(1);
    const after = (audit.afterCut?.scales[0] as unknown as { model: { items: string[]; fit: { cfi: number; srmr: number } } }).model;
    expect(after.items).toHaveLength(5);
    expect(after.fit.cfi).toBeGreaterThan(model.fit.cfi);
    expect(after.fit.srmr).toBeLessThan(model.fit.srmr);
  });

  it('uses minres (SRMR, no chi-square) on polychoric matrices', async () => {
    const audit = await runAudit(inputOf(oneFactorItems(300, 4, 8), ['Q1', 'Q2', 'Q3', 'Q4']), { method: 'polychoric', bootstrap: 0 });
    const model = (audit.scales[0] as unknown as { model: { estimator: string; fit: { chisq: number | null; srmr: number } } }).model;
    expect(model.estimator).toBe('minres');
    expect(model.fit.chisq).toBeNull();
    expect(model.fit.srmr).toBeGreaterThan(0);
  });
});

describe('keying balance', () => {
  it('flags a cut that removes the last reverse-keyed item of a scale', async () => {
    const { keyingBalanceWarnings } = await import('../../src/lib/audit/run-audit');
    const items = ['A1', 'A2', 'A3', 'A4'].map((id, k) => ({ id, scale: 'A', text: null, locked: false, min: 1, max: 5, reverse: k === 3 }));
    const scales = [{ id: 'A', items: [0, 1, 2, 3] }];
    expect(keyingBalanceWarnings(items, scales, new Set(['A2']))).toEqual([]);
    const lost = keyingBalanceWarnings(items, scales, new Set(['A4']));
    expect(lost.map((entry) => [entry.code, entry.items])).toEqual([['keying-balance-lost', ['A4']]]);
    expect(lost[0].message).toMatch(/every reverse-keyed item of scale A \(A4\)/);
  });
});
