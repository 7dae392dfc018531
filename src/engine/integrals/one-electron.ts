/**
 * One-electron integral matrices over the basis functions (row-major nbf × nbf, atomic units):
 * overlap, kinetic energy, nuclear attraction, and Cartesian multipole moments.
 *
 * Overlap, kinetic and multipoles are products of 1D Obara–Saika overlaps (overlap-1d.ts):
 *   kinetic: T_x(i,j) = −½ [ j(j−1) S(i,j−2) − 2b(2j+1) S(i,j) + 4b² S(i,j+2) ]
 *            (the ket differentiated twice), T = T_x S_y S_z + S_x T_y S_z + S_x S_y T_z;
 *   moments about C: x_C = x_B + X_BC, so ⟨i|x_C|j⟩ = S(i,j+1) + X_BC S(i,j) and
 *            ⟨i|x_C²|j⟩ = S(i,j+2) + 2 X_BC S(i,j+1) + X_BC² S(i,j).
 * Nuclear attraction uses the McMurchie–Davidson Hermite expansion (hermite.ts).
 */
import { cartTables, cumStart, ncart } from "./cartesian.ts";
import { hermiteE, hermiteR, HermiteWork } from "./hermite.ts";
import { overlap1d } from "./overlap-1d.ts";
import { pairMatrices } from "./pair-matrix.ts";
import type { PreparedBasis, PreparedShell } from "./shells.ts";

export interface PointCharge {
  charge: number;
  x: number;
  y: number;
  z: number;
}

/** 1D overlap tables per axis, S[axis][i * (lb + extra + 1) + j], reused between calls. */
class Tables1d {
  t = [new Float64Array(0), new Float64Array(0), new Float64Array(0)];
  work = new Float64Array(0);
  width = 0;
  fill(sa: PreparedShell, a: number, sb: PreparedShell, b: number, extra: number): Float64Array[] {
    const jmax = sb.l + extra;
    this.width = jmax + 1;
    const need = (sa.l + 1) * this.width;
    if (this.t[0].length < need) this.t = [0, 1, 2].map(() => new Float64Array(need));
    const wn = (sa.l + jmax + 1) ** 2;
    if (this.work.length < wn) this.work = new Float64Array(wn);
    overlap1d(sa.l, jmax, sa.x, sb.x, a, b, this.t[0], this.work);
    overlap1d(sa.l, jmax, sa.y, sb.y, a, b, this.t[1], this.work);
    overlap1d(sa.l, jmax, sa.z, sb.z, a, b, this.t[2], this.work);
    return this.t;
  }
}

/** Calls f(ca, cb, iaOffsetInPow, ibOffsetInPow) over the Cartesian components of a pair. */
function forComponents(
  sa: PreparedShell,
  sb: PreparedShell,
  pow: Int32Array,
  f: (k: number, ia: number, ib: number) => void,
): void {
  const oa = cumStart(sa.l);
  const ob = cumStart(sb.l);
  const na = ncart(sa.l);
  const nb = ncart(sb.l);
  for (let ca = 0; ca < na; ca++) for (let cb = 0; cb < nb; cb++) f(ca * nb + cb, 3 * (oa + ca), 3 * (ob + cb));
}

export function overlapMatrix(basis: PreparedBasis): Float64Array {
  const pow = cartTables(basis.maxL).pow;
  const t1 = new Tables1d();
  return pairMatrices(basis, 1, (a, sa, b, sb, out) => {
    const [sx, sy, sz] = t1.fill(sa, a, sb, b, 0);
    const w = t1.width;
    forComponents(sa, sb, pow, (k, ia, ib) => {
      out[k] = sx[pow[ia] * w + pow[ib]] * sy[pow[ia + 1] * w + pow[ib + 1]] * sz[pow[ia + 2] * w + pow[ib + 2]];
    });
  })[0];
}

export function kineticMatrix(basis: PreparedBasis): Float64Array {
  const pow = cartTables(basis.maxL).pow;
  const t1 = new Tables1d();
  return pairMatrices(basis, 1, (a, sa, b, sb, out) => {
    const s = t1.fill(sa, a, sb, b, 2);
    const w = t1.width;
    // T_x(i, j) from the ket's second derivative
    const kin = (tab: Float64Array, i: number, j: number) =>
      -0.5 *
      ((j > 1 ? j * (j - 1) * tab[i * w + j - 2] : 0) - 2 * b * (2 * j + 1) * tab[i * w + j] + 4 * b * b * tab[i * w + j + 2]);
    forComponents(sa, sb, pow, (k, ia, ib) => {
      const ix = pow[ia], iy = pow[ia + 1], iz = pow[ia + 2];
      const jx = pow[ib], jy = pow[ib + 1], jz = pow[ib + 2];
      const Sx = s[0][ix * w + jx], Sy = s[1][iy * w + jy], Sz = s[2][iz * w + jz];
      out[k] = kin(s[0], ix, jx) * Sy * Sz + Sx * kin(s[1], iy, jy) * Sz + Sx * Sy * kin(s[2], iz, jz);
    });
  })[0];
}

/**
 * Multipole moment matrices about `origin` (bohr): order 1 gives [x, y, z]; order 2 adds
 * [xx, xy, xz, yy, yz, zz] (Cartesian second moments, not traceless). Electronic sign not applied.
 */
export function multipoleMatrices(basis: PreparedBasis, origin: [number, number, number], order: 1 | 2): Float64Array[] {
  const pow = cartTables(basis.maxL).pow;
  const t1 = new Tables1d();
  const nops = order === 1 ? 3 : 9;
  const pairs2: [number, number][] = [[0, 0], [0, 1], [0, 2], [1, 1], [1, 2], [2, 2]];
  return pairMatrices(basis, nops, (a, sa, b, sb, out) => {
    const s = t1.fill(sa, a, sb, b, 2);
    const w = t1.width;
    const bc = [sb.x - origin[0], sb.y - origin[1], sb.z - origin[2]];
    const blk = ncart(sa.l) * ncart(sb.l);
    const m0 = [0, 0, 0];
    const m1 = [0, 0, 0];
    const m2 = [0, 0, 0];
    forComponents(sa, sb, pow, (k, ia, ib) => {
      for (let ax = 0; ax < 3; ax++) {
        const i = pow[ia + ax];
        const j = pow[ib + ax];
        const t = s[ax];
        const x = bc[ax];
        m0[ax] = t[i * w + j];
        m1[ax] = t[i * w + j + 1] + x * m0[ax];
        m2[ax] = t[i * w + j + 2] + 2 * x * t[i * w + j + 1] + x * x * m0[ax];
      }
      out[k] = m1[0] * m0[1] * m0[2];
      out[blk + k] = m0[0] * m1[1] * m0[2];
      out[2 * blk + k] = m0[0] * m0[1] * m1[2];
      if (order === 2) {
        pairs2.forEach(([u, v], q) => {
          let r = 1;
          for (let ax = 0; ax < 3; ax++) {
            const e = (ax === u ? 1 : 0) + (ax === v ? 1 : 0);
            r *= e === 0 ? m0[ax] : e === 1 ? m1[ax] : m2[ax];
          }
          out[(3 + q) * blk + k] = r;
        });
      }
    });
  });
}

/** Σ_C −Z_C ⟨a| 1/|r − C| |b⟩ over the given point charges (nuclei). */
export function nuclearAttractionMatrix(basis: PreparedBasis, charges: readonly PointCharge[]): Float64Array {
  const pow = cartTables(basis.maxL).pow;
  const work = new HermiteWork(2 * basis.maxL);
  const NR = work.lmax + 1;
  return pairMatrices(basis, 1, (a, sa, b, sb, out) => {
    const p = a + b;
    const L = sa.l + sb.l;
    const blk = ncart(sa.l) * ncart(sb.l);
    out.fill(0, 0, blk);
    const abx = sa.x - sb.x, aby = sa.y - sb.y, abz = sa.z - sb.z;
    const px = (a * sa.x + b * sb.x) / p, py = (a * sa.y + b * sb.y) / p, pz = (a * sa.z + b * sb.z) / p;
    const ex = hermiteE(sa.l, sb.l, a, b, abx, work.ex);
    const ey = hermiteE(sa.l, sb.l, a, b, aby, work.ey);
    const ez = hermiteE(sa.l, sb.l, a, b, abz, work.ez);
    const nt = L + 1;
    const eStride = (sb.l + 1) * nt; // E[i][j][t] at i*eStride + j*nt + t
    const oa = cumStart(sa.l), ob = cumStart(sb.l);
    const na = ncart(sa.l), nb = ncart(sb.l);
    for (const c of charges) {
      const R = hermiteR(L, p, px - c.x, py - c.y, pz - c.z, work);
      const pref = (-c.charge * 2 * Math.PI) / p;
      for (let ca = 0; ca < na; ca++) {
        const ia = 3 * (oa + ca);
        for (let cb = 0; cb < nb; cb++) {
          const ib = 3 * (ob + cb);
          const ox = pow[ia] * eStride + pow[ib] * nt;
          const oy = pow[ia + 1] * eStride + pow[ib + 1] * nt;
          const oz = pow[ia + 2] * eStride + pow[ib + 2] * nt;
          const tx = pow[ia] + pow[ib], ty = pow[ia + 1] + pow[ib + 1], tz = pow[ia + 2] + pow[ib + 2];
          let s = 0;
          for (let t = 0; t <= tx; t++) {
            const et = ex[ox + t];
            if (et === 0) continue;
            for (let u = 0; u <= ty; u++) {
              const eu = et * ey[oy + u];
              if (eu === 0) continue;
              const base = (t * NR + u) * NR;
              for (let v = 0; v <= tz; v++) s += eu * ez[oz + v] * R[base + v];
            }
          }
          out[ca * nb + cb] += pref * s;
        }
      }
    }
  })[0];
}
