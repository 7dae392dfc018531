// The SIMD dot kernel (src/engine/linalg/simd.ts, WebAssembly assembled at run time) and its
// JavaScript fallback against the definition C_ij = Σ_p A_ip B_jp. Exact up to rounding of sums
// of k products; no published value is involved.
import { describe, expect, it } from "vitest";
import { dotWorkspace } from "../../../src/engine/linalg/simd.ts";
import { rng } from "../integrals/helpers.ts";

function check(simd: boolean, n: number, k: number, m: number, lda = k, ldb = k, ldc = m): number {
  const r = rng(31 + n * 7 + k * 3 + m);
  const a = 3, b = a + n * lda + 1, c = b + m * ldb + 2;
  const ws = dotWorkspace(c + n * ldc + 5, { simd });
  const f = ws.f64;
  for (let x = 0; x < c; x++) f[x] = r() - 0.5;
  f.fill(NaN, c, c + n * ldc);
  const guard = f[c + n * ldc + 1];
  ws.abt(a, b, n, k, m, c, lda, ldb, ldc);
  let worst = 0;
  for (let i = 0; i < n; i++)
    for (let j = 0; j < m; j++) {
      let s = 0;
      for (let p = 0; p < k; p++) s += f[a + i * lda + p] * f[b + j * ldb + p];
      const got = f[c + i * ldc + j];
      worst = Math.max(worst, Number.isNaN(got) ? Infinity : Math.abs(got - s));
    }
  // nothing written past the block
  if (!Object.is(f[c + n * ldc + 1], guard)) return Infinity;
  return worst;
}

const shapes = [[1, 1, 1], [2, 2, 2], [3, 5, 7], [4, 3, 2], [7, 1, 9], [8, 16, 8], [13, 5, 11], [2, 0, 2], [15, 114, 93]];

describe("SIMD dot kernel", () => {
  it("is the one that runs here (WebAssembly SIMD is available in this Node)", () => {
    expect(dotWorkspace(16).simd).toBe(true);
  });

  for (const simd of [true, false]) {
    it(`gives A·Bᵀ for every remainder of its 2 × 2 blocking and odd k (${simd ? "SIMD" : "JavaScript"})`, () => {
      for (const [n, k, m] of shapes) expect(check(simd, n, k, m)).toBeLessThan(1e-13);
    });

    it(`honours row strides of A, B and C (${simd ? "SIMD" : "JavaScript"})`, () => {
      for (const [n, k, m] of shapes) expect(check(simd, n, k, m, k + 3, k + 1, m + 2)).toBeLessThan(1e-13);
    });
  }

  it("keeps its contents when the memory grows", () => {
    const ws = dotWorkspace(4);
    ws.f64.set([1, 2, 3, 4]);
    ws.reserve(200000);
    expect(Array.from(ws.f64.subarray(0, 4))).toEqual([1, 2, 3, 4]);
    expect(ws.f64.length).toBeGreaterThanOrEqual(200000);
  });
});
