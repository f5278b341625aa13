/**
 * The audit assembly: from a wave file to the audit JSON. The statistics themselves are checked
 * against R and NIST in their own test files; here the claims are about the composition: the
 * JSON has the contract's shape, never a NaN, the same numbers as calling the core directly,
 * repeats exactly for the same seed, honours locks, and finds the demo's planted overlaps
 * (planted by our own generator: fixtures/demo/README.md).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { auditInputFromWave, AuditInputError } from '../../src/lib/audit/audit-input';
import { runAudit } from '../../src/lib/audit/run-audit';
import { acceptProposal, readWave } from '../../src/lib/ingest';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { selectItems } from '../../src/lib/stats/types';
import { demoWave } from '../../src/lib/synth/demo';

async function demoBuiltWave() {
  // The one reader and the one accept path, as the seed and the command line use them.
  const read = await readWave({
    fileName: 'library-pilot-1.csv', bytes: new Uint8Array(readFileSync('fixtures/demo/library-pilot-1.csv')),
    codebookName: 'library-codebook.csv', codebookBytes: new Uint8Array(readFileSync('fixtures/demo/library-codebook.csv')), sheet: null,
  });
  return acceptProposal(read).wave;
}

/** Every number in the JSON is finite (JSON.stringify would silently turn NaN into null). */
function nonFinitePaths(value: unknown, path = '$'): string[] {
  if (typeof value === 'number') return Number.isFinite(value) ? [] : [path];
  if (Array.isArray(value)) return value.flatMap((entry, k) => nonFinitePaths(entry, `${path}[${k}]`));
  if (value !== null && typeof value === 'object') return Object.entries(value).flatMap(([key, entry]) => nonFinitePaths(entry, `${path}.${key}`));
  return [];
}

describe('runAudit on the demo wave', async () => {
  const wave = await demoBuiltWave();
  const input = auditInputFromWave(wave, { outcome: 'overall_sat' });
  const audit = await runAudit(input, { bootstrap: 20, seed: 7, outcome: 'overall_sat' });

  it('has the contract shape and no non-finite number anywhere', () => {
    expect(audit.schema).toBe('paredown.audit/1');
    expect(audit.input).toMatchObject({ rows: 400, respondentsUsed: 400 - wave.excluded.length, respondentsExcluded: wave.excluded.length, items: wave.items.length });
    expect(audit.items.map((item) => item.id)).toEqual(wave.items.map((item) => item.id));
    expect(audit.eigenvalues).toHaveLength(audit.correlation.items.length);
    expect(audit.collinearity?.columns[0]).toBe('(intercept)');
    expect(audit.outcomeModel?.coefficients[0].term).toBe('(intercept)');
    expect(nonFinitePaths(audit)).toEqual([]);
  });

  it('reports the same correlation matrix as the core called directly', () => {
    const usable = audit.correlation.items.map((id) => wave.items.findIndex((item) => item.id === id));
    const direct = correlationMatrix(selectItems(input.matrix, usable), { method: 'pearson', missing: 'pairwise' });
    const order = direct.matrix.order;
    for (let a = 0; a < order; a++) for (let b = 0; b < order; b++) expect(audit.correlation.matrix[a][b]).toBeCloseTo(direct.matrix.data[a * order + b], 12);
  });

  it('refits the driver model without the proposed cut, on the same respondents', () => {
    const model = audit.outcomeModel as unknown as { n: number; completeRows: number; afterCut: { removed: string[]; n: number; coefficients: { term: string; seRatio: number | null }[] } };
    expect(model.completeRows).toBe(model.n);
    expect(model.afterCut.removed).toEqual((audit.afterCut?.removed as string[]).filter((id) => audit.correlation.items.includes(id)));
    expect(model.afterCut.n).toBe(model.n);
    // fixtures/demo/README.md: coll_7 is planted as a near-copy of coll_2, so once it is gone
    // coll_2's standard error shrinks the most.
    const ratio = (id: string) => model.afterCut.coefficients.find((c) => c.term === id)?.seRatio ?? Number.NaN;
    expect(ratio('coll_2')).toBeLessThan(0.5);
    expect(ratio('hours_1')).toBeGreaterThan(0.8);
    expect(model.afterCut.coefficients.some((c) => model.afterCut.removed.includes(c.term))).toBe(false);
  });

  it('names the constant item and the exact duplicate instead of producing NaN', () => {
    const codes = audit.warnings.map((w) => `${w.code}:${w.items.join(',')}`);
    expect(codes).toContain('constant-item:hours_7');
    expect(audit.items.find((item) => item.id === 'hours_7')?.inMatrix).toBe(false);
    expect(audit.items.find((item) => item.id === 'events_3b')?.vif).toBeNull();
    expect(audit.kmo).not.toBeNull(); // computed with the copy set aside
    // The outcome model's warning names the copy by its id, not by a column number
    // (fixtures/demo/README.md: events_3b is a planted exact copy of events_3).
    const aliased = audit.warnings.find((w) => w.code === 'aliased-column');
    expect(aliased?.items).toEqual(['events_3b', 'events_3']);
    expect(aliased?.message).toMatch(/^events_3b is an exact linear combination of the intercept and events_3/);
    expect(audit.warnings.some((w) => /Predictor \d/.test(w.message))).toBe(false);
    expect(codes).toContain('set-aside-for-structure:events_3b');
  });

  it('recommends a cut in every planted overlap of the demo', () => {
    const truth = demoWave().truth;
    const planted = [...truth.plantedPairs, ...truth.duplicates];
    for (const [a, b] of planted) {
      const found = audit.recommendations.some((r) => r.cluster.includes(a) && r.cluster.includes(b));
      expect(found, `${a} ~ ${b}`).toBe(true);
    }
    for (const recommendation of audit.recommendations) expect(recommendation.reason.length).toBeGreaterThan(20);
  });

  it('repeats exactly for the same settings and seed', async () => {
    const again = await runAudit(input, { bootstrap: 20, seed: 7, outcome: 'overall_sat' });
    expect(JSON.stringify(again)).toBe(JSON.stringify(audit));
  });

  it('hands out the early cut list once, before the bootstrap: the same lines, stability still null', async () => {
    const early: { resamples: number; recommendations: typeof audit.recommendations }[] = [];
    const stages: string[] = [];
    const again = await runAudit(input, { bootstrap: 20, seed: 7, outcome: 'overall_sat' }, (stage) => stages.push(stage), undefined, undefined, (cutList) => {
      early.push(cutList);
      stages.push('cut-list');
    });
    expect(JSON.stringify(again)).toBe(JSON.stringify(audit));
    expect(early).toHaveLength(1);
    expect(early[0].resamples).toBe(20);
    // Handed out while the engine stage runs, before the outcome stage.
    expect(stages.indexOf('cut-list')).toBeGreaterThan(stages.indexOf('engine'));
    expect(stages.indexOf('cut-list')).toBeLessThan(stages.indexOf('outcome'));
    const lines = (list: typeof audit.recommendations) => list.map(({ cluster, keep, actions, reason }) => ({ cluster, keep, actions, reason }));
    expect(lines(early[0].recommendations)).toEqual(lines(audit.recommendations));
    expect(early[0].recommendations.every((line) => line.stability === null)).toBe(true);
    // Without a bootstrap there is nothing to wait for, and no early list.
    let called = false;
    await runAudit(input, { bootstrap: 0, seed: 7, outcome: 'overall_sat' }, undefined, undefined, undefined, () => (called = true));
    expect(called).toBe(false);
  });

  it("moves the evidence stage's bar through its steps and the network's whole EBIC path, never back", async () => {
    const evidence: number[] = [];
    await runAudit(input, { bootstrap: 0, seed: 7, outcome: 'overall_sat' }, (stage, fraction) => {
      if (stage === 'evidence') evidence.push(fraction);
    });
    // Its own steps, then one call per penalty of the path (100 by default: engine-settings.ts).
    expect(evidence.length).toBeGreaterThan(100);
    evidence.forEach((fraction, k) => expect(fraction).toBeGreaterThanOrEqual(k === 0 ? 0 : evidence[k - 1]));
    expect(evidence.at(-1)).toBeCloseTo(0.2, 12); // the end of the stage's span (run-audit.ts, STAGE_SPAN)
  });

  it('never proposes a locked item for a cut', async () => {
    const lockedIds = audit.recommendations.flatMap((r) => r.actions.filter((a) => a.action !== 'keep').map((a) => a.item));
    expect(lockedIds.length).toBeGreaterThan(0);
    const locked = await runAudit(auditInputFromWave(wave, { locked: lockedIds }), { bootstrap: 0 });
    const cut = locked.recommendations.flatMap((r) => r.actions.filter((a) => a.action !== 'keep').map((a) => a.item));
    for (const id of lockedIds) expect(cut).not.toContain(id);
  });

  it('refuses an outcome or a locked item the wave does not have', () => {
    expect(() => auditInputFromWave(wave, { outcome: 'nope' })).toThrow(AuditInputError);
    expect(() => auditInputFromWave(wave, { locked: ['Q99'] })).toThrow(/not an item of this wave/);
  });
});
