/**
 * Bootstrap resamples decided on worker threads (src/lib/audit/resample-threads.ts): the same
 * stability figures, exactly, on the calling thread, on one thread and on two, for one seed; the
 * threads end when the bootstrap ends; a resample that throws on its thread fails the bootstrap
 * instead of hanging it. The threads run resample-worker.ts bundled from source here (locateBundledWorker).
 */
import { describe, expect, it } from 'vitest';
import { createResampleThreadRunner, MAX_RESAMPLE_THREADS } from '../../src/lib/audit/resample-threads';
import { bootstrapStability, type ResampleRunner } from '../../src/lib/engine/bootstrap-stability';
import { computeEvidence } from '../../src/lib/engine/compute-evidence';
import { resolveEngineSettings } from '../../src/lib/engine/engine-settings';
import { localDependenceReuse } from '../../src/lib/engine/local-dependence';
import { runEngine } from '../../src/lib/engine/run-engine';
import { wordingSimilarity } from '../../src/lib/engine/wording-similarity';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import { generateWave } from '../../src/lib/synth/generate-wave';
import { randomWaveSpec } from '../../src/lib/synth/random-wave-spec';

/** A generated wave with scales and planted twins, its recommendations and what a resample reuses. */
async function prepared(seed: number, resamples: number) {
  const { matrix, items } = engineInputFromSyntheticWave(generateWave(randomWaveSpec(seed), seed));
  const settings = resolveEngineSettings({ seed, bootstrap: resamples });
  const evidence = computeEvidence(matrix, items, settings);
  const engine = await runEngine(evidence, matrix, items, { ...settings, bootstrap: 0 });
  const wording = wordingSimilarity(items.map((item) => item.text));
  const reuse = evidence.localDependence === null ? null : localDependenceReuse(evidence.localDependence);
  return { matrix, items, settings, wording, reuse, recommendations: engine.recommendations };
}

describe('createResampleThreadRunner', () => {
  it('gives the same stability figures on the calling thread, one thread and two', async () => {
    const wave = await prepared(8, 24);
    expect(wave.recommendations.length).toBeGreaterThan(0);
    const run = (runner?: ResampleRunner) =>
      bootstrapStability(wave.matrix, wave.items, wave.settings, wave.wording, wave.recommendations, {
        reuse: wave.reuse,
        ...(runner === undefined ? {} : { runner }),
      });
    const calling = await run();
    // The shares must be informative for the comparison to mean anything: not all 0 or all 1.
    expect(calling.shares.some((share) => share > 0)).toBe(true);
    const fractions: number[] = [];
    const one = await run(createResampleThreadRunner(1));
    const two = await bootstrapStability(wave.matrix, wave.items, wave.settings, wave.wording, wave.recommendations, {
      reuse: wave.reuse,
      runner: createResampleThreadRunner(MAX_RESAMPLE_THREADS),
      onProgress: (_, fraction) => fractions.push(fraction),
    });
    expect(one).toEqual(calling);
    expect(two).toEqual(calling);
    // Progress after every resample, whatever thread decided it.
    expect(fractions).toHaveLength(24);
    expect(fractions.at(-1)).toBe(1);
  }, 120_000);

  it('fails the bootstrap when a resample throws on its thread, and ends the threads', async () => {
    const wave = await prepared(8, 6);
    const runner = createResampleThreadRunner(2);
    let closed = false;
    const watched: ResampleRunner = {
      parallelism: runner.parallelism,
      // Settings left out make the thread's resample throw a TypeError (not a RangeError, which would only mark it failed).
      start: (matrix, context) => runner.start(matrix, { ...context, settings: null as unknown as typeof context.settings }),
      decide: (rows) => runner.decide(rows),
      close: async () => {
        closed = true;
        await runner.close();
      },
    };
    await expect(
      bootstrapStability(wave.matrix, wave.items, wave.settings, wave.wording, wave.recommendations, { reuse: wave.reuse, runner: watched }),
    ).rejects.toThrow(/resample failed on its thread/);
    expect(closed).toBe(true);
    await expect(runner.decide(new Int32Array(1))).rejects.toThrow(/before start|closed/);
  }, 120_000);

  it('refuses a thread count outside 1 to MAX_RESAMPLE_THREADS', () => {
    expect(() => createResampleThreadRunner(0)).toThrow(RangeError);
    expect(() => createResampleThreadRunner(MAX_RESAMPLE_THREADS + 1)).toThrow(RangeError);
    expect(() => createResampleThreadRunner(1.5)).toThrow(RangeError);
  });
});
