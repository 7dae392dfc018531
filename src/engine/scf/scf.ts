/**
 * The self-consistent-field loop for restricted (RHF), unrestricted (UHF) and restricted
 * open-shell (ROHF) Hartree–Fock.
 *
 *  RHF (C. C. J. Roothaan, Rev. Mod. Phys. 23, 69 (1951)):  F C = S C ε,
 *      F = H + J[D] − ½ K[D],  D = 2 Σ_i^occ C_i C_iᵀ,  E = ½ tr D (H + F) + E_nuc
 *  UHF (J. A. Pople, R. K. Nesbet, J. Chem. Phys. 22, 571 (1954)):  F^σ C^σ = S C^σ ε^σ,
 *      F^σ = H + J[D^α + D^β] − K[D^σ],  E = ½ tr[(D^α + D^β) H + D^α F^α + D^β F^β] + E_nuc
 *  ROHF (C. C. J. Roothaan, Rev. Mod. Phys. 32, 179 (1960)): one set of orbitals, closed (c),
 *      open (o) and virtual (v), from one effective Fock matrix. Convention used here: in the
 *      basis of the current orbitals R_cc = R_oo = R_vv = R_cv = F_c = ½(F^α + F^β),
 *      R_co = F^β, R_ov = F^α. At convergence the off-diagonal blocks vanish, which are exactly
 *      the ROHF stationarity conditions; the orbital energies reported are the eigenvalues of R
 *      (they depend on this canonicalization; the total energy does not).
 *
 * Convergence: change of energy below `energy` and RMS change of the density (each spin)
 * below `density`, checked on a full (non-incremental) Fock build. Acceleration by DIIS
 * (diis.ts) on the orbital gradient, optional level shift of the virtual orbitals and density
 * damping. Not converging within `maxIterations` is a result (converged: false), not an error.
 */
import { matmul, symmetricEigen, transpose } from "../linalg/dense.ts";
import { kineticMatrix, nuclearAttractionMatrix, overlapMatrix, type PointCharge } from "../integrals/one-electron.ts";
import type { PreparedBasis } from "../integrals/shells.ts";
import { Diis } from "./diis.ts";
import { JkBuilder, type JkOptions, type JkStats } from "./jk.ts";
import { orthogonalizer, type Orthogonalizer } from "./orthogonalize.ts";
import { sadDensity } from "./sad.ts";

export type Reference = "rhf" | "uhf" | "rohf";

export interface ScfOptions {
  /** hartree; default 1e-10 */
  energy?: number;
  /** RMS density change; default 1e-8 */
  density?: number;
  maxIterations?: number;
  accelerator?: "diis" | "none";
  diisSize?: number;
  guess?: "sad" | "core";
  /** hartree added to virtual orbital energies; default 0 */
  levelShift?: number;
  /** fraction of the previous density mixed in; default 0 */
  damping?: number;
  /** canonical orthogonalization drops overlap eigenvalues below this; default 1e-7 */
  orthThreshold?: number;
  /** full Fock rebuild every this many iterations (incremental in between); default 8 */
  rebuildEvery?: number;
  jk?: JkOptions;
}

export const SCF_DEFAULTS = {
  energy: 1e-10,
  density: 1e-8,
  maxIterations: 128,
  accelerator: "diis",
  diisSize: 8,
  guess: "sad",
  levelShift: 0,
  damping: 0,
  orthThreshold: 1e-7,
  rebuildEvery: 8,
} as const;

export interface ScfProblem {
  basis: PreparedBasis;
  nuclei: PointCharge[];
  nuclearRepulsion: number;
  nalpha: number;
  nbeta: number;
  reference: Reference;
}

export interface ScfIteration {
  iteration: number;
  energy: number;
  deltaEnergy: number;
  densityRms: number;
  diisError: number;
  seconds: number;
  /** whether this iteration used a full Fock build */
  fullBuild: boolean;
}

/** Matrices of a finished SCF, for properties and post-HF methods (not serialized). */
export interface ScfMatrices {
  S: Float64Array;
  T: Float64Array;
  V: Float64Array;
  H: Float64Array;
  /** AO × MO coefficients (nbf × nmo) per spin; RHF/ROHF: the same array twice */
  C: [Float64Array, Float64Array];
  /** AO densities per spin (RHF: D/2 each) */
  D: [Float64Array, Float64Array];
  F: [Float64Array, Float64Array];
  J: Float64Array;
  K: [Float64Array, Float64Array];
  orth: Orthogonalizer;
  jk: JkBuilder;
}

export interface OrbitalSet {
  energies: number[];
  occupations: number[];
}

export interface ScfResult {
  reference: Reference;
  converged: boolean;
  iterations: ScfIteration[];
  energy: number;
  nalpha: number;
  nbeta: number;
  orbitals: { alpha: OrbitalSet; beta: OrbitalSet | null };
  orthogonalization: { kind: string; dropped: number; minEigenvalue: number; threshold: number; nmo: number };
  jk: JkStats;
  matrices: ScfMatrices;
}

export type ScfEvent = { type: "iteration"; data: ScfIteration; reference: Reference };

interface State {
  C: [Float64Array, Float64Array];
  eps: [Float64Array, Float64Array];
}

/** Run the SCF. `start` optionally gives initial orbitals (e.g. after a stability step). */
export function runScf(
  problem: ScfProblem,
  options: ScfOptions = {},
  onEvent?: (e: ScfEvent) => void,
  start?: { C: [Float64Array, Float64Array]; matrices?: ScfMatrices },
): ScfResult {
  const o = { ...SCF_DEFAULTS, ...options };
  const { basis, reference, nalpha, nbeta } = problem;
  const n = basis.nbf;
  const reuse = start?.matrices;
  const S = reuse?.S ?? overlapMatrix(basis);
  const T = reuse?.T ?? kineticMatrix(basis);
  const V = reuse?.V ?? nuclearAttractionMatrix(basis, problem.nuclei);
  const H = reuse?.H ?? T.map((t, k) => t + V[k]);
  const orth = reuse?.orth ?? orthogonalizer(S, n, o.orthThreshold);
  const m = orth.nmo;
  if (nalpha > m || nbeta > m)
    throw new Error(`${Math.max(nalpha, nbeta)} electrons of one spin need more than the ${m} independent basis functions`);
  const jk = reuse?.jk ?? new JkBuilder(basis, o.jk);
  const X = orth.X;
  const Xt = transpose(X, n, m);
  const unrestricted = reference === "uhf";

  // orthonormal-basis matrix → eigen-solution → AO coefficients
  const solve = (Forth: Float64Array): { C: Float64Array; eps: Float64Array; Cp: Float64Array } => {
    const { values, vectors } = symmetricEigen(Forth, m);
    return { C: matmul(X, vectors, n, m, m), eps: values, Cp: vectors };
  };
  const toOrth = (F: Float64Array) => matmul(Xt, matmul(F, X, n, n, m), m, n, m);

  if (start && start.C.some((c) => c.length !== n * m))
    throw new Error(`starting orbitals must be ${n} × ${m} (basis functions × independent functions)`);
  let state: State;
  if (start) state = { C: start.C, eps: [new Float64Array(m), new Float64Array(m)] };
  else if (o.guess === "core" || nalpha + nbeta === 0) {
    const s = solve(toOrth(H));
    state = { C: [s.C, s.C], eps: [s.eps, s.eps] };
  } else {
    const D0 = sadDensity(basis, problem.nuclei);
    // F = H + J[D0] − ½K[D0], from one density (the single-density build is the fast one)
    const { J, K } = jk.build([D0]);
    const F = H.map((h, k) => h + J[k] - 0.5 * K[0][k]);
    const s = solve(toOrth(F));
    state = { C: [s.C, s.C], eps: [s.eps, s.eps] };
  }

  const density = (C: Float64Array, nocc: number): Float64Array => {
    const D = new Float64Array(n * n);
    for (let i = 0; i < n; i++)
      for (let j = 0; j <= i; j++) {
        let s = 0;
        for (let k = 0; k < nocc; k++) s += C[i * m + k] * C[j * m + k];
        D[i * n + j] = s;
        D[j * n + i] = s;
      }
    return D;
  };

  const diis = new Diis(o.diisSize);
  const iterations: ScfIteration[] = [];
  let Dprev: [Float64Array, Float64Array] | null = null;
  let J: Float64Array = new Float64Array(n * n);
  let K: [Float64Array, Float64Array] = [new Float64Array(n * n), new Float64Array(n * n)];
  let Eprev = 0;
  let converged = false;
  let forceFull = true;
  let sinceFull = 0;
  let F: [Float64Array, Float64Array] = [H, H];
  let D: [Float64Array, Float64Array] = [new Float64Array(n * n), new Float64Array(n * n)];
  let energy = 0;

  // the orbitals the current density was made from (returned when not converged, so that
  // C, D and the energy belong together)
  let Cd: [Float64Array, Float64Array] = state.C;
  let epsd: [Float64Array, Float64Array] = state.eps;
  for (let it = 1; it <= o.maxIterations; it++) {
    const t0 = performance.now();
    Cd = state.C;
    epsd = state.eps;
    let Da = density(state.C[0], nalpha);
    let Db = reference === "rhf" ? Da : density(state.C[1], nbeta);
    if (o.damping > 0 && Dprev) {
      const d = o.damping;
      Da = Da.map((x, k) => (1 - d) * x + d * Dprev![0][k]);
      Db = reference === "rhf" ? Da : Db.map((x, k) => (1 - d) * x + d * Dprev![1][k]);
    }
    D = [Da, Db];
    const full = forceFull || Dprev === null || sinceFull >= o.rebuildEvery;
    if (full) {
      const r = jk.build(reference === "rhf" ? [Da] : [Da, Db]);
      if (reference === "rhf") {
        J = r.J.map((x) => 2 * x); // J of the total density 2·Dα
        K = [r.K[0], r.K[0]];
      } else {
        J = r.J;
        K = [r.K[0], r.K[1]];
      }
      sinceFull = 0;
    } else {
      const dA = Da.map((x, k) => x - Dprev![0][k]);
      const dB = reference === "rhf" ? dA : Db.map((x, k) => x - Dprev![1][k]);
      // Near convergence the screening error summed over many ΔD builds reached 1e-10 Eh in the
      // energy and cost iterations at the 1e-10 criterion; a 10× tighter threshold there keeps
      // it near 1e-11. Far from convergence it does not matter (a full build comes first).
      const th = o.jk?.threshold ?? 1e-12;
      const near = iterations.length > 0 && iterations[iterations.length - 1].densityRms < 1e-5;
      const r = jk.build(reference === "rhf" ? [dA] : [dA, dB], true, near ? th / 10 : th);
      const Jn = new Float64Array(n * n);
      const f = reference === "rhf" ? 2 : 1;
      for (let k = 0; k < n * n; k++) Jn[k] = J[k] + f * r.J[k];
      const Ka = K[0].map((x, k) => x + r.K[0][k]);
      const Kb = reference === "rhf" ? Ka : K[1].map((x, k) => x + r.K[1][k]);
      J = Jn;
      K = [Ka, Kb];
      sinceFull++;
    }
    forceFull = false;
    const Fa = new Float64Array(n * n);
    const Fb = reference === "rhf" ? Fa : new Float64Array(n * n);
    for (let k = 0; k < n * n; k++) {
      Fa[k] = H[k] + J[k] - K[0][k];
      if (reference !== "rhf") Fb[k] = H[k] + J[k] - K[1][k];
    }
    F = [Fa, Fb];
    let e = 0;
    for (let k = 0; k < n * n; k++) e += (Da[k] + Db[k]) * H[k] + Da[k] * Fa[k] + Db[k] * Fb[k];
    energy = 0.5 * e + problem.nuclearRepulsion;

    // orbital gradient in the orthonormal basis
    // RHF: the gradient of the total density 2Dα (DIIS is scale invariant; the report is not)
    const err = reference === "rohf" ? null
      : gradient(F, unrestricted ? D : [Da.map((x) => 2 * x), Db], S, X, Xt, n, m, unrestricted);
    let newFocks: Float64Array[];
    let rohfErr: Float64Array | null = null;
    if (reference === "rohf") {
      const r = rohfEffective(Fa, Fb, state.C[0], S, Xt, n, m, nalpha, nbeta);
      rohfErr = r.error;
      newFocks = [r.Reff];
    } else newFocks = unrestricted ? [toOrth(Fa), toOrth(Fb)] : [toOrth(Fa)];
    const errVec = rohfErr ?? err!;
    let diisError = 0;
    for (let k = 0; k < errVec.length; k++) diisError = Math.max(diisError, Math.abs(errVec[k]));

    const dE = it === 1 ? NaN : energy - Eprev; // undefined at the first iteration (null in JSON)
    let drms = 0;
    if (Dprev) {
      for (const [x, y] of [[Da, Dprev[0]], [Db, Dprev[1]]] as const) {
        let s = 0;
        for (let k = 0; k < n * n; k++) s += (x[k] - y[k]) ** 2;
        drms = Math.max(drms, Math.sqrt(s / (n * n)));
      }
    } else drms = Infinity;
    const rec: ScfIteration = {
      iteration: it, energy, deltaEnergy: dE, densityRms: Number.isFinite(drms) ? drms : NaN,
      diisError, seconds: 0, fullBuild: full,
    };
    if (it > 1 && Math.abs(dE) < o.energy && drms < o.density) {
      if (full) {
        rec.seconds = (performance.now() - t0) / 1000;
        iterations.push(rec);
        onEvent?.({ type: "iteration", data: rec, reference });
        converged = true;
        break;
      }
      forceFull = true; // confirm on a full build
    } else if (it > 1 && Math.abs(dE) < 10 * o.energy && drms < 10 * o.density) {
      // within 10× of both criteria the next iteration is likely the last: build it in full,
      // so it can be accepted at once instead of after one more, confirming, iteration
      forceFull = true;
    }
    Dprev = [Da, Db];
    Eprev = energy;

    const ext = o.accelerator === "diis" ? diis.extrapolate(newFocks, errVec) : newFocks;
    // diagonalize (with a level shift of the virtual space if asked)
    const next: State = { C: [state.C[0], state.C[1]], eps: [state.eps[0], state.eps[1]] };
    const spins = reference === "uhf" ? 2 : 1;
    for (let sp = 0; sp < spins; sp++) {
      let Fo = ext[sp];
      if (o.levelShift > 0) Fo = shiftVirtuals(Fo, state.C[sp], orthCoefficients(state.C[sp], S, Xt, n, m), m,
        sp === 0 ? (reference === "rohf" ? nbeta : nalpha) : nbeta, o.levelShift, reference === "rohf" ? nalpha : -1);
      const s = solve(Fo);
      next.C[sp] = s.C;
      next.eps[sp] = s.eps;
    }
    if (spins === 1) {
      next.C[1] = next.C[0];
      next.eps[1] = next.eps[0];
    }
    state = next;
    rec.seconds = (performance.now() - t0) / 1000;
    iterations.push(rec);
    onEvent?.({ type: "iteration", data: rec, reference });
  }

  // orbital energies of the final (un-extrapolated) Fock matrices
  let finalC: [Float64Array, Float64Array];
  let finalEps: [Float64Array, Float64Array];
  if (reference === "rohf") {
    const r = rohfEffective(F[0], F[1], state.C[0], S, Xt, n, m, nalpha, nbeta);
    const s = solve(r.Reff);
    finalC = [s.C, s.C];
    finalEps = [s.eps, s.eps];
  } else {
    const sa = solve(toOrth(F[0]));
    const sb = reference === "uhf" ? solve(toOrth(F[1])) : sa;
    finalC = [sa.C, sb.C];
    finalEps = [sa.eps, sb.eps];
  }
  if (!converged) {
    // report the orbitals the final density was made from, with their own energies
    finalC = Cd;
    finalEps = epsd;
  }
  const occ = (count: number, w: number) => Array.from({ length: m }, (_, k) => (k < count ? w : 0));
  const orbitals =
    reference === "rhf"
      ? { alpha: { energies: Array.from(finalEps[0]), occupations: occ(nalpha, 2) }, beta: null }
      : reference === "rohf"
        ? { alpha: { energies: Array.from(finalEps[0]), occupations: Array.from({ length: m }, (_, k) => (k < nbeta ? 2 : k < nalpha ? 1 : 0)) }, beta: null }
        : { alpha: { energies: Array.from(finalEps[0]), occupations: occ(nalpha, 1) }, beta: { energies: Array.from(finalEps[1]), occupations: occ(nbeta, 1) } };
  return {
    reference, converged, iterations, energy, nalpha, nbeta, orbitals,
    orthogonalization: { kind: orth.kind, dropped: orth.dropped, minEigenvalue: orth.minEigenvalue, threshold: orth.threshold, nmo: m },
    jk: jk.stats,
    matrices: { S, T, V, H, C: finalC, D, F, J, K, orth, jk },
  };
}

/** X ᵀ(F D S − S D F) X per spin (concatenated for UHF); RHF uses the total density. */
function gradient(
  F: [Float64Array, Float64Array], D: [Float64Array, Float64Array], S: Float64Array,
  X: Float64Array, Xt: Float64Array, n: number, m: number, unrestricted: boolean,
): Float64Array {
  const one = (Fs: Float64Array, Ds: Float64Array) => {
    const FDS = matmul(matmul(Fs, Ds, n, n, n), S, n, n, n);
    const c = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) c[i * n + j] = FDS[i * n + j] - FDS[j * n + i];
    return matmul(Xt, matmul(c, X, n, n, m), m, n, m);
  };
  if (!unrestricted) return one(F[0], D[0]);
  const a = one(F[0], D[0]);
  const b = one(F[1], D[1]);
  const out = new Float64Array(a.length + b.length);
  out.set(a);
  out.set(b, a.length);
  return out;
}

/** Orthonormal-basis coefficients C' = Xᵀ S C of AO coefficients C. */
function orthCoefficients(C: Float64Array, S: Float64Array, Xt: Float64Array, n: number, m: number): Float64Array {
  return matmul(Xt, matmul(S, C, n, n, m), m, n, m);
}

/**
 * F + shift·(projector on the virtual orbitals) in the orthonormal basis. For ROHF the open
 * orbitals get half the shift (closed count `nclosed`, occupied count `nocc`).
 */
function shiftVirtuals(Fo: Float64Array, _C: Float64Array, Cp: Float64Array, m: number, nclosed: number, shift: number, nocc: number): Float64Array {
  const out = Fo.slice();
  const nOcc = nocc >= 0 ? nocc : nclosed;
  for (let k = nclosed; k < m; k++) {
    const w = k < nOcc ? 0.5 * shift : shift;
    for (let i = 0; i < m; i++) {
      const ci = Cp[i * m + k] * w;
      for (let j = 0; j < m; j++) out[i * m + j] += ci * Cp[j * m + k];
    }
  }
  return out;
}

/** ROHF effective Fock matrix in the orthonormal basis, and its gradient blocks (see top). */
function rohfEffective(
  Fa: Float64Array, Fb: Float64Array, C: Float64Array, S: Float64Array, Xt: Float64Array,
  n: number, m: number, nalpha: number, nbeta: number,
): { Reff: Float64Array; error: Float64Array } {
  const Ct = transpose(C, n, m);
  const mo = (F: Float64Array) => matmul(Ct, matmul(F, C, n, n, m), m, n, m);
  const A = mo(Fa);
  const B = mo(Fb);
  const R = new Float64Array(m * m);
  const E = new Float64Array(m * m);
  const space = (k: number) => (k < nbeta ? 0 : k < nalpha ? 1 : 2); // closed, open, virtual
  for (let i = 0; i < m; i++)
    for (let j = 0; j < m; j++) {
      const si = space(i), sj = space(j);
      let v = 0.5 * (A[i * m + j] + B[i * m + j]);
      if (si + sj === 1 && si !== sj) v = B[i * m + j]; // closed–open
      else if (si + sj === 3) v = A[i * m + j]; // open–virtual
      R[i * m + j] = v;
      if (si !== sj) E[i * m + j] = si < sj ? v : -v;
    }
  // to the orthonormal AO basis with the orthogonal C' = Xᵀ S C: R_orth = C' R C'ᵀ
  const Cp = orthCoefficients(C, S, Xt, n, m);
  const Cpt = transpose(Cp, m, m);
  const Reff = matmul(Cp, matmul(R, Cpt, m, m, m), m, m, m);
  const error = matmul(Cp, matmul(E, Cpt, m, m, m), m, m, m);
  return { Reff, error };
}
