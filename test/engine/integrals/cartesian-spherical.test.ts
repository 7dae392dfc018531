import { describe, expect, it } from "vitest";
import type { Shell } from "../../../src/engine/basis/types.ts";
import { cartComponents } from "../../../src/engine/integrals/cartesian.ts";
import { EriEngine } from "../../../src/engine/integrals/eri.ts";
import { kineticMatrix, overlapMatrix } from "../../../src/engine/integrals/one-electron.ts";
import { makeShellPair } from "../../../src/engine/integrals/shell-pairs.ts";
import { prepareShells } from "../../../src/engine/integrals/shells.ts";
import { componentTransform } from "../../../src/engine/integrals/spherical.ts";
import { matmul, primShell, randomShell, rng, symmetricEigenvalues, transpose, type Vec3 } from "./helpers.ts";

/**
 * C (ns × nc) with sph_o = Σ_i C_oi cart_i, cart_i the normalized Cartesian functions.
 *
 * componentTransform(l, true).matrix M maps the raw components g_i (x^i y^j z^k e^{−ar²}, all
 * carrying the normalization of x^l) to the spherical functions: sph_o = Σ_i M_oi g_i.
 * componentTransform(l, false).matrix is diagonal, D_ii, with cart_i = D_ii g_i. Hence
 * g_i = cart_i / D_ii and C_oi = M_oi / D_ii.
 */
function cartToSph(l: number): Float64Array {
  const M = componentTransform(l, true);
  const D = componentTransform(l, false);
  const nc = M.ncart;
  const C = new Float64Array(M.ncomp * nc);
  for (let o = 0; o < M.ncomp; o++) for (let i = 0; i < nc; i++) C[o * nc + i] = M.matrix[o * nc + i] / D.matrix[i * nc + i];
  return C;
}

/** identity on s and p shells (they stay Cartesian), C for l ≥ 2 */
function transformFor(l: number): { C: Float64Array; ns: number; nc: number } {
  const nc = ((l + 1) * (l + 2)) / 2;
  if (l < 2) {
    const C = new Float64Array(nc * nc);
    for (let i = 0; i < nc; i++) C[i * nc + i] = 1;
    return { C, ns: nc, nc };
  }
  return { C: cartToSph(l), ns: 2 * l + 1, nc };
}

function withPure(shells: Shell[], pure: boolean): Shell[] {
  return shells.map((s) => ({ ...s, pure }));
}

/** sub-block rows [r0, r0+nr), cols [c0, c0+nc) of an n×n matrix */
function sub(M: Float64Array, n: number, r0: number, nr: number, c0: number, nc: number): Float64Array {
  const out = new Float64Array(nr * nc);
  for (let i = 0; i < nr; i++) for (let j = 0; j < nc; j++) out[i * nc + j] = M[(r0 + i) * n + c0 + j];
  return out;
}

function maxRel(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let d = 0;
  let m = 0;
  for (let i = 0; i < b.length; i++) {
    d = Math.max(d, Math.abs(a[i] - b[i]));
    m = Math.max(m, Math.abs(b[i]));
  }
  return d / m;
}

describe("Cartesian and spherical functions", () => {
  it("gives S_sph = C S_cart Cᵀ and T_sph = C T_cart Cᵀ for d and f shells on different centres, to 1e-14", () => {
    // exact analytic result: the spherical functions are fixed linear combinations of the Cartesian ones
    const r = rng(51);
    const A: Vec3 = [0.1, 0.2, -0.3];
    const B: Vec3 = [1.0, -0.6, 0.8];
    for (const [la, lb] of [[2, 2], [3, 2], [3, 3], [2, 1], [3, 0]]) {
      const shells = [randomShell(r, la, A, 2, 1, false), randomShell(r, lb, B, 3, 1, false)];
      const cart = prepareShells(withPure(shells, false));
      const sph = prepareShells(withPure(shells, true));
      const ta = transformFor(la);
      const tb = transformFor(lb);
      for (const op of [overlapMatrix, kineticMatrix]) {
        const Mc = op(cart);
        const Ms = op(sph);
        const blockC = sub(Mc, cart.nbf, 0, ta.nc, ta.nc, tb.nc);
        const blockS = sub(Ms, sph.nbf, 0, ta.ns, ta.ns, tb.ns);
        const pred = matmul(matmul(ta.C, blockC, ta.ns, ta.nc, tb.nc), transpose(tb.C, tb.ns, tb.nc), ta.ns, tb.nc, tb.ns);
        expect(maxRel(blockS, pred)).toBeLessThanOrEqual(1e-14);
      }
    }
  });

  it("gives spherical ERI blocks as C-transforms of the Cartesian ones in every index, to 1e-13", () => {
    // exact analytic result, as above, for (d f | d p) and (f d | s d)
    const r = rng(52);
    for (const ls of [[2, 3, 2, 1], [3, 2, 0, 2]]) {
      const shells = ls.map((l, k) => randomShell(r, l, [0.4 * k, -0.3 * k, 0.2 * k * k] as Vec3, 1, 1, false, k));
      const cart = prepareShells(withPure(shells, false));
      const sph = prepareShells(withPure(shells, true));
      const get = (b: ReturnType<typeof prepareShells>) => {
        const eng = new EriEngine(b);
        const s = b.shells;
        const P = makeShellPair(s[0], 0, s[1], 1);
        const Q = makeShellPair(s[2], 2, s[3], 3);
        expect(P.swapped || Q.swapped).toBe(ls[0] < ls[1] || ls[2] < ls[3]);
        return { blk: Float64Array.from(eng.compute(P, Q).subarray(0, s.reduce((x, y) => x * y.nfunc, 1))), order: [P.a, P.b, Q.a, Q.b].map((x) => x.l) };
      };
      const c = get(cart);
      const s = get(sph);
      const t = c.order.map(transformFor);
      // transform index by index: out[o0 o1 o2 o3] = Σ C0 C1 C2 C3 cart[i0 i1 i2 i3]
      let cur = c.blk;
      let dims = t.map((x) => x.nc);
      for (let k = 0; k < 4; k++) {
        const before = dims.slice(0, k).reduce((x, y) => x * y, 1);
        const after = dims.slice(k + 1).reduce((x, y) => x * y, 1);
        const next = new Float64Array(before * t[k].ns * after);
        for (let p = 0; p < before; p++)
          for (let o = 0; o < t[k].ns; o++)
            for (let i = 0; i < t[k].nc; i++) {
              const w = t[k].C[o * t[k].nc + i];
              if (w === 0) continue;
              for (let q = 0; q < after; q++) next[(p * t[k].ns + o) * after + q] += w * cur[(p * t[k].nc + i) * after + q];
            }
        cur = next;
        dims = dims.map((d, j) => (j === k ? t[k].ns : d));
      }
      expect(maxRel(s.blk, cur)).toBeLessThanOrEqual(1e-13);
    }
  });

  it("has six independent Cartesian d functions, spanning the five spherical d plus the s-type x²+y²+z²", () => {
    // exact analytic result: x², y², z², xy, xz, yz = 5 solid harmonics ⊕ r²; on one centre
    // with one exponent the spherical d are orthonormal and orthogonal to r² e^{−ar²}
    const l = 2;
    const basis = prepareShells([primShell(l, [0.3, -0.2, 0.1], 1.3, false)]);
    const S = overlapMatrix(basis); // 6 × 6
    const nc = 6;
    const ev = symmetricEigenvalues(S, nc);
    expect(ev[0]).toBeGreaterThan(0.05); // rank 6, well conditioned
    const C = cartToSph(l);
    // C S Cᵀ = 1 (5 × 5)
    const CSCt = matmul(matmul(C, S, 5, nc, nc), transpose(C, 5, nc), 5, nc, 5);
    for (let i = 0; i < 5; i++) for (let j = 0; j < 5; j++) expect(Math.abs(CSCt[i * 5 + j] - (i === j ? 1 : 0))).toBeLessThanOrEqual(1e-14);
    // r² in normalized Cartesian functions: u_i = 1/D_ii for xx, yy, zz
    const D = componentTransform(l, false).matrix;
    const comps = cartComponents(l);
    const u = new Float64Array(nc);
    comps.forEach((c, i) => {
      if (c.includes(2)) u[i] = 1 / D[i * nc + i];
    });
    const Su = matmul(S, u, nc, nc, 1);
    const uSu = u.reduce((s, x, i) => s + x * Su[i], 0);
    expect(uSu).toBeGreaterThan(0.5); // r² is a genuine (nonzero) member of the Cartesian span
    const CSu = matmul(C, Su, 5, nc, 1); // its overlap with each spherical d
    for (let o = 0; o < 5; o++) expect(Math.abs(CSu[o]) / Math.sqrt(uSu)).toBeLessThanOrEqual(1e-14);
    // [C; û] is a complete orthonormal set of the Cartesian space: G S Gᵀ = 1 (6 × 6)
    const G = new Float64Array(nc * nc);
    G.set(C);
    for (let i = 0; i < nc; i++) G[5 * nc + i] = u[i] / Math.sqrt(uSu);
    const GSGt = matmul(matmul(G, S, nc, nc, nc), transpose(G, nc, nc), nc, nc, nc);
    for (let i = 0; i < nc; i++) for (let j = 0; j < nc; j++) expect(Math.abs(GSGt[i * nc + j] - (i === j ? 1 : 0))).toBeLessThanOrEqual(1e-14);
  });

  it("has ten Cartesian f functions spanning the seven spherical f plus the p-type x r², y r², z r²", () => {
    // exact analytic result: 10 = 7 ⊕ 3
    const l = 3;
    const nc = 10;
    const S = overlapMatrix(prepareShells([primShell(l, [0, 0, 0], 0.8, false)]));
    const C = cartToSph(l);
    const D = componentTransform(l, false).matrix;
    const comps = cartComponents(l);
    const G = new Float64Array(nc * nc);
    G.set(C);
    for (let ax = 0; ax < 3; ax++) {
      // x_ax · r² = Σ_b x_ax x_b²: components with exponent pattern 1_ax + 2_b
      const u = new Float64Array(nc);
      comps.forEach((c, i) => {
        for (let b = 0; b < 3; b++) {
          const want = [0, 0, 0];
          want[ax] += 1;
          want[b] += 2;
          if (c[0] === want[0] && c[1] === want[1] && c[2] === want[2]) u[i] += 1 / D[i * nc + i];
        }
      });
      const Su = matmul(S, u, nc, nc, 1);
      const uSu = u.reduce((s, x, i) => s + x * Su[i], 0);
      for (let i = 0; i < nc; i++) G[(7 + ax) * nc + i] = u[i] / Math.sqrt(uSu);
    }
    const GSGt = matmul(matmul(G, S, nc, nc, nc), transpose(G, nc, nc), nc, nc, nc);
    for (let i = 0; i < nc; i++) for (let j = 0; j < nc; j++) expect(Math.abs(GSGt[i * nc + j] - (i === j ? 1 : 0))).toBeLessThanOrEqual(1e-14);
  });
});
