/**
 * Typed access to fixtures/reference/reliability.json (written by scripts/reference/reliability.R)
 * for the alpha, item-rest, alpha-if-deleted, Bartlett, minres and omega tests.
 */
import { readReferenceFixture } from './reliability-fixtures';

export interface ReliabilityCase {
  name: string;
  description: string;
  items: string[];
  reversed: string[];
  n: number;
  covariance: number[][];
  correlation: number[][];
  alpha: { call: string; rawAlpha: number; stdAlpha: number; rDrop: number[]; alphaDropRaw: number[]; alphaDropStd: number[] };
  bartlett: { call: string; chisq: number; df: number; p: number };
  minres: { call: string; loadings: number[]; communalities: number[] };
  omega: { call: string; omegaTotal: number; psychOmegaCall: string; psychOmegaTotal: number | null };
}

export interface ReliabilityFixture {
  source: string;
  versions: Record<string, string>;
  cases: ReliabilityCase[];
  twoItems: {
    description: string;
    call: string;
    items: string[];
    n: number;
    covariance: number[][];
    rawAlpha: number;
    stdAlpha: number;
    rDrop: number[];
  };
}

export const reliabilityFixture = readReferenceFixture<ReliabilityFixture>('reliability.json');
