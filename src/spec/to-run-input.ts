/**
 * NormalizedSpec → RunInput for the engine (src/engine/run.ts). Pure mapping; the only I/O is
 * reading a basis file (`model.basis: { file }`) through `readFile`.
 */
import { type BasisAssignment, parseBasisText } from "../engine/basis/index.ts";
import { InputError } from "../engine/errors.ts";
import type { RunInput } from "../engine/run.ts";
import type { NormalizedSpec } from "./types.ts";

/** The engine input of a validated spec. Throws InputError "file-reading-unavailable" for a basis file without `readFile`. */
export function specToRunInput(spec: NormalizedSpec, readFile?: (repoRelativePath: string) => string): RunInput {
  const m = spec.model;
  let basis: BasisAssignment;
  if (typeof m.basis === "string") basis = m.basis;
  else if ("file" in m.basis) {
    if (!readFile)
      throw new InputError("file-reading-unavailable", `the basis file ${JSON.stringify(m.basis.file)} cannot be read: file reading not available`, {
        hint: "pass readFile to specToRunInput",
      });
    basis = parseBasisText(readFile(m.basis.file), m.basis.file);
  } else basis = { default: m.basis.default, elements: { ...m.basis.elements } };

  const c = spec.convergence;
  const input: RunInput = {
    atoms: spec.molecule.atoms.map((a) => ({ symbol: a.symbol, z: a.z, xyz: [a.xyz[0], a.xyz[1], a.xyz[2]] })),
    charge: spec.molecule.charge,
    multiplicity: spec.molecule.multiplicity,
    basis,
    harmonics: m.harmonics,
    reference: m.reference,
    correlation: m.correlation,
    frozenCore: m.frozen_core,
    mp2Integrals: m.density_fitting ? "density-fitting" : "exact",
    scf: {
      energy: c.energy,
      density: c.density,
      maxIterations: c.max_iterations,
      accelerator: c.accelerator,
      guess: c.guess,
      levelShift: c.level_shift,
      damping: c.damping,
    },
  };
  if (m.density_fitting && m.fitting_basis !== null) input.fittingBasis = m.fitting_basis;
  return input;
}
