/**
 * Small dense linear algebra on row-major Float64Arrays: a[i * cols + j]. Square n × n unless
 * the dimensions are given. Allocation happens only where a result is returned.
 */
import { symmetricEigenFlat } from "./eigen.ts";

/**
 * C = A·B with A (n × k), B (k × m). Four rows of B per pass over a row of C, so each load and
 * store of C serves four multiply-adds.
 */
export function matmul(A: Float64Array, B: Float64Array, n: number, k: number, m: number, C = new Float64Array(n * m)): Float64Array {
  C.fill(0, 0, n * m);
  const k4 = k - (k % 4);
  for (let i = 0; i < n; i++) {
    const ci = i * m;
    const ai = i * k;
    for (let p = 0; p < k4; p += 4) {
      const a0 = A[ai + p], a1 = A[ai + p + 1], a2 = A[ai + p + 2], a3 = A[ai + p + 3];
      if (a0 === 0 && a1 === 0 && a2 === 0 && a3 === 0) continue;
      const b0 = p * m, b1 = b0 + m, b2 = b1 + m, b3 = b2 + m;
      for (let j = 0; j < m; j++) C[ci + j] += a0 * B[b0 + j] + a1 * B[b1 + j] + a2 * B[b2 + j] + a3 * B[b3 + j];
    }
    for (let p = k4; p < k; p++) {
      const a = A[ai + p];
      if (a === 0) continue;
      const bp = p * m;
      for (let j = 0; j < m; j++) C[ci + j] += a * B[bp + j];
    }
  }
  return C;
}

/** Aᵀ (n × m → m × n). */
export function transpose(A: Float64Array, n: number, m: number): Float64Array {
  const T = new Float64Array(n * m);
  for (let i = 0; i < n; i++) for (let j = 0; j < m; j++) T[j * n + i] = A[i * m + j];
  return T;
}

/** Xᵀ A X with X (n × m), A (n × n): the m × m transformed matrix. */
export function congruence(A: Float64Array, X: Float64Array, n: number, m: number): Float64Array {
  const AX = matmul(A, X, n, n, m);
  return matmul(transpose(X, n, m), AX, m, n, m);
}

/** tr(A·B) for square A, B; with B symmetric this is Σ_ij A_ij B_ij. */
export function traceProduct(A: Float64Array, B: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s += A[i * n + j] * B[j * n + i];
  return s;
}

/** In place: A = (A + Aᵀ)/2. */
export function symmetrize(A: Float64Array, n: number): Float64Array {
  for (let i = 0; i < n; i++)
    for (let j = 0; j < i; j++) {
      const v = 0.5 * (A[i * n + j] + A[j * n + i]);
      A[i * n + j] = v;
      A[j * n + i] = v;
    }
  return A;
}

export interface SymmetricEigen {
  /** ascending */
  values: Float64Array;
  /** eigenvectors as columns: vectors[i * n + k] is component i of vector k */
  vectors: Float64Array;
}

/** Eigen-decomposition of a symmetric matrix (symmetrized as ½(A + Aᵀ) first); see eigen.ts. */
export function symmetricEigen(A: Float64Array, n: number): SymmetricEigen {
  return symmetricEigenFlat(A, n);
}

/** Largest |A_ij − B_ij|. */
export function maxAbsDiff(A: Float64Array, B: Float64Array): number {
  let m = 0;
  for (let i = 0; i < A.length; i++) m = Math.max(m, Math.abs(A[i] - B[i]));
  return m;
}

/** √(mean of squares) of A − B. */
export function rmsDiff(A: Float64Array, B: Float64Array): number {
  let s = 0;
  for (let i = 0; i < A.length; i++) s += (A[i] - B[i]) ** 2;
  return Math.sqrt(s / A.length);
}

/**
 * C = A·Bᵀ with A (n × k) and B (m × k): dot products of contiguous rows, computed 2 × 2 at a
 * time so every load serves two multiply-adds and no store happens inside the k loop.
 */
export function matmulABt(A: Float64Array, aOff: number, B: Float64Array, bOff: number, n: number, k: number, m: number, C: Float64Array): Float64Array {
  const n2 = n - (n % 2), m2 = m - (m % 2);
  for (let i = 0; i < n2; i += 2) {
    const r0 = aOff + i * k, r1 = r0 + k;
    for (let j = 0; j < m2; j += 2) {
      const q0 = bOff + j * k, q1 = q0 + k;
      let s00 = 0, s01 = 0, s10 = 0, s11 = 0;
      for (let p = 0; p < k; p++) {
        const x0 = A[r0 + p], x1 = A[r1 + p], y0 = B[q0 + p], y1 = B[q1 + p];
        s00 += x0 * y0;
        s01 += x0 * y1;
        s10 += x1 * y0;
        s11 += x1 * y1;
      }
      C[i * m + j] = s00;
      C[i * m + j + 1] = s01;
      C[(i + 1) * m + j] = s10;
      C[(i + 1) * m + j + 1] = s11;
    }
  }
  // leftover row and column
  const dot = (r: number, q: number) => {
    let s = 0;
    for (let p = 0; p < k; p++) s += A[r + p] * B[q + p];
    return s;
  };
  if (m2 < m) for (let i = 0; i < n; i++) C[i * m + m - 1] = dot(aOff + i * k, bOff + (m - 1) * k);
  if (n2 < n) for (let j = 0; j < m2; j++) C[(n - 1) * m + j] = dot(aOff + (n - 1) * k, bOff + j * k);
  return C;
}
