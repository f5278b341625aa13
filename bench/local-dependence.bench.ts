/**
 * Local-dependence core benchmark (issue 9): the EBIC graphical-lasso path with wTO, the
 * residual-correlation bootstrap, Bentler-Yuan smoothing and the EM covariance, on seeded data
 * of the sizes an audit meets (25 and 40 items; a 40-item scale with 200 draws; 54 items × 400
 * rows with 3% missing answers). Each stage runs three times after one warm-up; the best time
 * is printed. The last line is machine-readable: {"bench":"local-dependence",...}.
 *
 * Run: `npx tsx bench/local-dependence.bench.ts` (or `npm run bench -- local-dependence`).
 * Figures only: nothing here asserts on time.
 */
import { loadAverageAndCores } from './bench-helpers';
import { ebicGlasso } from '../src/lib/stats/ebic-glasso';
import { emCovariance } from '../src/lib/stats/em-covariance';
import { belsleyCollinearityFromMoments } from '../src/lib/stats/belsley-collinearity';
import { centeredCrossProducts, pearsonFromCrossProducts } from '../src/lib/stats/cross-products';
import { oneFactorResiduals, residualBootstrap } from '../src/lib/stats/residual-correlations';
import { createSeededRandom } from '../src/lib/stats/seeded-random';
import { smoothCorrelationMatrix } from '../src/lib/stats/smooth-correlation-matrix';
import type { ItemMatrix, SquareMatrix } from '../src/lib/stats/types';
import { weightedTopologicalOverlap } from '../src/lib/stats/weighted-topological-overlap';

const random = createSeededRandom(20261202);

/** Five-point answers of `items` items on `factors` factors (loadings .5-.8), n rows, a share missing. */
function wave(rows: number, items: number, factors: number, missingShare: number): ItemMatrix {
  const scores = Array.from({ length: factors }, () => Float64Array.from({ length: rows }, () => random.nextNormal()));
  const data = new Float64Array(rows * items);
  for (let j = 0; j < items; j++) {
    const loading = 0.5 + 0.3 * random.next();
    const factor = scores[j % factors];
    for (let i = 0; i < rows; i++) {
      const z = loading * factor[i] + Math.sqrt(1 - loading * loading) * random.nextNormal();
      data[j * rows + i] = random.next() < missingShare ? Number.NaN : Math.max(1, Math.min(5, Math.round(3 + 1.1 * z)));
    }
  }
  return { rows, columns: items, data };
}

function correlationOf(matrix: ItemMatrix): SquareMatrix {
  return pearsonFromCrossProducts(centeredCrossProducts(matrix));
}

function best(run: () => void): number {
  run();
  let fastest = Number.POSITIVE_INFINITY;
  for (let repeat = 0; repeat < 3; repeat++) {
    const start = performance.now();
    run();
    fastest = Math.min(fastest, performance.now() - start);
  }
  return fastest / 1000;
}

console.log(`load ${loadAverageAndCores()}`);
const figures: Record<string, number> = {};

for (const items of [25, 40]) {
  const r = correlationOf(wave(400, items, 5, 0));
  figures[`ebicGlassoWto${items}`] = best(() => weightedTopologicalOverlap(ebicGlasso(r, 400).absoluteNetwork));
  console.log(`  ebicGlasso (100 penalties) + wTO, ${items} items: ${figures[`ebicGlassoWto${items}`].toFixed(3)} s`);
}

const scale = correlationOf(wave(300, 40, 1, 0));
const loadings = oneFactorResiduals(scale).loadings;
figures.residualBootstrap40x200 = best(() => residualBootstrap(loadings, 300, { draws: 200, seed: 1 }));
console.log(`  residualBootstrap, 40-item scale, n 300, 200 draws: ${figures.residualBootstrap40x200.toFixed(3)} s`);
const thresholds = Array.from({ length: 10 }, () => [-1.3, -0.4, 0.4, 1.3]);
figures.residualBootstrap10Ordinal = best(() => residualBootstrap(loadings.subarray(0, 10), 300, { draws: 200, seed: 1, thresholds }));
console.log(`  residualBootstrap, 10 five-point items, n 300, 200 draws (Pearson on codes): ${figures.residualBootstrap10Ordinal.toFixed(3)} s`);

// An indefinite matrix: a 40-item correlation matrix with one pair pushed to .99 against the rest.
const indefinite = correlationOf(wave(300, 40, 4, 0));
indefinite.data[1] = 0.99;
indefinite.data[40] = 0.99;
figures.smoothBentlerYuan40 = best(() => smoothCorrelationMatrix(indefinite));
console.log(`  smoothCorrelationMatrix (Bentler-Yuan, MTFA), 40 items: ${figures.smoothBentlerYuan40.toFixed(3)} s`);

const missing = wave(400, 54, 6, 0.03);
figures.emBkw54x400 = best(() => {
  const em = emCovariance(missing);
  belsleyCollinearityFromMoments(em.means, em.covariance, em.rows);
});
console.log(`  emCovariance + BKW from moments, 54 items × 400 rows, 3% missing: ${figures.emBkw54x400.toFixed(3)} s`);

console.log(JSON.stringify({ bench: 'local-dependence', ...Object.fromEntries(Object.entries(figures).map(([key, value]) => [key, Number(value.toFixed(4))])) }));
