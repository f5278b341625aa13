/**
 * The audit's structure figures beside the engine: KMO and Bartlett's test (with exact copies set
 * aside), and the parallel analysis's plumbing that runAudit uses: which variant applies, the size
 * to start its draws at before the evidence exists, the respondents behind the tests, and the
 * JSON of each variant. Split from run-audit.ts, which composes them.
 * References: Kaiser 1974 (KMO); Bartlett 1950 (sphericity); Horn 1965 and Garrido, Abad &
 * Ponsoda 2013 (parallel analysis); see the functions they call.
 */
import { namePositions } from '../engine/notice-warnings';
import type { EngineSettings } from '../engine/engine-settings';
import { principalSubmatrix } from '../engine/principal-submatrix';
import type { EngineEvidence } from '../engine/types';
import { bartlettSphericity } from '../stats/bartlett-sphericity';
import { completeRows } from '../stats/complete-rows';
import { usableItems } from '../stats/usable-items';
import { kaiserMeyerOlkin } from '../stats/kmo';
import type { parallelAnalysis } from '../stats/parallel-analysis';
import type { polychoricParallelAnalysis } from '../stats/parallel-analysis-polychoric';
import { selectItems, type ItemMatrix, type NumericalNotice } from '../stats/types';
import type { AuditJson, AuditWarningJson } from './audit-json';

/**
 * Whether the audit runs the Pearson parallel analysis (normal random data): two or more items,
 * three or more respondents, and not the polychoric variant (which needs every item's thresholds).
 * structureStatistics leaves exactly these cases to runAudit.
 */
export function pearsonParallelAnalysisApplies(evidence: EngineEvidence, respondents: number): boolean {
  if (evidence.correlation.order < 2 || respondents < 3) return false;
  const thresholds = evidence.thresholds ?? null;
  return !(evidence.method === 'polychoric' && thresholds !== null && thresholds.every((limits) => limits.length > 0));
}

/**
 * The observed thresholds when the audit runs the polychoric parallel analysis (random ordinal data
 * at those thresholds): two or more items, three or more respondents, the polychoric method and
 * every item with a threshold; null otherwise. structureStatistics leaves exactly these cases to runAudit.
 */
export function polychoricParallelAnalysisThresholds(evidence: EngineEvidence, respondents: number): readonly (readonly number[])[] | null {
  if (evidence.correlation.order < 2 || respondents < 3 || evidence.method !== 'polychoric') return null;
  const thresholds = evidence.thresholds ?? null;
  return thresholds !== null && thresholds.every((limits) => limits.length > 0) ? thresholds : null;
}

/** The JSON of a polychoric parallel analysis; `iterations` is the draws asked for (more than it makes, said in the note). */
export function polychoricParallelJson(result: ReturnType<typeof polychoricParallelAnalysis>, iterations: number): AuditJson['parallelAnalysis'] {
  return {
    observed: [...result.observed], random95: [...result.random95], suggested: result.suggested, iterations: result.iterations, seed: result.seed,
    correlation: 'polychoric',
    note: `Random data were ordinal items cut at each item's observed thresholds, correlated by polychoric r like the observed matrix (Garrido, Abad & Ponsoda 2013); ${result.iterations} draws${result.iterations < iterations ? ` instead of ${iterations}, as each draw costs a full polychoric matrix` : ''}.`,
  };
}

/** The JSON of a Pearson parallel analysis. */
export function pearsonParallelJson(result: ReturnType<typeof parallelAnalysis>): AuditJson['parallelAnalysis'] {
  return {
    observed: [...result.observed], random95: [...result.random95], suggested: result.suggested, iterations: result.iterations, seed: result.seed,
    correlation: 'pearson',
    note: `Random data were standard normal of the same size, correlated by Pearson r (each random matrix drawn from its Wishart law, Bartlett's decomposition); ${result.iterations} draws.`,
  };
}

/**
 * The size of the Pearson parallel analysis as computeEvidence and respondentsBehind will give it,
 * read before them: the items that vary (usableItems) and, under listwise deletion, the rows
 * complete on them. Only a guess to start the draws early: pairs without a correlation can still
 * take items out, and then the draws of the right size are made after the evidence. Null when
 * the matrix cannot be read (computeEvidence then says why).
 */
export function expectedParallelAnalysisSize(matrix: ItemMatrix, missing: EngineSettings['missing']): { rows: number; items: number } | null {
  let usable: readonly number[];
  try {
    usable = usableItems(matrix).usable;
  } catch (error) {
    if (error instanceof RangeError) return null;
    throw error;
  }
  if (missing === 'pairwise') return { rows: matrix.rows, items: usable.length };
  const { rows, data } = matrix;
  let complete = 0;
  for (let i = 0; i < rows; i++) {
    let answered = true;
    for (const j of usable) {
      const value = data[j * rows + i];
      if (value !== value) {
        answered = false;
        break;
      }
    }
    if (answered) complete++;
  }
  return { rows: complete, items: usable.length };
}

/** Respondents behind the structure tests: complete rows under listwise, every row under pairwise. */
export function respondentsBehind(evidence: EngineEvidence, matrix: ItemMatrix): number {
  if (evidence.missing === 'pairwise' || evidence.completeData) return matrix.rows;
  return completeRows(selectItems(matrix, evidence.usable)).length;
}

export interface StructureStatistics {
  readonly kmo: number | null;
  readonly kmoLabel: string | null;
  readonly msa: (number | null)[];
  readonly bartlett: AuditJson['bartlett'];
  readonly warnings: AuditWarningJson[];
}

/**
 * KMO and Bartlett's test, and whether parallel analysis can run (runAudit runs it, from draws it
 * starts early). KMO and Bartlett need an invertible matrix, so the last item of each exactly
 * dependent group (e.g. a duplicated column) is set aside for them, with a warning; the
 * eigenvalues and parallel analysis use the full matrix.
 */
export function structureStatistics(evidence: EngineEvidence, respondents: number, ids: readonly string[]): StructureStatistics {
  const warnings: AuditWarningJson[] = [];
  const order = evidence.correlation.order;
  const usableIds = evidence.usable.map((j) => ids[j]);
  if (order < 2) {
    warnings.push({ code: 'too-few-items', items: usableIds, message: "Fewer than two items vary, so KMO, Bartlett's test and parallel analysis were skipped." });
    return { kmo: null, kmoLabel: null, msa: new Array(order).fill(null), bartlett: null, warnings };
  }
  const setAside = new Set(evidence.exactDependencies.map((group) => Math.max(...group)));
  const kept = evidence.usable.map((j, local) => ({ j, local })).filter(({ j }) => !setAside.has(j));
  const keptLocal = kept.map(({ local }) => local);
  const keptIds = kept.map(({ j }) => ids[j]);
  if (setAside.size > 0) {
    const names = [...setAside].map((j) => ids[j]);
    warnings.push({
      code: 'set-aside-for-structure',
      items: names,
      message: `${names.join(', ')} ${names.length > 1 ? 'are' : 'is'} an exact copy or combination of other items, so KMO and Bartlett's test are computed without ${names.length > 1 ? 'them' : 'it'}.`,
    });
  }
  const reduced = keptLocal.length === order ? evidence.correlation : principalSubmatrix(evidence.correlation, keptLocal);
  const msa: (number | null)[] = new Array(order).fill(null);
  let kmo: ReturnType<typeof kaiserMeyerOlkin> | null = null;
  let bartlett: ReturnType<typeof bartlettSphericity> | null = null;
  if (reduced.order >= 2) {
    kmo = kaiserMeyerOlkin(reduced);
    warnings.push(...noticeWarnings(kmo.notices, keptIds));
    kmo.items.forEach((entry, k) => {
      msa[keptLocal[k]] = entry.msa;
    });
    bartlett = bartlettSphericity(reduced, respondents);
    warnings.push(...noticeWarnings(bartlett.notices, keptIds));
  }
  if (respondents >= 3) {
    // Parallel analysis: left null here; runAudit fills it from the draws it started, polychoric
    // (polychoricParallelAnalysisThresholds) or Pearson (pearsonParallelAnalysisApplies).
  } else {
    warnings.push({ code: 'parallel-analysis-skipped', items: [], message: 'Parallel analysis needs at least three respondents with answers; it was skipped.' });
  }
  return {
    kmo: kmo?.overall ?? null,
    kmoLabel: kmo?.label ?? null,
    msa,
    bartlett: bartlett === null ? null : { chi2: bartlett.chiSquare, df: bartlett.degreesOfFreedom, p: bartlett.pValue, respondents: bartlett.respondents, items: keptIds.length },
    warnings,
  };
}

function noticeWarnings(notices: readonly NumericalNotice[], ids: readonly string[]): AuditWarningJson[] {
  return notices.map((notice) => ({ code: notice.code, items: notice.items.map((k) => ids[k] ?? String(k)), message: namePositions(notice.message, ids) }));
}
