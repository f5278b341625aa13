import { Matrix, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { symmetricEigen } from '../../src/lib/stats/symmetric-eigen';
import { itemMatrixFromColumns, squareMatrixFromRows, type ItemMatrix } from '../../src/lib/stats/types';
import { varianceInflation } from '../../src/lib/stats/variance-inflation';
import {
  allFinite,
  completeItemMatrix,
  correlatedData,
  dataset,
  indefiniteCorrelation,
  overlapFixture,
  pearsonOf,
  permuteSquare,
  referenceCorrelation,
  relativeError,
  reverseItem,
} from './overlap-fixtures';

/** R² of item j regressed (with an intercept) on the other items, by ml-matrix least squares (QR). */
function auxiliaryR2(matrix: ItemMatrix, j: number): number {
  const { rows, columns, data } = matrix;
  const others = Array.from({ length: columns }, (_, k) => k).filter((k) => k !== j);
  const design = new Matrix(rows, others.length + 1);
  const y = Matrix.columnVector(Array.from(data.subarray(j * rows, (j + 1) * rows)));
  for (let i = 0; i < rows; i++) {
    design.set(i, 0, 1);
    others.forEach((k, c) => design.set(i, c + 1, data[k * rows + i]));
  }
  const fitted = design.mmul(solve(design, y));
  let mean = 0;
  for (let i = 0; i < rows; i++) mean += y.get(i, 0) / rows;
  let residual = 0;
  let total = 0;
  for (let i = 0; i < rows; i++) {
    residual += (y.get(i, 0) - fitted.get(i, 0)) ** 2;
    total += (y.get(i, 0) - mean) ** 2;
  }
  return 1 - residual / total;
}

function vifOf(matrix: ItemMatrix) {
  return varianceInflation(pearsonOf(matrix));
}

describe('varianceInflation', () => {
  it('matches car::vif(lm(...)) to 1e-6 on longley, mtcars, swiss, attitude and bfi', () => {
    // R 4.2.2, car 3.1.1: car::vif(lm(y ~ ., data = X)), fixtures/reference/overlap.json
    const checked = overlapFixture.datasets.filter((entry) => entry.vifCar !== undefined);
    expect(checked.map((entry) => entry.name)).toEqual(['longley', 'mtcars', 'swiss', 'attitude', 'bfi']);
    for (const entry of checked) {
      const result = varianceInflation(referenceCorrelation(entry));
      entry.vifCar!.value.forEach((expected, j) => {
        const item = result.items[j];
        expect(relativeError(item.vif!, expected), `${entry.name} item ${j}`).toBeLessThan(1e-6);
        expect(relativeError(item.tolerance!, 1 / expected)).toBeLessThan(1e-6);
        expect(Math.abs(item.r2! - (1 - 1 / expected))).toBeLessThan(1e-6);
      });
      expect(result.notices).toEqual([]);
    }
  });

  it('matches diag(solve(cor(X))) to 1e-9 when computed from the data (sat.act, longley)', () => {
    // R 4.2.2: diag(solve(cor(X)))
    for (const name of ['sat.act', 'longley']) {
      const entry = dataset(name);
      const result = vifOf(completeItemMatrix(entry));
      entry.vifFromInverse.value.forEach((expected, j) => expect(relativeError(result.items[j].vif!, expected), `${name} ${j}`).toBeLessThan(1e-9));
    }
  });

  it('equals 1/(1 − R²) of each auxiliary regression (least squares by QR)', () => {
    // Identity: VIF_j = [R⁻¹]_jj = 1 / (1 − R²_j) (Marquardt 1970)
    for (const matrix of [completeItemMatrix(dataset('attitude')), correlatedData(200, 8, 4, 2, true)]) {
      const result = vifOf(matrix);
      for (let j = 0; j < matrix.columns; j++) {
        const r2 = auxiliaryR2(matrix, j);
        expect(relativeError(result.items[j].vif!, 1 / (1 - r2)), `item ${j}`).toBeLessThan(1e-9);
      }
    }
  });

  it('names each item’s strongest partner by |r|', () => {
    // R 4.2.2: cor(X) of mtcars; partner = which.max(abs(r[j, -j]))
    const entry = dataset('mtcars');
    const result = varianceInflation(referenceCorrelation(entry));
    result.items.forEach((item, j) => {
      const row = entry.correlation.value[j].map((r, k) => (k === j ? 0 : Math.abs(r)));
      const best = row.indexOf(Math.max(...row));
      expect(item.topPartner?.index).toBe(best);
      expect(item.topPartner?.r).toBe(entry.correlation.value[j][best]);
    });
  });

  it('is invariant to column order and to reverse-keying an item', () => {
    const entry = dataset('bfi');
    const R = referenceCorrelation(entry);
    const base = varianceInflation(R);
    const order = [24, 3, 17, 0, 9, 12, 1, 22, 5, 8, 19, 2, 14, 6, 21, 10, 16, 4, 23, 11, 18, 7, 20, 13, 15];
    const permuted = varianceInflation(permuteSquare(R, order));
    order.forEach((original, position) => expect(relativeError(permuted.items[position].vif!, base.items[original].vif!)).toBeLessThan(1e-12));
    // R 4.2.2: diag(solve(cor(X))) after X[, keyed] <- 7 - X[, keyed], equal to the unreversed VIFs
    const reversed = vifOf(completeItemMatrix(entry));
    const keyed = reverseItem(completeItemMatrix(entry), 0, 1, 6);
    const afterReverse = vifOf(keyed);
    entry.reversedKeys!.vifFromInverse.forEach((expected, j) => {
      expect(relativeError(reversed.items[j].vif!, expected)).toBeLessThan(1e-9);
      expect(relativeError(afterReverse.items[j].vif!, expected)).toBeLessThan(1e-9);
    });
    expect(afterReverse.items[1].topPartner?.index).toBe(reversed.items[1].topPartner?.index);
  });

  it('reports an exact duplicate column: VIF null for both, one exact-dependency notice naming both', () => {
    const base = correlatedData(120, 4, 8, 2, true);
    const columns = Array.from({ length: 4 }, (_, j) => base.data.subarray(j * 120, (j + 1) * 120));
    const withDuplicate = itemMatrixFromColumns([columns[0], columns[1], columns[2], columns[1], columns[3]]);
    const result = vifOf(withDuplicate);
    expect(result.exactDependencies).toEqual([[1, 3]]);
    expect(result.items[1]).toMatchObject({ vif: null, tolerance: null, r2: null });
    expect(result.items[3]).toMatchObject({ vif: null, tolerance: null, r2: null });
    expect(result.notices).toHaveLength(1);
    expect(result.notices[0].code).toBe('exact-dependency');
    expect(result.notices[0].items).toEqual([1, 3]);
    expect(result.items[3].topPartner).toEqual({ index: 1, r: 1 });
    // The others keep their exact VIF: regressing on a duplicated column adds nothing.
    const withoutDuplicate = vifOf(itemMatrixFromColumns([columns[0], columns[1], columns[2], columns[3]]));
    expect(relativeError(result.items[0].vif!, withoutDuplicate.items[0].vif!)).toBeLessThan(1e-9);
    expect(relativeError(result.items[4].vif!, withoutDuplicate.items[3].vif!)).toBeLessThan(1e-9);
    expect(allFinite(result)).toBe(true);
  });

  it('keeps separate dependencies apart and gives uninvolved items their auxiliary-regression VIF', () => {
    const base = correlatedData(150, 4, 21);
    const c = (j: number) => Array.from(base.data.subarray(j * 150, (j + 1) * 150));
    const sum = c(0).map((value, i) => value + 2 * c(1)[i]);
    const twice = c(2).map((value) => 3 - 2 * value);
    const matrix = itemMatrixFromColumns([c(0), c(1), sum, c(2), twice, c(3)]);
    const result = vifOf(matrix);
    expect(result.exactDependencies).toEqual([[0, 1, 2], [3, 4]]);
    expect(result.notices.map((notice) => notice.items)).toEqual([[0, 1, 2], [3, 4]]);
    // Item 5 regressed on the rest (QR least squares handles the redundant columns).
    const r2 = auxiliaryR2(itemMatrixFromColumns([c(0), c(1), c(2), c(3)]), 3);
    expect(relativeError(result.items[5].vif!, 1 / (1 - r2))).toBeLessThan(1e-8);
  });

  it('reports every item as dependent when there are more items than respondents', () => {
    const result = vifOf(correlatedData(5, 8, 2));
    expect(result.exactDependencies).toEqual([[0, 1, 2, 3, 4, 5, 6, 7]]);
    expect(result.items.every((item) => item.vif === null)).toBe(true);
    expect(allFinite(result)).toBe(true);
  });

  it('handles two items and one item', () => {
    // Closed form: for two items VIF = 1 / (1 − r²)
    const two = varianceInflation(squareMatrixFromRows([[1, 0.6], [0.6, 1]]));
    expect(two.items[0].vif).toBeCloseTo(1 / 0.64, 13);
    expect(two.items[1].r2).toBeCloseTo(0.36, 13);
    const one = varianceInflation(squareMatrixFromRows([[1]]));
    expect(one.items).toEqual([{ vif: 1, tolerance: 1, r2: 0, topPartner: null }]);
  });

  it('refuses to invert an indefinite matrix and says so', () => {
    // Eigenvalues of this matrix include a negative one (R 4.2.2: eigen() gives 2.047, 1.5, -0.547)
    const result = varianceInflation(indefiniteCorrelation());
    expect(result.items.every((item) => item.vif === null)).toBe(true);
    expect(result.notices[0].code).toBe('indefinite-matrix');
    expect(result.items[0].topPartner).toEqual({ index: 1, r: 0.9 });
  });

  it('reuses a given eigen-decomposition, checks inputs and mutates nothing', () => {
    const R = referenceCorrelation(dataset('swiss'));
    const before = Float64Array.from(R.data);
    const eigen = symmetricEigen(R);
    expect(varianceInflation(R, { eigen })).toEqual(varianceInflation(R));
    expect(Array.from(R.data)).toEqual(Array.from(before));
    expect(() => varianceInflation(squareMatrixFromRows([[1, 0.2], [0.2, 2]]))).toThrow(/diagonal element 1 is 2/);
    expect(() => varianceInflation(R, { eigen: symmetricEigen(squareMatrixFromRows([[1]])) })).toThrow(/order 1, the matrix 5/);
  });
});
