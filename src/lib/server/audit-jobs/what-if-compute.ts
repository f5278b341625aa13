/**
 * The live what-if of the designer's decisions, as the what-if worker thread computes it: the
 * audit's evidence is rebuilt once from the stored wave with the audit's own settings (the same
 * `computeEvidence` call the audit made, so the same matrices) and kept in a small cache keyed by
 * the audit; each request then runs the engine's pure `simulateCut` on it, which reads principal
 * submatrices (or recomputes from the data of the remaining items where the evidence says it must).
 * Touches no database: the main thread reads the rows and sends them. docs/decisions/011.
 */
import { auditInputFromJobWave } from './job-input';
import { computeEvidence } from '../../engine/compute-evidence';
import { fitOutcomeModel, outcomePredictorColumns, refitOutcomeAfterCut, type OutcomeModelInput } from '../../audit/outcome-model';
import { resolveEngineSettings, type EngineSettings } from '../../engine/engine-settings';
import { engineSettingsOf } from '../../audit/settings-table';
import { simulateCut } from '../../engine/simulate-cut';
import type { EngineEvidence } from '../../engine/types';
import type { ItemMatrix } from '../../stats/types';
import type { WhatIfResponse } from '../../api/cut-list';
import type { AuditWorkerJob } from './worker-protocol';
import type { ResolvedAuditSettings } from './audit-settings';

/** One what-if job: the audit's stored wave and settings, and the items the decisions remove. */
export interface WhatIfJob {
  readonly jobId: string;
  /** Cache key: the audit id and its settings hash (a done audit never changes). */
  readonly key: string;
  readonly auditId: string;
  readonly wave: AuditWorkerJob['wave'];
  readonly settings: ResolvedAuditSettings;
  readonly removed: readonly string[];
}

/** Evidence kept per audit. */
interface Prepared {
  readonly evidence: EngineEvidence;
  readonly matrix: ItemMatrix;
  readonly settings: EngineSettings;
  /** The audit's driver model before any cut, when the audit has an outcome. */
  readonly driverModel: { input: OutcomeModelInput; columns: number[]; before: ReturnType<typeof fitOutcomeModel> } | null;
}

/** Audits whose evidence a worker keeps (the workspace of one or two studies at a time). */
export const WHAT_IF_CACHE_SIZE = 3;

/** A small least-recently-used cache of prepared evidence. */
export class WhatIfCache {
  private readonly entries = new Map<string, Prepared>();

  get(key: string): Prepared | undefined {
    const found = this.entries.get(key);
    if (found) {
      this.entries.delete(key);
      this.entries.set(key, found);
    }
    return found;
  }

  set(key: string, value: Prepared): void {
    this.entries.set(key, value);
    while (this.entries.size > WHAT_IF_CACHE_SIZE) this.entries.delete(this.entries.keys().next().value as string);
  }
}

/** Rebuilds an audit's evidence from its stored wave and settings. */
function prepare(job: WhatIfJob): Prepared {
  const input = auditInputFromJobWave(job.wave, { outcome: job.settings.outcome, locked: job.settings.locked });
  const settings = resolveEngineSettings(engineSettingsOf(job.settings));
  const evidence = computeEvidence(input.matrix, input.items, settings);
  let driverModel: Prepared['driverModel'] = null;
  if (input.outcome) {
    const modelInput = { matrix: input.matrix, ids: input.items.map((item) => item.id), outcome: input.outcome };
    const columns = outcomePredictorColumns(modelInput, evidence.usable, job.settings.predictors ?? []);
    driverModel = { input: modelInput, columns, before: fitOutcomeModel(modelInput, columns, []) };
  }
  return { evidence, matrix: input.matrix, settings, driverModel };
}

/**
 * Computes one what-if.
 * @param job the job.
 * @param cache evidence kept from earlier jobs (filled on a miss).
 * @throws {RangeError} when a removed id is not an item of the audit (the route checks first).
 * @returns the figures after the cut, with those before.
 * References: src/lib/engine/simulate-cut.ts (Marquardt 1970; Belsley, Kuh & Welsch 1980;
 * Cronbach 1951; McDonald 1999; Spearman 1910, Brown 1910).
 */
export function computeWhatIf(job: WhatIfJob, cache: WhatIfCache): WhatIfResponse {
  const started = performance.now();
  let prepared = cache.get(job.key);
  const coldStart = prepared === undefined;
  if (!prepared) {
    prepared = prepare(job);
    cache.set(job.key, prepared);
  }
  const after = simulateCut(prepared.evidence, prepared.matrix, job.removed, prepared.settings);
  const model = prepared.driverModel;
  const inModel = model ? job.removed.filter((id) => model.columns.some((j) => model.input.ids[j] === id)) : [];
  const refit = model && inModel.length > 0 && inModel.length < model.columns.length ? refitOutcomeAfterCut(model.input, model.columns, model.before, inModel, []) : null;
  return {
    auditId: job.auditId,
    removed: [...after.removed],
    itemsRemoved: after.itemsRemoved,
    minutesSaved: after.minutesSaved,
    secondsPerItem: after.secondsPerItem,
    maxVifBefore: after.maxVifBefore,
    maxVif: after.maxVif,
    conditionNumberBefore: after.conditionNumberBefore,
    conditionNumber: after.conditionNumber,
    scales: after.scales.map((scale) => ({
      id: scale.id,
      itemsBefore: scale.itemsBefore,
      items: scale.items,
      alphaBefore: scale.alphaBefore,
      alpha: scale.alpha,
      omegaBefore: scale.omegaBefore,
      omega: scale.omegaTotal,
      spearmanBrown: scale.spearmanBrown,
    })),
    warnings: after.warnings.map((warning) => ({ code: warning.code, items: [...warning.items], message: warning.message })),
    driverModel: model
      ? {
          outcome: model.before.outcome,
          r2Before: model.before.r2,
          adjR2Before: model.before.adjR2,
          afterDecisions: refit && { removed: refit.removed, n: refit.n, r2: refit.r2, adjR2: refit.adjR2, coefficients: refit.coefficients.map(({ term, se, seRatio }) => ({ term, se, seRatio })) },
        }
      : null,
    computeMs: Math.round((performance.now() - started) * 10) / 10,
    coldStart,
  };
}
