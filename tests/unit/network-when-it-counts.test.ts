/**
 * The network fitted only where it can count (src/lib/engine/network-when-it-counts.ts): where
 * `networkCanCount` says no, the engine's whole result (clusters, pairs, recommendations,
 * warnings) is the same with the network attached as without it; where a scale of four or more
 * items or a linked pair exists, it says yes; `attachNetwork` gives the evidence computeEvidence
 * gives with its network.
 */
import { describe, expect, it } from 'vitest';
import { computeEvidence } from '../../src/lib/engine/compute-evidence';
import { resolveEngineSettings } from '../../src/lib/engine/engine-settings';
import { attachNetwork, networkCanCount } from '../../src/lib/engine/network-when-it-counts';
import { runEngine } from '../../src/lib/engine/run-engine';
import type { EngineItem } from '../../src/lib/engine/types';
import { wordingSimilarity } from '../../src/lib/engine/wording-similarity';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import { generateWave } from '../../src/lib/synth/generate-wave';
import { randomWaveSpec } from '../../src/lib/synth/random-wave-spec';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import type { ItemMatrix } from '../../src/lib/stats/types';

const settings = resolveEngineSettings({ seed: 3, bootstrap: 0 });

/** 300 respondents × 12 five-point items on one factor (loadings 0.5-0.6: no pair near 0.8), outside any scale. */
function weakWave(): { matrix: ItemMatrix; items: EngineItem[] } {
  const random = createSeededRandom(11);
  const rows = 300;
  const columns = 12;
  const data = new Float64Array(rows * columns);
  for (let i = 0; i < rows; i++) {
    const factor = random.nextNormal();
    for (let j = 0; j < columns; j++) {
      const loading = 0.5 + 0.01 * j;
      const latent = loading * factor + Math.sqrt(1 - loading * loading) * random.nextNormal();
      data[j * rows + i] = Math.min(5, Math.max(1, Math.round(3 + latent * 1.2)));
    }
  }
  const items: EngineItem[] = Array.from({ length: columns }, (_, j) => ({ id: `q${j + 1}`, text: null, scale: null, locked: false, min: 1, max: 5 }));
  return { matrix: { rows, columns, data }, items };
}

function evidencePair(matrix: ItemMatrix, items: readonly EngineItem[]) {
  const without = computeEvidence(matrix, items, settings, { localDependence: { network: false } });
  const withNetwork = computeEvidence(matrix, items, settings);
  return { without, withNetwork, wording: wordingSimilarity(items.map((item) => item.text)) };
}

describe('networkCanCount', () => {
  it('says no for a wave without scales and without a linked pair, where the network changes nothing', async () => {
    const { matrix, items } = weakWave();
    const { without, withNetwork, wording } = evidencePair(matrix, items);
    expect(withNetwork.localDependence?.wto).not.toBeNull(); // the network exists to be left out
    expect(networkCanCount(without, wording, settings)).toBe(false);
    const engineWithout = await runEngine(without, matrix, items, settings);
    const engineWith = await runEngine(withNetwork, matrix, items, settings);
    expect(engineWithout).toEqual(engineWith);
    expect(engineWith.pairs).toEqual([]);
  });

  it('says yes for a wave with scales, and for a wave without scales whose twins are linked', () => {
    const { matrix, items } = engineInputFromSyntheticWave(generateWave(randomWaveSpec(8), 8));
    expect(items.some((item) => item.scale !== null)).toBe(true);
    const scaled = evidencePair(matrix, items);
    expect(networkCanCount(scaled.without, scaled.wording, settings)).toBe(true);
    const unscaledItems = items.map((item) => ({ ...item, scale: null }));
    const unscaled = evidencePair(matrix, unscaledItems);
    expect(networkCanCount(unscaled.without, unscaled.wording, settings)).toBe(true);
  });

  it('attaches the network computeEvidence computes', () => {
    const { matrix, items } = engineInputFromSyntheticWave(generateWave(randomWaveSpec(8), 8));
    const { without, withNetwork } = evidencePair(matrix, items);
    const attached = attachNetwork(without, settings, null);
    expect(attached.localDependence).toEqual(withNetwork.localDependence);
    expect(attached.warnings).toEqual(withNetwork.warnings);
  });
});
