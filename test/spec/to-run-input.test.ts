import { describe, expect, it } from "vitest";
import { run } from "../../src/engine/run.ts";
import { parseSpec } from "../../src/spec/parse.ts";
import { specToRunInput } from "../../src/spec/to-run-input.ts";
import { readRepo } from "./fixtures.ts";

const H2 = `fieldbook: 1
title: H2, STO-3G
molecule:
  units: bohr
  xyz: |
    H 0 0 0
    H 0 0 1.4
model:
  basis: sto-3g
`;

function parsed(text: string) {
  const r = parseSpec(text, { path: "calculations/h2.yaml", readFile: readRepo });
  expect(r.errors).toEqual([]);
  return r.spec!;
}

describe("specToRunInput", () => {
  it("maps every setting", () => {
    const input = specToRunInput(parsed(H2.replace("  basis: sto-3g", "  basis: cc-pvdz\n  correlation: mp2\n  density_fitting: true\n  frozen_core: false") + "convergence:\n  max_iterations: 40\n  level_shift: 0.1\n"));
    expect(input).toEqual({
      atoms: [
        { symbol: "H", z: 1, xyz: [0, 0, 0] },
        { symbol: "H", z: 1, xyz: [0, 0, 1.4] },
      ],
      charge: 0,
      multiplicity: 1,
      basis: "cc-pVDZ",
      harmonics: "auto",
      reference: "rhf",
      correlation: "mp2",
      frozenCore: false,
      mp2Integrals: "density-fitting",
      fittingBasis: "cc-pVDZ-RIFIT",
      scf: { energy: 1e-10, density: 1e-8, maxIterations: 40, accelerator: "diis", guess: "sad", levelShift: 0.1, damping: 0 },
    });
  });

  it("passes per-element assignments and reads basis files", () => {
    const perElement = specToRunInput(parsed(H2.replace("  basis: sto-3g", "  basis: { default: cc-pvdz, elements: { H: sto-3g } }")));
    expect(perElement.basis).toEqual({ default: "cc-pVDZ", elements: { H: "STO-3G" } });
    const fromFile = parsed(H2.replace("  basis: sto-3g", "  basis: { file: basis/h-only.json }"));
    const input = specToRunInput(fromFile, readRepo);
    expect(typeof input.basis === "object" && "name" in input.basis ? input.basis.name : null).toBe("STO-3G (H only)");
    expect(() => specToRunInput(fromFile)).toThrow(/file reading not available/);
  });

  it("feeds run(): H2 STO-3G at R = 1.4 bohr", () => {
    const result = run(specToRunInput(parsed(H2)));
    expect(result.status).toBe("ok");
    expect(result.basis.functions).toBe(2);
    // Szabo & Ostlund, Modern Quantum Chemistry (Dover 1996), section 3.5.2: H2 STO-3G at
    // R = 1.4 bohr, total energy -1.1167 hartree (given to four decimals).
    expect(result.scf.energy).toBeCloseTo(-1.1167, 4);
  });
});
