/**
 * The engine's evaluation on generated pilot waves (issue 5, "How it is checked"): precision and
 * recall of the planted near-duplicate pairs over random waves with planted clusters, and the
 * number of recommendations on waves with nothing planted. Used by the unit test (which asserts
 * the floors) and by bench/engine.bench.ts (which prints the exact figures).
 *
 * A pair of items counts as found when both sit in the cluster of one recommendation. The truth
 * is the generator's `plantedPairs` (every pair inside a planted cluster, reverse-worded twins
 * included) and its exact `duplicates`. Figures are pooled over all waves (micro-averaged).
 */
import { generateWave } from '../synth/generate-wave';
import { randomUnplantedWaveSpec, randomWaveSpec } from '../synth/random-wave-spec';
import { computeEvidence } from '../engine/compute-evidence';
import type { EngineSettings } from '../engine/engine-settings';
import { runEngine } from '../engine/run-engine';
import { engineInputFromSyntheticWave } from './synthetic-wave-input';

/** Options of `evaluateEngineOnWaves`. */
export interface EvaluationOptions {
  /** Waves with planted clusters (spec seeds firstSeed .. firstSeed + plantedWaves − 1). */
  readonly plantedWaves: number;
  /** Waves with nothing planted (same spec seeds). */
  readonly cleanWaves: number;
  /** First spec seed (default 1). */
  readonly firstSeed?: number;
  /** Engine settings; the bootstrap is off unless set here. */
  readonly settings?: Partial<EngineSettings>;
  /**
   * Compute the local-dependence evidence (default true). The near-copy evaluation can turn it
   * off to stay affordable in a unit test; the local-dependence evaluation is
   * evaluate-local-dependence.ts.
   */
  readonly localDependence?: boolean;
}

/** The evaluation's figures. */
export interface EvaluationResult {
  readonly plantedWaves: number;
  readonly plantedPairs: number;
  readonly truePositives: number;
  readonly falsePositives: number;
  /** TP / (TP + FP); 1 when nothing was recommended. */
  readonly precision: number;
  /** TP / planted pairs; 1 when nothing was planted. */
  readonly recall: number;
  readonly cleanWaves: number;
  readonly cleanRecommendations: number;
  readonly cleanRecommendationsPerTenWaves: number;
  /** One line per missed or false pair, and per clean-wave recommendation, for the report. */
  readonly misses: readonly string[];
}

/** Seed offsets between a wave's structure and its respondents (stated so runs repeat). */
const PLANTED_WAVE_SEED_OFFSET = 100_000;
const CLEAN_WAVE_SEED_OFFSET = 200_000;

function pairKey(a: string, b: string): string {
  return a < b ? `${a}|${b}` : `${b}|${a}`;
}

/**
 * Runs the evaluation.
 * @param options Numbers of planted and clean waves, first seed, engine settings.
 * @throws {RangeError} when a wave count is not a non-negative integer.
 * @returns Pooled precision and recall, clean-wave recommendations, and the misses.
 * References: van Rijsbergen 1979, "Information Retrieval", ch. 7 (precision and recall).
 */
export async function evaluateEngineOnWaves(options: EvaluationOptions): Promise<EvaluationResult> {
  const { plantedWaves, cleanWaves } = options;
  const firstSeed = options.firstSeed ?? 1;
  for (const [name, value] of [['plantedWaves', plantedWaves], ['cleanWaves', cleanWaves]] as const) {
    if (!(Number.isInteger(value) && value >= 0)) throw new RangeError(`evaluateEngineOnWaves: ${name} must be a non-negative integer, got ${value}`);
  }
  const settings: Partial<EngineSettings> = { bootstrap: 0, ...options.settings };
  const misses: string[] = [];
  let plantedPairs = 0;
  let truePositives = 0;
  let falsePositives = 0;

  for (let seed = firstSeed; seed < firstSeed + plantedWaves; seed++) {
    const wave = generateWave(randomWaveSpec(seed), seed + PLANTED_WAVE_SEED_OFFSET);
    const { matrix, items } = engineInputFromSyntheticWave(wave);
    const evidence = computeEvidence(matrix, items, { method: settings.method ?? 'pearson', missing: settings.missing ?? 'pairwise', ...settings }, { localDependence: options.localDependence === false ? false : undefined });
    const result = await runEngine(evidence, matrix, items, settings);
    const truth = new Set([...wave.truth.plantedPairs, ...wave.truth.duplicates].map(([a, b]) => pairKey(a, b)));
    const found = new Set<string>();
    for (const recommendation of result.recommendations) {
      const cluster = recommendation.cluster;
      for (let x = 0; x < cluster.length; x++) for (let y = x + 1; y < cluster.length; y++) found.add(pairKey(cluster[x], cluster[y]));
    }
    plantedPairs += truth.size;
    for (const pair of found) {
      if (truth.has(pair)) truePositives++;
      else {
        falsePositives++;
        misses.push(`planted wave ${seed}: false pair ${pair}`);
      }
    }
    for (const pair of truth) if (!found.has(pair)) misses.push(`planted wave ${seed}: missed pair ${pair}`);
  }

  let cleanRecommendations = 0;
  for (let seed = firstSeed; seed < firstSeed + cleanWaves; seed++) {
    const wave = generateWave(randomUnplantedWaveSpec(seed), seed + CLEAN_WAVE_SEED_OFFSET);
    const { matrix, items } = engineInputFromSyntheticWave(wave);
    const evidence = computeEvidence(matrix, items, { method: settings.method ?? 'pearson', missing: settings.missing ?? 'pairwise', ...settings }, { localDependence: options.localDependence === false ? false : undefined });
    const result = await runEngine(evidence, matrix, items, settings);
    cleanRecommendations += result.recommendations.length;
    for (const recommendation of result.recommendations) misses.push(`clean wave ${seed}: recommendation on ${recommendation.cluster.join(', ')} (max r ${recommendation.evidence.maxR.toFixed(2)}, condition index ${recommendation.evidence.conditionIndex?.toFixed(1) ?? 'null'})`);
  }

  return {
    plantedWaves,
    plantedPairs,
    truePositives,
    falsePositives,
    precision: truePositives + falsePositives === 0 ? 1 : truePositives / (truePositives + falsePositives),
    recall: plantedPairs === 0 ? 1 : truePositives / plantedPairs,
    cleanWaves,
    cleanRecommendations,
    cleanRecommendationsPerTenWaves: cleanWaves === 0 ? 0 : (10 * cleanRecommendations) / cleanWaves,
    misses,
  };
}
