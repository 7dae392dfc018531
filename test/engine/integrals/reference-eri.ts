/**
 * A slow, independent electron-repulsion integral for tests: McMurchie–Davidson over
 * primitive Cartesian Gaussians (L. E. McMurchie, E. R. Davidson, J. Comput. Phys. 26, 218
 * (1978); Helgaker, Jørgensen, Olsen, Molecular Electronic-Structure Theory (2000), eq. 9.9.33):
 *   (ab|cd) = 2π^{5/2} / (pq √(p+q)) Σ_{tuv} E^{ab}_{tuv} Σ_{τνφ} (−1)^{τ+ν+φ} E^{cd}_{τνφ} R_{t+τ,u+ν,v+φ}(α, PQ)
 * It shares only the Hermite E/R recurrences with the engine's nuclear attraction, not the
 * Obara–Saika/HRR code of eri.ts, and then contracts and transforms with plain loops.
 */
import { cartComponents } from "../../../src/engine/integrals/cartesian.ts";
import { hermiteE, hermiteR, HermiteWork } from "../../../src/engine/integrals/hermite.ts";
import type { PreparedShell } from "../../../src/engine/integrals/shells.ts";
import { componentTransform } from "../../../src/engine/integrals/spherical.ts";

function primitiveEri(
  la: number[], a: number, A: number[], lb: number[], b: number, B: number[],
  lc: number[], c: number, C: number[], ld: number[], d: number, D: number[], work: HermiteWork,
): number {
  const p = a + b, q = c + d;
  const P = A.map((x, k) => (a * x + b * B[k]) / p);
  const Q = C.map((x, k) => (c * x + d * D[k]) / q);
  const alpha = (p * q) / (p + q);
  const lab = [la[0] + lb[0], la[1] + lb[1], la[2] + lb[2]];
  const lcd = [lc[0] + ld[0], lc[1] + ld[1], lc[2] + ld[2]];
  const Ltot = lab[0] + lab[1] + lab[2] + lcd[0] + lcd[1] + lcd[2];
  const Eab = [0, 1, 2].map((k) => {
    const e = hermiteE(la[k], lb[k], a, b, A[k] - B[k], new Float64Array((la[k] + 1) * (lb[k] + 1) * (la[k] + lb[k] + 1)));
    const nt = la[k] + lb[k] + 1;
    return Array.from({ length: nt }, (_, t) => e[la[k] * (lb[k] + 1) * nt + lb[k] * nt + t]);
  });
  const Ecd = [0, 1, 2].map((k) => {
    const e = hermiteE(lc[k], ld[k], c, d, C[k] - D[k], new Float64Array((lc[k] + 1) * (ld[k] + 1) * (lc[k] + ld[k] + 1)));
    const nt = lc[k] + ld[k] + 1;
    return Array.from({ length: nt }, (_, t) => e[lc[k] * (ld[k] + 1) * nt + ld[k] * nt + t]);
  });
  const R = hermiteR(Ltot, alpha, P[0] - Q[0], P[1] - Q[1], P[2] - Q[2], work);
  const N = work.lmax + 1;
  let s = 0;
  for (let t = 0; t <= lab[0]; t++)
    for (let u = 0; u <= lab[1]; u++)
      for (let v = 0; v <= lab[2]; v++)
        for (let tt = 0; tt <= lcd[0]; tt++)
          for (let uu = 0; uu <= lcd[1]; uu++)
            for (let vv = 0; vv <= lcd[2]; vv++) {
              const sign = (tt + uu + vv) % 2 ? -1 : 1;
              s += sign * Eab[0][t] * Eab[1][u] * Eab[2][v] * Ecd[0][tt] * Ecd[1][uu] * Ecd[2][vv] *
                R[((t + tt) * N + (u + uu)) * N + (v + vv)];
            }
  return ((2 * Math.PI ** 2.5) / (p * q * Math.sqrt(p + q))) * s;
}

/** Contracted, transformed block in the engine's layout for shells (a b | c d) in this order. */
export function referenceEriBlock(sa: PreparedShell, sb: PreparedShell, sc: PreparedShell, sd: PreparedShell): Float64Array {
  const sh = [sa, sb, sc, sd];
  const work = new HermiteWork(4 * Math.max(...sh.map((s) => s.l)) + 1);
  const comps = sh.map((s) => cartComponents(s.l));
  const cen = sh.map((s) => [s.x, s.y, s.z]);
  const tr = sh.map((s) => componentTransform(s.l, s.pure));
  const nf = sh.map((s) => s.nfunc);
  const out = new Float64Array(nf[0] * nf[1] * nf[2] * nf[3]);
  const nc = comps.map((c) => c.length);
  for (let r0 = 0; r0 < sa.ncontr; r0++) for (let r1 = 0; r1 < sb.ncontr; r1++)
    for (let r2 = 0; r2 < sc.ncontr; r2++) for (let r3 = 0; r3 < sd.ncontr; r3++) {
      const cart = new Float64Array(nc[0] * nc[1] * nc[2] * nc[3]);
      const rows = [r0, r1, r2, r3];
      for (let i0 = 0; i0 < sa.nprim; i0++) for (let i1 = 0; i1 < sb.nprim; i1++)
        for (let i2 = 0; i2 < sc.nprim; i2++) for (let i3 = 0; i3 < sd.nprim; i3++) {
          const idx = [i0, i1, i2, i3];
          const coef = sh.reduce((acc, s, k) => acc * s.coef[rows[k] * s.nprim + idx[k]], 1);
          if (coef === 0) continue;
          let q = 0;
          for (let c0 = 0; c0 < nc[0]; c0++) for (let c1 = 0; c1 < nc[1]; c1++)
            for (let c2 = 0; c2 < nc[2]; c2++) for (let c3 = 0; c3 < nc[3]; c3++) {
              cart[q++] += coef * primitiveEri(
                comps[0][c0], sa.exps[i0], cen[0], comps[1][c1], sb.exps[i1], cen[1],
                comps[2][c2], sc.exps[i2], cen[2], comps[3][c3], sd.exps[i3], cen[3], work);
            }
        }
      for (let f0 = 0; f0 < tr[0].ncomp; f0++) for (let f1 = 0; f1 < tr[1].ncomp; f1++)
        for (let f2 = 0; f2 < tr[2].ncomp; f2++) for (let f3 = 0; f3 < tr[3].ncomp; f3++) {
          let v = 0;
          for (let c0 = 0; c0 < nc[0]; c0++) {
            const t0 = tr[0].matrix[f0 * nc[0] + c0];
            if (t0 === 0) continue;
            for (let c1 = 0; c1 < nc[1]; c1++) {
              const t1 = t0 * tr[1].matrix[f1 * nc[1] + c1];
              if (t1 === 0) continue;
              for (let c2 = 0; c2 < nc[2]; c2++) {
                const t2 = t1 * tr[2].matrix[f2 * nc[2] + c2];
                if (t2 === 0) continue;
                for (let c3 = 0; c3 < nc[3]; c3++)
                  v += t2 * tr[3].matrix[f3 * nc[3] + c3] * cart[((c0 * nc[1] + c1) * nc[2] + c2) * nc[3] + c3];
              }
            }
          }
          const F = [r0 * tr[0].ncomp + f0, r1 * tr[1].ncomp + f1, r2 * tr[2].ncomp + f2, r3 * tr[3].ncomp + f3];
          out[((F[0] * nf[1] + F[1]) * nf[2] + F[2]) * nf[3] + F[3]] = v;
        }
    }
  return out;
}
