// J and K from the 8-fold-symmetric, screened quartet digestion (every block-shape path: (ss|ss),
// a last sp shell of four functions, the general loop, and the two-density and J-only paths)
// against the defining sums J_μν = Σ (μν|λσ) D_λσ and K_μν = Σ (μλ|νσ) D_λσ over a full
// n⁴ tensor filled from the same ERIs by the permutational symmetry. Exact identities, no source
// needed; the ERIs themselves are checked elsewhere (test/engine/integrals).
import { describe, expect, it } from "vitest";
import { EriEngine } from "../../../src/engine/integrals/eri.ts";
import { JkBuilder } from "../../../src/engine/scf/jk.ts";
import { groupKernel } from "../../../src/engine/scf/jk-kernels.ts";
import { SimdStore, simdJkAvailable } from "../../../src/engine/scf/jk-simd.ts";
import { rng } from "../integrals/helpers.ts";
import { randomSymmetric } from "../linalg/helpers.ts";
import { atomsBohr, scfProblem } from "./helpers.ts";

function fullTensor(engine: EriEngine, n: number): Float64Array {
  const g = new Float64Array(n ** 4);
  const pairs = engine.pairs;
  for (let i = 0; i < pairs.length; i++)
    for (let j = 0; j <= i; j++) {
      const P = pairs[i], Q = pairs[j];
      const blk = engine.compute(P, Q);
      let k = 0;
      for (let a = 0; a < P.a.nfunc; a++)
        for (let b = 0; b < P.b.nfunc; b++)
          for (let c = 0; c < Q.a.nfunc; c++)
            for (let d = 0; d < Q.b.nfunc; d++) {
              const v = blk[k++];
              const A = P.a.offset + a, B = P.b.offset + b, C = Q.a.offset + c, D = Q.b.offset + d;
              for (const [p, q, r, s] of [[A, B, C, D], [B, A, C, D], [A, B, D, C], [B, A, D, C],
                [C, D, A, B], [D, C, A, B], [C, D, B, A], [D, C, B, A]])
                g[((p * n + q) * n + r) * n + s] = v;
            }
    }
  return g;
}

function reference(g: Float64Array, D: Float64Array, n: number) {
  const J = new Float64Array(n * n), K = new Float64Array(n * n);
  for (let m = 0; m < n; m++)
    for (let v = 0; v < n; v++) {
      let j = 0, k = 0;
      for (let l = 0; l < n; l++)
        for (let s = 0; s < n; s++) {
          j += g[((m * n + v) * n + l) * n + s] * D[l * n + s];
          k += g[((m * n + l) * n + v) * n + s] * D[l * n + s];
        }
      J[m * n + v] = j;
      K[m * n + v] = k;
    }
  return { J, K };
}

function maxDiff(a: Float64Array, b: Float64Array): number {
  let m = 0;
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k] - b[k]));
  return m;
}

// CH2F2 in 6-31G* (sp shells of 4, Cartesian d of 6, H s of 1) and water in
// cc-pVDZ (p of 3, spherical d of 5): every digestion path meets several shapes
const cases = [
  { name: "CH2F2 6-31G*", atoms: atomsBohr([["C", 0, 0, 0], ["F", 0, 0, 2.6], ["F", 2.4, 0, -0.9], ["H", -1.0, 1.7, -0.6], ["H", -1.0, -1.7, -0.6]]), basis: "6-31G*" },
  { name: "water cc-pVDZ", atoms: atomsBohr([["O", 0, 0, 0.2217], ["H", 0, 1.4309, -0.8867], ["H", 0, -1.4309, -0.8867]]), basis: "cc-pVDZ" },
];

describe("J/K digestion equals the defining sums over the full tensor", () => {
  for (const c of cases) for (const simd of [true, false]) {
    it(`${c.name} (${simd ? "SIMD" : "JavaScript"} run kernels)`, () => {
      const { basis } = scfProblem(c.atoms, c.basis, "rhf");
      const n = basis.nbf;
      // threshold 0: nothing screened, so the comparison is exact up to rounding
      const jk = new JkBuilder(basis, { threshold: 0, simd });
      const g = fullTensor(jk.engine, n);
      const D1 = randomSymmetric(n, 7), D2 = randomSymmetric(n, 11);
      const r1 = reference(g, D1, n), r2 = reference(g, D2, n);
      const scale = Math.max(...r1.J.map(Math.abs));
      const tol = 1e-13 * scale;
      const one = jk.build([D1]);
      expect(maxDiff(one.J, r1.J)).toBeLessThan(tol);
      expect(maxDiff(one.K[0], r1.K)).toBeLessThan(tol);
      const two = jk.build([D1, D2]);
      const Jsum = r1.J.map((x, k) => x + r2.J[k]);
      expect(maxDiff(two.J, Jsum)).toBeLessThan(tol);
      expect(maxDiff(two.K[0], r1.K)).toBeLessThan(tol);
      expect(maxDiff(two.K[1], r2.K)).toBeLessThan(tol);
      const jOnly = jk.build([D1], false);
      expect(maxDiff(jOnly.J, r1.J)).toBeLessThan(tol);
      // direct mode digests the same blocks recomputed
      const direct = new JkBuilder(basis, { threshold: 0, mode: "direct" }).build([D1]);
      expect(maxDiff(direct.K[0], r1.K)).toBeLessThan(tol);
    });
  }
});

describe("J/K run kernels", () => {
  it("give the same J and K generated (d unrolled) as the plain loops, for every last-shell size", () => {
    // the in-core RHF build goes through the generated kernels; the plain ones are the fallback
    // where code generation is not allowed: both digest the same made-up quartets
    const r = rng(5);
    const n = 40;
    const D = randomSymmetric(n, 3);
    for (const [na, nb, nc, nd] of [[1, 1, 1, 1], [4, 1, 4, 4], [6, 4, 3, 5], [3, 6, 1, 6], [1, 3, 7, 7], [10, 1, 1, 10]]) {
      const nq = 5;
      const size = na * nb * nc * nd;
      const blk = Float64Array.from({ length: nq * size }, () => r() - 0.5);
      // pair p: shells starting at 2p and 2p + 1 … (overlapping ranges are fine for the sums)
      const npair = 8;
      const g = {
        qBra: Int32Array.from({ length: nq }, (_, q) => q % npair),
        qKet: Int32Array.from({ length: nq }, (_, q) => (q * 3) % npair),
        qBound: new Float64Array(nq).fill(1),
        qCross: new Int32Array(4 * nq),
        qOff: Int32Array.from({ length: nq }, (_, q) => q * size),
        pA0: Int32Array.from({ length: npair }, (_, p) => 2 * p),
        pB0: Int32Array.from({ length: npair }, (_, p) => 2 * p + 1),
        pHalf: Float64Array.from({ length: npair }, (_, p) => (p % 3 === 0 ? 0.5 : 1)),
      };
      const pd = new Float64Array(npair).fill(1);
      const out = [true, false].map((generated) => {
        const J = new Float64Array(n * n), K = new Float64Array(n * n);
        const built = groupKernel(nd, { generated })(g, 0, nq, na, nb, nc, blk, pd, 1, 1e-12, n, D, J, K);
        return { J, K, built };
      });
      expect(out[0].built).toBe(nq);
      expect(out[1].built).toBe(nq);
      expect(maxDiff(out[0].J, out[1].J)).toBeLessThan(1e-14);
      expect(maxDiff(out[0].K, out[1].K)).toBeLessThan(1e-14);
      expect(Math.max(...out[0].K.map(Math.abs))).toBeGreaterThan(0.01);
    }
  });

  it("give the same J and K and screen the same quartets in SIMD as in JavaScript, for last shells of 1 to 10", () => {
    expect(simdJkAvailable()).toBe(true);
    const r = rng(9);
    const n = 40, npair = 8, nq = 7;
    const D = randomSymmetric(n, 13);
    for (let nd = 1; nd <= 10; nd++) {
      for (const [na, nb, nc] of [[1, 1, 1], [4, 3, 2], [3, 1, 5]]) {
        const size = na * nb * nc * nd;
        const blk = Float64Array.from({ length: nq * size }, () => r() - 0.5);
        const g = {
          qBra: Int32Array.from({ length: nq }, (_, q) => q % npair),
          qKet: Int32Array.from({ length: nq }, (_, q) => (q * 3) % npair),
          // quartet 2's bound is too small for the density: skipped by both
          qBound: Float64Array.from({ length: nq }, (_, q) => (q === 2 ? 1e-14 : 1)),
          qCross: Int32Array.from({ length: 4 * nq }, (_, k) => (k * 5) % npair),
          qOff: Int32Array.from({ length: nq }, (_, q) => q * size),
          pA0: Int32Array.from({ length: npair }, (_, p) => 3 * p),
          pB0: Int32Array.from({ length: npair }, (_, p) => 3 * p + 1),
          pHalf: Float64Array.from({ length: npair }, (_, p) => (p % 3 === 0 ? 0.5 : 1)),
        };
        const pd = Float64Array.from({ length: npair }, (_, p) => 0.5 + 0.1 * p);
        const J = new Float64Array(n * n), K = new Float64Array(n * n);
        const built = groupKernel(nd, { generated: false })(g, 0, nq, na, nb, nc, blk, pd, 1.2, 1e-12, n, D, J, K);
        // pieces of two quartets: the runs span several pieces
        const st = new SimdStore(npair, n, { quartets: 2, doubles: 2 * size });
        st.i32.set(g.pA0, st.at.pA0 / 4);
        st.i32.set(g.pB0, st.at.pB0 / 4);
        st.f64.set(g.pHalf, st.at.pHalf / 8);
        st.f64.set(pd, st.at.pd / 8);
        st.f64.set(D, st.at.D / 8);
        // from quartet 1 on, so that the pieces' offsets do not start at 0
        const builtSimd = st.digestRun(g, blk, nd, 0, 1, na, nb, nc, n, 1.2, 1e-12) + st.digestRun(g, blk, nd, 1, nq, na, nb, nc, n, 1.2, 1e-12);
        const Js = st.f64.subarray(st.at.J / 8, st.at.J / 8 + n * n), Ks = st.f64.subarray(st.at.K / 8, st.at.K / 8 + n * n);
        expect(built).toBe(nq - 1);
        expect(builtSimd).toBe(built);
        // a density too small for every bound: whole pieces skipped, nothing digested
        expect(st.digestRun(g, blk, nd, 0, nq, na, nb, nc, n, 1e-20, 1e-12)).toBe(0);
        expect(maxDiff(Js, J)).toBeLessThan(1e-14);
        expect(maxDiff(Ks, K)).toBeLessThan(1e-14);
        expect(Math.max(...K.map(Math.abs))).toBeGreaterThan(0.01);
      }
    }
  });
});
