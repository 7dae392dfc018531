import { describe, expect, it } from "vitest";
import type { Shell } from "../../../src/engine/basis/types.ts";
import { EriEngine } from "../../../src/engine/integrals/eri.ts";
import { makeShellPair, type ShellPair } from "../../../src/engine/integrals/shell-pairs.ts";
import { prepareShells, type PreparedShell } from "../../../src/engine/integrals/shells.ts";
import { boysF0, primShell, randomPoint, randomShell, rng, type Vec3 } from "./helpers.ts";
import { referenceEriBlock } from "./reference-eri.ts";

const dist2 = (A: Vec3, B: Vec3) => (A[0] - B[0]) ** 2 + (A[1] - B[1]) ** 2 + (A[2] - B[2]) ** 2;

/**
 * The engine's block for the quartet of user shells (i j | k l), returned in the user's layout
 * ((f_i·n_j + f_j)·n_k + f_k)·n_l + f_l, whatever orientation the engine stored the pairs in
 * (ShellPair.swapped) and whichever of bra/ket was passed first (`ketFirst`).
 */
function engineBlock(eng: EriEngine, sh: PreparedShell[], q: [number, number, number, number], ketFirst = false): Float64Array {
  const [i, j, k, l] = q;
  const P = makeShellPair(sh[i], i, sh[j], j);
  const Q = makeShellPair(sh[k], k, sh[l], l);
  const X = ketFirst ? Q : P;
  const Y = ketFirst ? P : Q;
  const blk = eng.compute(X, Y);
  const nf = [sh[i].nfunc, sh[j].nfunc, sh[k].nfunc, sh[l].nfunc];
  // user positions 0..3 of the engine's four indices X.a, X.b, Y.a, Y.b
  const posOf = (pair: ShellPair, first: number, second: number) => (pair.swapped ? [second, first] : [first, second]);
  const pos = [...posOf(X, ketFirst ? 2 : 0, ketFirst ? 3 : 1), ...posOf(Y, ketFirst ? 0 : 2, ketFirst ? 1 : 3)];
  const en = pos.map((p) => nf[p]);
  const userStride = [nf[1] * nf[2] * nf[3], nf[2] * nf[3], nf[3], 1];
  const out = new Float64Array(nf[0] * nf[1] * nf[2] * nf[3]);
  let e = 0;
  for (let a = 0; a < en[0]; a++)
    for (let b = 0; b < en[1]; b++)
      for (let c = 0; c < en[2]; c++)
        for (let d = 0; d < en[3]; d++) {
          const idx = [0, 0, 0, 0];
          idx[pos[0]] = a;
          idx[pos[1]] = b;
          idx[pos[2]] = c;
          idx[pos[3]] = d;
          out[idx[0] * userStride[0] + idx[1] * userStride[1] + idx[2] * userStride[2] + idx[3]] = blk[e++];
        }
  return out;
}

function relErr(a: Float64Array, ref: Float64Array): number {
  let d = 0;
  let m = 0;
  for (let i = 0; i < ref.length; i++) {
    d = Math.max(d, Math.abs(a[i] - ref[i]));
    m = Math.max(m, Math.abs(ref[i]));
  }
  return d / m;
}

/** (a b | c d) with the four shells given, each orientation of the 8-fold symmetry. */
const ORIENTATIONS: { q: [number, number, number, number]; ketFirst: boolean }[] = [
  { q: [0, 1, 2, 3], ketFirst: false },
  { q: [1, 0, 2, 3], ketFirst: false },
  { q: [0, 1, 3, 2], ketFirst: false },
  { q: [1, 0, 3, 2], ketFirst: true },
  { q: [0, 1, 2, 3], ketFirst: true },
];

/** permute a user-layout block of (i j | k l) back to the (0 1 | 2 3) layout */
function toCanonical(blk: Float64Array, q: [number, number, number, number], nf: number[]): Float64Array {
  const out = new Float64Array(blk.length);
  const n = q.map((p) => nf[p]);
  const cs = [nf[1] * nf[2] * nf[3], nf[2] * nf[3], nf[3], 1];
  let e = 0;
  for (let a = 0; a < n[0]; a++)
    for (let b = 0; b < n[1]; b++)
      for (let c = 0; c < n[2]; c++)
        for (let d = 0; d < n[3]; d++) {
          const idx = [0, 0, 0, 0];
          idx[q[0]] = a;
          idx[q[1]] = b;
          idx[q[2]] = c;
          idx[q[3]] = d;
          out[idx[0] * cs[0] + idx[1] * cs[1] + idx[2] * cs[2] + idx[3]] = blk[e++];
        }
  return out;
}

describe("EriEngine on s functions", () => {
  it("gives the closed-form (ss|ss) = 2π^{5/2}/(pq√(p+q)) N_aN_bN_cN_d e^{−μR_ab²} e^{−νR_cd²} F_0(ρ|P−Q|²) to 1e-14 relative", () => {
    // exact analytic result; F_0 from the independent erf closed form (helpers.ts)
    // exponents 0.05 … 50 and centres within ±2 bohr; integrals whose primitive pairs the engine
    // drops as negligible (shell-pairs.ts PRIMITIVE_PAIR_CUTOFF = 1e-20) must be tiny themselves
    const r = rng(31);
    const N = (a: number) => ((2 * a) / Math.PI) ** 0.75;
    let worst = 0;
    let dropped = 0;
    let largestDropped = 0;
    for (let k = 0; k < 200; k++) {
      const e = [0, 1, 2, 3].map(() => 0.05 * 1000 ** r());
      const c: Vec3[] = [0, 1, 2, 3].map(() => randomPoint(r, 2));
      if (k % 6 === 0) c[1] = c[0];
      if (k % 6 === 1) c[3] = c[2];
      if (k % 6 === 2) c[1] = c[2] = c[3] = c[0];
      if (k % 6 === 3) c[2] = c[0];
      const basis = prepareShells(c.map((x, i) => primShell(0, x, e[i])));
      const sh = basis.shells;
      const eng = new EriEngine(basis);
      const v = engineBlock(eng, sh, [0, 1, 2, 3])[0];
      const [a, b, cc, d] = e;
      const p = a + b;
      const q = cc + d;
      const P: Vec3 = [0, 1, 2].map((i) => (a * c[0][i] + b * c[1][i]) / p) as Vec3;
      const Q: Vec3 = [0, 1, 2].map((i) => (cc * c[2][i] + d * c[3][i]) / q) as Vec3;
      const ref =
        ((2 * Math.PI ** 2.5) / (p * q * Math.sqrt(p + q))) *
        N(a) * N(b) * N(cc) * N(d) *
        Math.exp(-((a * b) / p) * dist2(c[0], c[1])) *
        Math.exp(-((cc * d) / q) * dist2(c[2], c[3])) *
        boysF0(((p * q) / (p + q)) * dist2(P, Q));
      if (v === 0 && ref < 1e-15) {
        dropped++;
        largestDropped = Math.max(largestDropped, ref);
        continue;
      }
      worst = Math.max(worst, Math.abs(v - ref) / ref);
    }
    expect(worst).toBeLessThanOrEqual(1e-14);
    expect(dropped).toBeGreaterThan(0); // the range does reach the cutoff
    expect(dropped).toBeLessThan(100);
    expect(largestDropped).toBeLessThanOrEqual(1e-18);
  });

  it("gives the self-repulsion of a normalized s Gaussian, (ss|ss) = 2√(a/π) on one centre, to 1e-14", () => {
    // exact analytic result: the closed form above with all four exponents a, R = 0, F_0(0) = 1
    for (const a of [0.01, 0.7, 130.7093214]) {
      const eng = new EriEngine(prepareShells([primShell(0, [0.2, 0.3, -0.1], a)]));
      const v = eng.compute(eng.pairs[0], eng.pairs[0])[0];
      expect(Math.abs(v / (2 * Math.sqrt(a / Math.PI)) - 1)).toBeLessThanOrEqual(1e-14);
    }
  });
});

type Quartet = [number, number, number, number];

/** every (la lb | lc ld) with each l ≤ 2 (81 classes) */
const UP_TO_D: Quartet[] = [];
for (let a = 0; a <= 2; a++) for (let b = 0; b <= 2; b++) for (let c = 0; c <= 2; c++) for (let d = 0; d <= 2; d++) UP_TO_D.push([a, b, c, d]);

/** f and g in every position, alone and with other angular momenta (kept small enough for the slow reference) */
const WITH_F_G: Quartet[] = [
  [3, 0, 0, 0], [0, 3, 0, 0], [0, 0, 3, 0], [0, 0, 0, 3],
  [4, 0, 0, 0], [0, 4, 0, 0], [0, 0, 4, 0], [0, 0, 0, 4],
  [3, 1, 2, 0], [1, 3, 0, 2], [2, 0, 3, 1], [0, 2, 1, 3],
  [3, 3, 1, 0], [1, 1, 3, 3], [3, 2, 2, 1],
  [4, 1, 1, 0], [1, 4, 0, 1], [0, 1, 4, 1], [1, 0, 1, 4],
  [4, 2, 0, 0], [0, 0, 2, 4], [4, 0, 3, 0], [0, 3, 0, 4], [4, 1, 2, 2],
  [4, 4, 0, 0], [0, 0, 4, 4], [4, 0, 4, 0], [2, 4, 1, 1], [1, 3, 4, 0],
];

/** cost of the reference block ≈ Cartesian components × primitive quartets */
function ncart(l: number): number {
  return ((l + 1) * (l + 2)) / 2;
}

interface Case {
  ls: Quartet;
  shells: Shell[];
  label: string;
}

/** Random shells for a class: centres with coincidences, pure/Cartesian mix, segmented and general contractions. */
function makeCase(r: () => number, ls: Quartet, variant: number): Case {
  const comps = ls.reduce((s, l) => s * ncart(l), 1);
  // primitives per shell: keep the reference's work (components × primitive quartets) bounded
  const budget = 12000;
  const base: Vec3 = randomPoint(r, 1);
  const centres: Vec3[] = [0, 1, 2, 3].map(() => randomPoint(r, 1.2));
  const coincide = variant % 5;
  if (coincide === 1) centres[1] = centres[0]; // a = b
  if (coincide === 2) centres[3] = centres[2]; // c = d
  if (coincide === 3) centres[2] = centres[0]; // a = c
  if (coincide === 4) centres[1] = centres[2] = centres[3] = centres[0]; // one centre
  const shells: Shell[] = [];
  let work = comps;
  const general = variant % 2 === 1;
  const labels: string[] = [];
  for (let k = 0; k < 4; k++) {
    const l = ls[k];
    const pure = l >= 2 && r() < 0.5;
    // general contraction (2–3 rows over 3 primitives) on one shell when affordable, else segmented
    let nprim = 1;
    let nrows = 1;
    if (general && k === variant % 4 && work * 27 * 9 <= budget * 9) {
      nprim = 3;
      nrows = 2 + (variant % 3 === 0 ? 1 : 0);
    } else if (work * 2 <= budget) nprim = 2;
    work *= nprim * nrows;
    const c: Vec3 = [base[0] + centres[k][0], base[1] + centres[k][1], base[2] + centres[k][2]];
    shells.push(randomShell(r, l, c, nprim, nrows, pure, k));
    labels.push(`${"spdfg"[l]}${pure ? "(sph)" : ""}${nrows > 1 ? `[${nrows}x${nprim}]` : nprim > 1 ? `[${nprim}]` : ""}`);
  }
  return { ls, shells, label: `(${labels[0]} ${labels[1]}|${labels[2]} ${labels[3]}) centres#${coincide}` };
}

/** max |x| */
function maxAbs(x: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < x.length; i++) m = Math.max(m, Math.abs(x[i]));
  return m;
}

/** max |diagonal| of the engine's (ab|ab) block for shells i, j */
function schwarzDiag(eng: EriEngine, sh: PreparedShell[], i: number, j: number): number {
  const blk = engineBlock(eng, sh, [i, j, i, j]);
  const n = sh[i].nfunc * sh[j].nfunc;
  let m = 0;
  for (let k = 0; k < n; k++) m = Math.max(m, Math.abs(blk[k * n + k]));
  return m;
}

/**
 * Errors of one quartet, each orientation against the reference and against the first
 * orientation. The scale is max |reference|, except for blocks that vanish by symmetry (all
 * centres coincide and the angular momenta cannot couple): there max |reference| is rounding
 * noise, and the scale is the Schwarz bound √(ab|ab)√(cd|cd) (from the engine's diagonal blocks).
 */
function checkCase(c: Case, warmCalls: number): { ref: number; orient: number; zero: boolean } {
  const basis = prepareShells(c.shells);
  const eng = new EriEngine(basis, { warmCalls });
  const sh = basis.shells;
  const ref = referenceEriBlock(sh[0], sh[1], sh[2], sh[3]);
  const nf = sh.map((s) => s.nfunc);
  const bound = Math.sqrt(schwarzDiag(eng, sh, 0, 1) * schwarzDiag(eng, sh, 2, 3));
  const zero = maxAbs(ref) < 1e-10 * bound;
  const scale = zero ? bound : maxAbs(ref);
  let worstRef = 0;
  let worstOrient = 0;
  const first = engineBlock(eng, sh, [0, 1, 2, 3]);
  for (const o of ORIENTATIONS) {
    const blk = toCanonical(engineBlock(eng, sh, o.q, o.ketFirst), o.q, nf);
    let d = 0;
    let dO = 0;
    for (let i = 0; i < ref.length; i++) {
      d = Math.max(d, Math.abs(blk[i] - ref[i]));
      dO = Math.max(dO, Math.abs(blk[i] - first[i]));
    }
    worstRef = Math.max(worstRef, d / scale);
    worstOrient = Math.max(worstOrient, dO / scale);
  }
  return { ref: worstRef, orient: worstOrient, zero };
}

describe("EriEngine against the independent McMurchie–Davidson reference (reference-eri.ts)", () => {
  // Tolerance: max |engine − reference| ≤ 1e-12 · max |reference| over each block — both are
  // exact methods, so the difference is rounding in recurrences up to L = 16 (common practice,
  // no source). The orientations are the 8-fold permutational symmetry (ab|cd) = (ba|cd) =
  // (ab|dc) = (cd|ab) … (exact analytic result); the engine takes different recurrence paths for
  // them, so they agree to rounding only.
  // every check runs twice: through the table-driven code (which a class uses for its first
  // quartets, eri.ts WARM_CALLS) and through the generated code from the first quartet
  for (const [mode, warmCalls] of [["tables", Infinity], ["generated code", 0]] as const) {
  it(`matches every class with l ≤ 2 in each position (81 classes × 2 variants), Cartesian and spherical, segmented and general (${mode})`, () => {
    const r = rng(41);
    let worst = 0;
    let worstO = 0;
    let where = "";
    for (const ls of UP_TO_D)
      for (let v = 0; v < 2; v++) {
        const c = makeCase(r, ls, v + 2 * (ls[0] + ls[1] + ls[2] + ls[3]));
        const e = checkCase(c, warmCalls);
        if (e.ref > worst) {
          worst = e.ref;
          where = c.label;
        }
        worstO = Math.max(worstO, e.orient);
      }
    expect(worst, where).toBeLessThanOrEqual(1e-12);
    expect(worstO).toBeLessThanOrEqual(1e-12);
  });

  it(`matches classes with f and g functions in every position (${mode})`, () => {
    const r = rng(42);
    let worst = 0;
    let worstO = 0;
    let where = "";
    WITH_F_G.forEach((ls, i) => {
      const c = makeCase(r, ls, i);
      const e = checkCase(c, warmCalls);
      if (e.ref > worst) {
        worst = e.ref;
        where = c.label;
      }
      worstO = Math.max(worstO, e.orient);
    });
    expect(worst, where).toBeLessThanOrEqual(1e-12);
    expect(worstO).toBeLessThanOrEqual(1e-12);
  });
  }

  it("matches low classes far apart (Boys argument beyond its table), relative to the block itself, tables and generated code", () => {
    // T = ρ R² > 64: the generated code's upward recursion there leaves out e^−T (eri-codegen.ts);
    // the reference keeps it (boys.ts). Compared to the block's own largest element, so the
    // tiny values count in full.
    for (const [l1, l2, l3, l4] of [[0, 0, 0, 0], [1, 0, 0, 0], [1, 0, 1, 0], [1, 1, 0, 0], [2, 1, 1, 0], [2, 2, 2, 2]]) {
      for (const R of [5.5, 8, 12]) {
        const basis = prepareShells([
          primShell(l1, [0, 0, 0], 2.5), primShell(l2, [0.3, 0, 0], 1.5),
          primShell(l3, [0.1, R, 0.2], 2.0), primShell(l4, [0, R, -0.3], 1.8),
        ]);
        const sh = basis.shells;
        const ref = referenceEriBlock(sh[0], sh[1], sh[2], sh[3]);
        for (const warmCalls of [0, Infinity]) {
          const blk = engineBlock(new EriEngine(basis, { warmCalls }), sh, [0, 1, 2, 3]);
          expect(relErr(blk, ref), `(${l1}${l2}|${l3}${l4}) R ${R} warm ${warmCalls}`).toBeLessThanOrEqual(1e-13);
        }
      }
    }
  });

  // (gg|gg) with one primitive per shell; in each pair one diffuse and one tight g
  const ggShells = (pure: boolean): Shell[] => [
    primShell(4, [0.48883361276239157, -0.9128561620600522, -0.8759447997435927], 3.8487002830805137, pure, 0),
    primShell(4, [0.9996221815235913, -0.44719531247392297, 0.058831702917814255], 0.18654892374773854, pure, 1),
    primShell(4, [-0.4550940627232194, -0.2749102688394487, 0.3856081464327872], 1.9826234277025527, pure, 2),
    primShell(4, [-0.4809075496159494, 0.7062453501857817, 0.8699591560289264], 0.185009775946628, pure, 3),
  ];

  it("matches a quartet with g functions in all four positions, Cartesian and spherical, with the tighter shell first in each pair", () => {
    for (const pure of [false, true]) {
      const basis = prepareShells(ggShells(pure));
      const eng = new EriEngine(basis);
      const sh = basis.shells;
      const ref = referenceEriBlock(sh[0], sh[1], sh[2], sh[3]);
      const a = engineBlock(eng, sh, [0, 1, 2, 3]);
      const b = toCanonical(engineBlock(eng, sh, [0, 1, 2, 3], true), [0, 1, 2, 3], sh.map((x) => x.nfunc));
      expect(relErr(a, ref)).toBeLessThanOrEqual(1e-12);
      expect(relErr(b, ref)).toBeLessThanOrEqual(1e-12);
    }
  });

  // With the diffuse shell first in each pair the engine re-orients the pairs (tight shell as A,
  // shell-pairs.ts), because the horizontal recurrence building a tight shell from a diffuse one
  // cancels badly. Element ⟨x y z², x y z² | y⁴, y⁴⟩ of this quartet: exact 0.000911915287955359046124
  // (50-digit mpmath McMurchie–Davidson evaluation by the test author; reference-eri.ts agrees to
  // 1.6e-17 of the block maximum); before the re-orientation the engine was 1.0e-12 off.
  it("matches the same (gg|gg) quartet to 1e-12 with the diffuse shell first in each pair", () => {
    for (const pure of [false, true]) {
      const basis = prepareShells(ggShells(pure));
      const eng = new EriEngine(basis);
      const sh = basis.shells;
      const ref = referenceEriBlock(sh[0], sh[1], sh[2], sh[3]);
      const blk = toCanonical(engineBlock(eng, sh, [1, 0, 3, 2]), [1, 0, 3, 2], sh.map((x) => x.nfunc));
      expect(relErr(blk, ref)).toBeLessThanOrEqual(1e-12);
    }
  });

  it("gives compute(Q, P) as the transpose of compute(P, Q) for the engine's own pairs", () => {
    // (ab|cd) = (cd|ab), exact analytic result
    const r = rng(44);
    const shells = [0, 1, 2, 3, 4].map((k) => randomShell(r, k % 4, randomPoint(r, 1.2), 2, k === 1 ? 2 : 1, k % 2 === 0, k));
    const eng = new EriEngine(prepareShells(shells));
    let worst = 0;
    for (const P of eng.pairs)
      for (const Q of eng.pairs) {
        const pq = Float64Array.from(eng.compute(P, Q).subarray(0, P.a.nfunc * P.b.nfunc * Q.a.nfunc * Q.b.nfunc));
        const qp = eng.compute(Q, P);
        const nP = P.a.nfunc * P.b.nfunc;
        const nQ = Q.a.nfunc * Q.b.nfunc;
        const t = new Float64Array(nP * nQ);
        for (let i = 0; i < nP; i++) for (let j = 0; j < nQ; j++) t[i * nQ + j] = qp[j * nP + i];
        worst = Math.max(worst, relErr(t, pq));
      }
    expect(worst).toBeLessThanOrEqual(1e-13);
  });
});
