// UHF internal stability (src/engine/scf/stability.ts, solve.ts). The O2 triplet in STO-3G started
// from the core Hamiltonian converges first to a saddle point; the stability analysis must find the
// negative Hessian eigenvalue and the restart must reach a lower, stable solution. The energies
// quoted in the project's SCF issue (about −147.3786 and −147.6352 Eh) are not published reference
// values, so this test asserts the behaviour, and those values only to their quoted 4 decimals.
import { describe, expect, it } from "vitest";
import { buildBasis } from "../../src/engine/basis/index.ts";
import { prepareShells } from "../../src/engine/integrals/shells.ts";
import { nuclearRepulsion, parseXyz } from "../../src/engine/molecule.ts";
import { solveScf } from "../../src/engine/scf/solve.ts";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

const o2 = parseXyz(readFileSync(fileURLToPath(new URL("../bench/geometries/o2_triplet.xyz", import.meta.url)), "utf8"), { units: "angstrom" });

function o2Uhf(guess: "core" | "sad", check: boolean) {
  const atoms = o2.atoms;
  const basis = prepareShells(buildBasis(atoms, "STO-3G", "auto").shells);
  return solveScf({
    basis, nuclei: atoms.map((a) => ({ charge: a.z, x: a.xyz[0], y: a.xyz[1], z: a.xyz[2] })),
    nuclearRepulsion: nuclearRepulsion({ atoms }), nalpha: 9, nbeta: 7, reference: "uhf",
  }, { guess }, { check });
}

describe("UHF internal stability", () => {
  it("finds the unstable first solution of triplet O2/STO-3G from a core guess and restarts to a lower stable one", () => {
    const plain = o2Uhf("core", false);
    expect(plain.scf.converged).toBe(true);
    expect(plain.scf.energy).toBeCloseTo(-147.3786, 4); // quoted in the project's SCF issue (not published)
    const { scf, stability } = o2Uhf("core", true);
    expect(stability.checked).toBe(true);
    expect(stability.restarts).toBeGreaterThan(0);
    expect(stability.energies[0]).toBeCloseTo(plain.scf.energy, 9);
    expect(scf.energy).toBeLessThan(plain.scf.energy - 0.2);
    expect(scf.energy).toBeCloseTo(-147.6352, 4); // quoted in the project's SCF issue (not published)
    expect(stability.stable).toBe(true);
    expect(stability.lowestEigenvalue!).toBeGreaterThan(-1e-5);
  });

  it("reaches the same stable solution from the SAD guess", () => {
    const core = o2Uhf("core", true);
    const sad = o2Uhf("sad", true);
    expect(Math.abs(sad.scf.energy - core.scf.energy)).toBeLessThan(1e-9);
    expect(sad.stability.stable).toBe(true);
  });

  it("reports a positive lowest Hessian eigenvalue for a stable closed shell run as UHF", () => {
    const h2o = parseXyz(readFileSync(fileURLToPath(new URL("../bench/geometries/water.xyz", import.meta.url)), "utf8"), { units: "angstrom" });
    const basis = prepareShells(buildBasis(h2o.atoms, "STO-3G", "auto").shells);
    const { stability } = solveScf({
      basis, nuclei: h2o.atoms.map((a) => ({ charge: a.z, x: a.xyz[0], y: a.xyz[1], z: a.xyz[2] })),
      nuclearRepulsion: nuclearRepulsion({ atoms: h2o.atoms }), nalpha: 5, nbeta: 5, reference: "uhf",
    });
    expect(stability.restarts).toBe(0);
    expect(stability.lowestEigenvalue!).toBeGreaterThan(0);
  });
});
