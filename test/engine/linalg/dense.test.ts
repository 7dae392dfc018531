import { describe, expect, it } from "vitest";
import { matmul, matmulABt } from "../../../src/engine/linalg/dense.ts";
import { rng } from "../integrals/helpers.ts";

// the blocked products against their definitions (exact up to rounding: sums of k products)
describe("dense products", () => {
  it("gives A·Bᵀ = Σ_p A_ip B_jp for every remainder of the 2 × 2 blocking, with offsets into A and B", () => {
    const r = rng(17);
    for (const [n, k, m] of [[1, 1, 1], [4, 3, 2], [5, 7, 3], [7, 1, 9], [8, 16, 8], [13, 5, 11]]) {
      const aOff = 3, bOff = 5;
      const A = Float64Array.from({ length: aOff + n * k }, () => r() - 0.5);
      const B = Float64Array.from({ length: bOff + m * k }, () => r() - 0.5);
      const C = matmulABt(A, aOff, B, bOff, n, k, m, new Float64Array(n * m).fill(NaN));
      let worst = 0;
      for (let i = 0; i < n; i++)
        for (let j = 0; j < m; j++) {
          let s = 0;
          for (let p = 0; p < k; p++) s += A[aOff + i * k + p] * B[bOff + j * k + p];
          worst = Math.max(worst, Math.abs(C[i * m + j] - s));
        }
      expect(worst).toBeLessThan(1e-14);
    }
  });

  it("gives A·B = Σ_p A_ip B_pj, zero rows of A included", () => {
    const r = rng(19);
    for (const [n, k, m] of [[1, 1, 1], [3, 5, 2], [6, 9, 7]]) {
      const A = Float64Array.from({ length: n * k }, (_, x) => (x % 5 === 0 ? 0 : r() - 0.5));
      const B = Float64Array.from({ length: k * m }, () => r() - 0.5);
      const C = matmul(A, B, n, k, m);
      for (let i = 0; i < n; i++)
        for (let j = 0; j < m; j++) {
          let s = 0;
          for (let p = 0; p < k; p++) s += A[i * k + p] * B[p * m + j];
          expect(Math.abs(C[i * m + j] - s)).toBeLessThan(1e-14);
        }
    }
  });
});
