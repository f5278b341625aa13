import { describe, expect, it } from 'vitest';
import { bartlettSphericity } from '../../src/lib/stats/bartlett-sphericity';
import { squareMatrixFromRows, type SquareMatrix } from '../../src/lib/stats/types';
import { reliabilityFixture } from './reliability-cases';
import { collectNumbers, relativeError } from './reliability-fixtures';

function permuted(matrix: SquareMatrix, order: number[]): SquareMatrix {
  const k = matrix.order;
  return squareMatrixFromRows(order.map((i) => order.map((j) => matrix.data[i * k + j])));
}

describe('bartlettSphericity', () => {
  it.each(reliabilityFixture.cases.map((c) => [c.name, c] as const))(
    'matches psych::cortest.bartlett on %s at 1e-6',
    (_name, reference) => {
      const correlation = squareMatrixFromRows(reference.correlation);
      const before = Float64Array.from(correlation.data);
      const result = bartlettSphericity(correlation, reference.n);
      expect(relativeError(result.chiSquare as number, reference.bartlett.chisq)).toBeLessThan(1e-6); // R 4.2.2 psych 2.2.9: psych::cortest.bartlett(cor(x), n = nrow(x))$chisq
      expect(result.degreesOfFreedom).toBe(reference.bartlett.df); // same call, $df
      if (reference.bartlett.p === 0) expect(result.pValue as number).toBeLessThan(1e-290); // same call, $p.value underflows to 0 in R
      else expect(relativeError(result.pValue as number, reference.bartlett.p)).toBeLessThan(1e-6); // same call, $p.value
      expect(result.notices).toEqual([]);
      expect(correlation.data).toEqual(before);
    },
  );

  it('gives chi-square 0 and p = 1 for an identity matrix', () => {
    const result = bartlettSphericity(squareMatrixFromRows([[1, 0, 0], [0, 1, 0], [0, 0, 1]]), 50);
    expect(result.chiSquare).toBe(0);
    expect(result.pValue).toBe(1);
    expect(result.logDeterminant).toBe(0);
  });

  it('uses ln|R| of the 2 × 2 case: ln(1 − r²)', () => {
    // Hand-computed: |R| = 1 − 0.6² = 0.64; chi2 = −(100 − 1 − 9/6) · ln 0.64
    const result = bartlettSphericity(squareMatrixFromRows([[1, 0.6], [0.6, 1]]), 100);
    expect(result.logDeterminant).toBeCloseTo(Math.log(0.64), 14);
    expect(result.chiSquare).toBeCloseTo(-(99 - 1.5) * Math.log(0.64), 12);
  });

  it('is invariant to the order of the items', () => {
    const reference = reliabilityFixture.cases.find((c) => c.name === 'attitude')!;
    const correlation = squareMatrixFromRows(reference.correlation);
    const a = bartlettSphericity(correlation, reference.n);
    const b = bartlettSphericity(permuted(correlation, [6, 2, 0, 5, 1, 3, 4]), reference.n);
    expect(relativeError(b.chiSquare as number, a.chiSquare as number)).toBeLessThan(1e-12);
  });

  it('reports a singular matrix (an exact duplicate) instead of −Infinity', () => {
    const base = reliabilityFixture.cases.find((c) => c.name === 'attitude')!.correlation;
    const withDuplicate = base.map((row) => [...row, row[2]]);
    withDuplicate.push([...base[2], 1]);
    const result = bartlettSphericity(squareMatrixFromRows(withDuplicate), 30);
    expect(result.chiSquare).toBeNull();
    expect(result.pValue).toBeNull();
    expect(result.logDeterminant).toBeNull();
    expect(result.degreesOfFreedom).toBe(28);
    expect(result.notices).toEqual([expect.objectContaining({ code: 'singular-matrix', items: [7] })]);
    expect(collectNumbers(result).every(Number.isFinite)).toBe(true);
  });

  it('reports too few items and too few respondents', () => {
    const one = bartlettSphericity(squareMatrixFromRows([[1]]), 10);
    expect(one.chiSquare).toBeNull();
    expect(one.degreesOfFreedom).toBe(0);
    expect(one.notices.map((n) => n.code)).toEqual(['too-few-items']);
    // p = 5 needs n > 1 + 15/6 = 3.5
    const few = bartlettSphericity(squareMatrixFromRows(reliabilityFixture.cases[0].correlation), 3);
    expect(few.chiSquare).toBeNull();
    expect(few.logDeterminant).not.toBeNull();
    expect(few.notices.map((n) => n.code)).toEqual(['too-few-respondents']);
  });

  it('refuses invalid input', () => {
    expect(() => bartlettSphericity(squareMatrixFromRows([[2, 0], [0, 1]]), 10)).toThrow(/bartlettSphericity: diagonal element 0 is 2/);
    expect(() => bartlettSphericity(squareMatrixFromRows([[1, 0.5], [0.4, 1]]), 10)).toThrow(/not symmetric/);
    expect(() => bartlettSphericity(squareMatrixFromRows([[1, 0.5], [0.5, 1]]), 10.5)).toThrow(/respondents must be a positive integer/);
  });
});
