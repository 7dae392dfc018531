/**
 * RHF J/K digestion of stored integral blocks, one call per run of quartets that share a block
 * shape (na nb | nc nd functions): the store is ordered by shape (jk.ts), so each kernel loops
 * over many quartets with constant trip counts, screens them against the density itself, and
 * pays no per-quartet call or dispatch.
 *
 * Per integral v = (ab|cd) of a unique quartet with symmetry scale s (½ per shell pair made of
 * one shell, ½ when bra and ket are the same pair), before M ← M + Mᵀ at the end of the build:
 *   J_ab += 2s v D_cd, J_cd += 2s v D_ab,
 *   K_ac += s v D_bd, K_bd += s v D_ac, K_ad += s v D_bc, K_bc += s v D_ad.
 * The innermost index d runs along rows of every matrix it touches, so the D_ad, D_bd row
 * pieces and the K_ad, K_bd sums stay in locals across the c loop: each integral then costs
 * two array reads and one read-modify-write instead of seven.
 */
import { canGenerate } from "../integrals/eri-codegen.ts";

/** What a group kernel reads: the quartet lists and per-pair shell data of jk.ts. */
export interface GroupData {
  qBra: Int32Array;
  qKet: Int32Array;
  qBound: Float64Array;
  /** the four cross pairs (ac, ad, bc, bd) of each quartet */
  qCross: Int32Array;
  qOff: Int32Array;
  /** per pair: first functions of its shells, and ½ when both are one shell */
  pA0: Int32Array;
  pB0: Int32Array;
  pHalf: Float64Array;
}

/**
 * Digest quartets q0 … q1−1 (all of shape na nb | nc nd) from blk into J and K1 for the
 * density D1; skips quartets whose bound times the largest density element they touch (pd,
 * per pair; pdAll its maximum) is below th. Returns how many were digested.
 */
export type GroupKernel = (
  g: GroupData, q0: number, q1: number, na: number, nb: number, nc: number,
  blk: Float64Array, pd: Float64Array, pdAll: number, th: number,
  n: number, D1: Float64Array, J: Float64Array, K1: Float64Array,
) => number;

/** Last-shell sizes unrolled in generated kernels (Cartesian f has 10 functions). */
const MAX_UNROLLED_D = 10;

/**
 * Kernels per last-shell size nd only, with na, nb, nc as arguments: one function per nd keeps
 * the JIT's compile work small (a kernel per full shape cost more to compile than it saved).
 */
const made = new Map<number, GroupKernel>();

/** The kernel for last shells of nd functions; `generated: false` gives the fallback (tests). */
export function groupKernel(nd: number, options: { generated?: boolean } = {}): GroupKernel {
  if (options.generated === false) return genericKernel(nd);
  let k = made.get(nd);
  if (k === undefined) {
    k = (nd <= MAX_UNROLLED_D && canGenerate() ? generated(nd) : null) ?? genericKernel(nd);
    made.set(nd, k);
  }
  return k;
}

const screenHead = `
let built = 0;
const qBra = g.qBra, qKet = g.qKet, qBound = g.qBound, qCross = g.qCross, qOff = g.qOff;
const pA0 = g.pA0, pB0 = g.pB0, pHalf = g.pHalf;
for (let q = q0; q < q1; q++) {
  const bound = qBound[q];
  if (bound * pdAll < th) continue;
  const bi = qBra[q], ki = qKet[q];
  let dmax = pd[bi] > pd[ki] ? pd[bi] : pd[ki];
  const x0 = pd[qCross[4 * q]], x1 = pd[qCross[4 * q + 1]], x2 = pd[qCross[4 * q + 2]], x3 = pd[qCross[4 * q + 3]];
  if (x0 > dmax) dmax = x0;
  if (x1 > dmax) dmax = x1;
  if (x2 > dmax) dmax = x2;
  if (x3 > dmax) dmax = x3;
  if (bound * dmax < th) continue;
  built++;
  const a0 = pA0[bi], b0 = pB0[bi], c0 = pA0[ki], d0 = pB0[ki];
  const s = pHalf[bi] * pHalf[ki] * (bi === ki ? 0.5 : 1), s2 = 2 * s;
  let o = qOff[q];`;

function loop(v: string, count: string, body: string[]): string[] {
  return [`for (let ${v} = 0; ${v} < ${count}; ${v}++) {`, ...body, "}"];
}

function generated(nd: number): GroupKernel | null {
  const X = Array.from({ length: nd }, (_, x) => x);
  const sum = (f: (x: number) => string) => X.map(f).join(" + ");
  const cBody = [
    "const ic = (c0 + c) * n + d0;",
    "const dbc = s * D1[ib + c0 + c], dac = s * D1[ia + c0 + c];",
    `const ${X.map((x) => `v${x} = blk[o + ${x}]`).join(", ")};`,
    `jab += ${sum((x) => `v${x} * D1[ic + ${x}]`)};`,
    ...X.map((x) => `J[ic + ${x}] += v${x} * dab;`),
    `K1[ia + c0 + c] += s * (${sum((x) => `v${x} * pb${x}`)});`,
    `K1[ib + c0 + c] += s * (${sum((x) => `v${x} * pa${x}`)});`,
    ...X.map((x) => `ka${x} += v${x} * dbc; kb${x} += v${x} * dac;`),
    `o += ${nd};`,
  ];
  const bBody = [
    "const ib = (b0 + b) * n, ibd = ib + d0;",
    `const ${X.map((x) => `pb${x} = D1[ibd + ${x}]`).join(", ")};`,
    "const dab = s2 * D1[ia + b0 + b];",
    "let jab = 0;",
    `let ${X.map((x) => `ka${x} = 0, kb${x} = 0`).join(", ")};`,
    ...loop("c", "nc", cBody),
    "J[ia + b0 + b] += s2 * jab;",
    ...X.map((x) => `K1[iad + ${x}] += ka${x}; K1[ibd + ${x}] += kb${x};`),
  ];
  const aBody = [
    "const ia = (a0 + a) * n, iad = ia + d0;",
    `const ${X.map((x) => `pa${x} = D1[iad + ${x}]`).join(", ")};`,
    ...loop("b", "nb", bBody),
  ];
  const src = [screenHead, ...loop("a", "na", aBody), "}", "return built;"].join("\n");
  try {
    return new Function("g", "q0", "q1", "na", "nb", "nc", "blk", "pd", "pdAll", "th", "n", "D1", "J", "K1", src) as GroupKernel;
  } catch {
    return null;
  }
}

/** The same with a loop over d, for large last shells and where code generation is not allowed. */
function genericKernel(nd: number): GroupKernel {
  return (g, q0, q1, na, nb, nc, blk, pd, pdAll, th, n, D1, J, K1) => {
    let built = 0;
    const { qBra, qKet, qBound, qCross, qOff, pA0, pB0, pHalf } = g;
    for (let q = q0; q < q1; q++) {
      const bound = qBound[q];
      if (bound * pdAll < th) continue;
      const bi = qBra[q], ki = qKet[q];
      const dmax = Math.max(pd[bi], pd[ki], pd[qCross[4 * q]], pd[qCross[4 * q + 1]], pd[qCross[4 * q + 2]], pd[qCross[4 * q + 3]]);
      if (bound * dmax < th) continue;
      built++;
      const s = pHalf[bi] * pHalf[ki] * (bi === ki ? 0.5 : 1);
      digestBlock(blk, qOff[q], n, pA0[bi], pB0[bi], pA0[ki], pB0[ki], na, nb, nc, nd, s, D1, J, K1);
    }
    return built;
  };
}

/**
 * One block (shape na nb | nc ndd, first functions a0 … d0, symmetry scale s) into J and K1:
 * the direct build's path block by block, and the plain kernel's body.
 */
export function digestBlock(
  blk: Float64Array, off: number, n: number, a0: number, b0: number, c0: number, d0: number,
  na: number, nb: number, nc: number, ndd: number, s: number, D1: Float64Array, J: Float64Array, K1: Float64Array,
): void {
  const s2 = 2 * s;
  if (na * nb * nc * ndd === 1) {
    // (ss|ss), the most common block with hydrogen-rich molecules: no loops
    const v = s * blk[off];
    const ia = a0 * n, ib = b0 * n, ic = c0 * n;
    J[ia + b0] += 2 * v * D1[ic + d0];
    J[ic + d0] += 2 * v * D1[ia + b0];
    K1[ia + c0] += v * D1[ib + d0];
    K1[ib + c0] += v * D1[ia + d0];
    K1[ia + d0] += v * D1[ib + c0];
    K1[ib + d0] += v * D1[ia + c0];
    return;
  }
  let k = off;
  for (let a = 0; a < na; a++) {
    const ia = (a0 + a) * n;
    const iad = ia + d0;
    for (let b = 0; b < nb; b++) {
      const ib = (b0 + b) * n;
      const ibd = ib + d0;
      const dab = s2 * D1[ia + b0 + b];
      let jab = 0;
      for (let c = 0; c < nc; c++) {
        const ic = (c0 + c) * n + d0;
        const dbc = s * D1[ib + c0 + c], dac = s * D1[ia + c0 + c];
        let kac = 0, kbc = 0;
        for (let d = 0; d < ndd; d++) {
          const v = blk[k + d];
          jab += v * D1[ic + d];
          J[ic + d] += v * dab;
          kac += v * D1[ibd + d];
          kbc += v * D1[iad + d];
          K1[iad + d] += v * dbc;
          K1[ibd + d] += v * dac;
        }
        K1[ia + c0 + c] += s * kac;
        K1[ib + c0 + c] += s * kbc;
        k += ndd;
      }
      J[ia + b0 + b] += s2 * jab;
    }
  }
}

