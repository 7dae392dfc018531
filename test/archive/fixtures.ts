/** Shared test fixtures: a normalized H2 spec, its engine input, and a real run. */
import * as fs from "node:fs";
import * as os from "node:os";
import * as path from "node:path";
import { type RunInput, type RunResult, run } from "../../src/engine/run.ts";
import { parseXyz } from "../../src/engine/molecule.ts";
import type { NormalizedSpec, SpecCheck } from "../../src/spec/types.ts";
import { basisHashData, inputHash } from "../../src/archive/hash.ts";
import { NUMERICS_VERSION } from "../../src/engine/version.ts";
import { validate } from "./json-schema.ts";

export const H2_XYZ_BOHR = "H 0 0 0\nH 0 0 1.4\n";

/** H2 STO-3G at R = 1.4 bohr: E(SCF) = −1.1167 Eh (A. Szabo, N. S. Ostlund, Modern Quantum Chemistry (1989), §3.5.2). */
export const SZABO_OSTLUND_H2: SpecCheck = {
  quantity: "scf_energy",
  expected: -1.1167,
  tolerance: 1e-4,
  unit: "hartree",
  source: "A. Szabo, N. S. Ostlund, Modern Quantum Chemistry (1989), §3.5.2",
};

type Overrides = {
  [K in keyof NormalizedSpec]?: NormalizedSpec[K] extends object ? Partial<NormalizedSpec[K]> : NormalizedSpec[K];
};

export function h2Spec(over: Overrides = {}): NormalizedSpec {
  const geometry = { kind: "xyz" as const, file: null, text: H2_XYZ_BOHR };
  const base: NormalizedSpec = {
    fieldbook: 1,
    id: "test/h2-sto3g",
    title: "H2, STO-3G",
    summary: null,
    authors: ["A. Tester"],
    tags: ["h2"],
    molecule: {
      charge: 0, multiplicity: 1, units: "bohr", geometry,
      atoms: parseXyz(H2_XYZ_BOHR, { units: "bohr" }).atoms,
    },
    model: {
      reference: "rhf", correlation: "none", basis: "STO-3G", harmonics: "auto",
      frozen_core: true, density_fitting: false, fitting_basis: null,
    },
    convergence: { energy: 1e-10, density: 1e-8, max_iterations: 128, accelerator: "diis", guess: "sad", level_shift: 0, damping: 0 },
    checks: [SZABO_OSTLUND_H2],
    notes: null,
  };
  return {
    ...base,
    ...(over as Partial<NormalizedSpec>),
    molecule: { ...base.molecule, ...(over.molecule ?? {}) },
    model: { ...base.model, ...(over.model ?? {}) },
    convergence: { ...base.convergence, ...(over.convergence ?? {}) },
  };
}

/** What the spec module will hand the engine (mirrors the spec → RunInput mapping). */
export function runInputOf(spec: NormalizedSpec): RunInput {
  const b = spec.model.basis;
  if (typeof b === "object" && "file" in b) throw new Error("file bases not used in these tests");
  const c = spec.convergence;
  return {
    atoms: spec.molecule.atoms,
    charge: spec.molecule.charge,
    multiplicity: spec.molecule.multiplicity,
    basis: b,
    harmonics: spec.model.harmonics,
    reference: spec.model.reference,
    correlation: spec.model.correlation,
    frozenCore: spec.model.frozen_core,
    mp2Integrals: spec.model.density_fitting ? "density-fitting" : "exact",
    ...(spec.model.fitting_basis ? { fittingBasis: spec.model.fitting_basis } : {}),
    scf: {
      energy: c.energy, density: c.density, maxIterations: c.max_iterations, accelerator: c.accelerator,
      guess: c.guess, levelShift: c.level_shift, damping: c.damping,
    },
  };
}

export function runSpec(spec: NormalizedSpec): RunResult {
  return run(runInputOf(spec));
}

export function hashOf(spec: NormalizedSpec): string {
  return inputHash(spec, basisHashData(spec), NUMERICS_VERSION);
}

export function tempRoot(): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), "fieldbook-archive-"));
}

const schema = JSON.parse(fs.readFileSync(new URL("../../public/schemas/fieldbook-record-1.json", import.meta.url), "utf8"));

/** Schema errors of a record (after a JSON round trip, as it is stored). */
export function schemaErrors(record: unknown): string[] {
  return validate(schema, JSON.parse(JSON.stringify(record)));
}
