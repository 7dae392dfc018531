/**
 * A readable terminal summary of one engine result: what was computed, the numbers with
 * units and meaningful digits, convergence, consistency checks and cross-checks.
 */
import { HARTREE_EV } from "../engine/constants.ts";
import type { RunResult } from "../engine/run.ts";

export interface CheckLine {
  quantity: string;
  expected: number;
  computed: number | null;
  difference: number | null;
  tolerance: number;
  unit: string;
  status: string;
  source: string;
}

const f = (x: number | null | undefined, d: number) => (x === null || x === undefined || !Number.isFinite(x) ? "–" : x.toFixed(d));

export function formatSummary(r: RunResult, title: string, checks: CheckLine[] = []): string {
  const out: string[] = [];
  const model = `${r.scf.reference.toUpperCase()}${r.mp2 ? `/${r.mp2.variant.toUpperCase()}` : ""}`;
  const sets = [...new Set(Object.values(r.basis.sets))].join(" + ");
  out.push(`${title}`);
  out.push(`  ${r.molecule.formula}, charge ${r.molecule.charge}, multiplicity ${r.molecule.multiplicity}, ${r.molecule.electrons} electrons`);
  out.push(`  ${model}/${sets}: ${r.basis.functions} functions (${r.basis.harmonics} harmonics), ${r.basis.orthogonalization.kind} orthogonalization` +
    (r.basis.orthogonalization.dropped ? `, ${r.basis.orthogonalization.dropped} dropped` : ""));
  const last = r.scf.iterations[r.scf.iterations.length - 1];
  out.push(`  SCF ${r.scf.converged ? "converged" : "DID NOT CONVERGE"} in ${r.scf.iterations.length} iterations` +
    (last ? ` (last ΔE ${last.deltaEnergy.toExponential(1)} Eh, RMS ΔD ${last.densityRms.toExponential(1)})` : ""));
  if (r.scf.stability.checked)
    out.push(`  UHF stability: ${r.scf.stability.stable ? "stable" : "unstable"}, lowest Hessian eigenvalue ${f(r.scf.stability.lowestEigenvalue, 6)} Eh` +
      (r.scf.stability.restarts ? `, ${r.scf.stability.restarts} restart(s)` : ""));
  out.push(`  E(SCF)        ${f(r.scf.energy, 10)} Eh`);
  const p = r.properties;
  if (r.mp2?.valid) {
    out.push(`  E(MP2) corr.  ${f(r.mp2.correlation, 10)} Eh  (same spin ${f(r.mp2.same_spin, 8)}, opposite spin ${f(r.mp2.opposite_spin, 8)}, ${r.mp2.frozen_core_orbitals} frozen)`);
    out.push(`  E(MP2) total  ${f(r.mp2.total, 10)} Eh`);
    if (r.mp2.variant === "scs-mp2") out.push(`  E(SCS-MP2)    ${f(r.mp2.scs_total, 10)} Eh  (6/5 OS, 1/3 SS)`);
    if (r.mp2.integrals === "density-fitting") out.push(`  density fitting: ${r.mp2.fitting_basis} (${r.mp2.fitting_functions} functions)`);
  } else if (r.mp2 && !r.mp2.valid) out.push(`  MP2: not reported — ${r.mp2.reason}`);
  out.push(`  nuclear repulsion ${f(r.molecule.nuclear_repulsion, 10)} Eh; virial ratio −V/T ${f(p.virial_ratio, 6)}`);
  out.push(`  HOMO ${f(p.orbitals.homo, 6)} Eh (${f((p.orbitals.homo ?? NaN) * HARTREE_EV, 3)} eV), LUMO ${f(p.orbitals.lumo, 6)} Eh, gap ${f(p.orbitals.gap, 6)} Eh`);
  out.push(`  dipole ${f(p.dipole.magnitude_au, 6)} au = ${f(p.dipole.debye, 4)} D (about the ${p.dipole.origin.kind})`);
  if (p.s_squared) out.push(`  <S²> ${f(p.s_squared.value, 6)} (exact ${f(p.s_squared.exact, 4)})`);
  const failed = p.consistency.filter((c) => c.status === "fail");
  out.push(`  built-in checks: ${p.consistency.length - failed.length}/${p.consistency.length} pass` +
    (failed.length ? ` — FAILED: ${failed.map((c) => c.name).join("; ")}` : ""));
  for (const c of checks)
    out.push(`  check ${c.quantity}: ${c.status.toUpperCase()} expected ${c.expected} ${c.unit}, computed ${f(c.computed, 8)}, ` +
      `difference ${c.difference === null ? "–" : c.difference.toExponential(2)} (tolerance ${c.tolerance}) — ${c.source}`);
  out.push(`  time ${f(r.wall_seconds.total, 2)} s`);
  return out.join("\n");
}
