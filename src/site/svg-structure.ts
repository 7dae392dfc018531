/**
 * A structure picture drawn at build time: atoms projected onto the plane of the molecule's two
 * largest principal axes (so planar molecules lie flat), bonds where two atoms are closer than
 * 1.2 × the sum of their covalent radii (Cordero et al. 2008, from src/engine/elements.ts), atoms
 * as circles with element labels, drawn back to front.
 */
import { findElement } from "../engine/elements.ts";
import { BOHR_RADIUS_ANGSTROM } from "../engine/constants.ts";
import { escapeHtml } from "./format.ts";

type AtomRow = [string, number, number, number];

/** Eigenvectors of a symmetric 3×3 matrix by cyclic Jacobi rotations (columns), sorted by eigenvalue descending. */
function principalAxes(a: number[][]): number[][] {
  const A = a.map((r) => [...r]);
  const V = [[1, 0, 0], [0, 1, 0], [0, 0, 1]];
  for (let sweep = 0; sweep < 50; sweep++) {
    let off = 0;
    for (let p = 0; p < 3; p++) for (let q = p + 1; q < 3; q++) off += A[p][q] ** 2;
    if (off < 1e-22) break;
    for (let p = 0; p < 3; p++) for (let q = p + 1; q < 3; q++) {
      if (Math.abs(A[p][q]) < 1e-30) continue;
      const theta = (A[q][q] - A[p][p]) / (2 * A[p][q]);
      const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
      const c = 1 / Math.sqrt(t * t + 1), s = t * c;
      for (let k = 0; k < 3; k++) {
        const akp = A[k][p], akq = A[k][q];
        A[k][p] = c * akp - s * akq;
        A[k][q] = s * akp + c * akq;
      }
      for (let k = 0; k < 3; k++) {
        const apk = A[p][k], aqk = A[q][k];
        A[p][k] = c * apk - s * aqk;
        A[q][k] = s * apk + c * aqk;
      }
      for (let k = 0; k < 3; k++) {
        const vkp = V[k][p], vkq = V[k][q];
        V[k][p] = c * vkp - s * vkq;
        V[k][q] = s * vkp + c * vkq;
      }
    }
  }
  const order = [0, 1, 2].sort((i, j) => A[j][j] - A[i][i] || i - j);
  return order.map((i) => {
    const v = [V[0][i], V[1][i], V[2][i]];
    // fix the sign deterministically: largest component positive
    const big = v.reduce((b, x, k) => (Math.abs(x) > Math.abs(v[b]) + 1e-12 ? k : b), 0);
    return v[big] < 0 ? v.map((x) => -x) : v;
  });
}

const COLOURS: Record<string, string> = { H: "#f4f1ea", C: "#5a5a5a", N: "#6f8fcf", O: "#d0604a", F: "#8fc46a", Cl: "#5fae4f", S: "#e0c040", P: "#e09a3c" };

export function structureSvg(atoms: AtomRow[], idPrefix = "mol"): string {
  const n = atoms.length;
  const ang = atoms.map(([, x, y, z]) => [x * BOHR_RADIUS_ANGSTROM, y * BOHR_RADIUS_ANGSTROM, z * BOHR_RADIUS_ANGSTROM]);
  const c = [0, 1, 2].map((k) => ang.reduce((s, p) => s + p[k], 0) / Math.max(1, n));
  const rel = ang.map((p) => p.map((v, k) => v - c[k]));
  const cov = [0, 1, 2].map((i) => [0, 1, 2].map((j) => rel.reduce((s, p) => s + p[i] * p[j], 0)));
  const axes = principalAxes(cov);
  const proj = rel.map((p) => axes.map((ax) => ax[0] * p[0] + ax[1] * p[1] + ax[2] * p[2]));
  const W = 320, H = 240, pad = 34;
  const xs = proj.map((p) => p[0]), ys = proj.map((p) => p[1]);
  const spanX = Math.max(...xs) - Math.min(...xs) || 1, spanY = Math.max(...ys) - Math.min(...ys) || 1;
  const scale = Math.min((W - 2 * pad) / spanX, (H - 2 * pad) / spanY, 90);
  const cx = (Math.max(...xs) + Math.min(...xs)) / 2, cy = (Math.max(...ys) + Math.min(...ys)) / 2;
  const X = (p: number[]) => W / 2 + (p[0] - cx) * scale;
  const Y = (p: number[]) => H / 2 - (p[1] - cy) * scale;
  const f = (v: number) => (Math.round(v * 10) / 10).toString();
  const radius = (sym: string) => findElement(sym)?.covalentRadius ?? 0.75;
  const parts: string[] = [];
  parts.push(`<svg class="structure" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${idPrefix}-title" xmlns="http://www.w3.org/2000/svg">`);
  parts.push(`<title id="${idPrefix}-title">Structure: ${n} atoms projected onto their principal plane; bonds from covalent radii</title>`);
  const bonds: [number, number][] = [];
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) {
    const d = Math.hypot(ang[i][0] - ang[j][0], ang[i][1] - ang[j][1], ang[i][2] - ang[j][2]);
    if (d < 1.2 * (radius(atoms[i][0]) + radius(atoms[j][0]))) bonds.push([i, j]);
  }
  for (const [i, j] of bonds) parts.push(`<line class="bond" x1="${f(X(proj[i]))}" y1="${f(Y(proj[i]))}" x2="${f(X(proj[j]))}" y2="${f(Y(proj[j]))}" stroke="#333" stroke-width="3"/>`);
  const order = [...Array(n).keys()].sort((a, b) => proj[a][2] - proj[b][2] || a - b);
  for (const i of order) {
    const sym = atoms[i][0];
    const r = 8 + 10 * Math.min(1.2, radius(sym));
    const fill = COLOURS[sym] ?? "#b9a7d6";
    const dark = sym === "C" || sym === "N";
    parts.push(`<g class="atom"><circle cx="${f(X(proj[i]))}" cy="${f(Y(proj[i]))}" r="${f(r)}" fill="${fill}" stroke="#222" stroke-width="1.2"/>`);
    parts.push(`<text x="${f(X(proj[i]))}" y="${f(Y(proj[i]) + 4.5)}" text-anchor="middle" font-size="13" font-weight="600" fill="${dark ? "#fff" : "#111"}">${escapeHtml(sym)}<tspan font-size="8" dy="-5">${i + 1}</tspan></text></g>`);
  }
  parts.push(`</svg>`);
  return parts.join("");
}
