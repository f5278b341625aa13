/**
 * Local-dependence evaluation of the engine (issue 9): 60 generated waves of each kind (doublets,
 * homogeneous scales, cross-loading decoys, clean), precision and recall of each detector on its
 * own (|r| ≥ .80, the sequential modification-index test, relative residual above the bootstrap
 * critical value, wTO ≥ .25) and of the
 * engine, and recommendations on the waves where nothing is redundant. To stay affordable the
 * evaluation runs 30 EBIC penalties and 100 residual-bootstrap draws (an audit: 100 and 200);
 * about 11-13 minutes on this loaded 2-core machine.
 *
 * Run: npx tsx bench/engine-local-dependence.bench.ts   (prints figures, then one JSON line);
 * WAVES_PER_KIND and FIRST_SEED (environment) pick other seeds, e.g. a held-out set.
 * Beside them it prints what published detectors in R found on the same files (seeds 1-60,
 * fixtures/reference/local-dependence-recall.json from scripts/reference/local-dependence-recall.R).
 */
import { existsSync, readFileSync } from 'node:fs';
import { evaluateLocalDependence, LOCAL_DEPENDENCE_DETECTORS } from '../src/lib/evaluation/evaluate-local-dependence';

const WAVES_PER_KIND = Number(process.env.WAVES_PER_KIND ?? 60);
const FIRST_SEED = Number(process.env.FIRST_SEED ?? 1);
const start = Date.now();
const result = await evaluateLocalDependence({ wavesPerKind: WAVES_PER_KIND, firstSeed: FIRST_SEED, settings: { ebicPenaltyCount: 30, residualBootstrapDraws: 100 } });
console.log(`${WAVES_PER_KIND} waves per kind (seeds ${FIRST_SEED}-${FIRST_SEED + WAVES_PER_KIND - 1}), ${result.plantedDoublets} planted doublets`);
for (const name of LOCAL_DEPENDENCE_DETECTORS) {
  const score = result.detectors[name];
  console.log(`${name.padEnd(12)} precision ${score.precision.toFixed(3)}  recall ${score.recall.toFixed(3)}  flags by kind ${JSON.stringify(score.flagsByKind)}`);
}
console.log(`recommendations on waves with nothing redundant: ${JSON.stringify(result.recommendationsByKind)}, ${result.cleanRecommendationsPerTenWaves.toFixed(2)} per ten waves`);
console.log('engine per cell (respondents × planted residual): found / planted; per respondents band: false pairs');
for (const cell of result.cells) console.log(`  n ${cell.n}  residual ${cell.residual.padEnd(7)} ${cell.found}/${cell.planted}${cell.residual === 'all' ? `  false pairs ${cell.falsePairs}` : ''}`);
console.log(`seconds ${((Date.now() - start) / 1000).toFixed(0)}`);
const referenceFile = new URL('../fixtures/reference/local-dependence-recall.json', import.meta.url);
if (existsSync(referenceFile)) {
  type Cell = { n: string; residual: string; planted: number; found: number; falsePairs?: number };
  const reference = JSON.parse(readFileSync(referenceFile, 'utf8')) as { detectors: Record<string, { precision: number; recall: number; cleanFlagsPerTenWaves: number; cells: Cell[] }> };
  console.log('R on the same files (seeds 1-60; scripts/reference/local-dependence-recall.R): found / planted per cell');
  for (const [name, score] of Object.entries(reference.detectors)) {
    const cells = score.cells.map((cell) => `${cell.found}/${cell.planted}${cell.residual === 'all' ? ` (false ${cell.falsePairs})` : ''}`).join(' ');
    console.log(`  ${name.padEnd(18)} precision ${score.precision.toFixed(3)} recall ${score.recall.toFixed(3)} clean flags per ten waves ${score.cleanFlagsPerTenWaves.toFixed(2)}  ${cells}`);
  }
}
console.log(JSON.stringify({ bench: 'engine-local-dependence', ...result, misses: undefined }));
