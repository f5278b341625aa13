import { describe, expect, it } from 'vitest';
import { computeEvidence } from '../../src/lib/engine/compute-evidence';
import { runEngine } from '../../src/lib/engine/run-engine';
import { simulateCut } from '../../src/lib/engine/simulate-cut';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import { demoWave } from '../../src/lib/synth/demo';
import { reasonSentence } from '../../src/lib/words';

// The demo wave plants (src/lib/synth/demo.ts): coll_2/coll_7, space_1/space_6, the triple
// dig_1/dig_4/dig_7, the reverse-worded twin staff_6 of staff_2, the exact copy events_3b of
// events_3 and the constant item hours_7.
const PLANTED = [['coll_2', 'coll_7'], ['dig_1', 'dig_4', 'dig_7'], ['events_3', 'events_3b'], ['space_1', 'space_6'], ['staff_2', 'staff_6']];

async function demoRun(settings = {}, locked: string[] = []) {
  const { matrix, items } = engineInputFromSyntheticWave(demoWave(), locked);
  const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
  const result = await runEngine(evidence, matrix, items, { bootstrap: 0, ...settings });
  return { matrix, items, evidence, result };
}

describe('runEngine', () => {
  it('recommends on exactly the planted clusters of the demo wave, in the audit JSON shape', async () => {
    const { result } = await demoRun();
    // Besides the planted clusters: space_2/space_7 ("The reading areas are clean and tidy" / "The
    // toilets are clean and well kept"), not planted, flagged by local dependence (modification index
    // 17.5 against its scale's critical 16.5, expected residual correlation .26): a chance doublet of
    // the generated answers that the polychoric audit already flagged (docs/decisions/010, 015).
    const expected = [...PLANTED, ['space_2', 'space_7']].sort();
    expect(result.recommendations.map((recommendation) => [...recommendation.cluster].sort()).sort()).toEqual(expected);
    expect(result.clusters).toHaveLength(expected.length);
    expect(result.recommendations.find((recommendation) => recommendation.cluster.includes('space_7'))?.because.code).toBe('local-dependence');
    for (const recommendation of result.recommendations) {
      expect(Object.keys(recommendation)).toEqual(expect.arrayContaining(['cluster', 'keep', 'actions', 'evidence', 'stability', 'because', 'cautions']));
      expect(Object.keys(recommendation.evidence)).toEqual(expect.arrayContaining(['maxR', 'conditionIndex', 'vifBefore', 'vifAfter']));
      for (const action of recommendation.actions) expect(['drop', 'merge', 'reword', 'keep']).toContain(action.action);
      expect(reasonSentence(recommendation.because)).toMatch(/^[^;]+;.*\.$/);
      expect(recommendation.because.keep).toBe(recommendation.keep);
    }
    const copy = result.recommendations.find((recommendation) => recommendation.cluster.includes('events_3b'))!;
    expect(copy.actions[0]).toMatchObject({ action: 'merge' }); // an exact copy: r = 1 and identical wording
    expect(copy.evidence.vifBefore).toBeNull(); // infinite VIF (exact dependency), with a warning in the evidence
    expect(Object.keys(result.afterCut)).toEqual(expect.arrayContaining(['maxVif', 'conditionNumber', 'scales', 'itemsRemoved', 'minutesSaved']));
    const text = JSON.stringify(result);
    expect(text).not.toMatch(/NaN|Infinity/);
    // Every recommendation says which evidence fired; every flagged pair carries all its figures (audit-json.md `pairs`).
    for (const recommendation of result.recommendations) expect(recommendation.evidence.rules.length).toBeGreaterThan(0);
    expect(result.pairs.length).toBeGreaterThan(0);
    for (const pair of result.pairs) {
      expect(Object.keys(pair)).toEqual(expect.arrayContaining(['items', 'r', 'lower', 'upper', 'n', 'residual', 'residualCritical', 'mi', 'miCritical', 'sepc', 'wto', 'partial', 'wording', 'rules']));
      expect((pair.rules ?? []).length).toBeGreaterThan(0);
    }
    const twin = result.pairs.find((pair) => pair.items.includes('coll_2') && pair.items.includes('coll_7'))!;
    // A near-copy (r .93) is set aside from its scale's modification-index model (docs/decisions/022):
    // the strong-pair rule links it; its residual, above the critical value, stays among the figures.
    expect(twin.rules).toEqual(['strong-pair']);
    expect(twin.residual).toBeGreaterThan(twin.residualCritical!);
    const doublet = result.pairs.find((pair) => pair.items.includes('space_2') && pair.items.includes('space_7'))!;
    expect(doublet.rules).toContain('local-dependence-mi');
    expect(doublet.mi).toBeGreaterThan(doublet.miCritical!);
    expect(doublet.sepc).toBeGreaterThanOrEqual(0.2);
  });

  it('reports the what-if of exactly the proposed drops and merges, at 8 seconds an item', async () => {
    const { matrix, evidence, result } = await demoRun();
    const cut = result.recommendations.flatMap((recommendation) => recommendation.actions.filter((action) => action.action === 'drop' || action.action === 'merge').map((action) => action.item));
    expect([...result.afterCut.removed].sort()).toEqual([...cut].sort());
    expect(result.afterCut.itemsRemoved).toBe(cut.length);
    expect(result.afterCut.minutesSaved).toBeCloseTo((cut.length * 8) / 60, 14); // house figure: 8 s per rating item
    expect(result.afterCut).toEqual(simulateCut(evidence, matrix, result.afterCut.removed, { secondsPerItem: 8 }));
    expect(result.settings.secondsPerItem).toBe(8);
  });

  it('never touches a locked item', async () => {
    const { result } = await demoRun({}, ['coll_7', 'events_3b', 'dig_1', 'dig_4', 'dig_7']);
    for (const id of ['coll_7', 'events_3b', 'dig_1', 'dig_4', 'dig_7']) expect(result.afterCut.removed).not.toContain(id);
    const dig = result.recommendations.find((recommendation) => recommendation.cluster.includes('dig_1'))!;
    expect(dig.actions.every((action) => action.action === 'keep' && action.blockedBy.includes('locked'))).toBe(true);
  });

  it('fills stability beside each recommendation when the bootstrap runs, and reports progress', async () => {
    const stages = new Set<string>();
    const { matrix, items, evidence } = await demoRun();
    const frozen = Object.freeze(items.map((item) => Object.freeze({ ...item })));
    const before = Float64Array.from(matrix.data);
    const result = await runEngine(evidence, matrix, frozen, { bootstrap: 20, seed: 3 }, (stage) => stages.add(stage));
    expect(matrix.data).toEqual(before);
    expect([...stages]).toEqual(['clusters', 'recommendations', 'what-if', 'bootstrap']);
    for (const recommendation of result.recommendations) {
      expect(recommendation.stability).toBeGreaterThanOrEqual(0);
      expect(recommendation.stability).toBeLessThanOrEqual(1);
      expect(recommendation.unstable).toBe(recommendation.stability! < 0.7);
      if (recommendation.unstable) expect(['unstable', 'unstable-choice']).toContain(recommendation.cautions.at(-1)!.code);
      else expect(recommendation.cautions.map((caution) => caution.code)).toEqual(['overlap-not-proof', 'small-sample', 'validated-instrument']);
    }
    const copy = result.recommendations.find((recommendation) => recommendation.cluster.includes('events_3b'))!;
    expect(copy.overlapStability).toBe(1); // an exact copy is found in every resample
  });

  it('says when the bootstrap is off', async () => {
    const { result } = await demoRun();
    expect(result.recommendations.every((recommendation) => recommendation.stability === null)).toBe(true);
    expect(result.warnings.map((warning) => warning.code)).toContain('bootstrap-off');
  });

  it('refuses evidence computed with other settings, or other items', async () => {
    const { matrix, items, evidence } = await demoRun();
    await expect(runEngine(evidence, matrix, items, { missing: 'listwise' })).rejects.toThrow(/runEngine: the evidence was computed with pearson\/pairwise/);
    await expect(runEngine(evidence, matrix, [...items].reverse(), {})).rejects.toThrow(/items must be the evidence items/);
    await expect(runEngine(evidence, matrix, items, { alphaFloor: 2 })).rejects.toThrow(/resolveEngineSettings: alphaFloor/);
  });
});
