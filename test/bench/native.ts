// Native speed reference for the benchmark: spawns native_ref (our libint2 + Eigen C++ program from
// ../shared/tools/native-ref, built by scripts/build-native-ref.sh) single-threaded and parses its
// JSON. Only for side-by-side timing in the same run; correctness tests cite published values.
//
//   node test/bench/native.ts                    # table for water/cc-pVDZ
//   node test/bench/native.ts benzene cc-pVDZ    # any geometry in test/bench/geometries (or a path)

import { spawnSync } from "node:child_process";
import { existsSync, statSync } from "node:fs";
import { homedir } from "node:os";
import { basename, isAbsolute, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";

export const REPO_ROOT: string = fileURLToPath(new URL("../../", import.meta.url));
export const GEOMETRY_DIR: string = join(REPO_ROOT, "test", "bench", "geometries");

export interface NativeRef {
  /** absolute path of the native_ref executable */
  exe: string;
  /** directory with the basis-set JSON files (index.json, cc-pVDZ.json, ...) */
  basisDir: string;
}

export type Mp2Variant = "none" | "fc" | "ae" | "both";

export interface NativeRunOptions {
  /** default: findNativeRef(); throws if nothing is found */
  ref?: NativeRef;
  /** kill the process after this many ms (default 30 min) */
  timeoutMs?: number;
}

export interface NativeScfOptions extends NativeRunOptions {
  /** MP2 variants to compute (default "none" here; the program's own default is "both") */
  mp2?: Mp2Variant;
  /** default: rhf for singlets, uhf otherwise */
  reference?: "rhf" | "uhf";
  /** Schwarz threshold for the stored ERIs (default 0 = no screening) */
  schwarz?: number;
  puream?: "auto" | "cart" | "sph";
}

export interface NativeEriPass {
  shellQuartetsUnique: number;
  shellQuartetsComputed: number;
  integralsComputed: number;
  /** libint2 engine construction, not included in seconds */
  engineSetupSeconds: number;
  /** time spent computing all (screened) unique shell quartets */
  seconds: number;
  integralsPerSecond: number;
  checksum: number;
}

export interface NativeEriBench {
  basis: string;
  puream: string;
  natoms: number;
  nbf: number;
  nshell: number;
  maxL: number;
  libintVersion: string;
  /** all unique shell quartets, no screening */
  noScreening: NativeEriPass;
  /** Schwarz-screened pass */
  schwarz: NativeEriPass & {
    threshold: number;
    /** time for the (ab|ab) diagonal factors */
    schwarzFactorSeconds: number;
    /** schwarzFactorSeconds + seconds */
    totalSeconds: number;
  };
  /** wall time of the whole process as seen from Node (includes basis loading, process start) */
  processWallSeconds: number;
  raw: Record<string, unknown>;
}

export interface NativeMp2Part {
  nFrozenCore: number;
  eCorr: number;
  eTotal: number;
  eOppositeSpin: number;
  eSameSpin: number;
}

export interface NativeScf {
  program: string;
  basis: string;
  puream: string;
  reference: "RHF" | "UHF";
  charge: number;
  multiplicity: number;
  nbf: number;
  nmo: number;
  nshell: number;
  nElectrons: number;
  nuclearRepulsion: number;
  /** total SCF energy (Eh) */
  energy: number;
  converged: boolean;
  iterations: number;
  finalDeltaE: number;
  finalRmsDensityChange: number;
  /** UHF only */
  s2?: number;
  mp2: { frozenCore?: NativeMp2Part; allElectron?: NativeMp2Part };
  dipoleAu: { x: number; y: number; z: number; total: number };
  eri: {
    schwarzThreshold: number;
    shellQuartetsUnique: number;
    shellQuartetsComputed: number;
    integralsComputed: number;
    storedDoubles: number;
  };
  seconds: {
    /** S, T, V, dipole integrals */
    oneElectron: number;
    /** ERI quartet loop only */
    eri: number;
    /** all integrals incl. engine setup (oneElectron + eri + setup) */
    integrals: number;
    /** SCF iterations (after the integrals) */
    scf: number;
    /** MP2 step (all requested variants; 0 when mp2 = "none") */
    mp2: number;
    /** whole program incl. basis loading, properties */
    total: number;
  };
  processWallSeconds: number;
  raw: Record<string, unknown>;
}

function isExecutableFile(p: string): boolean {
  try {
    return statSync(p).isFile();
  } catch {
    return false;
  }
}

/** Locate native_ref and the basis directory; null when no binary is found. */
export function findNativeRef(): NativeRef | null {
  const candidates: string[] = [];
  const envExe = process.env.NATIVE_REF;
  if (envExe) candidates.push(resolve(envExe));
  const envDir = process.env.NATIVE_REF_DIR;
  if (envDir) candidates.push(join(resolve(envDir), "native_ref"));
  candidates.push(join(homedir(), ".cache", "fieldbook", "native-ref", "native_ref"));
  candidates.push("/tmp/native-ref/native_ref");
  const exe = candidates.find(isExecutableFile);
  if (!exe) return null;
  const basisDir = process.env.NATIVE_REF_BASIS_DIR
    ? resolve(process.env.NATIVE_REF_BASIS_DIR)
    : resolve(REPO_ROOT, "..", "shared", "reference", "basis");
  if (!existsSync(basisDir)) return null;
  return { exe, basisDir };
}

/** "water" -> test/bench/geometries/water.xyz; paths are resolved against the cwd. */
export function geometryPath(nameOrPath: string): string {
  if (isAbsolute(nameOrPath) || nameOrPath.includes("/") || nameOrPath.endsWith(".xyz")) {
    const p = resolve(nameOrPath);
    if (existsSync(p)) return p;
    const inDir = join(GEOMETRY_DIR, basename(nameOrPath));
    if (existsSync(inDir)) return inDir;
    return p;
  }
  return join(GEOMETRY_DIR, `${nameOrPath}.xyz`);
}

function runJson(args: string[], opts: NativeRunOptions): { json: Record<string, unknown>; wall: number; status: number } {
  const ref = opts.ref ?? findNativeRef();
  if (!ref) {
    throw new Error(
      "native_ref not found: run scripts/build-native-ref.sh (or set NATIVE_REF / NATIVE_REF_DIR, NATIVE_REF_BASIS_DIR)",
    );
  }
  const env = {
    ...process.env,
    OMP_NUM_THREADS: "1",
    OPENBLAS_NUM_THREADS: "1",
    MKL_NUM_THREADS: "1",
    NATIVE_REF_BASIS_DIR: ref.basisDir,
  };
  const t0 = performance.now();
  const r = spawnSync(ref.exe, ["--basis-dir", ref.basisDir, ...args], {
    env,
    encoding: "utf8",
    maxBuffer: 256 * 1024 * 1024,
    timeout: opts.timeoutMs ?? 30 * 60 * 1000,
  });
  const wall = (performance.now() - t0) / 1000;
  if (r.error) throw new Error(`native_ref ${args.join(" ")}: ${r.error.message}`);
  // exit status 3 = SCF not converged (JSON is still printed)
  if ((r.status !== 0 && r.status !== 3) || !r.stdout) {
    throw new Error(`native_ref ${args.join(" ")} failed (status ${r.status}, signal ${r.signal}): ${r.stderr.trim()}`);
  }
  return { json: JSON.parse(r.stdout) as Record<string, unknown>, wall, status: r.status };
}

type Obj = Record<string, unknown>;
const num = (o: Obj, k: string): number => {
  const v = o[k];
  if (typeof v !== "number") throw new Error(`native_ref JSON: expected number at "${k}", got ${JSON.stringify(v)}`);
  return v;
};
const str = (o: Obj, k: string): string => String(o[k] ?? "");
const obj = (o: Obj, k: string): Obj => (o[k] ?? {}) as Obj;

function eriPass(p: Obj): NativeEriPass {
  return {
    shellQuartetsUnique: num(p, "shell_quartets_unique"),
    shellQuartetsComputed: num(p, "shell_quartets_computed"),
    integralsComputed: num(p, "integrals_computed"),
    engineSetupSeconds: num(p, "engine_setup_time_s"),
    seconds: num(p, "time_s"),
    integralsPerSecond: num(p, "integrals_per_s"),
    checksum: num(p, "checksum"),
  };
}

/** ERI-only benchmark: all unique shell quartets without screening, then with Schwarz screening. */
export function runNativeEri(
  xyzPath: string,
  basis: string,
  opts: NativeRunOptions & { schwarz?: number } = {},
): NativeEriBench {
  const args = ["--bench", "--basis", basis];
  if (opts.schwarz !== undefined) args.push("--bench-schwarz", String(opts.schwarz));
  args.push(geometryPath(xyzPath));
  const { json: j, wall } = runJson(args, opts);
  const s = obj(j, "schwarz");
  return {
    basis: str(j, "basis"),
    puream: str(j, "puream"),
    natoms: num(j, "natoms"),
    nbf: num(j, "nbf"),
    nshell: num(j, "nshell"),
    maxL: num(j, "max_l"),
    libintVersion: str(j, "libint_version"),
    noScreening: eriPass(obj(j, "no_screening")),
    schwarz: {
      ...eriPass(s),
      threshold: num(s, "threshold"),
      schwarzFactorSeconds: num(s, "schwarz_factor_time_s"),
      totalSeconds: num(s, "total_time_s"),
    },
    processWallSeconds: wall,
    raw: j,
  };
}

function mp2Part(o: Obj | undefined): NativeMp2Part | undefined {
  if (!o) return undefined;
  return {
    nFrozenCore: num(o, "n_frozen_core"),
    eCorr: num(o, "e_corr"),
    eTotal: num(o, "e_total"),
    eOppositeSpin: num(o, "e_opposite_spin"),
    eSameSpin: num(o, "e_same_spin"),
  };
}

/** Full SCF (RHF/UHF) and optionally MP2. ERIs are stored unscreened unless opts.schwarz > 0. */
export function runNativeScf(xyzPath: string, basis: string, opts: NativeScfOptions = {}): NativeScf {
  const args = ["--basis", basis, "--mp2", opts.mp2 ?? "none"];
  if (opts.reference) args.push("--reference", opts.reference);
  if (opts.schwarz !== undefined) args.push("--schwarz", String(opts.schwarz));
  if (opts.puream) args.push("--puream", opts.puream);
  args.push(geometryPath(xyzPath));
  const { json: j, wall } = runJson(args, opts);
  const mp2 = obj(j, "mp2");
  const t = obj(j, "timings_s");
  const e = obj(j, "eri");
  const d = obj(j, "dipole_au");
  return {
    program: str(j, "program"),
    basis: str(j, "basis"),
    puream: str(j, "puream"),
    reference: str(j, "reference") === "UHF" ? "UHF" : "RHF",
    charge: num(j, "charge"),
    multiplicity: num(j, "multiplicity"),
    nbf: num(j, "nbf"),
    nmo: num(j, "nmo"),
    nshell: num(j, "nshell"),
    nElectrons: num(j, "n_electrons"),
    nuclearRepulsion: num(j, "nuclear_repulsion"),
    energy: num(j, "e_scf"),
    converged: j.converged === true,
    iterations: num(j, "iterations"),
    finalDeltaE: num(j, "final_delta_e"),
    finalRmsDensityChange: num(j, "final_rms_density_change"),
    s2: typeof j.s2 === "number" ? j.s2 : undefined,
    mp2: {
      frozenCore: mp2Part(mp2.frozen_core as Obj | undefined),
      allElectron: mp2Part(mp2.all_electron as Obj | undefined),
    },
    dipoleAu: { x: num(d, "x"), y: num(d, "y"), z: num(d, "z"), total: num(d, "total") },
    eri: {
      schwarzThreshold: num(e, "schwarz_threshold"),
      shellQuartetsUnique: num(e, "shell_quartets_unique"),
      shellQuartetsComputed: num(e, "shell_quartets_computed"),
      integralsComputed: num(e, "integrals_computed"),
      storedDoubles: num(e, "stored_doubles"),
    },
    seconds: {
      oneElectron: num(t, "one_electron_integrals"),
      eri: num(t, "eri"),
      integrals: num(t, "integrals"),
      scf: num(t, "scf"),
      mp2: num(t, "mp2"),
      total: num(t, "total"),
    },
    processWallSeconds: wall,
    raw: j,
  };
}

// ---- CLI: node test/bench/native.ts [molecule] [basis]
function main(argv: string[]): void {
  const mol = argv[0] ?? "water";
  const basis = argv[1] ?? "cc-pVDZ";
  const ref = findNativeRef();
  if (!ref) {
    console.error("native_ref not found; build it with scripts/build-native-ref.sh");
    process.exitCode = 1;
    return;
  }
  const eri = runNativeEri(mol, basis, { ref });
  const rhf = runNativeScf(mol, basis, { ref, mp2: "none" });
  const mp2 = runNativeScf(mol, basis, { ref, mp2: "fc" });
  const f = (s: number): string => s.toFixed(4);
  const rows: [string, string][] = [
    ["native_ref", ref.exe],
    ["case", `${mol} / ${basis} (${eri.puream}), nbf ${eri.nbf}, ${eri.nshell} shells`],
    ["ERI, no screening (s)", `${f(eri.noScreening.seconds)}  (${eri.noScreening.integralsComputed} integrals, ${eri.noScreening.shellQuartetsUnique} quartets)`],
    ["ERI, Schwarz 1e-12 total (s)", `${f(eri.schwarz.totalSeconds)}  (${eri.schwarz.shellQuartetsComputed} quartets computed)`],
    [`E(${rhf.reference}) (Eh)`, `${rhf.energy.toFixed(10)}  (${rhf.iterations} iterations, converged ${rhf.converged})`],
    ["RHF integrals / SCF / total (s)", `${f(rhf.seconds.integrals)} / ${f(rhf.seconds.scf)} / ${f(rhf.seconds.total)}`],
    ["E_corr MP2 fc (Eh)", `${mp2.mp2.frozenCore?.eCorr.toFixed(10)}  (E_total ${mp2.mp2.frozenCore?.eTotal.toFixed(10)})`],
    ["MP2 fc step (s)", f(mp2.seconds.mp2)],
  ];
  const w = Math.max(...rows.map((r) => r[0].length));
  for (const [k, v] of rows) console.log(`${k.padEnd(w)}  ${v}`);
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main(process.argv.slice(2));
}
