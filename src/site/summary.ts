/**
 * What a record says at a glance: model chemistry label, status in words, the final energy and
 * the check tally. Used by the index, the facet pages and the calculation page header.
 */
import type { FieldbookRecord } from "../archive/record.ts";

export type StatusWord = "converged" | "not converged" | "failed";

export interface Mp2View {
  variant: "mp2" | "scs-mp2";
  reference: string;
  valid: boolean;
  reason?: string;
  frozen_core_orbitals: number;
  active_occupied: number[];
  virtual: number[];
  correlation: number;
  same_spin: number;
  opposite_spin: number;
  total: number;
  scs: { correlation: number; opposite_spin_scale: number; same_spin_scale: number };
  scs_total: number;
  integrals: "exact" | "density-fitting";
  fitting_basis: string | null;
  fitting_functions: number | null;
}

export function mp2Of(r: FieldbookRecord): Mp2View | null {
  return (r.mp2 as unknown as Mp2View | null) ?? null;
}

export function statusWord(r: FieldbookRecord): StatusWord {
  return r.status === "ok" ? "converged" : r.status === "not-converged" ? "not converged" : "failed";
}

/** Basis name as written in the spec (string, per-element map or file). */
export function specBasisName(r: FieldbookRecord): string {
  if (r.basis && typeof r.basis.name === "string") return r.basis.name;
  const b = r.spec.model.basis;
  if (typeof b === "string") return b;
  if ("file" in b) return `file ${b.file}`;
  return [b.default, ...Object.entries(b.elements).map(([el, n]) => `${el}: ${n}`)].join(", ");
}

/** Method part of the model chemistry: RHF, UHF, ROHF, MP2, UMP2, SCS-MP2, DF-MP2, … */
export function methodLabel(r: FieldbookRecord): string {
  const m = r.spec.model;
  const ref = m.reference.toUpperCase();
  if (m.correlation === "none") return ref;
  const u = m.reference === "uhf" ? "U" : m.reference === "rohf" ? "RO" : "";
  const core = m.correlation === "scs-mp2" ? `SCS-${u}MP2` : `${u}MP2`;
  return m.density_fitting ? `DF-${core}` : core;
}

/** e.g. "MP2/cc-pVDZ", "UHF/6-31G*". */
export function modelChemistry(r: FieldbookRecord): string {
  return `${methodLabel(r)}/${specBasisName(r)}`;
}

export interface FinalEnergy {
  value: number;
  /** what the number is: "MP2 total energy", "SCF energy", … */
  label: string;
}

/** The calculation's final energy (the highest level that produced a valid number), or null. */
export function finalEnergy(r: FieldbookRecord): FinalEnergy | null {
  if (r.status === "failed" || !r.scf) return null;
  const mp2 = mp2Of(r);
  const scfE = r.scf.energy as number;
  if (mp2 && mp2.valid) {
    return mp2.variant === "scs-mp2"
      ? { value: mp2.scs_total, label: "SCS-MP2 total energy" }
      : { value: mp2.total, label: `${mp2.reference === "uhf" ? "UMP2" : "MP2"} total energy` };
  }
  const ref = String(r.scf.reference).toUpperCase();
  return { value: scfE, label: `${ref} energy${r.status === "not-converged" ? " (last iteration, not converged)" : ""}` };
}

export interface CheckTally {
  pass: number;
  fail: number;
  notRun: number;
  total: number;
  /** "passed" when all ran and passed, "failed" when any failed, "incomplete" when some did not run, "none" */
  word: "passed" | "failed" | "incomplete" | "none";
  text: string;
}

export function checkTally(r: FieldbookRecord): CheckTally {
  const pass = r.checks.filter((c) => c.status === "pass").length;
  const fail = r.checks.filter((c) => c.status === "fail").length;
  const notRun = r.checks.filter((c) => c.status === "not-run").length;
  const total = r.checks.length;
  const word = total === 0 ? "none" : fail > 0 ? "failed" : notRun > 0 ? "incomplete" : "passed";
  const parts = [pass ? `${pass} passed` : "", fail ? `${fail} failed` : "", notRun ? `${notRun} not run` : ""].filter(Boolean);
  const text = total === 0 ? "checks: none" : `checks: ${parts.join(", ")}`;
  return { pass, fail, notRun, total, word, text };
}

/** Facet values used by the index filters and the facet pages. */
export interface Facets {
  method: string;
  basis: string;
  tags: string[];
  status: StatusWord;
  checks: CheckTally["word"];
}

export function facetsOf(r: FieldbookRecord): Facets {
  return { method: methodLabel(r), basis: specBasisName(r), tags: [...r.spec.tags].sort(), status: statusWord(r), checks: checkTally(r).word };
}

/** URL-safe slug of a facet value ("6-31G*" → "6-31g-star", "SCS-MP2" → "scs-mp2"). */
export function facetSlug(value: string): string {
  return value.toLowerCase().replace(/\*/g, "-star").replace(/\+/g, "-plus").replace(/[^a-z0-9]+/g, "-").replace(/^-+|-+$/g, "") || "none";
}
