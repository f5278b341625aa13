/**
 * Redundancy engine benchmark: the evaluation of issue 5 over generated pilot waves, and timings.
 *
 * 1. Planted waves (randomWaveSpec, seeds 1..PLANTED_WAVES): precision and recall of the planted
 *    near-duplicate pairs, pooled over all waves. A pair counts as found when both items sit in
 *    the cluster of one recommendation.
 * 2. Clean waves (randomUnplantedWaveSpec, seeds 1..CLEAN_WAVES): recommendations per wave.
 * 3. The same evaluation under the other correlation methods and listwise deletion (reported,
 *    not asserted: the floors of issue 5 are for the default settings, Pearson and pairwise).
 * 4. Timings: evidence, engine without bootstrap, and the bootstrap (200 resamples) on a
 *    400 × 40 Pearson wave.
 *
 * Run: npx tsx bench/engine.bench.ts   (prints figures, then one JSON line {"bench":"engine-eval", ...})
 */
import { computeEvidence } from '../src/lib/engine/compute-evidence';
import type { EngineSettings } from '../src/lib/engine/engine-settings';
import { evaluateEngineOnWaves } from '../src/lib/evaluation/evaluate-engine';
import { runEngine } from '../src/lib/engine/run-engine';
import { engineInputFromSyntheticWave } from '../src/lib/evaluation/synthetic-wave-input';
import { generateWave } from '../src/lib/synth/generate-wave';
import type { WaveSpec } from '../src/lib/synth/types';
import { questionnaireSpec } from './bench-helpers';

const PLANTED_WAVES = 60;
const CLEAN_WAVES = 60;

function milliseconds(start: bigint): number {
  return Number(process.hrtime.bigint() - start) / 1e6;
}

/** A 400 × 40 wave: 5 scales of 8 five-point items, two planted twins, a little missing data. */
function timingSpec(): WaveSpec {
  return questionnaireSpec(400, 5, { itemsPerScale: 8, twinnedScales: 2, prefix: 't', label: 'Timing' });
}

async function timeBootstrap(label: string, missingFree: boolean): Promise<{ label: string; evidenceMs: number; engineMs: number; bootstrapMs: number; recommendations: number }> {
  const wave = generateWave(timingSpec(), 4242);
  const input = engineInputFromSyntheticWave(wave);
  const data = missingFree ? input.matrix.data.map((value) => (Number.isNaN(value) ? 3 : value)) : input.matrix.data;
  const matrix = { ...input.matrix, data };
  let start = process.hrtime.bigint();
  const evidence = computeEvidence(matrix, input.items, { method: 'pearson', missing: 'pairwise' });
  const evidenceMs = milliseconds(start);
  start = process.hrtime.bigint();
  const plain = await runEngine(evidence, matrix, input.items, { bootstrap: 0 });
  const engineMs = milliseconds(start);
  start = process.hrtime.bigint();
  await runEngine(evidence, matrix, input.items, { bootstrap: 200, seed: 7 });
  const bootstrapMs = milliseconds(start) - engineMs;
  return { label, evidenceMs, engineMs, bootstrapMs, recommendations: plain.recommendations.length };
}

async function main(): Promise<void> {
  const start = process.hrtime.bigint();
  const evaluation = await evaluateEngineOnWaves({ plantedWaves: PLANTED_WAVES, cleanWaves: CLEAN_WAVES });
  const evaluationMs = milliseconds(start);

  process.stdout.write(`Planted waves: ${evaluation.plantedWaves}, planted pairs ${evaluation.plantedPairs}, found ${evaluation.truePositives}, false pairs ${evaluation.falsePositives}\n`);
  process.stdout.write(`  precision ${evaluation.precision.toFixed(4)}  recall ${evaluation.recall.toFixed(4)}  (floors 0.95)\n`);
  process.stdout.write(`Clean waves: ${evaluation.cleanWaves}, recommendations ${evaluation.cleanRecommendations} (${evaluation.cleanRecommendationsPerTenWaves.toFixed(2)} per ten waves; ceiling 1)\n`);
  for (const miss of evaluation.misses) process.stdout.write(`  ${miss}\n`);
  process.stdout.write(`Evaluation time ${(evaluationMs / 1000).toFixed(1)} s (bootstrap off)\n`);
  process.stdout.write('Other settings (reported only):\n');

  const variants: { label: string; settings: Partial<EngineSettings> }[] = [
    { label: 'spearman, pairwise', settings: { method: 'spearman', missing: 'pairwise' } },
    { label: 'polychoric, pairwise', settings: { method: 'polychoric', missing: 'pairwise' } },
    { label: 'pearson, listwise', settings: { method: 'pearson', missing: 'listwise' } },
  ];
  const byVariant: Record<string, { precision: number; recall: number; cleanRecommendationsPerTenWaves: number }> = {};
  for (const variant of variants) {
    const result = await evaluateEngineOnWaves({ plantedWaves: PLANTED_WAVES, cleanWaves: CLEAN_WAVES, settings: variant.settings });
    byVariant[variant.label] = { precision: result.precision, recall: result.recall, cleanRecommendationsPerTenWaves: result.cleanRecommendationsPerTenWaves };
    process.stdout.write(
      `  ${variant.label}: precision ${result.precision.toFixed(4)}, recall ${result.recall.toFixed(4)}, clean-wave recommendations per ten waves ${result.cleanRecommendationsPerTenWaves.toFixed(2)}\n`,
    );
  }

  const timings = [await timeBootstrap('400x40 pearson pairwise, with missing answers', false), await timeBootstrap('400x40 pearson, complete data', true)];
  for (const timing of timings) {
    process.stdout.write(
      `${timing.label}: evidence ${timing.evidenceMs.toFixed(0)} ms, engine ${timing.engineMs.toFixed(0)} ms, bootstrap x200 ${(timing.bootstrapMs / 1000).toFixed(2)} s (${timing.recommendations} recommendations)\n`,
    );
  }
  process.stdout.write(
    `${JSON.stringify({
      bench: 'engine-eval',
      plantedWaves: evaluation.plantedWaves,
      plantedPairs: evaluation.plantedPairs,
      truePositives: evaluation.truePositives,
      falsePositives: evaluation.falsePositives,
      precision: evaluation.precision,
      recall: evaluation.recall,
      cleanWaves: evaluation.cleanWaves,
      cleanRecommendations: evaluation.cleanRecommendations,
      cleanRecommendationsPerTenWaves: evaluation.cleanRecommendationsPerTenWaves,
      evaluationMs: Math.round(evaluationMs),
      bootstrap200MsWithMissing: Math.round(timings[0].bootstrapMs),
      bootstrap200MsComplete: Math.round(timings[1].bootstrapMs),
      engineMs: Math.round(timings[0].engineMs),
      evidenceMs: Math.round(timings[0].evidenceMs),
      byVariant,
    })}\n`,
  );
}

main().catch((error: unknown) => {
  process.stderr.write(`${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
  process.exitCode = 1;
});
