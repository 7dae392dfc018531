/**
 * The RHF run kernels of jk-kernels.ts in WebAssembly with 128-bit SIMD: the same digestion
 * (same screening, same sums) with the last index d of each block row two doubles per
 * instruction, the unrolled d loop's row sums and the D_ad, D_bd row pieces in vector locals.
 * One module per last-shell size nd, assembled at first use (linalg/wasm.ts); the density, the
 * results and each piece of a run being digested live in its WebAssembly memory (`SimdStore`).
 *
 * Per integral v = (ab|cd) with symmetry scale s (see jk-kernels.ts):
 *   J_ab += 2s v D_cd, J_cd += 2s v D_ab, K_ac += s v D_bd, K_bd += s v D_ac, K_ad += s v D_bc,
 *   K_bc += s v D_ad.
 */
import type { GroupData } from "./jk-kernels.ts";
import {
  block, compileModule, F64, f64c, f64load, f64store, get, I32, i32c, i32load, loop, moduleBytes, op, regions, set, V128, vadd,
  vlane, vload, vmul, vsplat, vstore, vzero,
} from "../linalg/wasm.ts";

/** Last-shell sizes with a SIMD kernel (Cartesian f has 10 functions). */
export const MAX_SIMD_D = 10;

type Kernel = (
  qBra: number, qKet: number, qBound: number, qCross: number, qOff: number, pA0: number, pB0: number, pHalf: number, pd: number,
  blk: number, D: number, J: number, K: number, q0: number, q1: number, na: number, nb: number, nc: number, n: number,
  pdAll: number, th: number,
) => number;

const modules = new Map<number, WebAssembly.Module | null>();

function kernelModule(nd: number): WebAssembly.Module | null {
  let m = modules.get(nd);
  if (m === undefined) {
    m = compileModule(assemble(nd));
    modules.set(nd, m);
  }
  return m;
}

/** Whether the SIMD kernels can run here (WebAssembly with SIMD, code generation allowed). */
export function simdJkAvailable(): boolean {
  return kernelModule(4) !== null;
}

/** Quartets and block doubles per streamed piece of a run (see SimdStore). */
const PIECE_QUARTETS = 1 << 15;
const PIECE_DOUBLES = 1 << 18;
/** The largest block a piece takes (a store with larger blocks uses the JavaScript kernels). */
export const SIMD_PIECE_DOUBLES = PIECE_DOUBLES;

/**
 * The SIMD kernels' WebAssembly memory: per pair its first functions (i32), ½ factor and
 * largest density element (f64), D, J, K (n × n), and buffers for one piece of a run: its
 * quartet lists (bra, ket, offset, four cross pairs as i32; bound as f64) and its blocks.
 * The integral store itself stays a Float64Array: runs are copied through in pieces of at most
 * 2 MiB (about 20 GB/s here, 20 ms per build for C8H18/6-31G*), because V8 maps WebAssembly
 * memory itself and a store there would miss the huge pages that make its first touch cheaper.
 */
export class SimdStore {
  readonly memory: WebAssembly.Memory;
  readonly f64: Float64Array;
  readonly i32: Int32Array;
  readonly at: {
    qBra: number; qKet: number; qOff: number; qCross: number; qBound: number;
    pA0: number; pB0: number; pHalf: number; pd: number; D: number; J: number; K: number; blk: number;
  };
  private readonly kernels = new Map<number, Kernel | null>();
  private readonly pieceQuartets: number;
  private readonly pieceDoubles: number;

  /**
   * Throws (RangeError) when the memory cannot be had; the caller then uses plain arrays.
   * `piece` overrides the piece size (tests: runs of many pieces).
   */
  constructor(pairs: number, n: number, piece: { quartets: number; doubles: number } = { quartets: PIECE_QUARTETS, doubles: PIECE_DOUBLES }) {
    this.pieceQuartets = piece.quartets;
    this.pieceDoubles = piece.doubles;
    const mem = regions(16);
    const take = mem.take;
    const nq = piece.quartets;
    this.at = {
      qBra: take(4 * nq), qKet: take(4 * nq), qOff: take(4 * nq), qCross: take(16 * nq), qBound: take(8 * nq),
      pA0: take(4 * pairs), pB0: take(4 * pairs), pHalf: take(8 * pairs), pd: take(8 * pairs),
      D: take(8 * n * n), J: take(8 * n * n), K: take(8 * n * n), blk: take(8 * piece.doubles),
    };
    const pages = Math.ceil(mem.size / 65536);
    if (pages > 65536) throw new RangeError("beyond 4 GiB");
    this.memory = new WebAssembly.Memory({ initial: pages, maximum: pages });
    this.f64 = new Float64Array(this.memory.buffer);
    this.i32 = new Int32Array(this.memory.buffer);
  }

  kernel(nd: number): Kernel | null {
    let k = this.kernels.get(nd);
    if (k === undefined) {
      const m = nd <= MAX_SIMD_D ? kernelModule(nd) : null;
      let made: Kernel | null = null;
      try {
        // a browser's main thread may refuse synchronous instantiation: the JavaScript kernel then
        if (m !== null) made = new WebAssembly.Instance(m, { m: { mem: this.memory } }).exports.digest as Kernel;
      } catch {
        made = null;
      }
      this.kernels.set(nd, made);
      return made;
    }
    return k;
  }

  /**
   * Digest quartets q0 … q1−1 of shape (na nb | nc nd), whose lists are g and whose blocks are
   * store[g.qOff[q] …] (consecutive, as jk.ts lays them out), into the J and K of this memory
   * for its D and pair maxima; returns how many passed screening.
   */
  digestRun(
    g: GroupData, store: Float64Array, nd: number, q0: number, q1: number, na: number, nb: number, nc: number, n: number,
    pdAll: number, th: number,
  ): number {
    const k = this.kernel(nd);
    if (k === null) throw new Error(`no SIMD kernel for last shells of ${nd} functions`);
    const { i32, f64, at } = this;
    const size = na * nb * nc * nd;
    if (size > this.pieceDoubles) throw new Error(`a ${size}-double block does not fit a piece`);
    const per = Math.max(1, Math.min(this.pieceQuartets, Math.floor(this.pieceDoubles / size)));
    let built = 0;
    for (let p0 = q0; p0 < q1; p0 += per) {
      const p1 = Math.min(q1, p0 + per), count = p1 - p0;
      // skip a piece whose every bound is below what the largest density element allows
      let bmax = 0;
      for (let q = p0; q < p1; q++) if (g.qBound[q] > bmax) bmax = g.qBound[q];
      if (bmax * pdAll < th) continue;
      i32.set(g.qBra.subarray(p0, p1), at.qBra / 4);
      i32.set(g.qKet.subarray(p0, p1), at.qKet / 4);
      i32.set(g.qOff.subarray(p0, p1), at.qOff / 4);
      i32.set(g.qCross.subarray(4 * p0, 4 * p1), at.qCross / 4);
      f64.set(g.qBound.subarray(p0, p1), at.qBound / 8);
      const off0 = g.qOff[p0];
      f64.set(store.subarray(off0, off0 + count * size), at.blk / 8);
      // the kernel adds 8·qOff to the block base: the base is moved back by the piece's first offset
      // (32-bit wrap-around arithmetic, as the kernel's)
      const base = (at.blk - 8 * off0) | 0;
      built += k(at.qBra, at.qKet, at.qBound, at.qCross, at.qOff, at.pA0, at.pB0, at.pHalf, at.pd, base, at.D, at.J, at.K,
        0, count, na, nb, nc, n, pdAll, th);
    }
    return built;
  }
}

/** The kernel for last shells of nd functions: vecs = ⌊nd/2⌋ vector lanes pairs and an odd tail. */
function assemble(nd: number): Uint8Array<ArrayBuffer> {
  const vecs = nd >> 1, tail = nd & 1;
  const { i32add: add, i32mul: mul, i32shl: shl, i32geS: geS, i32eq: eq, f64add: fadd, f64mul: fmul, f64lt: flt, f64max: fmax } = op;
  // parameters
  const [qBra, qKet, qBound, qCross, qOff, pA0, pB0, pHalf, pd, blk, D, J, K, q0, q1, na, nb, nc, n] =
    Array.from({ length: 19 }, (_, i) => i);
  const pdAll = 19, th = 20;
  // i32 locals
  let next = 21;
  const I = () => next++;
  const q = I(), bi = I(), ki = I(), a0 = I(), b0 = I(), c0 = I(), d0 = I(), a = I(), b = I(), c = I(), built = I();
  const rowA = I(), rowB = I(), rowC = I(), bcol = I(), ccol = I(), o = I(), n8 = I(), da = I(), db = I(), dc = I(), jc = I();
  const nI32 = next - 21;
  // f64 locals
  const F = () => next++;
  const fStart = next;
  const bound = F(), dmax = F(), s = F(), s2 = F(), dab = F(), dbc = F(), dac = F(), jabS = F();
  const paT = F(), pbT = F(), kaT = F(), kbT = F(), vT = F();
  const nF64 = next - fStart;
  // v128 locals
  const vStart = next;
  const V = () => next++;
  const pa = Array.from({ length: vecs }, V), pb = Array.from({ length: vecs }, V);
  const ka = Array.from({ length: vecs }, V), kb = Array.from({ length: vecs }, V), vv = Array.from({ length: vecs }, V);
  const jabV = V(), kacV = V(), kbcV = V(), dbcV = V(), dacV = V(), dabV = V();
  const nV = next - vStart;
  const X = Array.from({ length: vecs }, (_, x) => x);

  const addr = (base: number, ...parts: number[]) => [...get(base), ...parts.flatMap((p) => [...get(p), add])];
  const pdOf = (pairIdx: number[]) => [...get(pd), ...pairIdx, ...i32c(3), shl, add, ...f64load()];
  const hsum = (v: number) => [...get(v), ...vlane(0), ...get(v), ...vlane(1), fadd];
  const te = 8 * (nd - 1); // byte offset of the odd tail element

  const cBody = [
    [...get(c), ...get(nc), geS, op.brIf, 1],
    // dbc = s·D[b, c0+c], dac = s·D[a, c0+c]
    [...get(s), ...addr(D, rowB, ccol), ...f64load(), fmul, ...set(dbc)],
    [...get(s), ...addr(D, rowA, ccol), ...f64load(), fmul, ...set(dac)],
    ...(vecs > 0 ? [[...get(dbc), ...vsplat, ...set(dbcV), ...get(dac), ...vsplat, ...set(dacV), ...vzero, ...set(kacV), ...vzero, ...set(kbcV)]] : []),
    [...addr(D, rowC, d0), ...set(dc), ...addr(J, rowC, d0), ...set(jc)],
    ...X.map((x) => [
      ...get(o), ...vload(16 * x), ...set(vv[x]),
      ...get(jabV), ...get(vv[x]), ...get(dc), ...vload(16 * x), ...vmul, ...vadd, ...set(jabV),
      ...get(jc), ...get(jc), ...vload(16 * x), ...get(vv[x]), ...get(dabV), ...vmul, ...vadd, ...vstore(16 * x),
      ...get(kacV), ...get(vv[x]), ...get(pb[x]), ...vmul, ...vadd, ...set(kacV),
      ...get(kbcV), ...get(vv[x]), ...get(pa[x]), ...vmul, ...vadd, ...set(kbcV),
      ...get(ka[x]), ...get(vv[x]), ...get(dbcV), ...vmul, ...vadd, ...set(ka[x]),
      ...get(kb[x]), ...get(vv[x]), ...get(dacV), ...vmul, ...vadd, ...set(kb[x]),
    ]),
    ...(tail ? [[
      ...get(o), ...f64load(te), ...set(vT),
      ...get(jabS), ...get(vT), ...get(dc), ...f64load(te), fmul, fadd, ...set(jabS),
      ...get(jc), ...get(jc), ...f64load(te), ...get(vT), ...get(dab), fmul, fadd, ...f64store(te),
      ...get(kaT), ...get(vT), ...get(dbc), fmul, fadd, ...set(kaT),
      ...get(kbT), ...get(vT), ...get(dac), fmul, fadd, ...set(kbT),
    ]] : []),
    // K[a, c0+c] += s·Σ_d v D[b, d]; K[b, c0+c] += s·Σ_d v D[a, d]
    [...addr(K, rowA, ccol), ...addr(K, rowA, ccol), ...f64load(), ...get(s),
      ...(vecs > 0 ? hsum(kacV) : f64c(0)), ...(tail ? [...get(vT), ...get(pbT), fmul, fadd] : []), fmul, fadd, ...f64store()],
    [...addr(K, rowB, ccol), ...addr(K, rowB, ccol), ...f64load(), ...get(s),
      ...(vecs > 0 ? hsum(kbcV) : f64c(0)), ...(tail ? [...get(vT), ...get(paT), fmul, fadd] : []), fmul, fadd, ...f64store()],
    [...get(c), ...i32c(1), add, ...set(c), ...get(rowC), ...get(n8), add, ...set(rowC)],
    [...get(ccol), ...i32c(8), add, ...set(ccol), ...get(o), ...i32c(8 * nd), add, ...set(o), op.br, 0],
  ];
  const bBody = [
    [...get(b), ...get(nb), geS, op.brIf, 1],
    [...addr(D, rowB, d0), ...set(db)],
    ...X.map((x) => [...get(db), ...vload(16 * x), ...set(pb[x]), ...vzero, ...set(ka[x]), ...vzero, ...set(kb[x])]),
    ...(tail ? [[...get(db), ...f64load(te), ...set(pbT), ...f64c(0), ...set(kaT), ...f64c(0), ...set(kbT)]] : []),
    [...get(s2), ...addr(D, rowA, bcol), ...f64load(), fmul, ...set(dab)],
    ...(vecs > 0 ? [[...get(dab), ...vsplat, ...set(dabV), ...vzero, ...set(jabV)]] : []),
    [...f64c(0), ...set(jabS)],
    [...get(c0), ...get(n), mul, ...set(rowC), ...get(c0), ...set(ccol), ...i32c(0), ...set(c)],
    block(loop(...cBody)),
    // J[a, b0+b] += 2s·Σ v D[c, d]; K[a, d0+d] += Σ_c v D[b, c]; K[b, d0+d] += Σ_c v D[a, c]
    [...addr(J, rowA, bcol), ...addr(J, rowA, bcol), ...f64load(), ...get(s2),
      ...(vecs > 0 ? hsum(jabV) : f64c(0)), ...get(jabS), fadd, fmul, fadd, ...f64store()],
    ...X.map((x) => [
      ...addr(K, rowA, d0), ...addr(K, rowA, d0), ...vload(16 * x), ...get(ka[x]), ...vadd, ...vstore(16 * x),
      ...addr(K, rowB, d0), ...addr(K, rowB, d0), ...vload(16 * x), ...get(kb[x]), ...vadd, ...vstore(16 * x),
    ]),
    ...(tail ? [[
      ...addr(K, rowA, d0), ...addr(K, rowA, d0), ...f64load(te), ...get(kaT), fadd, ...f64store(te),
      ...addr(K, rowB, d0), ...addr(K, rowB, d0), ...f64load(te), ...get(kbT), fadd, ...f64store(te),
    ]] : []),
    [...get(b), ...i32c(1), add, ...set(b), ...get(rowB), ...get(n8), add, ...set(rowB)],
    [...get(bcol), ...i32c(8), add, ...set(bcol), op.br, 0],
  ];
  const aBody = [
    [...get(a), ...get(na), geS, op.brIf, 1],
    [...addr(D, rowA, d0), ...set(da)],
    ...X.map((x) => [...get(da), ...vload(16 * x), ...set(pa[x])]),
    ...(tail ? [[...get(da), ...f64load(te), ...set(paT)]] : []),
    [...get(b0), ...get(n), mul, ...set(rowB), ...get(b0), ...set(bcol), ...i32c(0), ...set(b)],
    block(loop(...bBody)),
    [...get(a), ...i32c(1), add, ...set(a), ...get(rowA), ...get(n8), add, ...set(rowA), op.br, 0],
  ];
  const qBody = [
    [...get(q), ...get(q1), geS, op.brIf, 1],
    block(
      // bound · max |D| over everything the quartet touches, against the threshold
      [...get(qBound), ...get(q), ...i32c(3), shl, add, ...f64load(), ...set(bound)],
      [...get(bound), ...get(pdAll), fmul, ...get(th), flt, op.brIf, 0],
      [...get(qBra), ...get(q), ...i32c(2), shl, add, ...i32load(), ...set(bi)],
      [...get(qKet), ...get(q), ...i32c(2), shl, add, ...i32load(), ...set(ki)],
      [...pdOf(get(bi)), ...pdOf(get(ki)), fmax],
      ...[0, 1, 2, 3].map((x) => [...pdOf([...get(qCross), ...get(q), ...i32c(4), shl, add, ...i32load(4 * x)]), fmax]),
      [...set(dmax), ...get(bound), ...get(dmax), fmul, ...get(th), flt, op.brIf, 0],
      [...get(built), ...i32c(1), add, ...set(built)],
      // first functions as byte offsets: a0 … d0 = 8 × index
      [...get(pA0), ...get(bi), ...i32c(2), shl, add, ...i32load(), ...i32c(3), shl, ...set(a0)],
      [...get(pB0), ...get(bi), ...i32c(2), shl, add, ...i32load(), ...i32c(3), shl, ...set(b0)],
      [...get(pA0), ...get(ki), ...i32c(2), shl, add, ...i32load(), ...i32c(3), shl, ...set(c0)],
      [...get(pB0), ...get(ki), ...i32c(2), shl, add, ...i32load(), ...i32c(3), shl, ...set(d0)],
      // s = ½[A=B]·½[C=D]·½[AB=CD]
      [...get(pHalf), ...get(bi), ...i32c(3), shl, add, ...f64load(), ...get(pHalf), ...get(ki), ...i32c(3), shl, add, ...f64load(), fmul],
      [...f64c(0.5), ...f64c(1), ...get(bi), ...get(ki), eq, op.select, fmul, ...set(s)],
      [...get(s), ...get(s), fadd, ...set(s2)],
      [...get(blk), ...get(qOff), ...get(q), ...i32c(2), shl, add, ...i32load(), ...i32c(3), shl, add, ...set(o)],
      [...get(a0), ...get(n), mul, ...set(rowA), ...i32c(0), ...set(a)],
      block(loop(...aBody)),
    ),
    [...get(q), ...i32c(1), add, ...set(q), op.br, 0],
  ];
  const body = [
    ...get(n), ...i32c(3), shl, ...set(n8),
    ...get(q0), ...set(q),
    ...block(loop(...qBody)),
    ...get(built),
  ];
  const params = [...new Array(19).fill(I32), F64, F64];
  return moduleBytes("digest", params, I32, [[nI32, I32], [nF64, F64], [nV, V128]].filter(([k]) => k > 0) as [number, number][], body);
}
