/**
 * Loads fixtures/reference/engine-evidence.json (written by scripts/reference/engine-evidence.R)
 * as the engine's input: the recoded matrix and the item list. Shared by the engine's tests.
 */
import { readFileSync } from 'node:fs';
import type { EngineItem } from '../../src/lib/engine/types';
import { itemMatrixFromColumns, type ItemMatrix } from '../../src/lib/stats/types';

export interface ScaleReference {
  id: string;
  items: string[];
  alpha: number;
  psychRawAlpha: number;
  itemRest: number[];
  alphaIfDeleted: number[];
  omegaTotal: number;
}

export interface PolicyReference {
  items: string[];
  correlation: number[][];
  pairN: number[][];
  vif: number[];
  eigenvalues: number[];
  conditionNumber: number;
  scales: ScaleReference[];
}

export interface WhatIfReference {
  removed: string[];
  maxVif: number;
  conditionNumber: number;
  scales: { id: string; alpha: number; omegaTotal: number; items: number; spearmanBrown: number }[];
}

export interface EngineReference {
  items: { id: string; scale: string | null }[];
  rows: number;
  data: (number | null)[][];
  descriptives: { id: string; n: number; missingRate: number; floor: number; ceiling: number }[];
  pairwise: PolicyReference;
  listwise: PolicyReference;
  collinearity: { rowsUsed: number; conditionIndices: number[]; varianceProportions: number[][] };
  keeperVif: { A1: number; A5: number };
  fisherZ: { a: string; b: string; r: number; n: number; lower: number; upper: number };
  whatIf: { pairwise: WhatIfReference; listwise: WhatIfReference };
}

export const engineReference = JSON.parse(
  readFileSync(new URL('../../fixtures/reference/engine-evidence.json', import.meta.url), 'utf8'),
) as EngineReference;

/** The fixture as engine input (every item on a 1..5 range, nothing locked unless asked). */
export function referenceInput(locked: readonly string[] = []): { matrix: ItemMatrix; items: EngineItem[] } {
  const matrix = itemMatrixFromColumns(engineReference.data.map((column) => column.map((value) => (value === null ? Number.NaN : value))));
  const items: EngineItem[] = engineReference.items.map((item) => ({
    id: item.id,
    scale: item.scale ?? null,
    text: null,
    locked: locked.includes(item.id),
    min: 1,
    max: 5,
  }));
  return { matrix, items };
}
