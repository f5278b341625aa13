import { describe, expect, it } from 'vitest';
import { cronbachAlpha } from '../../src/lib/stats/cronbach-alpha';
import { spearmanBrown, spearmanBrownLengthRatio } from '../../src/lib/stats/spearman-brown';
import { squareMatrixFromRows } from '../../src/lib/stats/types';

function parallelItems(k: number, r: number) {
  return squareMatrixFromRows(Array.from({ length: k }, (_, i) => Array.from({ length: k }, (_, j) => (i === j ? 1 : r))));
}

describe('spearmanBrown', () => {
  it('gives the hand-computed prophecies', () => {
    // Hand-computed: doubling a test of reliability .60 gives 2(.60)/(1 + .60) = .75
    expect(spearmanBrown(0.6, 2)).toBeCloseTo(0.75, 15);
    // Hand-computed: halving a test of reliability .70 gives .35/(1 − .5 · .70) = .35/.65 = 7/13
    expect(spearmanBrown(0.7, 0.5)).toBeCloseTo(7 / 13, 15);
    // Split-half step-up: r = .5 between halves gives 2/3
    expect(spearmanBrown(0.5, 2)).toBeCloseTo(2 / 3, 15);
    expect(spearmanBrown(0.8, 1)).toBe(0.8);
    expect(spearmanBrown(0, 3)).toBe(0);
    expect(spearmanBrown(1, 0.25)).toBe(1);
  });

  it('predicts the standardized alpha of a longer or shorter set of parallel items', () => {
    // Identity: standardized alpha of k parallel items is the step-up of r̄ by k, so stepping the
    // alpha of 4 items by 10/4 gives the alpha of 10 items.
    const four = cronbachAlpha(parallelItems(4, 0.3)).alphaStandardized as number;
    const ten = cronbachAlpha(parallelItems(10, 0.3)).alphaStandardized as number;
    expect(spearmanBrown(four, 10 / 4)).toBeCloseTo(ten, 14);
    expect(spearmanBrown(ten, 4 / 10)).toBeCloseTo(four, 14);
  });

  it('has an inverse that returns the length ratio', () => {
    const ratio = spearmanBrownLengthRatio(0.85, 0.7);
    expect(ratio).toBeLessThan(1);
    expect(spearmanBrown(0.85, ratio)).toBeCloseTo(0.7, 14);
    // Hand-computed: from .60 to .75 needs m = .75 · .40 / (.60 · .25) = 2
    expect(spearmanBrownLengthRatio(0.6, 0.75)).toBeCloseTo(2, 14);
  });

  it('refuses reliabilities outside [0, 1] and non-positive ratios', () => {
    expect(() => spearmanBrown(1.2, 2)).toThrow(/spearmanBrown: reliability must lie in \[0, 1\]/);
    expect(() => spearmanBrown(-0.1, 2)).toThrow(RangeError);
    expect(() => spearmanBrown(0.5, 0)).toThrow(/lengthRatio must be positive/);
    expect(() => spearmanBrown(0.5, Infinity)).toThrow(RangeError);
    expect(() => spearmanBrownLengthRatio(0, 0.5)).toThrow(/strictly between 0 and 1/);
    expect(() => spearmanBrownLengthRatio(0.5, 1)).toThrow(/targetReliability/);
  });
});
