/**
 * Helpers for the tests of the local-dependence core (not a module under test): the committed
 * reference fixtures written by scripts/reference/local-dependence-network.R and
 * scripts/reference/local-dependence-residuals.R, and a largest-difference helper.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { SquareMatrix } from '../../src/lib/stats/types';

/** One glasso::glasso case (see scripts/reference/local-dependence-network.R). */
export interface GlassoReference {
  name: string;
  rho: number;
  penalizeDiagonal: boolean;
  input: number[][];
  tight: { call: string; w: number[][]; wi: number[][]; niter: number };
  default: { call: string; w: number[][]; wi: number[][]; niter: number };
}

/** One qgraph::EBICglasso case. */
export interface EbicReference {
  name: string;
  n: number;
  input: number[][];
  tight: {
    call: string;
    lambda: number[];
    ebic: number[];
    selectedIndex: number;
    network: number[][];
    wto: { call: string; value: number[][] };
  };
  default: { call: string; lambda: number; selectedIndex: number; network: number[][] };
}

export interface NetworkFixture {
  versions: Record<string, string>;
  glasso: GlassoReference[];
  ebic: EbicReference[];
}

function readFixture<T>(name: string): T {
  return JSON.parse(readFileSync(fileURLToPath(new URL(`../../fixtures/reference/${name}`, import.meta.url)), 'utf8')) as T;
}

export const networkFixture = readFixture<NetworkFixture>('local-dependence-network.json');

/** Largest |a_ij − b_ij| between a core matrix and nested reference rows. */
export function largestDifference(actual: SquareMatrix, expected: readonly (readonly number[])[]): number {
  const p = actual.order;
  if (expected.length !== p) throw new Error(`order ${p} against ${expected.length} reference rows`);
  let largest = 0;
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) largest = Math.max(largest, Math.abs(actual.data[i * p + j] - expected[i][j]));
  }
  return largest;
}

export { readFixture };

/** One scale of psych::bfi with its one-factor minres residuals (scripts/reference/local-dependence-residuals.R). */
export interface ResidualReference {
  name: string;
  items: string[];
  correlation: number[][];
  call: string;
  loadings: number[];
  residual: number[][];
  meanResidual: number;
  relative: number[][];
  q3: number[][];
  q3Relative: number[][];
}

/** One bootstrap null distribution drawn in R. */
export interface BootstrapReference {
  name: string;
  loadings: number[];
  n: number;
  thresholds: number[][] | null;
  maxRelative: number[];
  maxRelativeQ3: number[];
  call: string;
  quantiles: [number, number];
  quantilesQ3: [number, number];
}

export interface ResidualFixture {
  versions: Record<string, string>;
  residuals: ResidualReference[];
  bootstrap: BootstrapReference[];
}

export const residualFixture = readFixture<ResidualFixture>('local-dependence-residuals.json');

/** Two-sample Kolmogorov-Smirnov distance sup |F_a − F_b| (Smirnov 1948), both samples sorted ascending. */
export function kolmogorovSmirnovDistance(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let i = 0;
  let j = 0;
  let largest = 0;
  while (i < a.length && j < b.length) {
    const value = Math.min(a[i], b[j]);
    while (i < a.length && a[i] <= value) i++;
    while (j < b.length && b[j] <= value) j++;
    largest = Math.max(largest, Math.abs(i / a.length - j / b.length));
  }
  return largest;
}

/** Figures of a matrix that inverts it, from R (null when it is not positive definite). */
export interface InverseFigures {
  smallestEigenvalue: number;
  largestVif: number | null;
  kmo: number | null;
  conditionNumber: number | null;
}

/** One indefinite matrix of scripts/reference/smooth-correlation.R. */
export interface SmoothReference {
  name: string;
  source: string;
  correlation: number[][];
  mtfa: { call: string; communalities: number[] };
  bentlerYuan: { call: string; matrix: number[][]; figures: InverseFigures };
  corSmooth: { call: string; matrix: number[][]; figures: InverseFigures };
  before: InverseFigures;
  pearson: { call: string; figures: InverseFigures } | null;
}

export const smoothFixture = readFixture<{ versions: Record<string, string>; cases: SmoothReference[] }>('smooth-correlation.json');

/** One data set of scripts/reference/em-covariance.R. */
export interface EmReference {
  name: string;
  source: string;
  rows: number;
  columns: number;
  missingShare: number;
  completeRows: number;
  data: (number | null)[][];
  em: { call: string; means: number[]; covariance: number[][]; iterations: number; rows: number };
  lavaan: { call: string; means: number[]; covariance: number[][] };
  bkw: { call: string; singularValues: number[]; conditionIndices: number[]; proportions: number[][] };
}

export const emFixture = readFixture<{ versions: Record<string, string>; cases: EmReference[] }>('em-covariance.json');
