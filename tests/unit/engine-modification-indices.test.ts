/**
 * The engine's use of modification indices (docs/decisions/022-engine-modification-indices.md): the
 * sequential test per scale, and the pair rules that combine it with wTO and the residual.
 */
import { describe, expect, it } from 'vitest';
import { coreDetectors } from '../../src/lib/engine/core-detectors';
import { resolveEngineSettings } from '../../src/lib/engine/engine-settings';
import { localDependenceEvidence, localDependenceReuse, modificationIndexCritical, type LocalDependenceDetectors } from '../../src/lib/engine/local-dependence';
import { pairRules, type PairLocalFigures } from '../../src/lib/engine/overlap-clusters';
import type { EngineItem } from '../../src/lib/engine/types';
import { localDependenceSettings } from '../../src/lib/engine/wave-local-dependence';
import { residualModificationIndices } from '../../src/lib/stats/residual-modification-indices';
import type { SquareMatrix } from '../../src/lib/stats/types';

/** The model-implied correlation matrix of one factor with loadings λ, plus residual covariances. */
function population(loadings: readonly number[], extra: readonly [number, number, number][]): SquareMatrix {
  const p = loadings.length;
  const data = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) data[i * p + j] = i === j ? 1 : loadings[i] * loadings[j];
  for (const [i, j, value] of extra) data[i * p + j] = data[j * p + i] = data[i * p + j] + value;
  return { order: p, data };
}

const items = (count: number): EngineItem[] => Array.from({ length: count }, (_, j) => ({ id: `q${j + 1}`, scale: 'S', text: null, locked: false, min: null, max: null }));
const settings = { ...localDependenceSettings({}), residualBootstrapDraws: 0 };

describe('the sequential modification-index test', () => {
  it('flags a planted doublet and then nothing else, where the one-step indices also flag pairs the doublet distorts', () => {
    // Five items, a residual covariance of .30 between q1 and q2 (the model-implied matrix: no sampling noise).
    const matrix = population([0.6, 0.6, 0.6, 0.55, 0.5], [[0, 1, 0.3]]); // r(q1, q2) = .66, below the near-copy rule
    const n = 2000;
    const critical = modificationIndexCritical(5, settings.modificationIndexAlpha);
    // χ²(1) upper 0.001/10 point: z = Φ⁻¹(1 − 0.00005) = 3.8906 (R: qnorm(1 - 0.001 / 20)^2 = 15.137)
    expect(critical).toBeCloseTo(15.137, 2);
    const oneStep = residualModificationIndices(matrix, n);
    const distorted: string[] = [];
    for (let i = 0; i < 5; i++) for (let j = i + 1; j < 5; j++) if (!(i === 0 && j === 1) && oneStep.mi.data[i * 5 + j] > critical) distorted.push(`q${i + 1}/q${j + 1}`);
    expect(distorted.length).toBeGreaterThan(0);
    const { evidence } = localDependenceEvidence(matrix, items(5), [0, 1, 2, 3, 4], n, settings, coreDetectors);
    const scale = evidence.scales[0];
    expect(scale.miFlagged.map((flag) => [flag.a, flag.b])).toEqual([[0, 1]]);
    expect(scale.miStrictCount).toBe(1);
    expect(scale.sepc?.[0][1]).toBeGreaterThan(0.2);
  });

  it('flags nothing in a scale that fits one factor exactly, however many respondents', () => {
    const matrix = population([0.88, 0.86, 0.9, 0.85, 0.87, 0.84], []);
    const { evidence } = localDependenceEvidence(matrix, items(6), [0, 1, 2, 3, 4, 5], 100_000, settings, coreDetectors);
    expect(evidence.scales[0].miFlagged).toEqual([]);
  });

  it('needs a residual correlation of a size that matters: a trivial covariance with a huge index is not flagged', () => {
    // .02 of residual covariance between q3 and q4 of loadings .6: SEPC about .03, index large at n 100 000.
    const matrix = population([0.7, 0.65, 0.6, 0.6, 0.55], [[2, 3, 0.02]]);
    const { evidence } = localDependenceEvidence(matrix, items(5), [0, 1, 2, 3, 4], 100_000, settings, coreDetectors);
    expect(evidence.scales[0].modificationIndices?.[2][3]).toBeGreaterThan(modificationIndexCritical(5, settings.modificationIndexAlpha));
    expect(evidence.scales[0].miFlagged).toEqual([]);
  });
});

describe('the sequential test in a bootstrap resample (warm-started fits)', () => {
  it('starts the first fit from the full sample\'s uniquenesses and each refit from the fit before it, with the same flags and indices', () => {
    const matrix = population([0.6, 0.6, 0.6, 0.55, 0.5], [[0, 1, 0.3]]);
    const n = 2000;
    const full = localDependenceEvidence(matrix, items(5), [0, 1, 2, 3, 4], n, settings, coreDetectors).evidence;
    const reuse = localDependenceReuse(full);
    const first = full.scales[0].miUniquenesses as number[];
    expect(first).toHaveLength(5);
    expect([...reuse.uniquenesses.entries()]).toEqual(first.map((psi, k) => [k, psi]));
    const starts: ((number | null)[] | null)[] = [];
    const spy: LocalDependenceDetectors = {
      ...coreDetectors,
      modificationIndices(correlation, sampleSize, start) {
        starts.push(start === undefined || start === null ? null : [...start]);
        return coreDetectors.modificationIndices(correlation, sampleSize, start);
      },
    };
    const resample = localDependenceEvidence(matrix, items(5), [0, 1, 2, 3, 4], n, settings, spy, reuse).evidence.scales[0];
    // Two fits: all five items, then q2 (the later member of the flagged pair) set aside.
    expect(starts).toHaveLength(2);
    expect(starts[0]).toEqual(first);
    expect(starts[1]).toHaveLength(4);
    // The refit starts from the first resample fit's uniquenesses of the items it keeps.
    starts[1]?.forEach((psi, x) => expect(psi).toBeCloseTo(first[[0, 2, 3, 4][x]], 6));
    expect(resample.miFlagged.map((flag) => [flag.a, flag.b])).toEqual(full.scales[0].miFlagged.map((flag) => [flag.a, flag.b]));
    expect(resample.miStrictCount).toBe(full.scales[0].miStrictCount);
    // Same optimum to the fit's tolerance: the indices agree to 1e-6 relative.
    for (let a = 0; a < 5; a++) {
      for (let b = 0; b < 5; b++) {
        const cold = full.scales[0].modificationIndices?.[a][b] ?? null;
        const warm = resample.modificationIndices?.[a][b] ?? null;
        if (cold === null) expect(warm).toBeNull();
        else expect(Math.abs((warm as number) - cold)).toBeLessThan(1e-6 * Math.max(1, cold));
      }
    }
  });
});

describe('pairRules', () => {
  const thresholds = resolveEngineSettings({});
  const none: PairLocalFigures = { residual: 0.01, relativeResidual: 0.01, residualCritical: 0.1, wto: 0.05, partial: 0.05, standOut: 0.02, mi: 1, miCritical: 15, sepc: 0.05, miFlagged: null };

  it('links a pair the strict test flags, and names the residual beside it when that exceeds its critical value', () => {
    expect(pairRules(0.5, { ...none, miFlagged: 'strict', mi: 40, sepc: 0.4 }, thresholds)).toEqual(['local-dependence-mi']);
    expect(pairRules(0.5, { ...none, miFlagged: 'strict', mi: 40, sepc: 0.4, relativeResidual: 0.15 }, thresholds)).toEqual(['local-dependence-mi', 'local-dependence-residual']);
  });

  it('lets wTO count only where the score test also flags the pair (a small tight factor has high wTO everywhere)', () => {
    expect(pairRules(0.6, { ...none, wto: 0.4 }, thresholds)).toEqual([]);
    expect(pairRules(0.6, { ...none, wto: 0.4, miFlagged: 'network', mi: 12, sepc: 0.3 }, thresholds)).toEqual(['local-dependence-wto']);
    expect(pairRules(0.6, { ...none, wto: 0.2, miFlagged: 'network', mi: 12, sepc: 0.3 }, thresholds)).toEqual([]);
  });

  it('does not link a pair on its residual alone (a wording factor raises the residuals of every like-worded pair)', () => {
    expect(pairRules(0.45, { ...none, relativeResidual: 0.2, residualCritical: 0.08 }, thresholds)).toEqual([]);
  });

  it('keeps the strong-pair rule and its veto in a homogeneous scale', () => {
    expect(pairRules(0.85, { ...none, standOut: 0.3 }, thresholds)).toEqual(['strong-pair']);
    expect(pairRules(0.85, { ...none, standOut: 0.05 }, thresholds)).toEqual([]);
  });
});
