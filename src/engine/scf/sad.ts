/**
 * Superposition of atomic densities (SAD) initial guess: the molecular density starts as the
 * block-diagonal sum of neutral-atom densities, each from a spherically averaged atomic
 * Hartree–Fock calculation done here in the same basis (J. Almlöf, K. Faegri, K. Korsell,
 * J. Comput. Chem. 3, 385 (1982); J. H. Van Lenthe et al., J. Comput. Chem. 27, 926 (2006)).
 *
 * Spherical averaging: orbitals are occupied in order of energy, and a partly filled set of
 * degenerate orbitals (a p, d or f shell of a spherical atom) shares its electrons equally,
 * which keeps the density spherical from the spherical core-Hamiltonian start. The atomic
 * result is cached per element and basis (same shells, same numbers).
 */
import { matmul, symmetricEigen, transpose } from "../linalg/dense.ts";
import { kineticMatrix, nuclearAttractionMatrix, overlapMatrix, type PointCharge } from "../integrals/one-electron.ts";
import type { PreparedBasis, PreparedShell } from "../integrals/shells.ts";
import { JkBuilder } from "./jk.ts";
import { orthogonalizer } from "./orthogonalize.ts";

/** Atomic densities by element and basis; bounded by the distinct (element, basis) pairs seen. */
const cache = new Map<string, Float64Array>();

function signature(z: number, shells: PreparedShell[]): string {
  return `${z}|` + shells.map((s) => `${s.l}${s.pure ? "p" : "c"}:${Array.from(s.exps).join(",")}:${Array.from(s.coef).join(",")}`).join(";");
}

/** Molecular SAD density (total, both spins) in the basis's function order. */
export function sadDensity(basis: PreparedBasis, nuclei: PointCharge[]): Float64Array {
  const n = basis.nbf;
  const D = new Float64Array(n * n);
  const byAtom = new Map<number, PreparedShell[]>();
  for (const s of basis.shells) {
    if (!byAtom.has(s.atom)) byAtom.set(s.atom, []);
    byAtom.get(s.atom)!.push(s);
  }
  for (const [atom, shells] of byAtom) {
    const z = Math.round(nuclei[atom]?.charge ?? 0);
    if (z <= 0) continue;
    const key = signature(z, shells);
    let Da = cache.get(key);
    if (!Da) {
      Da = atomicDensity(z, shells);
      cache.set(key, Da);
    }
    // the atom's functions are contiguous in the molecular order
    const off = shells[0].offset;
    const na = shells.reduce((t, s) => t + s.nfunc, 0);
    for (let i = 0; i < na; i++) for (let j = 0; j < na; j++) D[(off + i) * n + off + j] = Da[i * na + j];
  }
  return D;
}

/** Spherically averaged neutral-atom density in the atom's own shells (local order). */
export function atomicDensity(z: number, shells: PreparedShell[]): Float64Array {
  let offset = 0;
  const local = shells.map((s) => {
    const c = { ...s, offset };
    offset += s.nfunc;
    return c;
  });
  const basis: PreparedBasis = { shells: local, nbf: offset, maxL: Math.max(...local.map((s) => s.l)) };
  const n = basis.nbf;
  const S = overlapMatrix(basis);
  const H = kineticMatrix(basis);
  const V = nuclearAttractionMatrix(basis, [{ charge: z, x: local[0].x, y: local[0].y, z: local[0].z }]);
  for (let k = 0; k < n * n; k++) H[k] += V[k];
  const orth = orthogonalizer(S, n);
  const m = orth.nmo;
  const X = orth.X;
  const Xt = transpose(X, n, m);
  const jk = new JkBuilder(basis, { mode: "in-core" });
  const diag = (F: Float64Array) => {
    const { values, vectors } = symmetricEigen(matmul(Xt, matmul(F, X, n, n, m), m, n, m), m);
    return { eps: values, C: matmul(X, vectors, n, m, m) };
  };
  let { eps, C } = diag(H);
  let D = new Float64Array(n * n);
  // a guess needs no tight convergence: after 100 damped steps the density is used as it is
  for (let it = 0; it < 100; it++) {
    const occ = averagedOccupations(eps, z);
    const Dn = new Float64Array(n * n);
    for (let k = 0; k < m; k++) {
      if (occ[k] === 0) continue;
      for (let i = 0; i < n; i++) {
        const ci = occ[k] * C[i * m + k];
        for (let j = 0; j < n; j++) Dn[i * n + j] += ci * C[j * m + k];
      }
    }
    let change = 0;
    for (let k = 0; k < n * n; k++) {
      const mixed = it === 0 ? Dn[k] : 0.5 * (Dn[k] + D[k]);
      change = Math.max(change, Math.abs(mixed - D[k]));
      Dn[k] = mixed;
    }
    D = Dn;
    if (it > 0 && change < 1e-7) break;
    const half = D.map((x) => x / 2);
    const { J, K } = jk.build([half]);
    // F = H + J[D] − ½ K[D] with D = 2·half
    const F = H.map((h, k) => h + 2 * J[k] - K[0][k]);
    ({ eps, C } = diag(F));
  }
  return D;
}

/** Occupations (0…2) by energy, degenerate sets sharing the last electrons equally. */
export function averagedOccupations(eps: Float64Array, electrons: number): Float64Array {
  const occ = new Float64Array(eps.length);
  let left = electrons;
  let k = 0;
  while (left > 1e-12 && k < eps.length) {
    let g = k + 1;
    while (g < eps.length && Math.abs(eps[g] - eps[k]) < 1e-6 * Math.max(1, Math.abs(eps[k]))) g++;
    const cap = 2 * (g - k);
    const put = Math.min(cap, left);
    for (let j = k; j < g; j++) occ[j] = put / (g - k);
    left -= put;
    k = g;
  }
  return occ;
}
