import { createSeededRandom, type SeededRandom } from '../stats/seeded-random';
import type { ItemSpec, ScalePoints, ScaleSpec, WaveSpec } from './types';

/**
 * The four kinds of evaluation wave for local dependence (issue 9):
 * - `doublets`: 1-3 planted doublets (two items of one scale sharing a latent residual
 *   covariance of 0.15-0.35 beyond the common factor), the only redundancy in the wave;
 * - `homogeneous`: one or two highly homogeneous scales (loadings 0.84-0.90, 3-8 items), where
 *   every pair correlates highly and nothing is redundant;
 * - `cross-loading`: one or two decoy items that also load 0.30-0.40 on another scale's factor;
 * - `clean`: nothing planted.
 * Only `doublets` waves carry redundancy; any recommendation on the other three is a false alarm.
 */
export type LocalDependenceWaveKind = 'doublets' | 'homogeneous' | 'cross-loading' | 'clean';

/** The kinds, in evaluation order. */
export const LOCAL_DEPENDENCE_WAVE_KINDS: readonly LocalDependenceWaveKind[] = Object.freeze(['doublets', 'homogeneous', 'cross-loading', 'clean']);

/** Range of a planted doublet's latent residual covariance (issue 9). */
export const DOUBLET_RESIDUAL_RANGE: readonly [number, number] = Object.freeze([0.15, 0.35]) as readonly [number, number];
/** Loadings of a homogeneous decoy scale (issue 9). */
export const HOMOGENEOUS_LOADING_RANGE: readonly [number, number] = Object.freeze([0.84, 0.9]) as readonly [number, number];
/** Loadings of ordinary scales (the range `randomWaveSpec` uses). */
const ORDINARY_LOADING_RANGE: readonly [number, number] = [0.5, 0.78];
/** Own loadings of a scale that carries a cross-loading decoy, low enough to leave unique variance. */
const DECOY_SCALE_LOADING_RANGE: readonly [number, number] = [0.5, 0.7];
/** Cross-loading of a decoy on the other scale's factor. */
const CROSS_LOADING_RANGE: readonly [number, number] = [0.3, 0.4];
/** Offsets that give each kind its own stream of structures for the same seed. */
const KIND_SEED_OFFSET: Readonly<Record<LocalDependenceWaveKind, number>> = Object.freeze({
  doublets: 0,
  homogeneous: 1_000_003,
  'cross-loading': 2_000_003,
  clean: 3_000_003,
});

function uniform(random: SeededRandom, [low, high]: readonly [number, number]): number {
  return low + (high - low) * random.next();
}

function integerBetween(random: SeededRandom, low: number, high: number): number {
  return low + random.nextInt(high - low + 1);
}

/**
 * Draws a random wave structure of one evaluation kind: 3-6 scales of 4-8 items on 5- or
 * 7-point scales (homogeneous decoy scales 3-8 items), 150-600 respondents, factor correlation
 * 0.15-0.50, about three scales in ten with one reverse-keyed item, missing codes 8 and 9 (0-3%
 * together), blanks (0-2%), up to 1.5% straightliners and 2% speeders. Doublets are added after
 * their source (a quarter of them reverse-worded); their residual covariance is drawn uniformly
 * in 0.15-0.35. Pass the spec to `generateWave` with any seed.
 * @param seed Integer seed for the structure.
 * @param kind Which kind of wave (see `LocalDependenceWaveKind`).
 * @throws {RangeError} when the seed is not an integer or the kind is unknown.
 * @returns A spec; its doublets come back in `truth.doublets`, decoys in `truth.crossLoadings`,
 *   homogeneous scales in `truth.ownLoadingScales`.
 * References: Thurstone 1947, "Multiple-factor analysis" (common-factor model); Chen & Thissen
 * 1997, "Local dependence indexes for item pairs using item response theory" (J. Educational and
 * Behavioral Statistics 22:265-289), for locally dependent pairs as a residual covariance.
 */
export function localDependenceWaveSpec(seed: number, kind: LocalDependenceWaveKind): WaveSpec {
  if (!Number.isInteger(seed)) throw new RangeError(`localDependenceWaveSpec: seed must be an integer, got ${seed}`);
  if (!LOCAL_DEPENDENCE_WAVE_KINDS.includes(kind)) throw new RangeError(`localDependenceWaveSpec: unknown kind "${String(kind)}"; use ${LOCAL_DEPENDENCE_WAVE_KINDS.join(', ')}`);
  const random = createSeededRandom(seed + KIND_SEED_OFFSET[kind]);
  const scaleCount = integerBetween(random, 3, 6);
  const respondents = integerBetween(random, 150, 600);
  const homogeneousCount = kind === 'homogeneous' ? integerBetween(random, 1, 2) : 0;
  const scales: { name: string; points: ScalePoints; items: ItemSpec[]; loadingRange?: readonly [number, number] }[] = [];
  for (let s = 1; s <= scaleCount; s++) {
    const points: ScalePoints = random.next() < 0.7 ? 5 : 7;
    const homogeneous = s <= homogeneousCount;
    const itemCount = integerBetween(random, homogeneous ? 3 : 4, 8);
    const reversedItem = random.next() < 0.3 ? random.nextInt(itemCount) : -1;
    const items: ItemSpec[] = [];
    for (let q = 1; q <= itemCount; q++) items.push({ name: `s${s}_q${q}`, text: `Scale ${s}, statement ${q}`, reverse: q - 1 === reversedItem });
    scales.push({ name: `scale_${s}`, points, items, ...(homogeneous ? { loadingRange: HOMOGENEOUS_LOADING_RANGE } : {}) });
  }

  if (kind === 'doublets') {
    const count = integerBetween(random, 1, 3);
    const used = new Set<string>();
    for (let d = 0; d < count; d++) {
      const scale = scales[random.nextInt(scales.length)];
      const candidates = scale.items.filter((item) => item.doubletOf === undefined && !used.has(item.name));
      const source = candidates[random.nextInt(candidates.length)];
      used.add(source.name);
      const reverse = random.next() < 0.25 ? !source.reverse : source.reverse === true;
      const name = `${scale.name.replace('scale_', 's')}_q${scale.items.length + 1}`;
      used.add(name);
      scale.items.push({ name, text: `${source.text}, said differently`, doubletOf: source.name, doubletResidual: uniform(random, DOUBLET_RESIDUAL_RANGE), reverse });
    }
  } else if (kind === 'cross-loading') {
    const count = integerBetween(random, 1, 2);
    const decoyScales = new Set<number>();
    for (let d = 0; d < count; d++) {
      const own = random.nextInt(scales.length);
      const other = (own + 1 + random.nextInt(scales.length - 1)) % scales.length;
      const scale = scales[own];
      decoyScales.add(own);
      const name = `${scale.name.replace('scale_', 's')}_q${scale.items.length + 1}`;
      scale.items.push({ name, text: `Scale ${own + 1}, statement that also touches scale ${other + 1}`, crossLoading: { scale: scales[other].name, loading: uniform(random, CROSS_LOADING_RANGE) } });
    }
    for (const own of decoyScales) scales[own].loadingRange = DECOY_SCALE_LOADING_RANGE;
  }

  const missingRate = uniform(random, [0, 0.03]);
  return {
    respondents,
    scales: scales as ScaleSpec[],
    factorCorrelation: uniform(random, [0.15, 0.5]),
    loadingRange: ORDINARY_LOADING_RANGE,
    twinNoise: 0.15,
    skew: uniform(random, [0, 0.6]),
    missingCodes: [
      { code: 8, label: "don't know", rate: missingRate / 2 },
      { code: 9, label: 'prefer not to say', rate: missingRate / 2 },
    ],
    blankRate: uniform(random, [0, 0.02]),
    constantItems: [],
    duplicateColumns: [],
    straightliners: Math.floor(respondents * uniform(random, [0, 0.015])),
    speeders: Math.floor(respondents * uniform(random, [0, 0.02])),
    medianDurationSeconds: Math.round(uniform(random, [180, 600])),
    idColumn: 'respondent_id',
    durationColumn: 'duration_sec',
    firstRespondentId: 1,
    outcome: null,
  };
}
