/**
 * The SCF settings a record used, each with whether it is the default. The defaults mirror
 * src/engine/scf/scf.ts SCF_DEFAULTS (test/site/settings.test.ts keeps them in step) so the site
 * bundle does not pull in the engine.
 */
import type { FieldbookRecord } from "../archive/record.ts";
import { sci } from "./format.ts";

export const SCF_DEFAULTS_VIEW = {
  energy: 1e-10,
  density: 1e-8,
  max_iterations: 128,
  accelerator: "diis",
  diis_size: 8,
  guess: "sad",
  level_shift: 0,
  damping: 0,
  orth_threshold: 1e-7,
  rebuild_every: 8,
} as const;

export interface SettingRow {
  name: string;
  value: string;
  isDefault: boolean;
  meaning: string;
}

type Settings = { [K in keyof typeof SCF_DEFAULTS_VIEW]: number | string };

export function scfSettingRows(r: FieldbookRecord): SettingRow[] {
  const fromScf = (r.scf?.settings ?? null) as Settings | null;
  const c = r.spec.convergence;
  const s: Settings = fromScf ?? {
    energy: c.energy, density: c.density, max_iterations: c.max_iterations, accelerator: c.accelerator,
    diis_size: SCF_DEFAULTS_VIEW.diis_size, guess: c.guess, level_shift: c.level_shift, damping: c.damping,
    orth_threshold: SCF_DEFAULTS_VIEW.orth_threshold, rebuild_every: SCF_DEFAULTS_VIEW.rebuild_every,
  };
  const rows: [keyof Settings, string, (v: number | string) => string][] = [
    ["energy", "energy change between iterations below (hartree)", (v) => sci(Number(v), 1)],
    ["density", "RMS change of the density matrix below (each spin)", (v) => sci(Number(v), 1)],
    ["max_iterations", "iteration cap", String],
    ["accelerator", "convergence accelerator", String],
    ["diis_size", "DIIS subspace (previous Fock matrices kept)", String],
    ["guess", "initial guess (sad: superposition of atomic densities; core: core Hamiltonian)", String],
    ["level_shift", "level shift of the virtual orbitals (hartree)", String],
    ["damping", "density damping factor", String],
    ["orth_threshold", "canonical orthogonalization drops overlap eigenvalues below", (v) => sci(Number(v), 1)],
    ["rebuild_every", "full Fock rebuild every N iterations (incremental builds in between)", String],
  ];
  return rows.map(([k, meaning, fmt]) => ({ name: k, value: fmt(s[k]), isDefault: s[k] === SCF_DEFAULTS_VIEW[k], meaning }));
}

/** Harmonics actually used, read from the record's function labels (e.g. "O1 3d-2" spherical, "O1 3dxx" Cartesian). */
export function harmonicsUsed(r: FieldbookRecord): string {
  const labels = (r.basis?.function_labels ?? []) as string[];
  const high = labels.filter((l) => /\s\d+[dfghi]/.test(l));
  if (!high.length) return "no d or higher shells (s and p only, where spherical and Cartesian agree)";
  const sph = high.some((l) => /\d+[dfghi][+-]?\d$/.test(l));
  const cart = high.some((l) => /\d+[dfghi][xyz]+$/.test(l));
  return sph && cart ? "mixed: spherical and Cartesian shells" : sph ? "spherical (real solid harmonics)" : cart ? "Cartesian" : "unknown";
}
