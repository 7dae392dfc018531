// A nearly linearly dependent basis: canonical orthogonalization drops the overlap eigenvectors
// below the threshold (default 1e-7) and says how many; the SCF still gives a finite, variational
// energy. Even-tempered s functions with ratio β = 1.15 overlap almost completely (common
// practice: β close to 1 makes the set nearly dependent, no source).
import { describe, expect, it } from "vitest";
import { evenTemperedBasisSet } from "../../src/engine/basis/even-tempered.ts";
import { run } from "../../src/engine/run.ts";

describe("near-linear dependence", () => {
  const he = [{ symbol: "He", z: 2, xyz: [0, 0, 0] as [number, number, number] }];

  it("drops the dependent combinations, reports them, and still converges to a finite energy", () => {
    const basis = evenTemperedBasisSet("He", [{ l: 0, alpha: 0.1, beta: 1.15, count: 40 }]);
    const r = run({ atoms: he, charge: 0, multiplicity: 1, basis, reference: "rhf" });
    expect(r.basis.orthogonalization.kind).toBe("canonical");
    expect(r.basis.orthogonalization.dropped).toBeGreaterThan(0);
    expect(r.basis.orthogonalization.independent_functions).toBe(40 - r.basis.orthogonalization.dropped);
    expect(r.status).toBe("ok");
    expect(Number.isFinite(r.scf.energy)).toBe(true);
    // variational: not below the Hartree–Fock limit −2.8616800 Eh (E. Clementi, C. Roetti,
    // At. Data Nucl. Data Tables 14, 177 (1974))
    expect(r.scf.energy).toBeGreaterThan(-2.86168 - 1e-9);
  });

  it("uses the symmetric orthogonalization for a well-conditioned basis", () => {
    const r = run({ atoms: he, charge: 0, multiplicity: 1, basis: "cc-pVDZ", reference: "rhf" });
    expect(r.basis.orthogonalization.kind).toBe("symmetric");
    expect(r.basis.orthogonalization.dropped).toBe(0);
  });
});
