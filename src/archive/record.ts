/**
 * Result records ("fieldbook-record/1", design/record-format.md): one JSON object per computed
 * version of a calculation, holding its inputs, convergence history, results, checks and
 * provenance, so that a page can be rebuilt years later without the engine.
 *
 * Conventions:
 * - every quantity is in atomic units (hartree, bohr, e·bohr) unless its name says otherwise
 *   (dipole_debye, koopmans_ie_ev, seconds);
 * - a number that is undefined (the first iteration's delta_energy, a density change before
 *   there is a previous density, a stability eigenvalue with no rotations) is null, never NaN;
 * - −0 is written as 0; typed arrays as plain arrays;
 * - status: "ok" (converged), "not-converged" (a result, kept and shown), "failed" (the run threw:
 *   an InputError, code from the error, or a bug, code "internal-error").
 */
import {
  auToDebye, type EnergyUnit, hartreeTo,
} from "../engine/constants.ts";
import { InputError } from "../engine/errors.ts";
import { electronCount, hillFormula, nuclearRepulsion } from "../engine/molecule.ts";
import type { RunResult } from "../engine/run.ts";
import { ENGINE_NAME, ENGINE_VERSION, NUMERICS_VERSION } from "../engine/version.ts";
import type { CheckQuantity, CheckUnit, NormalizedSpec, SpecCheck } from "../spec/types.ts";
import { INPUT_HASH_PATTERN } from "./hash.ts";

export const RECORD_FORMAT = "fieldbook-record/1";

export type RecordStatus = "ok" | "not-converged" | "failed";
export type CheckStatus = "pass" | "fail" | "not-run";

export interface CheckResult {
  quantity: CheckQuantity;
  expected: number;
  /** the computed value in `unit`; null when not run */
  computed: number | null;
  /** computed − expected in `unit`; null when not run */
  difference: number | null;
  tolerance: number;
  unit: CheckUnit;
  source: string;
  status: CheckStatus;
  /** why a check was not run; null otherwise */
  reason: string | null;
}

export interface WallSeconds {
  basis: number | null;
  integrals: number | null;
  scf: number | null;
  properties: number | null;
  mp2: number | null;
  total: number | null;
}

export interface Provenance {
  engine: { name: string; version: string; numerics: number };
  repository_commit: string | null;
  node: string;
  platform: string;
  started_at: string;
  finished_at: string;
  wall_seconds: WallSeconds;
}

/** What the caller knows about the run's circumstances; node and platform default to this process. */
export interface ProvenanceInput {
  repository_commit: string | null;
  /** ISO 8601 UTC, e.g. new Date().toISOString() */
  started_at: string;
  finished_at: string;
  node?: string;
  platform?: string;
}

export interface RecordError {
  message: string;
  /** the InputError code, or "internal-error" for a bug */
  code: string;
  kind: "input" | "internal";
  hint: string | null;
  /** where the input error is (file, line, column) or the engine stage that threw; null if unknown */
  where: { source: string | null; line: number | null; column: number | null; stage: string | null } | null;
}

export interface FieldbookRecord {
  format: typeof RECORD_FORMAT;
  id: string;
  input_hash: string;
  spec: NormalizedSpec;
  spec_source: string;
  provenance: Provenance;
  molecule: {
    formula: string;
    atoms: [string, number, number, number][];
    units: "bohr";
    charge: number;
    multiplicity: number;
    electrons: number;
    alpha: number | null;
    beta: number | null;
    nuclear_repulsion: number | null;
  };
  basis: Record<string, unknown> | null;
  scf: Record<string, unknown> | null;
  mp2: Record<string, unknown> | null;
  properties: Record<string, unknown> | null;
  consistency: { name: string; value: number | null; tolerance: number | null; status: string; source: string }[];
  checks: CheckResult[];
  status: RecordStatus;
  error?: RecordError;
}

// ---------------------------------------------------------------- JSON safety

/** A deep copy fit for JSON: non-finite numbers → null, −0 → 0, typed arrays → arrays, undefined properties dropped. */
export function jsonSafe<T>(value: T): T {
  const walk = (v: unknown): unknown => {
    if (typeof v === "number") return Number.isFinite(v) ? (Object.is(v, -0) ? 0 : v) : null;
    if (v === null || typeof v !== "object") return v;
    if (ArrayBuffer.isView(v)) return Array.from(v as unknown as ArrayLike<number>, walk);
    if (Array.isArray(v)) return v.map((x) => (x === undefined ? null : walk(x)));
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) if (x !== undefined) out[k] = walk(x);
    return out;
  };
  return walk(value) as T;
}

// ---------------------------------------------------------------- checks

const ENERGY_UNITS: readonly CheckUnit[] = ["hartree", "kcal/mol", "kJ/mol", "eV"];
const DIPOLE_UNITS: readonly CheckUnit[] = ["debye", "au"];
const DIMENSIONLESS_UNITS: readonly CheckUnit[] = ["au"];

const QUANTITY_KIND: Record<CheckQuantity, "energy" | "dipole" | "dimensionless"> = {
  scf_energy: "energy",
  total_energy: "energy",
  mp2_correlation: "energy",
  nuclear_repulsion: "energy",
  homo: "energy",
  lumo: "energy",
  dipole_magnitude: "dipole",
  s_squared: "dimensionless",
};

type Computed = { value: number } | { reason: string };

/** The computed value of a quantity in atomic units (hartree, e·bohr, dimensionless), or why there is none. */
function computedAu(q: CheckQuantity, r: RunResult): Computed {
  const mp2 = r.mp2;
  switch (q) {
    case "nuclear_repulsion":
      return { value: r.molecule.nuclear_repulsion };
    case "scf_energy":
      return { value: r.scf.energy };
    case "total_energy":
      if (mp2 === null) return { value: r.scf.energy };
      if (!mp2.valid) return { reason: `no ${mp2.variant} energy: ${mp2.reason}` };
      return { value: mp2.variant === "scs-mp2" ? mp2.scs_total : mp2.total };
    case "mp2_correlation":
      if (mp2 === null) return { reason: "the calculation has no correlation treatment (correlation: none)" };
      if (!mp2.valid) return { reason: `no ${mp2.variant} energy: ${mp2.reason}` };
      return { value: mp2.variant === "scs-mp2" ? mp2.scs.correlation : mp2.correlation };
    case "dipole_magnitude":
      return { value: r.properties.dipole.magnitude_au };
    case "homo": {
      const o = r.properties.orbitals;
      const hs = [o.homo, o.homo_beta].filter((x): x is number => typeof x === "number");
      return hs.length ? { value: Math.max(...hs) } : { reason: "no occupied orbital" };
    }
    case "lumo": {
      const o = r.properties.orbitals;
      const ls = [o.lumo, o.lumo_beta].filter((x): x is number => typeof x === "number");
      return ls.length ? { value: Math.min(...ls) } : { reason: "no virtual orbital in this basis" };
    }
    case "s_squared":
      // RHF: exactly 0 (the engine reports null there)
      return { value: r.properties.s_squared === null ? 0 : r.properties.s_squared.value };
    default:
      return { reason: `unknown quantity ${JSON.stringify(q)}` };
  }
}

function inUnit(kind: "energy" | "dipole" | "dimensionless", unit: CheckUnit, au: number): number {
  if (kind === "energy") return unit === "hartree" ? au : hartreeTo(unit as EnergyUnit, au);
  if (kind === "dipole") return unit === "debye" ? auToDebye(au) : au;
  return au;
}

/**
 * Evaluate the spec's checks against a result (null: the run failed).
 * - scf_energy: result.scf.energy; total_energy: the MP2 total (SCS-MP2 total for scs-mp2) when
 *   correlation was asked for, else the SCF energy; mp2_correlation: the MP2 (SCS-MP2) correlation
 *   energy; nuclear_repulsion; dipole_magnitude (about the engine's origin, the centre of mass
 *   unless told otherwise); homo: the highest occupied orbital energy (UHF: of α and β), lumo: the
 *   lowest virtual; s_squared: ⟨S²⟩ (0 for RHF), unit "au" (dimensionless).
 * - units: energies in hartree, kcal/mol (thermochemical calorie), kJ/mol, eV; dipoles in debye or
 *   au (e·bohr); conversions from src/engine/constants.ts (CODATA 2018). The computed value and the
 *   difference (computed − expected) are in the check's unit, and so is the tolerance.
 * - status: pass when |difference| ≤ tolerance, fail otherwise (NaN fails); not-run when the run
 *   failed, the SCF did not converge (no check of a non-converged record is ever marked passed,
 *   not even nuclear_repulsion), the quantity does not exist (mp2_correlation without MP2, lumo
 *   without virtuals), or the unit does not fit the quantity.
 */
export function evaluateChecks(checks: readonly SpecCheck[], result: RunResult | null): CheckResult[] {
  return checks.map((c) => {
    const base = { quantity: c.quantity, expected: c.expected, tolerance: c.tolerance, unit: c.unit, source: c.source };
    const notRun = (reason: string): CheckResult => ({ ...base, computed: null, difference: null, status: "not-run", reason });
    const kind = QUANTITY_KIND[c.quantity];
    if (!kind) return notRun(`unknown quantity ${JSON.stringify(c.quantity)}`);
    const allowed = kind === "energy" ? ENERGY_UNITS : kind === "dipole" ? DIPOLE_UNITS : DIMENSIONLESS_UNITS;
    if (!allowed.includes(c.unit)) return notRun(`unit ${c.unit} does not fit ${c.quantity} (use ${allowed.join(", ")})`);
    if (result === null) return notRun("the calculation failed");
    if (result.status !== "ok" || !result.scf.converged) return notRun("the SCF did not converge");
    const v = computedAu(c.quantity, result);
    if ("reason" in v) return notRun(v.reason);
    const computed = inUnit(kind, c.unit, v.value);
    const difference = computed - c.expected;
    const pass = Math.abs(difference) <= c.tolerance; // NaN compares false: fails
    return { ...base, computed, difference, status: pass ? "pass" : "fail", reason: null };
  });
}

// ---------------------------------------------------------------- records

function provenanceOf(p: ProvenanceInput, engine: Provenance["engine"], wall: WallSeconds): Provenance {
  return {
    engine: { name: engine.name, version: engine.version, numerics: engine.numerics },
    repository_commit: p.repository_commit,
    node: p.node ?? process.version,
    platform: p.platform ?? `${process.platform}-${process.arch}`,
    started_at: p.started_at,
    finished_at: p.finished_at,
    wall_seconds: wall,
  };
}

function checkHash(inputHash: string): void {
  if (!INPUT_HASH_PATTERN.test(inputHash)) throw new Error(`input hash must be "sha256:<64 hex>" (got ${JSON.stringify(inputHash)})`);
}

function basisName(sets: Record<string, string>): string {
  const names = [...new Set(Object.values(sets))];
  return names.length === 1 ? names[0] : Object.entries(sets).map(([el, n]) => `${el}: ${n}`).join(", ");
}

export interface BuildRecordInput {
  spec: NormalizedSpec;
  /** the spec file's text as read */
  specSource: string;
  result: RunResult;
  /** "sha256:<hex>" from inputHash() */
  inputHash: string;
  provenance: ProvenanceInput;
  /** default evaluateChecks(spec.checks, result) */
  checks?: CheckResult[];
}

/** The record of a run that returned (status "ok" or "not-converged"). */
export function buildRecord(input: BuildRecordInput): FieldbookRecord {
  const { spec, specSource, result: r, inputHash } = input;
  checkHash(inputHash);
  const p = r.properties;
  const w = r.wall_seconds;
  const wall: WallSeconds = {
    basis: w.basis ?? null, integrals: w.integrals ?? null, scf: w.scf ?? null,
    properties: w.properties ?? null, mp2: w.mp2 ?? null, total: w.total ?? null,
  };
  const s = r.scf.settings;
  const record: FieldbookRecord = {
    format: RECORD_FORMAT,
    id: spec.id,
    input_hash: inputHash,
    spec,
    spec_source: specSource,
    provenance: provenanceOf(input.provenance, r.engine, wall),
    molecule: {
      formula: r.molecule.formula,
      atoms: r.molecule.atoms.map((a) => [a[0], a[1], a[2], a[3]]),
      units: "bohr",
      charge: r.molecule.charge,
      multiplicity: r.molecule.multiplicity,
      electrons: r.molecule.electrons,
      alpha: r.molecule.alpha,
      beta: r.molecule.beta,
      nuclear_repulsion: r.molecule.nuclear_repulsion,
    },
    basis: {
      name: basisName(r.basis.sets),
      sets: r.basis.sets,
      functions: r.basis.functions,
      shells: r.basis.shells,
      harmonics: r.basis.harmonics,
      dropped_by_orthogonalization: r.basis.orthogonalization.dropped,
      orthogonalization: r.basis.orthogonalization,
      references: r.basis.references,
      function_labels: r.basis.function_labels,
    },
    scf: {
      reference: r.scf.reference,
      converged: r.scf.converged,
      iterations: r.scf.iterations.map((it) => ({
        iteration: it.iteration, energy: it.energy, delta_energy: it.deltaEnergy, density_rms: it.densityRms,
        diis_error: it.diisError, seconds: it.seconds, full_build: it.fullBuild,
      })),
      energy: r.scf.energy,
      components: p.energy_components,
      virial_ratio: p.virial_ratio,
      orbitals: {
        alpha: r.scf.orbitals.alpha,
        beta: r.scf.orbitals.beta,
        homo: p.orbitals.homo, lumo: p.orbitals.lumo, gap: p.orbitals.gap,
        ...(r.scf.orbitals.beta ? { homo_beta: p.orbitals.homo_beta ?? null, lumo_beta: p.orbitals.lumo_beta ?? null, gap_beta: p.orbitals.gap_beta ?? null } : {}),
      },
      s_squared: p.s_squared,
      stability: r.scf.stability,
      settings: {
        energy: s.energy, density: s.density, max_iterations: s.maxIterations, accelerator: s.accelerator,
        diis_size: s.diisSize, guess: s.guess, level_shift: s.levelShift, damping: s.damping,
        orth_threshold: s.orthThreshold, rebuild_every: s.rebuildEvery,
      },
      integrals: r.scf.integrals,
    },
    mp2: r.mp2 === null ? null : { ...r.mp2 },
    properties: {
      dipole_au: p.dipole.au,
      dipole_magnitude_au: p.dipole.magnitude_au,
      dipole_debye: p.dipole.debye,
      dipole_origin: p.dipole.origin,
      mulliken: p.mulliken,
      lowdin: p.lowdin,
      spin_populations: p.spin_populations,
      koopmans_ie_hartree: p.orbitals.koopmans_ie_hartree,
      koopmans_ie_ev: p.orbitals.koopmans_ie_ev,
    },
    consistency: p.consistency.map((c) => ({ ...c })),
    checks: input.checks ?? evaluateChecks(spec.checks, r),
    status: r.status,
  };
  return jsonSafe(record);
}

export interface FailedRecordInput {
  spec: NormalizedSpec;
  specSource: string;
  inputHash: string;
  provenance: ProvenanceInput;
  /** what run() threw */
  error: unknown;
  /** the engine stage that was running, if known (from the run's "stage" events) */
  stage?: string | null;
  /** stage times measured before the failure */
  wallSeconds?: Partial<WallSeconds>;
}

/** What a thrown value says, as a record error. */
export function recordError(error: unknown, stage: string | null = null): RecordError {
  if (error instanceof InputError) {
    const w = error.where ?? {};
    return {
      message: error.message, code: error.code, kind: "input", hint: error.hint ?? null,
      where: { source: w.source ?? null, line: w.line ?? null, column: w.column ?? null, stage },
    };
  }
  const message = error instanceof Error ? `${error.name && error.name !== "Error" ? error.name + ": " : ""}${error.message}` : String(error);
  return {
    message, code: "internal-error", kind: "internal", hint: "this is a bug in fieldbook; please report it with the spec",
    where: stage === null ? null : { source: null, line: null, column: null, stage },
  };
}

/** The record of a run that threw (an InputError, or a bug). Kept like any other version. */
export function failedRecord(input: FailedRecordInput): FieldbookRecord {
  const { spec } = input;
  checkHash(input.inputHash);
  const finite = (x: number): number | null => (Number.isFinite(x) ? x : null);
  const mol = { atoms: spec.molecule.atoms, charge: spec.molecule.charge, multiplicity: spec.molecule.multiplicity };
  let enuc: number | null = null;
  try {
    enuc = finite(nuclearRepulsion(mol));
  } catch {
    enuc = null;
  }
  const w = input.wallSeconds ?? {};
  const started = Date.parse(input.provenance.started_at);
  const finished = Date.parse(input.provenance.finished_at);
  const wall: WallSeconds = {
    basis: w.basis ?? null, integrals: w.integrals ?? null, scf: w.scf ?? null, properties: w.properties ?? null, mp2: w.mp2 ?? null,
    total: w.total ?? (Number.isFinite(started) && Number.isFinite(finished) ? (finished - started) / 1000 : null),
  };
  const record: FieldbookRecord = {
    format: RECORD_FORMAT,
    id: spec.id,
    input_hash: input.inputHash,
    spec,
    spec_source: input.specSource,
    provenance: provenanceOf(input.provenance, { name: ENGINE_NAME, version: ENGINE_VERSION, numerics: NUMERICS_VERSION }, wall),
    molecule: {
      formula: spec.molecule.atoms.length ? hillFormula(mol) : "",
      atoms: spec.molecule.atoms.map((a) => [a.symbol, a.xyz[0], a.xyz[1], a.xyz[2]]),
      units: "bohr",
      charge: spec.molecule.charge,
      multiplicity: spec.molecule.multiplicity,
      electrons: electronCount(mol),
      alpha: null,
      beta: null,
      nuclear_repulsion: enuc,
    },
    basis: null,
    scf: null,
    mp2: null,
    properties: null,
    consistency: [],
    checks: evaluateChecks(spec.checks, null),
    status: "failed",
    error: recordError(input.error, input.stage ?? null),
  };
  return jsonSafe(record);
}
