import { describe, expect, it } from "vitest";
import { sSquared } from "../../../src/engine/properties/index.ts";
import { calculate, ohAtoms, WATER } from "./setup.ts";

describe("⟨S²⟩", () => {
  const oh = ohAtoms();

  it("is exactly 0 for the RHF singlet of water", () => {
    // exact analytic result: Pα = Pβ are the same projector, so tr(Pα S Pβ S) = Nβ
    const c = calculate(WATER, "6-31G*", 0, 1, "rhf");
    const m = c.scf.matrices;
    const s2 = sSquared(m.D[0], m.D[1], m.S, c.basis.nbf, c.scf.nalpha, c.scf.nbeta);
    expect(s2.exact).toBe(0);
    expect(Math.abs(s2.value)).toBeLessThanOrEqual(1e-10);
  });

  it("is close to 0.75 for the UHF doublet OH radical in cc-pVDZ, and above it", () => {
    // 0.75 = S(S+1) for S = ½ (exact); spin contamination of OH is small, within 0.01 (common
    // practice, no source); the UHF value always lies at or above S(S+1) (exact analytic result:
    // the overlap sum is at most Nβ)
    const c = calculate(oh, "cc-pVDZ", 0, 2, "uhf");
    expect(c.scf.converged).toBe(true);
    const s2 = c.props.s_squared!;
    expect(s2.exact).toBe(0.75);
    expect(Math.abs(s2.value - 0.75)).toBeLessThanOrEqual(0.01);
    expect(s2.value).toBeGreaterThan(0.75);
  });

  it("is exactly 0.75 for the ROHF doublet OH radical", () => {
    // exact analytic result: ROHF β orbitals are a subset of the α orbitals
    const c = calculate(oh, "cc-pVDZ", 0, 2, "rohf");
    expect(c.scf.converged).toBe(true);
    expect(Math.abs(c.props.s_squared!.value - 0.75)).toBeLessThanOrEqual(1e-10);
  });

  it("gives S(S+1) = 2 for a triplet and S_z(S_z+1) + Nβ for α and β in disjoint orbitals", () => {
    // exact analytic result: S = 1 gives S(S+1) = 2; with no α–β overlap the sum vanishes
    const n = 3;
    const S = Float64Array.from([1, 0, 0, 0, 1, 0, 0, 0, 1]);
    const Pa = Float64Array.from([1, 0, 0, 0, 1, 0, 0, 0, 0]);
    const Pb = Float64Array.from([0, 0, 0, 0, 0, 0, 0, 0, 0]);
    expect(sSquared(Pa, Pb, S, n, 2, 0)).toEqual({ value: 2, exact: 2 });
    const Pb2 = Float64Array.from([0, 0, 0, 0, 0, 0, 0, 0, 1]);
    // 2 α in orbitals 1–2, 1 β in orbital 3: S_z = ½, 0.75 + 1
    expect(sSquared(Pa, Pb2, S, n, 2, 1)).toEqual({ value: 1.75, exact: 0.75 });
  });
});
