/**
 * runAudit's parallel analysis when its draws are large enough for worker threads
 * (src/lib/audit/random-eigenvalue-threads.ts, started before the evidence on the expected size):
 * the JSON holds exactly what the core's one-thread parallelAnalysis gives for the same
 * eigenvalues, respondents, draws and seed; and the polychoric variant, started once the
 * thresholds are known, what polychoricParallelAnalysis gives. The data are random (our generator); the claim is the
 * equality, not a statistic.
 */
import { describe, expect, it } from 'vitest';
import { runAudit, type AuditInput } from '../../src/lib/audit/run-audit';
import { PARALLEL_ANALYSIS_THREAD_MIN_WORK, polychoricParallelAnalysisThreadCount } from '../../src/lib/audit/random-eigenvalue-threads';
import { correlationMatrix } from '../../src/lib/stats/correlation-matrix';
import { forgetRandomCorrelationEigenvalues, parallelAnalysis } from '../../src/lib/stats/parallel-analysis';
import { forgetRandomPolychoricEigenvalues, polychoricParallelAnalysis } from '../../src/lib/stats/parallel-analysis-polychoric';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { selectItems } from '../../src/lib/stats/types';

/** rows × items five-point answers from one common factor; item 0 constant; a few answers missing. */
function input(rows: number, items: number, missingRows: readonly number[]): AuditInput {
  const random = createSeededRandom(515);
  const data = new Float64Array(rows * items);
  for (let i = 0; i < rows; i++) {
    const factor = random.nextNormal();
    for (let j = 0; j < items; j++) {
      const latent = 0.6 * factor + 0.8 * random.nextNormal();
      data[j * rows + i] = j === 0 ? 3 : Math.min(5, Math.max(1, Math.round(3 + latent)));
    }
  }
  missingRows.forEach((i, t) => {
    data[(1 + (t % (items - 1))) * rows + i] = Number.NaN;
  });
  return {
    matrix: { rows, columns: items, data },
    items: Array.from({ length: items }, (_, j) => ({ id: `Q${j}`, scale: j < items / 2 ? 'A' : 'B', text: null, locked: false, min: 1, max: 5, reverse: false })),
    rowsInWave: rows,
    excluded: 0,
    outcome: null,
  };
}

describe('runAudit with parallel analysis on worker threads', () => {
  it.each(['pairwise', 'listwise'] as const)('gives the one-thread answer (%s)', async (missing) => {
    const [rows, items, iterations, seed] = [240, 61, 500, 99];
    // 60 varying items × 500 draws: above the threshold, so the draws go to threads.
    expect(iterations * (items - 1) ** 3).toBeGreaterThanOrEqual(PARALLEL_ANALYSIS_THREAD_MIN_WORK);
    forgetRandomCorrelationEigenvalues();
    const audit = await runAudit(input(rows, items, [3, 50, 51, 200]), { missing, seed, parallelIterations: iterations, bootstrap: 0 });
    const respondents = missing === 'pairwise' ? rows : rows - 4;
    forgetRandomCorrelationEigenvalues();
    const direct = parallelAnalysis(audit.eigenvalues, respondents, { seed, iterations });
    expect(audit.parallelAnalysis).toMatchObject({ correlation: 'pearson', iterations, seed, suggested: direct.suggested });
    expect(audit.parallelAnalysis?.random95).toEqual(direct.random95);
    expect(audit.correlation.items).toHaveLength(items - 1); // the constant item is out
  }, 120_000);
});

describe('runAudit with polychoric parallel analysis', () => {
  // Its draws go through randomPolychoricEigenvaluesOnThreads, on threads only from
  // POLYCHORIC_PARALLEL_THREAD_MIN_PAIRS pair fits (far more than a unit test should fit); that
  // threads give the core's values to the last bit is random-eigenvalue-threads.test.ts's claim.
  it("gives the core's one-thread answer to the last bit", async () => {
    const [rows, items, seed] = [200, 19, 41];
    // 18 varying items × 20 data sets: 3,060 pair fits, on the calling thread.
    expect(polychoricParallelAnalysisThreadCount(items - 1, 20, 2)).toBe(0);
    const data = input(rows, items, [7, 90]);
    forgetRandomPolychoricEigenvalues();
    const audit = await runAudit(data, { method: 'polychoric', seed, parallelIterations: 100, bootstrap: 0 });
    // The core's one-thread answer on the audit's eigenvalues and the observed thresholds of the
    // varying items (pairwise: every respondent).
    const usable = Array.from({ length: items - 1 }, (_, k) => k + 1);
    const thresholds = correlationMatrix(selectItems(data.matrix, usable), { method: 'polychoric', missing: 'pairwise', repair: 'none' }).thresholds as number[][];
    forgetRandomPolychoricEigenvalues();
    const direct = polychoricParallelAnalysis(audit.eigenvalues, rows, thresholds, { seed, iterations: 20 });
    const parallel = audit.parallelAnalysis as unknown as { correlation: string; iterations: number; seed: number; suggested: number; random95: number[]; note: string };
    expect(parallel).toMatchObject({ correlation: 'polychoric', iterations: 20, seed, suggested: direct.suggested });
    expect(parallel.note).toMatch(/20 draws instead of 100/);
    expect(parallel.random95).toHaveLength(items - 1);
    direct.random95.forEach((value, k) => expect(Object.is(parallel.random95[k], value), `random95[${k}]`).toBe(true));
  }, 120_000);
});
