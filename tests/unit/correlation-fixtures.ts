/**
 * Helpers for the tests of the correlation part of the core (not a module under test): the
 * committed reference fixtures written by scripts/reference/correlation.R, read once, with
 * "Infinity" strings turned back into numbers and nulls into NaN where data are concerned.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { itemMatrixFromColumns, type ItemMatrix } from '../../src/lib/stats/types';

const fixtureDirectory = fileURLToPath(new URL('../../fixtures/reference/', import.meta.url));

/** Parses one fixture, mapping "Infinity" / "-Infinity" strings back to numbers. */
export function readCorrelationFixture<T>(name: string): T {
  const text = readFileSync(fixtureDirectory + name, 'utf8');
  return JSON.parse(text, (_key, value) => (value === 'Infinity' ? Infinity : value === '-Infinity' ? -Infinity : value)) as T;
}

/** One dataset of correlation-datasets.json. */
export interface CorrelationDataset {
  name: string;
  source: string;
  rows: number;
  columns: number;
  names: string[];
  /** One array per item, null for missing. */
  data: (number | null)[][];
  completeRows: number;
  pairCounts: number[][];
  pearsonPairwise: (number | null)[][];
  pearsonListwise: (number | null)[][];
  spearmanPairwise: (number | null)[][];
  spearmanListwise: (number | null)[][];
  covariancePairwise: (number | null)[][];
  covarianceListwise: (number | null)[][];
  descriptives: { n: number; mean: number; sd: number; min: number; max: number; floorShare: number; ceilingShare: number }[];
  polychoricPairwise?: { rho: number[][]; tau: number[][] };
  polychoricListwise?: { rho: number[][]; tau: number[][] };
  polychoricPrecise?: number[][];
}

/** Provenance block every correlation fixture carries. */
export interface Provenance {
  script: string;
  r: string;
  packages: Record<string, string>;
  calls: string[];
}

let datasetsCache: { provenance: Provenance; datasets: CorrelationDataset[] } | null = null;

/** All datasets of correlation-datasets.json (R 4.2.2, psych 2.2.9, mvtnorm 1.1-3). */
export function correlationDatasets(): CorrelationDataset[] {
  if (datasetsCache === null) datasetsCache = readCorrelationFixture<{ provenance: Provenance; datasets: CorrelationDataset[] }>('correlation-datasets.json');
  return datasetsCache.datasets;
}

/** One dataset by name. */
export function correlationDataset(name: string): CorrelationDataset {
  const found = correlationDatasets().find((dataset) => dataset.name === name);
  if (found === undefined) throw new Error(`no dataset ${name} in correlation-datasets.json`);
  return found;
}

/** Item column j of a dataset with NaN for missing. */
export function datasetColumn(dataset: CorrelationDataset, j: number): number[] {
  return dataset.data[j].map((value) => (value === null ? NaN : value));
}

/** The dataset as an ItemMatrix (NaN for missing). */
export function datasetMatrix(dataset: CorrelationDataset): ItemMatrix {
  return itemMatrixFromColumns(dataset.data.map((_, j) => datasetColumn(dataset, j)));
}

/** Largest |a − b| over two row-major matrices given as a flat array and nested rows. */
export function largestDifference(flat: ArrayLike<number>, rows: readonly (readonly (number | null)[])[]): number {
  let largest = 0;
  rows.forEach((row, i) =>
    row.forEach((value, j) => {
      const difference = Math.abs(flat[i * rows.length + j] - (value as number));
      largest = Math.max(largest, Number.isNaN(difference) ? Infinity : difference);
    }),
  );
  return largest;
}

/** True when any element is NaN. */
export function hasNaN(values: ArrayLike<number>): boolean {
  for (let i = 0; i < values.length; i++) if (Number.isNaN(values[i])) return true;
  return false;
}
