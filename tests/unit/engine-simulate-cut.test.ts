import { describe, expect, it } from 'vitest';
import { computeEvidence } from '../../src/lib/engine/compute-evidence';
import { largestVif, simulateCut } from '../../src/lib/engine/simulate-cut';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import { selectItems } from '../../src/lib/stats/types';
import { generateWave } from '../../src/lib/synth/generate-wave';
import { randomWaveSpec } from '../../src/lib/synth/random-wave-spec';
import type { CorrelationMethod, MissingPolicy } from '../../src/lib/stats/types';
import { demoWaveInput } from './demo-wave-input';
import { engineReference as ref, referenceInput } from './engine-fixture';

describe('simulateCut', () => {
  for (const policy of ['pairwise', 'listwise'] as const) {
    it(`matches R's figures for the reduced item set (${policy})`, () => {
      const { matrix, items } = referenceInput();
      const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: policy });
      const expected = ref.whatIf[policy];
      const removed = Object.freeze([...expected.removed]);
      const after = simulateCut(evidence, matrix, removed, { secondsPerItem: 8 });
      expect(after.maxVif).toBeCloseTo(expected.maxVif, 10); // R: max(diag(solve(R_reduced)))
      expect(after.conditionNumber).toBeCloseTo(expected.conditionNumber, 10); // R: sqrt(max/min eigen(R_reduced))
      for (const scale of expected.scales) {
        const found = after.scales.find((candidate) => candidate.id === scale.id)!;
        expect(found.alpha).toBeCloseTo(scale.alpha, 12); // R: alpha of the reduced scale
        expect(found.omegaTotal).toBeCloseTo(scale.omegaTotal, 5); // R: psych::fa(R_reduced, 1, "minres") -> omega
        expect(found.items).toBe(scale.items);
        expect(found.spearmanBrown).toBeCloseTo(scale.spearmanBrown, 12); // R: m a / (1 + (m - 1) a)
      }
      expect(after.itemsRemoved).toBe(2);
      expect(after.minutesSaved).toBeCloseTo((2 * 8) / 60, 14); // definition: items removed × seconds per item / 60
      expect(after.removed).toEqual(['A5', 'B4']);
    });
  }

  it('equals a fresh computeEvidence of the reduced item set (methods and policies, random waves)', () => {
    const cases: [number, CorrelationMethod, MissingPolicy][] = [
      [3, 'pearson', 'pairwise'],
      [5, 'pearson', 'listwise'],
      [7, 'spearman', 'pairwise'],
      [8, 'spearman', 'listwise'],
    ];
    for (const [seed, method, missing] of cases) {
      const wave = generateWave(randomWaveSpec(seed), seed + 100_000);
      const { matrix, items } = engineInputFromSyntheticWave(wave);
      const evidence = computeEvidence(matrix, items, { method, missing });
      const removedIds = items.filter((_, j) => j % 4 === 1).map((item) => item.id);
      const after = simulateCut(evidence, matrix, removedIds, { secondsPerItem: 8 });
      const kept = items.map((_, j) => j).filter((j) => !removedIds.includes(items[j].id));
      const fresh = computeEvidence(selectItems(matrix, kept), kept.map((j) => items[j]), { method, missing });
      expect(after.maxVif).toBeCloseTo(largestVif(fresh.vif, fresh.usable)!, 9);
      expect(after.conditionNumber).toBeCloseTo(fresh.conditionNumber!, 9);
      for (const scale of fresh.scales) {
        const found = after.scales.find((candidate) => candidate.id === scale.id)!;
        expect(found.items).toBe(scale.items.length);
        expect(found.alpha).toBeCloseTo(scale.alpha!, 12);
        expect(found.omegaTotal ?? -1).toBeCloseTo(scale.omegaTotal ?? -1, 9);
      }
    }
  });

  it('treats an indefinite matrix of the remaining items as a fresh audit does: smoothed, not projected (the demo wave, polychoric)', async () => {
    const { matrix, items } = await demoWaveInput();
    const settings = { method: 'polychoric', missing: 'pairwise' } as const;
    const evidence = computeEvidence(matrix, items, settings);
    expect(evidence.repaired).toBe(true);
    // The exact copy (events_3b, fixtures/demo/README.md) removed: the near-copies left keep the
    // matrix indefinite before smoothing.
    const removedIds = ['events_3b'];
    const kept = items.map((_, j) => j).filter((j) => !removedIds.includes(items[j].id));
    const fresh = computeEvidence(selectItems(matrix, kept), kept.map((j) => items[j]), settings);
    expect(fresh.warnings.some((warning) => warning.code === 'matrix-smoothed')).toBe(true);
    const after = simulateCut(evidence, matrix, removedIds, { secondsPerItem: 8 });
    expect(after.maxVif! / largestVif(fresh.vif, fresh.usable)!).toBeCloseTo(1, 9);
    expect(after.conditionNumber! / fresh.conditionNumber!).toBeCloseTo(1, 9);
    for (const scale of fresh.scales) {
      const found = after.scales.find((candidate) => candidate.id === scale.id)!;
      expect(found.alpha).toBeCloseTo(scale.alpha!, 12);
      expect(found.omegaTotal ?? -1).toBeCloseTo(scale.omegaTotal ?? -1, 9);
    }
  });

  it('reports the figures before beside the figures after, and nothing removed changes nothing', () => {
    const { matrix, items } = referenceInput();
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    const after = simulateCut(evidence, matrix, [], { secondsPerItem: 8 });
    expect(after.itemsRemoved).toBe(0);
    expect(after.minutesSaved).toBe(0);
    expect(after.maxVif).toBeCloseTo(Math.max(...ref.pairwise.vif), 10); // R: max(diag(solve(R)))
    expect(after.maxVifBefore).toBeCloseTo(Math.max(...ref.pairwise.vif), 10);
    for (const scale of after.scales) {
      expect(scale.alpha).toBeCloseTo(scale.alphaBefore!, 14);
      expect(scale.spearmanBrown).toBeCloseTo(scale.alphaBefore!, 14); // m = 1 leaves alpha unchanged
    }
  });

  it('refuses unknown or repeated ids and a non-positive answering time', () => {
    const { matrix, items } = referenceInput();
    const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise' });
    expect(() => simulateCut(evidence, matrix, ['ZZ'], { secondsPerItem: 8 })).toThrow(/simulateCut: "ZZ" is not an item/);
    expect(() => simulateCut(evidence, matrix, ['A1', 'A1'], { secondsPerItem: 8 })).toThrow(/listed twice/);
    expect(() => simulateCut(evidence, matrix, ['A1'], { secondsPerItem: 0 })).toThrow(/secondsPerItem must be a positive number/);
  });
});
