import { createSeededRandom, type SeededRandom } from '../stats/seeded-random';
import type { ItemSpec, ScalePoints, ScaleSpec, WaveSpec } from './types';

/** A uniform draw in [low, high). */
function uniform(random: SeededRandom, low: number, high: number): number {
  return low + (high - low) * random.next();
}

/** A uniform integer in [low, high]. */
function integerBetween(random: SeededRandom, low: number, high: number): number {
  return low + random.nextInt(high - low + 1);
}

function drawSpec(seed: number, planted: boolean): WaveSpec {
  if (!Number.isInteger(seed)) throw new RangeError(`randomWaveSpec: seed must be an integer, got ${seed}`);
  const random = createSeededRandom(seed);
  const scaleCount = integerBetween(random, 3, 7);
  const respondents = integerBetween(random, 150, 600);
  const base: { name: string; points: ScalePoints; items: ItemSpec[] }[] = [];
  for (let s = 1; s <= scaleCount; s++) {
    const points: ScalePoints = random.next() < 0.7 ? 5 : 7;
    const itemCount = integerBetween(random, 3, 8);
    const reversedItem = random.next() < 0.3 ? random.nextInt(itemCount) : -1;
    const items: ItemSpec[] = [];
    for (let q = 1; q <= itemCount; q++) {
      items.push({ name: `s${s}_q${q}`, text: `Scale ${s}, statement ${q}`, reverse: q - 1 === reversedItem });
    }
    base.push({ name: `scale_${s}`, points, items });
  }

  const clusterCount = planted ? integerBetween(random, 0, 3) : 0;
  const usedSources = new Set<string>();
  for (let c = 0; c < clusterCount; c++) {
    const scale = base[random.nextInt(base.length)];
    const candidates = scale.items.filter((item) => item.twinOf === undefined && !usedSources.has(item.name));
    const source = candidates[random.nextInt(candidates.length)];
    usedSources.add(source.name);
    const twins = random.next() < 0.5 ? 1 : 2;
    for (let t = 0; t < twins; t++) {
      const reverse = random.next() < 0.25 ? !source.reverse : source.reverse === true;
      const q = scale.items.length + 1;
      scale.items.push({ name: `${scale.name.replace('scale_', 's')}_q${q}`, text: `${source.text} (reworded ${t + 1})`, twinOf: source.name, reverse });
    }
  }

  const missingRate = uniform(random, 0, 0.03);
  const scales: ScaleSpec[] = base;
  return {
    respondents,
    scales,
    factorCorrelation: uniform(random, 0.15, 0.5),
    loadingRange: [0.5, 0.78],
    twinNoise: uniform(random, 0.1, 0.2),
    skew: uniform(random, 0, 0.6),
    missingCodes: [
      { code: 8, label: "don't know", rate: missingRate / 2 },
      { code: 9, label: 'prefer not to say', rate: missingRate / 2 },
    ],
    blankRate: uniform(random, 0, 0.02),
    constantItems: [],
    duplicateColumns: [],
    straightliners: Math.floor(respondents * uniform(random, 0, 0.015)),
    speeders: Math.floor(respondents * uniform(random, 0, 0.02)),
    medianDurationSeconds: Math.round(uniform(random, 180, 600)),
    idColumn: 'respondent_id',
    durationColumn: 'duration_sec',
    firstRespondentId: 1,
    outcome: null,
  };
}

/**
 * Draws a random wave structure for evaluation runs: 3-7 scales of 3-8 items on 5- or 7-point
 * scales, 150-600 respondents, and 0-3 planted near-duplicate clusters of 2-3 items (a source
 * and one or two twins; each twin is reverse-worded with probability 1/4). About three scales in
 * ten carry one ordinary reverse-keyed item. Missing codes 8 and 9 (0-3% together), blanks
 * (0-2%), up to 1.5% straightliners and 2% speeders. No exact copies, constant items or outcome,
 * so the planted pairs are the only redundancy. Pass it to `generateWave` with any seed.
 * @param seed Integer seed for the structure.
 * @throws {RangeError} when the seed is not an integer.
 * @returns A spec whose planted pairs `generateWave` reports in `truth.plantedPairs`.
 * References: Thurstone 1947, "Multiple-factor analysis" (common-factor model).
 */
export function randomWaveSpec(seed: number): WaveSpec {
  return drawSpec(seed, true);
}

/**
 * Draws a random wave structure as `randomWaveSpec` does but with nothing planted (no twins,
 * copies or constants), for the false-positive check: any redundancy an audit recommends on
 * such a wave is a false alarm.
 * @param seed Integer seed for the structure.
 * @throws {RangeError} when the seed is not an integer.
 * @returns A spec with empty planted structure.
 * References: Thurstone 1947, "Multiple-factor analysis" (common-factor model).
 */
export function randomUnplantedWaveSpec(seed: number): WaveSpec {
  return drawSpec(seed, false);
}
