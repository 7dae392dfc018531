import { describe, expect, it } from "vitest";
import { buildBasis } from "../../../src/engine/basis/index.ts";
import type { Shell } from "../../../src/engine/basis/types.ts";
import { kineticMatrix, nuclearAttractionMatrix, overlapMatrix, type PointCharge } from "../../../src/engine/integrals/one-electron.ts";
import { prepareShells } from "../../../src/engine/integrals/shells.ts";
import { boysF0, primShell, randomPoint, randomShell, rng, symmetricEigenvalues, type Vec3 } from "./helpers.ts";

const dist2 = (A: Vec3, B: Vec3) => (A[0] - B[0]) ** 2 + (A[1] - B[1]) ** 2 + (A[2] - B[2]) ** 2;
const norm = (a: number) => ((2 * a) / Math.PI) ** 0.75;

/** random exponent pairs and centres, including coincident centres and a far-apart pair */
function sPairs(): { a: number; b: number; A: Vec3; B: Vec3 }[] {
  const r = rng(11);
  const out: { a: number; b: number; A: Vec3; B: Vec3 }[] = [];
  for (let k = 0; k < 40; k++) {
    const a = 0.05 * 2000 ** r();
    const b = 0.05 * 2000 ** r();
    const A = randomPoint(r, 2);
    const B: Vec3 = k % 5 === 0 ? [A[0], A[1], A[2]] : randomPoint(r, 2);
    out.push({ a, b, A, B });
  }
  out.push({ a: 0.3, b: 0.2, A: [0, 0, 0], B: [0, 0, 9] });
  return out;
}

describe("one-electron integrals over normalized s Gaussians", () => {
  it("gives the closed-form overlap S = (4ab/p²)^{3/4} e^{−μR²} to 1e-14 relative", () => {
    // exact analytic result (Gaussian product theorem)
    for (const { a, b, A, B } of sPairs()) {
      const S = overlapMatrix(prepareShells([primShell(0, A, a), primShell(0, B, b)]));
      const p = a + b;
      const ref = ((4 * a * b) / (p * p)) ** 0.75 * Math.exp(-((a * b) / p) * dist2(A, B));
      expect(Math.abs(S[1] - ref) / ref).toBeLessThanOrEqual(1e-14);
      expect(Math.abs(S[0] - 1)).toBeLessThanOrEqual(1e-14);
    }
  });

  it("gives the closed-form kinetic energy T = μ(3 − 2μR²) S to 1e-14 of the diagonal scale", () => {
    // exact analytic result; T changes sign at 2μR² = 3, so the error is measured against
    // √(T_aa T_bb) (= the natural scale of the element) rather than against T_ab itself
    for (const { a, b, A, B } of sPairs()) {
      const T = kineticMatrix(prepareShells([primShell(0, A, a), primShell(0, B, b)]));
      const p = a + b;
      const mu = (a * b) / p;
      const R2 = dist2(A, B);
      const S = ((4 * a * b) / (p * p)) ** 0.75 * Math.exp(-mu * R2);
      const ref = mu * (3 - 2 * mu * R2) * S;
      expect(Math.abs(T[0] - 1.5 * a) / (1.5 * a)).toBeLessThanOrEqual(1e-14); // T_aa = 3a/2 (μ = a/2, R = 0)
      expect(Math.abs(T[1] - ref) / Math.sqrt(T[0] * T[3])).toBeLessThanOrEqual(1e-14);
    }
  });

  it("gives the closed-form nuclear attraction −(2π/p) N_a N_b e^{−μR²} F_0(p|P−C|²) to 1e-14 relative", () => {
    // exact analytic result; F_0 from the erf closed form of helpers.ts, not from boys.ts
    const r = rng(12);
    for (const { a, b, A, B } of sPairs()) {
      const C = randomPoint(r, 2.5);
      const Z = 1 + Math.floor(8 * r());
      const charges: PointCharge[] = [{ charge: Z, x: C[0], y: C[1], z: C[2] }];
      const V = nuclearAttractionMatrix(prepareShells([primShell(0, A, a), primShell(0, B, b)]), charges);
      const p = a + b;
      const P: Vec3 = [0, 1, 2].map((k) => (a * A[k] + b * B[k]) / p) as Vec3;
      const ref = -Z * ((2 * Math.PI) / p) * norm(a) * norm(b) * Math.exp(-((a * b) / p) * dist2(A, B)) * boysF0(p * dist2(P, C));
      expect(Math.abs(V[1] - ref) / Math.abs(ref)).toBeLessThanOrEqual(1e-14);
    }
  });

  it("sums the attraction of several charges, and a charge on the centre of a lone s gives −2Z√(2a/π)", () => {
    // exact analytic result: ⟨s|1/r|s⟩ = 2√(2a/π)·… for a normalized s Gaussian centred on the charge:
    // −Z (2π/2a) N² F_0(0) = −Z (π/a)(2a/π)^{3/2} = −2Z √(2a/π)
    const a = 0.83;
    const basis = prepareShells([primShell(0, [0.1, -0.2, 0.3], a)]);
    const one = nuclearAttractionMatrix(basis, [{ charge: 3, x: 0.1, y: -0.2, z: 0.3 }]);
    expect(Math.abs(one[0] / (-6 * Math.sqrt((2 * a) / Math.PI)) - 1)).toBeLessThanOrEqual(1e-14);
    const far: PointCharge = { charge: 2, x: 1.5, y: 0.4, z: -0.7 };
    const both = nuclearAttractionMatrix(basis, [{ charge: 3, x: 0.1, y: -0.2, z: 0.3 }, far]);
    const alone = nuclearAttractionMatrix(basis, [far]);
    expect(Math.abs(both[0] - one[0] - alone[0]) / Math.abs(both[0])).toBeLessThanOrEqual(1e-15);
  });

  it("gives ⟨p_x|V_C|s⟩ as the analytic A_x-derivative of the s–s closed form to 1e-13 relative", () => {
    // exact analytic result: x_A e^{−a r_A²} = (1/2a) ∂/∂A_x e^{−a r_A²}, so with
    // G = (2π/p) e^{−μR²} F_0(T), T = p|P−C|²:
    //   ∂G/∂A_x = (2π/p) e^{−μR²} [−2μ X_AB F_0(T) − 2a (P_x − C_x) F_1(T)],
    // F_1 = (F_0 − e^{−T})/(2T) (downward recursion), T kept ≥ 0.5 so that this is well conditioned.
    // p primitive normalization (2a/π)^{3/4} (4a)^{1/2} (exact analytic result for x e^{−a r²}).
    const r = rng(13);
    let n = 0;
    while (n < 20) {
      const a = 0.2 + 3 * r();
      const b = 0.2 + 3 * r();
      const A = randomPoint(r, 1.5);
      const B = randomPoint(r, 1.5);
      const C = randomPoint(r, 2.5);
      const p = a + b;
      const P: Vec3 = [0, 1, 2].map((k) => (a * A[k] + b * B[k]) / p) as Vec3;
      const T = p * dist2(P, C);
      if (T < 0.5) continue;
      n++;
      const mu = (a * b) / p;
      const e = Math.exp(-mu * dist2(A, B));
      const F0 = boysF0(T);
      const F1 = (F0 - Math.exp(-T)) / (2 * T);
      const V = nuclearAttractionMatrix(prepareShells([primShell(1, A, a), primShell(0, B, b)]), [{ charge: 1, x: C[0], y: C[1], z: C[2] }]);
      const Np = norm(a) * Math.sqrt(4 * a);
      for (let ax = 0; ax < 3; ax++) {
        const dG = ((2 * Math.PI) / p) * e * (-2 * mu * (A[ax] - B[ax]) * F0 - 2 * a * (P[ax] - C[ax]) * F1);
        const ref = -(Np * norm(b) * dG) / (2 * a);
        // basis order: p_x, p_y, p_z, s → element (ax, 3) of the 4×4 matrix
        const scale = Math.max(Math.abs(ref), ((2 * Math.PI) / p) * e * F0 * norm(a) * norm(b) * 1e-3);
        expect(Math.abs(V[ax * 4 + 3] - ref) / scale).toBeLessThanOrEqual(1e-13);
      }
    }
  });
});

/** water (bohr), geometry of the public SCF tutorial used in water-sto3g.test.ts */
const WATER = [
  { symbol: "O", xyz: [0, -0.143225816552, 0] as Vec3 },
  { symbol: "H", xyz: [1.638036840407, 1.136548822547, 0] as Vec3 },
  { symbol: "H", xyz: [-1.638036840407, 1.136548822547, 0] as Vec3 },
];

/** max |M1 − P M2 Pᵀ| / max |M1| where P maps functions of `shells` to those of the reversed list */
function orderDiscrepancy(shells: Shell[], m1: Float64Array, m2: Float64Array): number {
  const b1 = prepareShells(shells);
  const b2 = prepareShells([...shells].reverse());
  const perm = new Int32Array(b1.nbf);
  b1.shells.forEach((s, i) => {
    const t = b2.shells[shells.length - 1 - i];
    for (let f = 0; f < s.nfunc; f++) perm[s.offset + f] = t.offset + f;
  });
  const n = b1.nbf;
  let scale = 0;
  let diff = 0;
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      scale = Math.max(scale, Math.abs(m1[i * n + j]));
      diff = Math.max(diff, Math.abs(m1[i * n + j] - m2[perm[i] * n + perm[j]]));
    }
  return diff / scale;
}

/** A random basis with every l ≤ 4, Cartesian and spherical, segmented and general contractions. */
function mixedShells(seed: number): Shell[] {
  const r = rng(seed);
  const shells: Shell[] = [];
  const centres: Vec3[] = [[0, 0, 0], [1.2, -0.4, 0.3], [-0.5, 1.1, -0.9]];
  for (let l = 0; l <= 4; l++)
    for (const pure of l >= 2 ? [false, true] : [false]) {
      const c = centres[(l + (pure ? 1 : 0)) % 3];
      shells.push(randomShell(r, l, c, 3, l <= 1 ? 2 : 1, pure, 0));
      shells.push(randomShell(r, l, centres[(l + 2) % 3], 2, 1, pure, 0));
    }
  return shells;
}

describe("structure of the one-electron matrices", () => {
  it("gives unit-diagonal overlap for normalized Cartesian and spherical functions up to g", () => {
    // exact analytic result: every function is normalized (shells.ts, spherical.ts)
    const basis = prepareShells(mixedShells(21));
    const S = overlapMatrix(basis);
    const n = basis.nbf;
    let worst = 0;
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(S[i * n + i] - 1));
    expect(worst).toBeLessThanOrEqual(1e-14);
  });

  it("gives an orthonormal set of spherical functions on one centre (one primitive, l = 2, 3, 4)", () => {
    // exact analytic result: real solid harmonics of one l are orthogonal on the sphere
    for (let l = 2; l <= 4; l++) {
      const S = overlapMatrix(prepareShells([primShell(l, [0.3, -0.1, 0.2], 0.9, true)]));
      const n = 2 * l + 1;
      for (let i = 0; i < n; i++)
        for (let j = 0; j < n; j++) expect(Math.abs(S[i * n + j] - (i === j ? 1 : 0))).toBeLessThanOrEqual(1e-14);
    }
  });

  it("does not depend on the order of the shells (bra and ket roles exchanged) for S and V", () => {
    // the recurrences are applied towards the shell that comes first in the basis; exchanging the
    // order must only permute the matrices (hermiticity of the operators; exact analytic result).
    // 1e-13 of the largest element: rounding in recurrences up to l = 4+4 (common practice, no source)
    const shells = mixedShells(22);
    const b1 = prepareShells(shells);
    const b2 = prepareShells([...shells].reverse());
    const charges: PointCharge[] = [{ charge: 8, x: 0.2, y: 0.1, z: -0.3 }, { charge: 1, x: -1, y: 0.5, z: 0.8 }];
    expect(orderDiscrepancy(shells, overlapMatrix(b1), overlapMatrix(b2))).toBeLessThanOrEqual(1e-13);
    expect(orderDiscrepancy(shells, nuclearAttractionMatrix(b1, charges), nuclearAttractionMatrix(b2, charges))).toBeLessThanOrEqual(1e-13);
  });

  it("does not depend on the order of the shells for T of water in cc-pVQZ, to 1e-13 of the largest element", () => {
    // same hermiticity argument; measured 1.9e-14 (the g shells of O make the worst elements)
    const shells = buildBasis(WATER, "cc-pVQZ").shells;
    const b1 = prepareShells(shells);
    const b2 = prepareShells([...shells].reverse());
    expect(orderDiscrepancy(shells, kineticMatrix(b1), kineticMatrix(b2))).toBeLessThanOrEqual(1e-13);
  });

  // ⟨g (1,2,1) on A, a = 0.17 | −½∇² | g (0,4,0) on B, b = 2.85⟩, normalized Cartesian primitives,
  // A = (1.2, −0.4, 0.3), B = (−0.5, 1.1, −0.9): 0.08921626522580283006 — 40-digit mpmath
  // quadrature (mpmath.quad of the 1D factors, second derivative by mpmath.diff), computed by the
  // test author while writing this test.
  const GG_KINETIC = 0.08921626522580283;
  const ggPair = (): [Shell, Shell] => [primShell(4, [1.2, -0.4, 0.3], 0.17), primShell(4, [-0.5, 1.1, -0.9], 2.85)];

  it("gives a g–g kinetic element between a diffuse and a tight primitive to 1e-14 when the diffuse one comes first", () => {
    const [d, t] = ggPair();
    const T = kineticMatrix(prepareShells([d, t])); // element (d (1,2,1), t (0,4,0))
    expect(Math.abs(T[7 * 30 + 15 + 10] - GG_KINETIC) / GG_KINETIC).toBeLessThanOrEqual(1e-14);
  });

  // overlap-1d.ts runs the horizontal transfer from the tighter primitive towards the more diffuse
  // one whatever the shell order; transferring onto the tight shell came out 3.2e-12 relative off.
  it("gives the same g–g kinetic element to 1e-14 when the tight primitive comes first", () => {
    const [d, t] = ggPair();
    const T = kineticMatrix(prepareShells([t, d])); // element (t (0,4,0), d (1,2,1))
    expect(Math.abs(T[10 * 30 + 15 + 7] - GG_KINETIC) / GG_KINETIC).toBeLessThanOrEqual(1e-14);
  });

  it("gives positive-definite overlap and kinetic matrices for water in cc-pVDZ", () => {
    // common practice, no source: S is a Gram matrix of independent functions and T = ½⟨∇φ|∇φ⟩ is
    // a Gram matrix of their gradients, so both have only positive eigenvalues
    const atoms = WATER;
    const basis = prepareShells(buildBasis(atoms, "cc-pVDZ").shells);
    const n = basis.nbf;
    const evS = symmetricEigenvalues(overlapMatrix(basis), n);
    const evT = symmetricEigenvalues(kineticMatrix(basis), n);
    expect(evS[0]).toBeGreaterThan(0);
    expect(evT[0]).toBeGreaterThan(0);
    // the attraction of positive nuclei is negative definite
    const V = nuclearAttractionMatrix(basis, atoms.map((a) => ({ charge: a.symbol === "O" ? 8 : 1, x: a.xyz[0], y: a.xyz[1], z: a.xyz[2] })));
    expect(symmetricEigenvalues(V, n)[n - 1]).toBeLessThan(0);
  });
});
