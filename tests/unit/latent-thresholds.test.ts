/**
 * latentThresholds (src/lib/engine/wave-local-dependence.ts): Φ⁻¹ of each column's cumulative
 * answer shares (Olsson 1979), only for the columns the residual bootstrap can draw.
 */
import { describe, expect, it } from 'vitest';
import { latentThresholds } from '../../src/lib/engine/wave-local-dependence';

describe('latentThresholds', () => {
  // Column 0: answers 1, 2, 3 with shares .25, .5, .25; column 1: 1 and 2, half each.
  const data = { rows: 4, columns: 2, data: Float64Array.of(1, 2, 2, 3, 1, 1, 2, 2) };

  it('gives Φ⁻¹ of the cumulative shares per column (qnorm(c(.25, .75)) and qnorm(.5) in R)', () => {
    const [first, second] = latentThresholds(data);
    // R 4.2: qnorm(c(0.25, 0.75)) = -0.6744898 0.6744898; qnorm(0.5) = 0.
    expect(first).toHaveLength(2);
    expect(first![0]).toBeCloseTo(-0.6744898, 6);
    expect(first![1]).toBeCloseTo(0.6744898, 6);
    expect(second).toHaveLength(1);
    expect(second![0]).toBeCloseTo(0, 12);
  });

  it('leaves the columns the bootstrap never draws unread, as null', () => {
    const asked: number[] = [];
    const result = latentThresholds(data, (k) => (asked.push(k), k === 1));
    expect(asked).toEqual([0, 1]);
    expect(result[0]).toBeNull();
    expect(result[1]).toEqual(latentThresholds(data)[1]);
  });
});
