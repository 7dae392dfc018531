/**
 * The engine's one entry point: run(input, onEvent) → a plain, JSON-serializable result.
 * Input is plain data (atoms in bohr, charge, multiplicity, basis assignment, method and
 * settings); nothing here knows about files, YAML, hashes or pages.
 *
 * Bad input (impossible charge/multiplicity, RHF on an open shell, an element the basis lacks)
 * throws an InputError before any work. A calculation that does not converge returns normally
 * with status "not-converged".
 */
import { type BasisAssignment, buildBasis, type Harmonics } from "./basis/index.ts";
import { type Mp2Energies, mp2Energy } from "./correlation/mp2.ts";
import { riMp2Energy } from "./correlation/ri-mp2.ts";
import { coreOrbitals } from "./elements.ts";
import { InputError } from "./errors.ts";
import type { PointCharge } from "./integrals/one-electron.ts";
import { prepareShells } from "./integrals/shells.ts";
import { type Atom, electronCount, hillFormula, nuclearRepulsion, validateMolecule } from "./molecule.ts";
import { computeProperties, type Properties } from "./properties/index.ts";
import { type Reference, SCF_DEFAULTS, type ScfEvent, type ScfIteration, type ScfOptions } from "./scf/scf.ts";
import { solveScf, type StabilityOptions } from "./scf/solve.ts";
import type { StabilityRecord } from "./scf/stability.ts";
import { ENGINE_NAME, ENGINE_VERSION, NUMERICS_VERSION } from "./version.ts";

export interface RunInput {
  atoms: Atom[];
  charge: number;
  multiplicity: number;
  basis: BasisAssignment;
  harmonics?: Harmonics;
  reference: Reference;
  /** correlation on top of the SCF; default none */
  correlation?: "none" | "mp2" | "scs-mp2";
  /** freeze the noble-gas core of each atom in MP2; default true */
  frozenCore?: boolean;
  /** exact MP2 integrals, or density fitting (RI-MP2); default exact */
  mp2Integrals?: "exact" | "density-fitting";
  /** fitting basis for RI-MP2; default the set made for the orbital basis (FITTING_DEFAULTS) */
  fittingBasis?: string;
  scf?: ScfOptions;
  stability?: StabilityOptions;
  /** origin of the dipole moment (bohr); default the centre of mass */
  dipoleOrigin?: [number, number, number];
}

export type RunEvent =
  | ScfEvent
  | { type: "stage"; stage: Stage; state: "start" | "end"; seconds?: number }
  | { type: "mp2-batch"; done: number; total: number };

type Stage = "basis" | "integrals" | "scf" | "properties" | "mp2";

/** The fitting set published for each orbital basis (Weigend, Köhn, Hättig 2002; Weigend et al. 1998). */
export const FITTING_DEFAULTS: Record<string, string> = {
  "cc-pVDZ": "cc-pVDZ-RIFIT",
  "cc-pVTZ": "cc-pVTZ-RIFIT",
  "def2-SVP": "def2-SVP-RIFIT",
  "def2-TZVP": "def2-TZVP-RIFIT",
};

export interface RunResult {
  engine: { name: string; version: string; numerics: number };
  status: "ok" | "not-converged";
  molecule: {
    formula: string;
    atoms: [string, number, number, number][];
    units: "bohr";
    charge: number;
    multiplicity: number;
    electrons: number;
    alpha: number;
    beta: number;
    nuclear_repulsion: number;
  };
  basis: {
    sets: Record<string, string>;
    functions: number;
    shells: number;
    harmonics: Harmonics;
    orthogonalization: { kind: string; dropped: number; min_overlap_eigenvalue: number; threshold: number; independent_functions: number };
    references: Record<string, string>;
    function_labels: string[];
  };
  scf: {
    reference: Reference;
    converged: boolean;
    energy: number;
    iterations: ScfIteration[];
    settings: Required<Omit<ScfOptions, "jk">>;
    orbitals: { alpha: { energies: number[]; occupations: number[] }; beta: { energies: number[]; occupations: number[] } | null };
    stability: StabilityRecord;
    integrals: { mode: string; stored_bytes: number; quartets: number };
  };
  properties: Properties;
  /** null when no correlation was asked for */
  mp2:
    | (Omit<Mp2Energies, "transform"> & {
        variant: "mp2" | "scs-mp2"; valid: true; integrals: "exact" | "density-fitting";
        fitting_basis: string | null; fitting_functions: number | null; peak_bytes: number;
      })
    | { variant: "mp2" | "scs-mp2"; valid: false; reason: string }
    | null;
  wall_seconds: Record<string, number>;
}

export function run(input: RunInput, onEvent?: (e: RunEvent) => void): RunResult {
  const t0 = performance.now();
  const times: Record<string, number> = {};
  const mol = { atoms: input.atoms, charge: input.charge, multiplicity: input.multiplicity };
  validateMolecule(mol, { reference: input.reference });
  const correlation = input.correlation ?? "none";
  if (correlation !== "none" && input.reference === "rohf")
    throw new InputError("mp2-reference-unsupported", "MP2 from an ROHF reference is not supported", {
      hint: "use reference rhf (RMP2) for closed shells or uhf (UMP2) for open shells",
    });
  const electrons = electronCount(mol);
  const nalpha = (electrons + input.multiplicity - 1) / 2;
  const nbeta = (electrons - input.multiplicity + 1) / 2;

  const stage = <T>(name: Stage, f: () => T): T => {
    onEvent?.({ type: "stage", stage: name, state: "start" });
    const s = performance.now();
    const r = f();
    times[name] = (performance.now() - s) / 1000;
    onEvent?.({ type: "stage", stage: name, state: "end", seconds: times[name] });
    return r;
  };
  const built = stage("basis", () => buildBasis(input.atoms.map((a) => ({ symbol: a.symbol, xyz: a.xyz })), input.basis, input.harmonics ?? "auto"));
  const basis = prepareShells(built.shells);
  const nuclei: PointCharge[] = input.atoms.map((a) => ({ charge: a.z, x: a.xyz[0], y: a.xyz[1], z: a.xyz[2] }));
  const enuc = nuclearRepulsion(mol);
  const settings = { ...SCF_DEFAULTS, ...input.scf };
  const { scf, stability } = stage("scf", () =>
    solveScf({ basis, nuclei, nuclearRepulsion: enuc, nalpha, nbeta, reference: input.reference }, input.scf, input.stability,
      onEvent ? (e) => onEvent(e) : undefined));
  times.integrals = scf.jk.integralSeconds;
  const properties = stage("properties", () => computeProperties(scf, {
    basisShells: basis.shells, basis, atoms: input.atoms, nuclearRepulsion: enuc, charge: input.charge,
    ...(input.dipoleOrigin ? { origin: input.dipoleOrigin } : {}),
  }));
  let mp2: RunResult["mp2"] = null;
  if (correlation !== "none") {
    if (!scf.converged) mp2 = { variant: correlation, valid: false, reason: "the SCF reference did not converge; no MP2 energy is reported" };
    else {
      const frozen = input.frozenCore === false ? 0 : input.atoms.reduce((t, a) => t + coreOrbitals(a.z), 0);
      if (frozen > nbeta) throw new InputError("frozen-core-too-large", `the frozen core (${frozen} orbitals) exceeds the ${nbeta} occupied β orbitals`, { hint: "set frozen_core: false" });
      if (input.mp2Integrals === "density-fitting") {
        const names = Object.values(built.setNames);
        const fitName = input.fittingBasis ?? (new Set(names).size === 1 ? FITTING_DEFAULTS[names[0]] : undefined);
        if (!fitName)
          throw new InputError("fitting-basis-needed", `no default fitting basis for ${[...new Set(names)].join(" + ")}`, {
            hint: `name one (bundled: ${Object.values(FITTING_DEFAULTS).join(", ")})`,
          });
        const fit = prepareShells(buildBasis(input.atoms.map((a) => ({ symbol: a.symbol, xyz: a.xyz })), fitName, "auto").shells);
        const e = stage("mp2", () => riMp2Energy(scf, { frozen, fitting: fit }));
        mp2 = { ...e, variant: correlation, valid: true, integrals: "density-fitting", fitting_basis: fitName, fitting_functions: e.fitting_functions, peak_bytes: e.peak_bytes };
      } else {
        const e = stage("mp2", () => mp2Energy(scf, { frozen, onBatch: (done, total) => onEvent?.({ type: "mp2-batch", done, total }) }));
        const { transform, ...rest } = e;
        mp2 = { ...rest, variant: correlation, valid: true, integrals: "exact", fitting_basis: null, fitting_functions: null,
          peak_bytes: Math.max(0, ...transform.map((t) => t.peakBytes)) };
      }
    }
  }
  times.total = (performance.now() - t0) / 1000;
  const { jk: _jk, ...plainSettings } = settings;
  void _jk;
  return {
    engine: { name: ENGINE_NAME, version: ENGINE_VERSION, numerics: NUMERICS_VERSION },
    status: scf.converged ? "ok" : "not-converged",
    molecule: {
      formula: hillFormula(mol),
      atoms: input.atoms.map((a) => [a.symbol, a.xyz[0], a.xyz[1], a.xyz[2]]),
      units: "bohr",
      charge: input.charge,
      multiplicity: input.multiplicity,
      electrons,
      alpha: nalpha,
      beta: nbeta,
      nuclear_repulsion: enuc,
    },
    basis: {
      sets: built.setNames,
      functions: basis.nbf,
      shells: basis.shells.length,
      harmonics: built.harmonics,
      orthogonalization: {
        kind: scf.orthogonalization.kind, dropped: scf.orthogonalization.dropped,
        min_overlap_eigenvalue: scf.orthogonalization.minEigenvalue, threshold: scf.orthogonalization.threshold,
        independent_functions: scf.orthogonalization.nmo,
      },
      references: built.references,
      function_labels: built.functionLabels,
    },
    scf: {
      reference: scf.reference,
      converged: scf.converged,
      energy: scf.energy,
      iterations: scf.iterations,
      settings: plainSettings as Required<Omit<ScfOptions, "jk">>,
      orbitals: scf.orbitals,
      stability,
      integrals: { mode: scf.jk.mode, stored_bytes: scf.jk.storedBytes, quartets: scf.jk.quartets },
    },
    properties,
    mp2,
    wall_seconds: times,
  };
}
