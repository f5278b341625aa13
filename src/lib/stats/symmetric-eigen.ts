/**
 * Eigen-decomposition of a real symmetric matrix: Householder reduction to tridiagonal form,
 * then the implicit QL algorithm with Wilkinson-type shifts, on flat Float64Arrays.
 *
 * This is the classic EISPACK pair tred2/tql2 (as published in the Handbook for Automatic
 * Computation and carried into JAMA). It is about five times faster than ml-matrix's EVD for an
 * order of 300 here (about 100 ms against 560 ms), because it works on one flat array and keeps
 * the transformation stored TRANSPOSED (eigenvectors as rows while working) so that every
 * inner loop runs over contiguous memory.
 *
 * References: Martin, Reinsch & Wilkinson 1968, "Householder's tridiagonalization of a symmetric
 * matrix" (Numer. Math. 11:181-195, tred2); Bowdler, Martin, Reinsch & Wilkinson 1968, "The QR
 * and QL algorithms for symmetric matrices" (Numer. Math. 11:293-306, tql2); Smith et al. 1976,
 * "Matrix Eigensystem Routines - EISPACK Guide".
 */
import { HOUSEHOLDER_WASM_MIN_ORDER, householderReductionWasm } from './householder-reduction-kernel';
import { PlaneRotationBatch } from './plane-rotations-kernel';
import { checkSymmetricMatrix } from './symmetric-input';
import { EIGEN_MAX_ITERATIONS_PER_VALUE } from './tolerances';
import type { SquareMatrix } from './types';

/**
 * A symmetric eigen-decomposition `A = V · diag(values) · Vᵀ`. Computed once; treat every
 * array as read-only.
 */
export interface SymmetricEigenDecomposition {
  readonly order: number;
  /** Eigenvalues in DESCENDING order (largest first). */
  readonly values: Float64Array;
  /**
   * Orthonormal eigenvectors as the COLUMNS of a row-major matrix: component i of the
   * eigenvector of `values[k]` is `vectors.data[i * order + k]`. Each has unit length; its sign
   * is chosen so that its component of largest absolute value is positive.
   */
  readonly vectors: SquareMatrix;
}

/**
 * Below this order `symmetricEigen` applies the QL rotations in JavaScript: copying the rows into
 * WebAssembly memory and back costs more than the kernel saves there (measured in
 * docs/decisions/020-speed-whole-audit.md, "Addendum: the QL rotations in WebAssembly").
 */
export const WEBASSEMBLY_ROTATIONS_MIN_ORDER = 8;

/**
 * Eigenvalues and unit eigenvectors of a real symmetric matrix.
 * @param matrix Symmetric matrix (both triangles stored; only symmetry within SYMMETRY_TOLERANCE
 *   is accepted), finite values. It is not modified.
 * @throws {RangeError} when the matrix is empty, not square, not finite or not symmetric.
 * @throws {Error} when the QL iteration does not converge (never seen for finite symmetric input).
 * @returns Eigenvalues in descending order and the matching orthonormal eigenvectors (columns).
 * References: Martin, Reinsch & Wilkinson 1968 (tred2); Bowdler, Martin, Reinsch & Wilkinson
 * 1968 (tql2), both in Numerische Mathematik 11.
 */
export function symmetricEigen(matrix: SquareMatrix): SymmetricEigenDecomposition {
  checkSymmetricMatrix(matrix, 'symmetricEigen', 'matrix');
  return decompose(matrix, true, 'symmetricEigen');
}

/**
 * The same decomposition as `symmetricEigen` computed with the listing's loops: the Householder
 * reduction in JavaScript, tred2's accumulation of the transformation one row at a time and tql2's
 * rotations in JavaScript at every order. It is the reference that the WebAssembly reduction, the
 * four-row accumulation and the WebAssembly rotations must match bit for bit
 * (tests/unit/symmetric-eigen.test.ts) and the benchmark's baseline.
 * @param matrix Symmetric matrix with finite values; not modified.
 * @throws {RangeError} when the matrix is empty, not square, not finite or not symmetric.
 * @throws {Error} when the QL iteration does not converge.
 * @returns Eigenvalues in descending order and the matching orthonormal eigenvectors (columns),
 *   as `symmetricEigen`.
 * References: as `symmetricEigen`.
 */
export function symmetricEigenUnblocked(matrix: SquareMatrix): SymmetricEigenDecomposition {
  checkSymmetricMatrix(matrix, 'symmetricEigenUnblocked', 'matrix');
  return decompose(matrix, false, 'symmetricEigenUnblocked');
}

/** tred2 then tql2; `blocked` takes the four-row accumulation and (from order 8) the kernel. */
function decompose(matrix: SquareMatrix, blocked: boolean, caller: string): SymmetricEigenDecomposition {
  const n = matrix.order;
  // w holds Vᵀ: row j of w is column j of the transformation V of the EISPACK listing.
  const w = transposeCopy(matrix);
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  tridiagonalize(w, n, d, e, blocked);
  if (blocked && n >= WEBASSEMBLY_ROTATIONS_MIN_ORDER && n >= 2) {
    const rotations = new PlaneRotationBatch(w, n);
    tridiagonalQl(d, e, n, null, rotations, caller);
    rotations.finish();
  } else {
    tridiagonalQl(d, e, n, w, null, caller);
  }

  const order = descendingOrder(d);
  const values = new Float64Array(n);
  const vectors = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    const source = order[k];
    values[k] = d[source];
    const row = source * n;
    let largest = 0;
    let largestIndex = 0;
    for (let i = 0; i < n; i++) {
      const magnitude = Math.abs(w[row + i]);
      if (magnitude > largest) {
        largest = magnitude;
        largestIndex = i;
      }
    }
    const sign = w[row + largestIndex] < 0 ? -1 : 1;
    for (let i = 0; i < n; i++) vectors[i * n + k] = sign * w[row + i];
  }
  return Object.freeze({ order: n, values, vectors: Object.freeze({ order: n, data: vectors }) });
}

/**
 * Eigenvalues only of a real symmetric matrix (no eigenvectors, about four times faster).
 * @param matrix Symmetric matrix with finite values; not modified.
 * @throws {RangeError} when the matrix is empty, not square, not finite or not symmetric.
 * @throws {Error} when the QL iteration does not converge.
 * @returns The eigenvalues in DESCENDING order.
 * References: Martin, Reinsch & Wilkinson 1968 (tred2); Bowdler, Martin, Reinsch & Wilkinson
 * 1968 (tql1/tql2), both in Numerische Mathematik 11.
 */
export function symmetricEigenvalues(matrix: SquareMatrix): Float64Array {
  checkSymmetricMatrix(matrix, 'symmetricEigenvalues', 'matrix');
  const n = matrix.order;
  const w = transposeCopy(matrix);
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  tridiagonalizeValuesOnly(w, n, d, e);
  tridiagonalQl(d, e, n, null, null, 'symmetricEigenvalues');
  return d.sort().reverse();
}

function transposeCopy(matrix: SquareMatrix): Float64Array {
  const n = matrix.order;
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) out[j * n + i] = matrix.data[i * n + j];
  return out;
}

function descendingOrder(values: Float64Array): number[] {
  return Array.from(values, (_, index) => index).sort((a, b) => values[b] - values[a] || a - b);
}

/** sqrt(a² + b²) without overflow or destructive underflow. */
function hypotenuse(a: number, b: number): number {
  const x = Math.abs(a);
  const y = Math.abs(b);
  if (x > y) {
    const ratio = y / x;
    return x * Math.sqrt(1 + ratio * ratio);
  }
  if (y === 0) return 0;
  const ratio = x / y;
  return y * Math.sqrt(1 + ratio * ratio);
}

/**
 * EISPACK tred2 with V stored transposed: `w[b * n + a]` is V[a][b] of the listing. On return
 * d holds the diagonal and e the subdiagonal (e[0] = 0), and w holds Qᵀ. With `fourRows` the
 * accumulation of Q takes four rows per pass over k (the same sums in the same order, so the
 * same bits as the listing's one row at a time, which is taken otherwise) and the reduction may
 * run in WebAssembly; without it the reduction is the JavaScript `householderReductionScript`.
 */
function tridiagonalize(w: Float64Array, n: number, d: Float64Array, e: Float64Array, fourRows: boolean): void {
  if (fourRows) householderReduction(w, n, d, e);
  else householderReductionScript(w, n, d, e);

  for (let i = 0; i < n - 1; i++) {
    w[i * n + n - 1] = w[i * n + i];
    w[i * n + i] = 1;
    const h = d[i + 1];
    const next = (i + 1) * n;
    if (h !== 0) {
      for (let k = 0; k <= i; k++) d[k] = w[next + k] / h;
      // Rows j are independent (each reads only itself, row i + 1 and d): four rows share each
      // pass over k, and every g still sums its terms from 0 in increasing k.
      let j = 0;
      for (; fourRows && j + 3 <= i; j += 4) {
        const column0 = j * n;
        const column1 = column0 + n;
        const column2 = column1 + n;
        const column3 = column2 + n;
        let g0 = 0;
        let g1 = 0;
        let g2 = 0;
        let g3 = 0;
        for (let k = 0; k <= i; k++) {
          const value = w[next + k];
          g0 += value * w[column0 + k];
          g1 += value * w[column1 + k];
          g2 += value * w[column2 + k];
          g3 += value * w[column3 + k];
        }
        for (let k = 0; k <= i; k++) {
          const dk = d[k];
          w[column0 + k] -= g0 * dk;
          w[column1 + k] -= g1 * dk;
          w[column2 + k] -= g2 * dk;
          w[column3 + k] -= g3 * dk;
        }
      }
      for (; j <= i; j++) {
        const column = j * n;
        let g = 0;
        for (let k = 0; k <= i; k++) g += w[next + k] * w[column + k];
        for (let k = 0; k <= i; k++) w[column + k] -= g * d[k];
      }
    }
    for (let k = 0; k <= i; k++) w[next + k] = 0;
  }
  for (let j = 0; j < n; j++) {
    d[j] = w[j * n + n - 1];
    w[j * n + n - 1] = 0;
  }
  w[(n - 1) * n + n - 1] = 1;
  e[0] = 0;
}

/**
 * EISPACK tred1 without the transformation (for eigenvalues only): on return d holds the
 * diagonal and e the subdiagonal (e[0] = 0); w is overwritten.
 */
function tridiagonalizeValuesOnly(w: Float64Array, n: number, d: Float64Array, e: Float64Array): void {
  householderReduction(w, n, d, e);
  // The reduction leaves the tridiagonal's diagonal on the diagonal of w (tred1's result).
  for (let j = 0; j < n; j++) d[j] = w[j * n + j];
  e[0] = 0;
}

/**
 * The Householder reduction shared by tred2 (`tridiagonalize`) and tred1
 * (`tridiagonalizeValuesOnly`): from order HOUSEHOLDER_WASM_MIN_ORDER up in WebAssembly SIMD
 * (householder-reduction-kernel.ts, bit for bit `householderReductionScript`), below it in
 * JavaScript.
 */
function householderReduction(w: Float64Array, n: number, d: Float64Array, e: Float64Array): void {
  if (n >= HOUSEHOLDER_WASM_MIN_ORDER) householderReductionWasm(w, n, d, e);
  else householderReductionScript(w, n, d, e);
}

/**
 * The Householder reduction in JavaScript (EISPACK tred1/tred2's first part), exported as the
 * reference of the WebAssembly kernel's test (tests/unit/householder-reduction-kernel.test.ts):
 * on return e[1..n-1] holds the subdiagonal, d[i] the h of step i, and w the stored Householder
 * vectors (rows) with the reduced matrix's diagonal on its diagonal.
 * Four rows j .. j + 3 share each pass over k (the loads of d and e, and of e's stores), and every
 * sum is still formed in the order of one row at a time: row j's terms reach e[k] before row
 * j + 1's, each g runs over k in increasing order, and the corner of the four rows (k < j + 4) is
 * written out so that e[j + 1] .. e[j + 3] have their earlier rows' terms before they start a sum.
 * So d, e and w are bit for bit those of the listing's one-row loops; only the speed differs
 * (docs/decisions/020-speed-whole-audit.md, "Addendum: kernel").
 * @param w Row-major n × n working matrix (the symmetric matrix, stored transposed); overwritten.
 * @param n Order (at least 1).
 * @param d Length n; overwritten.
 * @param e Length n; overwritten.
 * @returns Nothing; w, d and e are written.
 * References: Martin, Reinsch & Wilkinson 1968, "Householder's tridiagonalization of a symmetric
 * matrix" (Numer. Math. 11:181-195).
 */
export function householderReductionScript(w: Float64Array, n: number, d: Float64Array, e: Float64Array): void {
  for (let j = 0; j < n; j++) d[j] = w[j * n + n - 1];
  for (let i = n - 1; i > 0; i--) {
    let scale = 0;
    let h = 0;
    for (let k = 0; k < i; k++) scale += Math.abs(d[k]);
    if (scale === 0) {
      e[i] = d[i - 1];
      for (let j = 0; j < i; j++) {
        d[j] = w[j * n + i - 1];
        w[j * n + i] = 0;
        w[i * n + j] = 0;
      }
    } else {
      for (let k = 0; k < i; k++) {
        d[k] /= scale;
        h += d[k] * d[k];
      }
      let f = d[i - 1];
      let g = Math.sqrt(h);
      if (f > 0) g = -g;
      e[i] = scale * g;
      h -= f * g;
      d[i - 1] = f - g;
      for (let j = 0; j < i; j++) e[j] = 0;
      // e = A·u over the stored triangle, four rows j .. j + 3 per pass over k.
      let j = 0;
      for (; j + 3 < i; j += 4) {
        const j1 = j + 1;
        const j2 = j + 2;
        const j3 = j + 3;
        const f0 = d[j];
        const f1 = d[j1];
        const f2 = d[j2];
        const f3 = d[j3];
        const column0 = j * n;
        const column1 = j1 * n;
        const column2 = j2 * n;
        const column3 = j3 * n;
        w[i * n + j] = f0;
        w[i * n + j1] = f1;
        w[i * n + j2] = f2;
        w[i * n + j3] = f3;
        // The corner k < j + 4, one row after the other.
        let g0 = e[j] + w[column0 + j] * f0;
        let value = w[column0 + j1];
        g0 += value * d[j1];
        e[j1] += value * f0;
        value = w[column0 + j2];
        g0 += value * d[j2];
        e[j2] += value * f0;
        value = w[column0 + j3];
        g0 += value * d[j3];
        e[j3] += value * f0;
        let g1 = e[j1] + w[column1 + j1] * f1;
        value = w[column1 + j2];
        g1 += value * d[j2];
        e[j2] += value * f1;
        value = w[column1 + j3];
        g1 += value * d[j3];
        e[j3] += value * f1;
        let g2 = e[j2] + w[column2 + j2] * f2;
        value = w[column2 + j3];
        g2 += value * d[j3];
        e[j3] += value * f2;
        let g3 = e[j3] + w[column3 + j3] * f3;
        for (let k = j3 + 1; k < i; k++) {
          const dk = d[k];
          const value0 = w[column0 + k];
          const value1 = w[column1 + k];
          const value2 = w[column2 + k];
          const value3 = w[column3 + k];
          g0 += value0 * dk;
          g1 += value1 * dk;
          g2 += value2 * dk;
          g3 += value3 * dk;
          e[k] = e[k] + value0 * f0 + value1 * f1 + value2 * f2 + value3 * f3;
        }
        e[j] = g0;
        e[j1] = g1;
        e[j2] = g2;
        e[j3] = g3;
      }
      for (; j < i; j++) {
        f = d[j];
        const column = j * n;
        w[i * n + j] = f;
        g = e[j] + w[column + j] * f;
        for (let k = j + 1; k <= i - 1; k++) {
          const value = w[column + k];
          g += value * d[k];
          e[k] += value * f;
        }
        e[j] = g;
      }
      f = 0;
      for (let m = 0; m < i; m++) {
        e[m] /= h;
        f += e[m] * d[m];
      }
      const hh = f / (h + h);
      for (let m = 0; m < i; m++) e[m] -= hh * d[m];
      // The rank-two update A −= u·pᵀ + p·uᵀ, four rows per pass over k (rows are independent; d[j]
      // .. d[j + 3] are replaced only after all four rows have read them).
      j = 0;
      for (; j + 3 < i; j += 4) {
        const j1 = j + 1;
        const j2 = j + 2;
        const j3 = j + 3;
        const f0 = d[j];
        const f1 = d[j1];
        const f2 = d[j2];
        const f3 = d[j3];
        const g0 = e[j];
        const g1 = e[j1];
        const g2 = e[j2];
        const g3 = e[j3];
        const column0 = j * n;
        const column1 = j1 * n;
        const column2 = j2 * n;
        const column3 = j3 * n;
        // The corner k < j + 3 (row j + r starts at k = j + r).
        w[column0 + j] -= f0 * e[j] + g0 * d[j];
        w[column0 + j1] -= f0 * e[j1] + g0 * d[j1];
        w[column1 + j1] -= f1 * e[j1] + g1 * d[j1];
        w[column0 + j2] -= f0 * e[j2] + g0 * d[j2];
        w[column1 + j2] -= f1 * e[j2] + g1 * d[j2];
        w[column2 + j2] -= f2 * e[j2] + g2 * d[j2];
        for (let k = j3; k < i; k++) {
          const ek = e[k];
          const dk = d[k];
          w[column0 + k] -= f0 * ek + g0 * dk;
          w[column1 + k] -= f1 * ek + g1 * dk;
          w[column2 + k] -= f2 * ek + g2 * dk;
          w[column3 + k] -= f3 * ek + g3 * dk;
        }
        d[j] = w[column0 + i - 1];
        w[column0 + i] = 0;
        d[j1] = w[column1 + i - 1];
        w[column1 + i] = 0;
        d[j2] = w[column2 + i - 1];
        w[column2 + i] = 0;
        d[j3] = w[column3 + i - 1];
        w[column3 + i] = 0;
      }
      for (; j < i; j++) {
        f = d[j];
        g = e[j];
        const column = j * n;
        for (let k = j; k <= i - 1; k++) w[column + k] -= f * e[k] + g * d[k];
        d[j] = w[column + i - 1];
        w[column + i] = 0;
      }
    }
    d[i] = h;
  }
}

/**
 * EISPACK tql2 (tql1 when `w` and `rotations` are null): eigenvalues of the tridiagonal (d, e)
 * into d, and the rotations applied to the rows of w (the transposed eigenvector matrix) here in
 * JavaScript, or recorded into `rotations` to be applied in WebAssembly, in the same order (they
 * depend on d and e only). Unsorted on return.
 */
function tridiagonalQl(
  d: Float64Array,
  e: Float64Array,
  n: number,
  w: Float64Array | null,
  rotations: PlaneRotationBatch | null,
  caller: string,
): void {
  for (let i = 1; i < n; i++) e[i - 1] = e[i];
  e[n - 1] = 0;

  let f = 0;
  let tst1 = 0;
  const eps = Number.EPSILON;
  for (let l = 0; l < n; l++) {
    tst1 = Math.max(tst1, Math.abs(d[l]) + Math.abs(e[l]));
    let m = l;
    while (m < n - 1 && Math.abs(e[m]) > eps * tst1) m++;

    if (m > l) {
      let iterations = 0;
      do {
        iterations++;
        if (iterations > EIGEN_MAX_ITERATIONS_PER_VALUE) {
          throw new Error(`${caller}: the QL iteration did not converge for eigenvalue ${l} within ${EIGEN_MAX_ITERATIONS_PER_VALUE} steps`);
        }
        let g = d[l];
        let p = (d[l + 1] - g) / (2 * e[l]);
        let r = hypotenuse(p, 1);
        if (p < 0) r = -r;
        d[l] = e[l] / (p + r);
        d[l + 1] = e[l] * (p + r);
        const dl1 = d[l + 1];
        let h = g - d[l];
        for (let i = l + 2; i < n; i++) d[i] -= h;
        f += h;

        p = d[m];
        let c = 1;
        let c2 = c;
        let c3 = c;
        const el1 = e[l + 1];
        let s = 0;
        let s2 = 0;
        if (rotations !== null) rotations.startSweep(m - 1, m - l);
        for (let i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i];
          h = c * p;
          r = hypotenuse(p, e[i]);
          e[i + 1] = s * r;
          s = e[i] / r;
          c = p / r;
          p = c * d[i] - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]);
          if (rotations !== null) {
            rotations.add(c, s);
          } else if (w !== null) {
            const upper = (i + 1) * n;
            const lower = i * n;
            for (let k = 0; k < n; k++) {
              const value = w[upper + k];
              w[upper + k] = s * w[lower + k] + c * value;
              w[lower + k] = c * w[lower + k] - s * value;
            }
          }
        }
        p = (-s * s2 * c3 * el1 * e[l]) / dl1;
        e[l] = s * p;
        d[l] = c * p;
      } while (Math.abs(e[l]) > eps * tst1);
    }
    d[l] += f;
    e[l] = 0;
  }
}
