import { describe, expect, it } from "vitest";
import { charges, functionAtoms, lowdinPopulations, mullikenPopulations, overlapSqrt } from "../../../src/engine/properties/index.ts";
import { matmul } from "../../../src/engine/linalg/dense.ts";
import type { Atom } from "../../../src/engine/molecule.ts";
import { AMMONIUM, calculate, ohAtoms, sum, WATER } from "./setup.ts";

// H2 at 1.4 bohr (near the equilibrium distance; common practice, no source)
const H2: Atom[] = [
  { symbol: "H", z: 1, xyz: [0, 0, -0.7] },
  { symbol: "H", z: 1, xyz: [0, 0, 0.7] },
];

describe("Mulliken and Löwdin charges", () => {
  const oh = ohAtoms();
  const cases = [
    { label: "water (neutral)", c: calculate(WATER, "6-31G*", 0, 1, "rhf") },
    { label: "hydroxide OH−", c: calculate(oh, "6-31G*", -1, 1, "rhf") },
    { label: "ammonium NH4+", c: calculate(AMMONIUM, "STO-3G", 1, 1, "rhf") },
    { label: "OH radical (UHF)", c: calculate(oh, "6-31G*", 0, 2, "uhf") },
  ];

  it("sum to the molecular charge for neutral molecules, anions, cations and open shells", () => {
    // exact analytic result: Σ_A q_A = Σ Z − tr(P S) = Σ Z − N = charge
    for (const { label, c } of cases) {
      expect(c.scf.converged, label).toBe(true);
      expect(Math.abs(sum(c.props.mulliken) - c.charge), label).toBeLessThanOrEqual(1e-10);
      expect(Math.abs(sum(c.props.lowdin) - c.charge), label).toBeLessThanOrEqual(1e-10);
    }
  });

  it("put the negative charge on the electronegative atom of water and hydroxide", () => {
    // qualitative chemistry (common practice, no source): O is more electronegative than H
    for (const { label, c } of cases.slice(0, 2)) {
      expect(c.props.mulliken[0], label).toBeLessThan(0);
      expect(c.props.lowdin[0], label).toBeLessThan(0);
      expect(c.props.mulliken[1], label).toBeGreaterThan(c.props.mulliken[0]);
    }
  });

  it("give equal charges to symmetry-equivalent atoms (the four hydrogens of NH4+, the two of water)", () => {
    // exact by symmetry, up to SCF convergence
    const nh4 = cases[2].c.props;
    for (const q of [nh4.mulliken, nh4.lowdin]) for (let a = 2; a <= 4; a++) expect(Math.abs(q[a] - q[1])).toBeLessThanOrEqual(1e-7);
    const w = cases[0].c.props;
    expect(Math.abs(w.mulliken[1] - w.mulliken[2])).toBeLessThanOrEqual(1e-7);
  });

  it("are exactly zero on both atoms of H2", () => {
    // exact by symmetry: the two atoms are equivalent and the molecule is neutral
    const p = calculate(H2, "cc-pVDZ", 0, 1, "rhf").props;
    for (const q of [...p.mulliken, ...p.lowdin]) expect(Math.abs(q)).toBeLessThanOrEqual(1e-8);
  });

  it("use an S^½ whose square is S", () => {
    const { basis, scf } = cases[0].c;
    const n = basis.nbf;
    const R = overlapSqrt(scf.matrices.S, n);
    const RR = matmul(R, R, n, n, n);
    let err = 0;
    for (let k = 0; k < n * n; k++) err = Math.max(err, Math.abs(RR[k] - scf.matrices.S[k]));
    expect(err).toBeLessThanOrEqual(1e-12);
  });

  it("map every basis function to the atom of its shell", () => {
    const { basis } = cases[0].c;
    const map = functionAtoms(basis.shells, basis.nbf);
    // 6-31G* water, Cartesian d: O has 1s + 2sp + 3sp + 6d = 15 functions, each H 2
    expect(Array.from(map)).toEqual([...Array(15).fill(0), 1, 1, 2, 2]);
    expect(() => functionAtoms(basis.shells.slice(1), basis.nbf)).toThrow(/belongs to no shell/);
  });

  it("agree with a hand-made two-function example", () => {
    // exact analytic result: S = [[1, s], [s, 1]], P = [[a, b], [b, c]] gives Mulliken
    // populations a + b s and c + b s; Löwdin with S^½ computed here in closed form
    const s = 0.4, a = 1.2, b = 0.3, c = 0.5;
    const S = Float64Array.from([1, s, s, 1]);
    const P = Float64Array.from([a, b, b, c]);
    const atomOf = Int32Array.from([0, 1]);
    const mull = mullikenPopulations(P, S, atomOf, 2);
    expect(mull[0]).toBeCloseTo(a + b * s, 14);
    expect(mull[1]).toBeCloseTo(c + b * s, 14);
    // S^½ = [[p, q], [q, p]] with p = (√(1+s) + √(1−s))/2, q = (√(1+s) − √(1−s))/2
    const p = (Math.sqrt(1 + s) + Math.sqrt(1 - s)) / 2;
    const q = (Math.sqrt(1 + s) - Math.sqrt(1 - s)) / 2;
    const low = lowdinPopulations(P, overlapSqrt(S, 2), atomOf, 2);
    expect(low[0]).toBeCloseTo(p * p * a + 2 * p * q * b + q * q * c, 13);
    expect(low[1]).toBeCloseTo(q * q * a + 2 * p * q * b + p * p * c, 13);
    expect(charges([1, 1], mull)).toEqual([1 - mull[0], 1 - mull[1]]);
  });
});

describe("spin populations", () => {
  const oh = ohAtoms();
  const uhf = calculate(oh, "6-31G*", 0, 2, "uhf");
  const rohf = calculate(oh, "6-31G*", 0, 2, "rohf");

  it("sum to Nα − Nβ = 1 for the OH radical, in UHF and ROHF", () => {
    // exact analytic result: tr((Pα − Pβ) S) = Nα − Nβ
    for (const c of [uhf, rohf]) {
      const sp = c.props.spin_populations!;
      expect(sp).not.toBeNull();
      expect(Math.abs(sum(sp.mulliken) - 1)).toBeLessThanOrEqual(1e-10);
      expect(Math.abs(sum(sp.lowdin) - 1)).toBeLessThanOrEqual(1e-10);
    }
  });

  it("put most of the unpaired spin on oxygen", () => {
    // qualitative chemistry (common practice, no source): the unpaired electron of OH is an O 2p π orbital
    for (const c of [uhf, rohf]) expect(c.props.spin_populations!.mulliken[0]).toBeGreaterThan(0.9);
  });
});
