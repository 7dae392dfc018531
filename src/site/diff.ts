/**
 * What changed between two versions of a calculation: the settings that enter the input hash
 * (model, convergence, charge, multiplicity, geometry, engine numerics) and the headline numbers.
 */
import type { FieldbookRecord } from "../archive/record.ts";
import { fixed, hartree, sci } from "./format.ts";
import { finalEnergy, mp2Of, statusWord } from "./summary.ts";
import { coordinateRows } from "./geometry.ts";

export interface Change {
  what: string;
  before: string;
  after: string;
  /** for numbers: after − before, formatted */
  delta?: string;
}

function flatten(prefix: string, v: unknown, out: Map<string, string>): void {
  if (v !== null && typeof v === "object" && !Array.isArray(v)) {
    for (const k of Object.keys(v as object).sort()) flatten(prefix ? `${prefix}.${k}` : k, (v as Record<string, unknown>)[k], out);
  } else out.set(prefix, typeof v === "number" ? (Number.isInteger(v) ? String(v) : sci(v, 6)) : JSON.stringify(v));
}

function geometryText(r: FieldbookRecord): string {
  return coordinateRows(r).map((a) => `${a.symbol} ${a.angstrom.map((x) => fixed(x, 6)).join(" ")}`).join("; ");
}

export function settingChanges(prev: FieldbookRecord, cur: FieldbookRecord): Change[] {
  const a = new Map<string, string>(), b = new Map<string, string>();
  const pick = (r: FieldbookRecord) => ({
    model: r.spec.model, convergence: r.spec.convergence,
    molecule: { charge: r.spec.molecule.charge, multiplicity: r.spec.molecule.multiplicity },
    engine: r.provenance.engine,
  });
  flatten("", pick(prev), a);
  flatten("", pick(cur), b);
  const out: Change[] = [];
  for (const k of [...new Set([...a.keys(), ...b.keys()])].sort()) {
    if (a.get(k) !== b.get(k)) out.push({ what: k, before: a.get(k) ?? "(absent)", after: b.get(k) ?? "(absent)" });
  }
  const ga = geometryText(prev), gb = geometryText(cur);
  if (ga !== gb) out.push({ what: "geometry (Å)", before: ga, after: gb });
  if ((prev.basis?.functions ?? null) !== (cur.basis?.functions ?? null)) {
    out.push({ what: "basis functions", before: String(prev.basis?.functions ?? "n/a"), after: String(cur.basis?.functions ?? "n/a") });
  }
  return out;
}

export function numberChanges(prev: FieldbookRecord, cur: FieldbookRecord): Change[] {
  const out: Change[] = [];
  const num = (what: string, x: number | null | undefined, y: number | null | undefined, fmt: (v: number) => string, dfmt: (v: number) => string) => {
    const okx = typeof x === "number", oky = typeof y === "number";
    if (!okx && !oky) return;
    out.push({ what, before: okx ? fmt(x) : "n/a", after: oky ? fmt(y) : "n/a", delta: okx && oky ? dfmt(y - x) : undefined });
  };
  out.push({ what: "status", before: statusWord(prev), after: statusWord(cur) });
  const fa = finalEnergy(prev), fb = finalEnergy(cur);
  num(`final energy (hartree; ${fb?.label ?? fa?.label ?? ""})`, fa?.value, fb?.value, hartree, (d) => sci(d, 3));
  num("SCF energy (hartree)", prev.scf?.energy as number | undefined, cur.scf?.energy as number | undefined, hartree, (d) => sci(d, 3));
  const ma = mp2Of(prev), mb = mp2Of(cur);
  num("MP2 correlation energy (hartree)", ma?.valid ? ma.correlation : null, mb?.valid ? mb.correlation : null, hartree, (d) => sci(d, 3));
  num("dipole moment (debye)", prev.properties?.dipole_debye as number | undefined, cur.properties?.dipole_debye as number | undefined, (v) => fixed(v, 6), (d) => sci(d, 3));
  num("SCF iterations", (prev.scf?.iterations as unknown[] | undefined)?.length, (cur.scf?.iterations as unknown[] | undefined)?.length, String, (d) => (d > 0 ? `+${d}` : String(d)));
  return out;
}
