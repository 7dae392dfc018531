// Direct SCF (integrals recomputed every build, for systems whose ERIs do not fit in memory) must
// give the in-core result: same algorithm, same screening. Exact identity, no published value.
import { describe, expect, it } from "vitest";
import { buildBasis } from "../../src/engine/basis/index.ts";
import { prepareShells } from "../../src/engine/integrals/shells.ts";
import { nuclearRepulsion, parseXyz } from "../../src/engine/molecule.ts";
import { runScf } from "../../src/engine/scf/scf.ts";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

describe("direct SCF", () => {
  it("gives the in-core RHF energy of formaldehyde/6-31G* to 1e-10 Eh and is chosen when memory is short", () => {
    const geo = parseXyz(readFileSync(fileURLToPath(new URL("../bench/geometries/formaldehyde.xyz", import.meta.url)), "utf8"), { units: "angstrom" });
    const basis = prepareShells(buildBasis(geo.atoms, "6-31G*", "auto").shells);
    const problem = {
      basis, nuclei: geo.atoms.map((a) => ({ charge: a.z, x: a.xyz[0], y: a.xyz[1], z: a.xyz[2] })),
      nuclearRepulsion: nuclearRepulsion({ atoms: geo.atoms }), nalpha: 8, nbeta: 8, reference: "rhf" as const,
    };
    const inCore = runScf(problem);
    const direct = runScf(problem, { jk: { memoryBytes: 1024 } });
    expect(inCore.jk.mode).toBe("in-core");
    expect(direct.jk.mode).toBe("direct");
    expect(direct.jk.storedBytes).toBe(0);
    expect(direct.converged).toBe(true);
    expect(Math.abs(direct.energy - inCore.energy)).toBeLessThan(1e-10);
  });
});
