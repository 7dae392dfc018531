import { describe, expect, it } from "vitest";
import { DEBYE_PER_AU } from "../../../src/engine/constants.ts";
import { centreOfMass } from "../../../src/engine/properties/index.ts";
import { AMMONIUM, calculate, ohAtoms } from "./setup.ts";

describe("dipole moment", () => {
  const oh = ohAtoms();

  it("of an ion shifts by q·ΔO when the origin moves (hydroxide, exact)", () => {
    // exact analytic result: μ(O) = μ(0) − q O with q the total charge
    const O2: [number, number, number] = [0.3, -0.2, 1.1];
    const a = calculate(oh, "6-31G*", -1, 1, "rhf", [0, 0, 0]).props.dipole;
    const b = calculate(oh, "6-31G*", -1, 1, "rhf", O2).props.dipole;
    for (let k = 0; k < 3; k++) expect(Math.abs(b.au[k] - (a.au[k] - -1 * O2[k]))).toBeLessThanOrEqual(1e-10);
    expect(Math.abs(b.magnitude_au - a.magnitude_au)).toBeGreaterThan(0.1);
  });

  it("of the neutral OH radical does not depend on the origin (UHF, exact)", () => {
    const a = calculate(oh, "6-31G*", 0, 2, "uhf", [0, 0, 0]).props.dipole;
    const b = calculate(oh, "6-31G*", 0, 2, "uhf").props.dipole;
    expect(b.origin.kind).toBe("centre-of-mass");
    for (let k = 0; k < 3; k++) expect(Math.abs(b.au[k] - a.au[k])).toBeLessThanOrEqual(1e-10);
  });

  it("vanishes for tetrahedral NH4+ about its centre of mass", () => {
    // exact by symmetry: the centre of mass is the N atom, the centre of the tetrahedron
    const d = calculate(AMMONIUM, "STO-3G", 1, 1, "rhf").props.dipole;
    for (let k = 0; k < 3; k++) expect(Math.abs(d.origin.bohr[k])).toBeLessThanOrEqual(1e-14);
    expect(d.magnitude_au).toBeLessThanOrEqual(1e-8);
  });

  it("converts the magnitude to debye with the CODATA constants", () => {
    const d = calculate(oh, "6-31G*", 0, 2, "uhf").props.dipole;
    expect(d.debye).toBe(d.magnitude_au * DEBYE_PER_AU);
    expect(d.magnitude_au).toBeCloseTo(Math.hypot(...d.au), 14);
  });

  it("uses the mass-weighted centre, which lies between the atoms of a diatomic at r·m_H/(m_O + m_H) from O", () => {
    // exact analytic result for two point masses; weights from elements.ts
    const c = centreOfMass(oh);
    const r = oh[1].xyz[2] - oh[0].xyz[2];
    expect(c[2]).toBeCloseTo((r * 1.008) / (15.999 + 1.008), 12);
  });
});
