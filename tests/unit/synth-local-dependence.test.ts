import { describe, expect, it } from 'vitest';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { generateWave } from '../../src/lib/synth/generate-wave';
import { DOUBLET_RESIDUAL_RANGE, LOCAL_DEPENDENCE_WAVE_KINDS, localDependenceWaveSpec } from '../../src/lib/synth/local-dependence-spec';
import type { WaveSpec } from '../../src/lib/synth/types';

/** A continuous-enough wave: one 7-point scale, many respondents, no missing answers. */
function spec(items: WaveSpec['scales'][number]['items'], extra: Partial<WaveSpec> = {}): WaveSpec {
  return {
    respondents: 20000, scales: [{ name: 'a', points: 7, items }, { name: 'b', points: 7, items: [{ name: 'b1', text: 'b1' }, { name: 'b2', text: 'b2' }, { name: 'b3', text: 'b3' }] }],
    factorCorrelation: 0.3, loadingRange: [0.6, 0.6], twinNoise: 0.1, skew: 0, missingCodes: [], blankRate: 0, constantItems: [], duplicateColumns: [],
    straightliners: 0, speeders: 0, medianDurationSeconds: 300, idColumn: 'id', durationColumn: 'seconds', firstRespondentId: 1, outcome: null, ...extra,
  };
}

function r(wave: ReturnType<typeof generateWave>, a: string, b: string): number {
  const { matrix, items } = engineInputFromSyntheticWave(wave);
  const result = correlationMatrix(matrix, { method: 'pearson', missing: 'pairwise' });
  const i = items.findIndex((item) => item.id === a);
  const j = items.findIndex((item) => item.id === b);
  return result.matrix.data[i * items.length + j];
}

describe('generateWave: doublets, homogeneous scales and cross-loading decoys', () => {
  it('plants a doublet whose latent correlation is loading² + residual covariance', () => {
    // Latent r = .6 · .6 + .3 = .66; other pairs .36. Seven categories attenuate Pearson r by about .95 (Olsson 1979, from memory).
    const wave = generateWave(spec([{ name: 'a1', text: 'a1' }, { name: 'a2', text: 'a2' }, { name: 'a3', text: 'a3' }, { name: 'a4', text: 'a4', doubletOf: 'a1', doubletResidual: 0.3 }]), 5);
    expect(wave.truth.doublets).toEqual([['a1', 'a4']]);
    expect(r(wave, 'a1', 'a4')).toBeGreaterThan(0.58);
    expect(r(wave, 'a1', 'a4')).toBeLessThan(0.68);
    expect(r(wave, 'a2', 'a3')).toBeGreaterThan(0.3);
    expect(r(wave, 'a2', 'a3')).toBeLessThan(0.38);
  });

  it('gives a scale its own loading range and lets an item cross-load on another scale', () => {
    const wave = generateWave(
      spec([{ name: 'a1', text: 'a1' }, { name: 'a2', text: 'a2' }, { name: 'a3', text: 'a3', crossLoading: { scale: 'b', loading: 0.4 } }]),
      6,
    );
    expect(wave.truth.crossLoadings).toEqual(['a3']);
    // a3 with b1: .6 · .6 · .3 (through the factor correlation) + .4 · .6 = .348 latent; a1 with b1: .108.
    expect(r(wave, 'a3', 'b1')).toBeGreaterThan(r(wave, 'a1', 'b1') + 0.15);
    const tight = generateWave(spec([{ name: 'a1', text: 'a1' }, { name: 'a2', text: 'a2' }, { name: 'a3', text: 'a3' }], { scales: [{ name: 'a', points: 7, loadingRange: [0.88, 0.88], items: [{ name: 'a1', text: 'a1' }, { name: 'a2', text: 'a2' }, { name: 'a3', text: 'a3' }] }] }), 7);
    expect(tight.truth.ownLoadingScales).toEqual(['a']);
    expect(r(tight, 'a1', 'a2')).toBeGreaterThan(0.7); // latent .7744
  });

  it('refuses a doublet with no unique variance left, or without its residual', () => {
    expect(() => generateWave(spec([{ name: 'a1', text: 'a1' }, { name: 'a2', text: 'a2', doubletOf: 'a1', doubletResidual: 0.7 }]), 1)).toThrow(/leaves no unique variance/);
    expect(() => generateWave(spec([{ name: 'a1', text: 'a1' }, { name: 'a2', text: 'a2', doubletOf: 'a1' }]), 1)).toThrow(/needs doubletResidual/);
    expect(() => generateWave(spec([{ name: 'a1', text: 'a1', crossLoading: { scale: 'a', loading: 0.3 } }]), 1)).toThrow(/another scale/);
  });

  it('draws the four evaluation kinds within the issue ranges, the same for the same seed', () => {
    for (const kind of LOCAL_DEPENDENCE_WAVE_KINDS) {
      for (let seed = 1; seed <= 20; seed++) {
        const drawn = localDependenceWaveSpec(seed, kind);
        expect(drawn).toEqual(localDependenceWaveSpec(seed, kind));
        expect(drawn.respondents).toBeGreaterThanOrEqual(150);
        expect(drawn.respondents).toBeLessThanOrEqual(600);
        const items = drawn.scales.flatMap((scale) => scale.items);
        const doublets = items.filter((item) => item.doubletOf !== undefined);
        expect(doublets.length > 0).toBe(kind === 'doublets');
        for (const item of doublets) {
          expect(item.doubletResidual).toBeGreaterThanOrEqual(DOUBLET_RESIDUAL_RANGE[0]);
          expect(item.doubletResidual).toBeLessThanOrEqual(DOUBLET_RESIDUAL_RANGE[1]);
        }
        expect(drawn.scales.some((scale) => scale.loadingRange?.[0] === 0.84)).toBe(kind === 'homogeneous');
        expect(items.some((item) => item.crossLoading !== undefined)).toBe(kind === 'cross-loading');
        expect(() => generateWave(drawn, seed)).not.toThrow();
      }
    }
  });
});
