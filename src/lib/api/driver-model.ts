/**
 * Contract of GET /api/audits/{id}/driver-model: the audit's outcome model alone (the panel of
 * the workspace loads this slice, not the whole audit JSON). Shapes and the typed call: safe for islands.
 */
import { callApi, segment, type ApiResult } from './client';

/** The three factors of a standard error: se = residualScale / (spread · overlap). */
export interface StandardErrorFactorsView {
  residualScale: number;
  spread: number;
  /** sqrt(1 − R²_j); 1/overlap = sqrt(VIF_j) is the inflation. */
  overlap: number;
}

/** One coefficient of the driver model. */
export interface DriverCoefficientView {
  term: string;
  estimate: number;
  se: number | null;
  t: number | null;
  p: number | null;
  vif: number | null;
  relativeWeight: number | null;
  aliased?: boolean;
  seFactors?: StandardErrorFactorsView | null;
  /** After the cut only: se after / se before. */
  seRatio?: number | null;
}

/** One fit of the driver model. */
export interface DriverFitView {
  n: number;
  r2: number;
  adjR2: number | null;
  sigma: number | null;
  coefficients: DriverCoefficientView[];
}

/** The answer of the route. */
export interface DriverModelResponse {
  /** Null when the audit has no outcome (or the model was skipped: see `note`). */
  model:
    | (DriverFitView & {
        outcome: string;
        completeRows: number;
        respondentsUsed: number;
        missing: string;
        afterCut: (DriverFitView & { removed: string[] }) | null;
      })
    | null;
  /** Why there is no model, in one sentence, when there is none. */
  note: string | null;
}

/** The typed calls of this domain. */
export const driverModelApi = {
  get: (auditId: string): Promise<ApiResult<DriverModelResponse>> => callApi('GET', `/api/audits/${segment(auditId)}/driver-model`),
};
