// The typed-array symmetric eigensolver: exact eigenvalues of the tridiagonal Toeplitz matrix
// tridiag(−1, 2, −1), λ_k = 2 − 2 cos(kπ/(n+1)) (a standard closed form, e.g. G. D. Smith,
// Numerical Solution of Partial Differential Equations, 3rd ed. (1985), ch. 2; chapter from
// memory); residuals and orthonormality on random and degenerate matrices; agreement with
// ml-matrix's independent implementation.
import { EigenvalueDecomposition, Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { symmetricEigenFlat } from "../../../src/engine/linalg/eigen.ts";
import { randomSymmetric } from "./helpers.ts";

function check(A: Float64Array, n: number) {
  const { values, vectors: V } = symmetricEigenFlat(A, n);
  let res = 0, orth = 0;
  for (let c = 0; c < n; c++)
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += A[i * n + k] * V[k * n + c];
      res = Math.max(res, Math.abs(s - values[c] * V[i * n + c]));
    }
  for (let a = 0; a < n; a++)
    for (let b = 0; b < n; b++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += V[k * n + a] * V[k * n + b];
      orth = Math.max(orth, Math.abs(s - (a === b ? 1 : 0)));
    }
  for (let c = 1; c < n; c++) expect(values[c]).toBeGreaterThanOrEqual(values[c - 1]);
  return { values, res, orth };
}

describe("symmetric eigensolver", () => {
  it("gives the closed-form eigenvalues of tridiag(−1, 2, −1)", () => {
    const n = 50;
    const A = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      A[i * n + i] = 2;
      if (i > 0) A[i * n + i - 1] = A[(i - 1) * n + i] = -1;
    }
    const { values, res, orth } = check(A, n);
    for (let k = 1; k <= n; k++) expect(Math.abs(values[k - 1] - (2 - 2 * Math.cos((k * Math.PI) / (n + 1))))).toBeLessThan(1e-13);
    expect(res).toBeLessThan(1e-13);
    expect(orth).toBeLessThan(1e-13);
  });

  it("agrees with an independent implementation on random matrices, with small residuals", () => {
    for (const n of [1, 2, 3, 17, 120]) {
      const A = randomSymmetric(n, n + 3);
      const { values, res, orth } = check(A, n);
      const rows = Array.from({ length: n }, (_, i) => Array.from(A.subarray(i * n, i * n + n)));
      const ref = [...new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true }).realEigenvalues].sort((a, b) => a - b);
      for (let k = 0; k < n; k++) expect(Math.abs(values[k] - ref[k])).toBeLessThan(1e-12);
      expect(res).toBeLessThan(1e-12);
      expect(orth).toBeLessThan(1e-12);
    }
  });

  it("handles exact degeneracy and a diagonal matrix", () => {
    const n = 12;
    const A = new Float64Array(n * n);
    for (let i = 0; i < n; i++) A[i * n + i] = i % 3; // three threefold+ degenerate levels
    const d = check(A, n);
    expect([...d.values]).toEqual([0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 2]);
    expect(d.orth).toBeLessThan(1e-14);
    // a rotated degenerate matrix: Q diag Qᵀ with a Householder Q
    const v = Float64Array.from({ length: n }, (_, i) => Math.sin(i + 1));
    const vv = v.reduce((s, x) => s + x * x, 0);
    const Q = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) Q[i * n + j] = (i === j ? 1 : 0) - (2 * v[i] * v[j]) / vv;
    const B = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += Q[i * n + k] * A[k * n + k] * Q[j * n + k];
      B[i * n + j] = s;
    }
    const r = check(B, n);
    for (let k = 0; k < n; k++) expect(Math.abs(r.values[k] - [0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 2][k])).toBeLessThan(1e-13);
    expect(r.res).toBeLessThan(1e-13);
    expect(r.orth).toBeLessThan(1e-13);
  });
});
