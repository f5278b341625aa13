import { describe, expect, it } from 'vitest';
import { computeEvidence, scaleAlphaOracle } from '../../src/lib/engine/compute-evidence';
import { warningsFromNotices } from '../../src/lib/engine/notice-warnings';
import { engineReference as ref, referenceInput, type PolicyReference } from './engine-fixture';
import type { EngineItem } from '../../src/lib/engine/types';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { smoothCorrelationMatrix } from '../../src/lib/stats/smooth-correlation-matrix';
import type { ItemMatrix } from '../../src/lib/stats/types';

// Every expected value below comes from R 4.2.2 (psych 2.2.9) via
// scripts/reference/engine-evidence.R -> fixtures/reference/engine-evidence.json.

function checkPolicy(policy: 'pairwise' | 'listwise', expected: PolicyReference): void {
  const { matrix, items } = referenceInput();
  const before = Float64Array.from(matrix.data);
  const frozenItems = Object.freeze(items.map((item) => Object.freeze({ ...item })));
  const evidence = computeEvidence(matrix, frozenItems, { method: 'pearson', missing: policy });
  expect(matrix.data).toEqual(before);

  const ids = evidence.usable.map((index) => items[index].id);
  expect(ids).toEqual(expected.items); // R: setdiff(colnames(X), "K1"), items[] order kept
  const order = evidence.correlation.order;
  expected.correlation.forEach((row, i) =>
    row.forEach((value, j) => {
      expect(evidence.correlation.data[i * order + j]).toBeCloseTo(value, 12); // R: cor(x, use = ...)
      expect(evidence.pairN.data[i * order + j]).toBe(policy === 'pairwise' ? expected.pairN[i][j] : expected.pairN[0][0]); // R: crossprod(!is.na(x))
    }),
  );
  evidence.usable.forEach((index, k) => expect(evidence.vif[index]).toBeCloseTo(expected.vif[k], 10)); // R: diag(solve(R))
  expect(evidence.vif[items.findIndex((item) => item.id === 'K1')]).toBeNull();
  evidence.usable.forEach((index, k) => expect(evidence.tolerance[index]! * expected.vif[k]).toBeCloseTo(1, 12)); // identity: tolerance = 1 / VIF
  expected.eigenvalues.forEach((value, k) => expect(evidence.eigenvalues[k]).toBeCloseTo(value, 10)); // R: eigen(R)$values
  expect(evidence.conditionNumber).toBeCloseTo(expected.conditionNumber, 10); // R: sqrt(max(ev) / min(ev))

  for (const scale of expected.scales) {
    const found = evidence.scales.find((candidate) => candidate.id === scale.id)!;
    expect(found.items.map((index) => items[index].id)).toEqual(scale.items);
    expect(found.alpha).toBeCloseTo(scale.alpha, 12); // R: k/(k-1)(1 - tr C / sum C)
    expect(found.alpha).toBeCloseTo(scale.psychRawAlpha, 12); // R: psych::alpha(C)$total$raw_alpha
    expect(found.omegaTotal).toBeCloseTo(scale.omegaTotal, 5); // R: psych::fa(R, 1, fm = "minres") -> omega total
    scale.items.forEach((id, k) => {
      const index = items.findIndex((item) => item.id === id);
      expect(evidence.itemRest[index]).toBeCloseTo(scale.itemRest[k], 12); // R: item-rest from C
      expect(evidence.alphaIfDeleted[index]).toBeCloseTo(scale.alphaIfDeleted[k], 12); // R: alpha of C without item
    });
  }
  expect(evidence.itemRest[items.findIndex((item) => item.id === 'U1')]).toBeNull(); // no scale
}

describe('computeEvidence', () => {
  it('matches R under pairwise deletion', () => checkPolicy('pairwise', ref.pairwise));
  it('matches R under listwise deletion', () => checkPolicy('listwise', ref.listwise));

  it('matches the R Belsley-Kuh-Welsch computation on the complete rows', () => {
    const { matrix, items } = referenceInput();
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    const diagnostics = evidence.collinearity!;
    expect(diagnostics.rowsUsed).toBe(ref.collinearity.rowsUsed); // R: sum(complete.cases(x))
    expect(diagnostics.columns.map((column) => (column < 0 ? '(intercept)' : items[column].id))).toEqual(['(intercept)', ...ref.pairwise.items]);
    ref.collinearity.conditionIndices.forEach((value, k) => expect(diagnostics.conditionIndices[k]).toBeCloseTo(value, 8)); // R: svd, d_max / d_k
    ref.collinearity.varianceProportions.forEach((row, k) =>
      row.forEach((value, column) => expect(diagnostics.varianceProportions[k][column]).toBeCloseTo(value, 8)), // R: (v^2 / d^2) normalised
    );
  });

  it('gives missing rate and floor / ceiling shares per item in items[] order', () => {
    const { matrix, items } = referenceInput();
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    ref.descriptives.forEach((expected, j) => {
      expect(evidence.descriptives[j].n).toBe(expected.n); // R: sum(!is.na(x))
      expect(evidence.descriptives[j].missingRate).toBeCloseTo(expected.missingRate, 14); // R: mean(is.na(x))
      expect(evidence.descriptives[j].floor).toBeCloseTo(expected.floor, 14); // R: mean(x == 1)
      expect(evidence.descriptives[j].ceiling).toBeCloseTo(expected.ceiling, 14); // R: mean(x == 5)
    });
  });

  it('leaves the constant item out with a warning naming it, and never returns NaN', () => {
    const { matrix, items } = referenceInput();
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    expect(evidence.usable).not.toContain(9);
    expect(evidence.warnings.some((warning) => warning.code === 'constant-item' && warning.items.includes('K1'))).toBe(true);
    const text = JSON.stringify(evidence, (_, value) => (value instanceof Float64Array ? Array.from(value) : value));
    expect(text).not.toMatch(/NaN|Infinity/);
    expect(JSON.parse(text).scales.find((scale: { id: string }) => scale.id === 'S2').items).toEqual([5, 6, 7, 8]);
  });

  it('skips omega and alpha if deleted at decision detail and keeps everything else', () => {
    const { matrix, items } = referenceInput();
    const full = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    const light = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' }, { detail: 'decision' });
    expect(light.scales.every((scale) => scale.omegaTotal === null)).toBe(true);
    expect(light.alphaIfDeleted.every((value) => value === null)).toBe(true);
    expect(light.vif).toEqual(full.vif);
    expect(light.itemRest).toEqual(full.itemRest);
    light.collinearity!.conditionIndices.forEach((value, k) => expect(value).toBeCloseTo(full.collinearity!.conditionIndices[k] as number, 6)); // same diagnostics by the Gram path
  });

  it('reports its steps in order up to 1, and the same evidence with or without a listener', () => {
    const { matrix, items } = referenceInput();
    const heard: number[] = [];
    const listened = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' }, { onProgress: (fraction) => heard.push(fraction) });
    expect(heard.length).toBeGreaterThanOrEqual(5);
    heard.forEach((fraction, k) => expect(fraction).toBeGreaterThan(k === 0 ? 0 : heard[k - 1]));
    expect(heard.at(-1)).toBe(1);
    const quiet = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    expect(JSON.stringify(listened)).toBe(JSON.stringify(quiet));
  });

  it('refuses items that do not match the matrix', () => {
    const { matrix, items } = referenceInput();
    expect(() => computeEvidence(matrix, items.slice(1), { method: 'pearson', missing: 'pairwise' })).toThrow(/computeEvidence: items must list one entry per matrix column/);
    const twice = items.map((item, j) => (j === 1 ? { ...item, id: items[0].id } : item));
    expect(() => computeEvidence(matrix, twice, { method: 'pearson', missing: 'pairwise' })).toThrow(/appears twice/);
    const badRange = items.map((item, j) => (j === 0 ? { ...item, min: 5, max: 1 } : item));
    expect(() => computeEvidence(matrix, badRange, { method: 'pearson', missing: 'pairwise' })).toThrow(/invalid range/);
  });
});

describe('scaleAlphaOracle', () => {
  it('gives the alpha a fresh audit of the reduced items gives, under both policies', () => {
    for (const policy of ['pairwise', 'listwise'] as const) {
      const { matrix, items } = referenceInput();
      const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: policy });
      const removed = new Set(ref.whatIf[policy].removed.map((id) => items.findIndex((item) => item.id === id)));
      const after = scaleAlphaOracle(evidence, matrix)(removed);
      for (const scale of ref.whatIf[policy].scales) {
        expect(after.get(scale.id)!.alpha).toBeCloseTo(scale.alpha, 12); // R: alpha of the reduced item set, same policy
        expect(after.get(scale.id)!.items).toBe(scale.items);
      }
    }
  });
});

describe('warningsFromNotices', () => {
  it('maps local columns to item ids and names the items of an exact dependency', () => {
    const items = ['Q1', 'Q2', 'Q3'].map((id) => ({ id, scale: null, text: null, locked: false, min: null, max: null }));
    const [warning] = warningsFromNotices([{ code: 'exact-dependency', items: [0, 1], message: 'Items at columns 0, 1 ...' }], items, [1, 2, 0]);
    expect(warning.items).toEqual(['Q2', 'Q3']);
    expect(warning.message).toMatch(/^Q2, Q3 are exactly linearly dependent/);
  });
});

describe('computeEvidence on an indefinite pairwise matrix', () => {
  // Three groups of respondents each answer two of the items A, B, C (and all answer D, E), so
  // each pair's correlation comes from other people: r(A,B) and r(B,C) near +.9 and r(A,C) near
  // -.9 cannot hold together, and the pairwise matrix has a negative eigenvalue.
  function indefiniteWave(): { matrix: ItemMatrix; items: EngineItem[] } {
    const random = createSeededRandom(11);
    const rows = 180;
    const columns = 5;
    const data = new Float64Array(rows * columns).fill(Number.NaN);
    const put = (i: number, j: number, value: number) => (data[j * rows + i] = Math.min(5, Math.max(1, Math.round(3 + value))));
    for (let i = 0; i < rows; i++) {
      const f = random.nextNormal();
      const g = random.nextNormal();
      const group = i % 3;
      const [first, second, sign] = group === 0 ? [0, 1, 1] : group === 1 ? [1, 2, 1] : [0, 2, -1];
      put(i, first, f + 0.3 * random.nextNormal());
      put(i, second, sign * f + 0.3 * random.nextNormal());
      put(i, 3, g + 0.6 * random.nextNormal());
      put(i, 4, g + 0.6 * random.nextNormal());
    }
    const items: EngineItem[] = ['A', 'B', 'C', 'D', 'E'].map((id, j) => ({ id, scale: j < 3 ? 'S1' : 'S2', text: `Item ${id}`, locked: false, min: 1, max: 5 }));
    return { matrix: { rows, columns, data }, items };
  }

  it('smooths the unrepaired correlations (no Higham projection first) and reports the smoothing alone', () => {
    const { matrix, items } = indefiniteWave();
    const raw = correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise', repair: 'none' });
    expect(raw.indefinite).toBe(true);
    // What the engine did before: the core repaired by Higham's projection, and the engine smoothed the matrix it kept as `unrepaired`.
    const repairedFirst = correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise' });
    expect(repairedFirst.repaired).toBe(true);
    const expected = smoothCorrelationMatrix(repairedFirst.unrepaired!);
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    expect(evidence.repaired).toBe(true);
    expect(Array.from(evidence.correlation.data).every((value, k) => Object.is(value, expected.matrix.data[k]))).toBe(true);
    const codes = evidence.warnings.map((warning) => warning.code);
    expect(codes).toContain('matrix-smoothed');
    expect(codes).not.toContain('matrix-repaired');
    expect(codes).not.toContain('matrix-indefinite');
  });
});

describe('computeEvidence with few complete rows', () => {
  // Eight items, one factor, 300 respondents, and each answer missing with probability .12, so
  // about a third of the respondents answer every item (fewer than half: the EM estimate is wanted).
  function scatteredWave(withCopy: boolean): { matrix: ItemMatrix; items: EngineItem[] } {
    const random = createSeededRandom(23);
    const rows = 300;
    const columns = withCopy ? 9 : 8;
    const data = new Float64Array(rows * columns);
    for (let i = 0; i < rows; i++) {
      const f = random.nextNormal();
      for (let j = 0; j < 8; j++) data[j * rows + i] = Math.min(5, Math.max(1, Math.round(3 + 0.8 * f + 0.7 * random.nextNormal())));
      if (withCopy) data[8 * rows + i] = data[i]; // an exact copy of the first item
      for (let j = 0; j < columns; j++) if (random.next() < 0.12 && !(withCopy && j === 8)) data[j * rows + i] = Number.NaN;
      if (withCopy && Number.isNaN(data[i])) data[8 * rows + i] = Number.NaN;
    }
    const items: EngineItem[] = Array.from({ length: columns }, (_, j) => ({ id: j === 8 ? 'Q1b' : `Q${j + 1}`, scale: 'S', text: `Item ${j + 1}`, locked: false, min: 1, max: 5 }));
    return { matrix: { rows, columns, data }, items };
  }

  it('takes the condition indices from the EM estimate over every respondent, and says so', () => {
    const { matrix, items } = scatteredWave(false);
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    expect(evidence.collinearity!.rowsUsed).toBe(300);
    const codes = evidence.warnings.map((warning) => warning.code);
    expect(codes).toContain('collinearity-from-em');
    expect(codes).not.toContain('collinearity-complete-rows');
  });

  it('says why it keeps to the complete rows when an exact copy makes the EM estimate singular', () => {
    const { matrix, items } = scatteredWave(true);
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    const complete = evidence.collinearity!.rowsUsed;
    expect(complete).toBeGreaterThan(items.length + 1);
    expect(complete).toBeLessThan(150);
    const warning = evidence.warnings.find((candidate) => candidate.code === 'collinearity-complete-rows');
    expect(warning?.message).toContain(`rest on the ${complete} of 300 respondents who answered every item`);
    expect(warning?.message).toContain('exactly linearly dependent');
    expect(evidence.warnings.map((candidate) => candidate.code)).not.toContain('collinearity-from-em');
  });
});
