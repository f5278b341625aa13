/**
 * The bootstrap of the recommendations on a 2,000 × 100 Pearson pairwise wave (ten scales of ten
 * five-point items, four planted twins, about 1.5% missing answers), 200 resamples: the engine's
 * bootstrap now (resample-decision.ts) and the earlier per-resample path (tests/unit/
 * bootstrap-reference.ts, timed on a few resamples and scaled to 200), beside R doing 200
 * resampled correlation (pairwise) + VIF (diag of solve) + eigenvalues on the same data; the
 * engine's bootstrap is timed on the calling thread and on MAX_RESAMPLE_THREADS worker threads
 * (resample-threads.ts; bundled from source once per process here, start-up included). Two
 * variants of the wave: with its scales, and with every item outside a scale (no residuals, so no
 * network per resample). Figures only; `--quick` uses 500 × 40 and 20 resamples.
 *
 * Run: npx tsx bench/bootstrap.bench.ts [--quick] [--no-r]
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { createResampleThreadRunner, MAX_RESAMPLE_THREADS } from '../src/lib/audit/resample-threads';
import { bootstrapStability } from '../src/lib/engine/bootstrap-stability';
import { computeEvidence } from '../src/lib/engine/compute-evidence';
import { resolveEngineSettings } from '../src/lib/engine/engine-settings';
import { localDependenceReuse } from '../src/lib/engine/local-dependence';
import { runEngine } from '../src/lib/engine/run-engine';
import type { EngineItem } from '../src/lib/engine/types';
import { wordingSimilarity } from '../src/lib/engine/wording-similarity';
import { engineInputFromSyntheticWave } from '../src/lib/evaluation/synthetic-wave-input';
import { generateWave } from '../src/lib/synth/generate-wave';
import type { WaveSpec } from '../src/lib/synth/types';
import type { ItemMatrix } from '../src/lib/stats/types';
import { referenceResampleDecision, referenceResampleRows } from '../tests/unit/bootstrap-reference';
import { loadAverageAndCores, questionnaireSpec, withRScript } from './bench-helpers';

const quick = process.argv.includes('--quick');
const ROWS = quick ? 500 : 2_000;
const SCALES = quick ? 4 : 10;
const RESAMPLES = quick ? 20 : 200;
/** Resamples the earlier path is timed on (it is scaled to RESAMPLES). */
const REFERENCE_RESAMPLES = quick ? 3 : 6;

function spec(): WaveSpec {
  return questionnaireSpec(ROWS, SCALES);
}

const seconds = (start: bigint): number => Number(process.hrtime.bigint() - start) / 1e9;

async function timeVariant(label: string, matrix: ItemMatrix, items: readonly EngineItem[]): Promise<{ label: string; nowSeconds: number; threadSeconds: number; beforeSeconds: number }> {
  const settings = resolveEngineSettings({ seed: 7, bootstrap: RESAMPLES });
  const evidence = computeEvidence(matrix, items, settings);
  const engine = await runEngine(evidence, matrix, items, { ...settings, bootstrap: 0 });
  const wording = wordingSimilarity(items.map((item) => item.text));
  const reuse = evidence.localDependence === null ? null : localDependenceReuse(evidence.localDependence);
  let start = process.hrtime.bigint();
  const calling = await bootstrapStability(matrix, items, settings, wording, engine.recommendations, { reuse });
  const nowSeconds = seconds(start);
  start = process.hrtime.bigint();
  const threaded = await bootstrapStability(matrix, items, settings, wording, engine.recommendations, { reuse, runner: createResampleThreadRunner(MAX_RESAMPLE_THREADS) });
  const threadSeconds = seconds(start);
  if (JSON.stringify(threaded) !== JSON.stringify(calling)) console.log(`  ${label}: the threads gave other figures than the calling thread (a defect: see tests/unit/resample-threads.test.ts)`);
  start = process.hrtime.bigint();
  for (const rows of referenceResampleRows(matrix.rows, settings.seed, REFERENCE_RESAMPLES)) referenceResampleDecision(matrix, rows, items, settings, wording, reuse);
  const beforeSeconds = (seconds(start) * RESAMPLES) / REFERENCE_RESAMPLES;
  console.log(`  ${label}: ${RESAMPLES} resamples ${nowSeconds.toFixed(2)} s on the calling thread, ${threadSeconds.toFixed(2)} s on ${MAX_RESAMPLE_THREADS} worker threads (start-up included); earlier path ${beforeSeconds.toFixed(1)} s (${REFERENCE_RESAMPLES} timed, scaled); ${(beforeSeconds / nowSeconds).toFixed(1)}× faster`);
  return { label, nowSeconds, threadSeconds, beforeSeconds };
}

function timeR(matrix: ItemMatrix): number | null {
  return withRScript(
    'paredown-bootstrap-',
    (directory) => {
      const file = join(directory, 'wave.csv');
      const lines: string[] = [];
      for (let i = 0; i < matrix.rows; i++) {
        const row: string[] = [];
        for (let j = 0; j < matrix.columns; j++) {
          const value = matrix.data[j * matrix.rows + i];
          row.push(Number.isNaN(value) ? 'NA' : String(value));
        }
        lines.push(row.join(','));
      }
      writeFileSync(file, `${Array.from({ length: matrix.columns }, (_, j) => `i${j + 1}`).join(',')}\n${lines.join('\n')}\n`);
      // 200 resamples of: cor(use = "pairwise.complete.obs"), VIF = diag(solve(R)), eigen(R, only.values = TRUE).
      return `t <- system.time({ x <- as.matrix(read.csv(${JSON.stringify(file)})); set.seed(7); for (b in 1:${RESAMPLES}) { s <- x[sample.int(nrow(x), replace = TRUE), ]; r <- cor(s, use = "pairwise.complete.obs"); v <- diag(solve(r)); e <- eigen(r, symmetric = TRUE, only.values = TRUE)$values } }); cat(t[["elapsed"]], "\\n")`;
    },
    (stdout) => Number(stdout.trim().split(/\s+/).at(-1)),
  );
}

async function main(): Promise<void> {
  console.log(`Bootstrap, ${ROWS} × ${SCALES * 10} Pearson pairwise, ${RESAMPLES} resamples (load ${loadAverageAndCores()}; shared machine: figures are noisy)`);
  const input = engineInputFromSyntheticWave(generateWave(spec(), 4242));
  const withScales = await timeVariant('with scales (network fitted where it can decide)', input.matrix, input.items);
  const withoutScales = await timeVariant('items outside any scale', input.matrix, input.items.map((item) => ({ ...item, scale: null })));
  const rSeconds = timeR(input.matrix);
  if (rSeconds !== null) {
    console.log(`  R, ${RESAMPLES} resampled cor + solve + eigen: ${rSeconds.toFixed(2)} s`);
    for (const variant of [withScales, withoutScales]) console.log(`  ratio to R (${variant.label}): now ${(variant.nowSeconds / rSeconds).toFixed(2)} (threads ${(variant.threadSeconds / rSeconds).toFixed(2)}), earlier ${(variant.beforeSeconds / rSeconds).toFixed(2)} (goal ≤ 0.5)`);
  }
  console.log(JSON.stringify({ bench: 'bootstrap', rows: ROWS, items: SCALES * 10, resamples: RESAMPLES, withScales, withoutScales, rSeconds }));
}

main().catch((error: unknown) => {
  process.stderr.write(`${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
  process.exitCode = 1;
});
