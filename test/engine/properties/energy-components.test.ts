import { describe, expect, it } from "vitest";
import type { Atom } from "../../../src/engine/molecule.ts";
import { energyComponents, virialRatio } from "../../../src/engine/properties/index.ts";
import { AMMONIUM, calculate, ohAtoms, WATER } from "./setup.ts";

const H_ATOM: Atom[] = [{ symbol: "H", z: 1, xyz: [0, 0, 0] }];
// H2 at 1.4 bohr (near the equilibrium distance; common practice, no source)
const H2: Atom[] = [
  { symbol: "H", z: 1, xyz: [0, 0, -0.7] },
  { symbol: "H", z: 1, xyz: [0, 0, 0.7] },
];

describe("energy components", () => {
  it("cancel Coulomb and exchange exactly for one electron (UHF hydrogen atom)", () => {
    // exact analytic result: a single electron has no two-electron energy, J[D] = K[D]
    const c = calculate(H_ATOM, "cc-pVDZ", 0, 2, "uhf");
    const e = c.props.energy_components;
    expect(c.scf.converged).toBe(true);
    expect(e.coulomb).toBeGreaterThan(0.1);
    expect(Math.abs(e.two_electron)).toBeLessThanOrEqual(1e-12);
    expect(Math.abs(e.total - e.one_electron)).toBeLessThanOrEqual(1e-12);
  });

  it("give exchange equal to minus half the Coulomb energy for two electrons in one orbital (RHF H2)", () => {
    // exact analytic result: E_J = 2 J_11 and E_K = −J_11 (K_11 = J_11) for one doubly occupied orbital
    const c = calculate(H2, "cc-pVDZ", 0, 1, "rhf");
    const e = c.props.energy_components;
    expect(c.scf.converged).toBe(true);
    expect(Math.abs(e.exchange + 0.5 * e.coulomb)).toBeLessThanOrEqual(1e-12);
  });

  it("sum to the SCF energy to 1e-10 for RHF, UHF and ROHF", () => {
    const oh = ohAtoms();
    for (const c of [
      calculate(WATER, "6-31G*", 0, 1, "rhf"),
      calculate(AMMONIUM, "STO-3G", 1, 1, "rhf"),
      calculate(oh, "6-31G*", 0, 2, "uhf"),
      calculate(oh, "6-31G*", 0, 2, "rohf"),
    ]) {
      expect(c.scf.converged).toBe(true);
      expect(Math.abs(c.props.energy_components.total - c.scf.energy), c.scf.reference).toBeLessThanOrEqual(1e-10);
    }
  });

  it("give a nuclear attraction energy equal to tr(D V) computed from the nuclear-attraction matrix", () => {
    // tr(D V) with V the nuclear-attraction matrix is an independent route to the attraction energy
    const c = calculate(WATER, "STO-3G", 0, 1, "rhf");
    const m = c.scf.matrices;
    const n = c.basis.nbf;
    let att = 0;
    for (let k = 0; k < n * n; k++) att += (m.D[0][k] + m.D[1][k]) * m.V[k];
    expect(Math.abs(c.props.energy_components.nuclear_attraction - att)).toBeLessThanOrEqual(1e-10);
    expect(att).toBeLessThan(0);
  });

  it("give the virial ratio as −V/T, and NaN when there is no kinetic energy", () => {
    const e = energyComponents(
      { D: [new Float64Array(1), new Float64Array(1)], H: new Float64Array(1), T: new Float64Array(1), J: new Float64Array(1), K: [new Float64Array(1), new Float64Array(1)] },
      0.5,
      1,
    );
    expect(e.total).toBe(0.5);
    expect(virialRatio(e)).toBeNaN();
    const c = calculate(WATER, "STO-3G", 0, 1, "rhf").props.energy_components;
    expect(virialRatio(c)).toBe(-c.potential / c.kinetic);
  });
});
