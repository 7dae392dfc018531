/**
 * Four-index transformation to the (ia|jb) integrals MP2 needs, in batches of occupied
 * orbitals i so memory stays bounded:
 *   1. X_i(ν, λσ)   = Σ_μ C_μi (μν|λσ)      per AO pair λσ, from the full (μν|λσ) matrix over μν
 *   2. H_i(j, ν, σ) = Σ_λ C_λj X_i(ν, λσ)   (the ket's occupied index: the smallest next)
 *   3. (ia|jb)      = Σ_νσ C_νa H_i(j, ν, σ) C_σb   per (i, j)
 * Ordering the quarters by dimension (o before v) makes steps 2–3 cost o²n³ + o²n²v + o²nv²
 * instead of o·v·n³/2 for transforming the bra's virtual index second.
 *
 * Every step is a product of row-major blocks with contiguous dot products, done by the SIMD
 * kernel (linalg/simd.ts) in its workspace. Step 1 gathers, per shell pair λσ of the ket, the
 * (μν|λσ) of all stored quartets with that pair (jk.ts forEachBlockOfPair) and transforms all
 * its λσ in one product written straight into X, where λσ are packed by shell pair (each
 * pair's block [ν][λσ] contiguous); step 2 unpacks X_i(ν, ·) to an n × n matrix (in cache) for
 * its product.
 * The AO integrals come from the SCF's in-core store or are recomputed per batch (direct).
 */
import { dotWorkspace } from "../linalg/simd.ts";
import { regions } from "../linalg/wasm.ts";
import type { ShellPair } from "../integrals/shell-pairs.ts";
import type { JkBuilder } from "../scf/jk.ts";

export interface OrbitalBlock {
  /** nbf × ncols coefficients, row-major */
  C: Float64Array;
  ncols: number;
}

export interface TransformStats {
  batches: number;
  batchSize: number;
  /** bytes of the largest batch buffers held at once */
  peakBytes: number;
}

/**
 * Calls visit(i0, count, T) per batch, T[((i − i0)·nv + a)·no2·nv2 + j·nv2 + b] = (ia|jb)
 * with i, a from (occ1, virt1) and j, b from (occ2, virt2). T is valid during the call only.
 */
export function transformIajb(
  jk: JkBuilder, nbf: number, occ1: OrbitalBlock, virt1: OrbitalBlock, occ2: OrbitalBlock, virt2: OrbitalBlock,
  memoryBytes: number, visit: (i0: number, count: number, T: Float64Array) => void, options: { simd?: boolean } = {},
): TransformStats {
  const n = nbf, nn = n * n;
  const no = occ1.ncols, nv = virt1.ncols, no2 = occ2.ncols, nv2 = virt2.ncols;
  const pairs = jk.engine.pairs;
  // the ket index λσ packed by shell pair: pair q's functions (λ ∈ C, σ ∈ D) at kOff[q] + c·nd + d;
  // wRow/wCol place each packed λσ in an n × n matrix, both ways round (X is symmetric in λσ)
  const kOff = new Int32Array(pairs.length + 1);
  let maxPair = 1;
  for (let q = 0; q < pairs.length; q++) {
    const w = pairs[q].a.nfunc * pairs[q].b.nfunc;
    kOff[q + 1] = kOff[q] + w;
    maxPair = Math.max(maxPair, w);
  }
  const npk = kOff[pairs.length];
  // X[i] holds pair q's block as [ν][cd] at n·kOff[q]: packed λσ p of pair q (its cd-th) for ν
  // sits at xBase[p] + ν·xStride[p]
  const wRow = new Int32Array(npk), wCol = new Int32Array(npk), xBase = new Int32Array(npk), xStride = new Int32Array(npk);
  for (let q = 0; q < pairs.length; q++) {
    const C = pairs[q].a, D = pairs[q].b, ncd = C.nfunc * D.nfunc;
    for (let c = 0, p = kOff[q]; c < C.nfunc; c++)
      for (let d = 0; d < D.nfunc; d++, p++) {
        wRow[p] = (C.offset + c) * n + D.offset + d;
        wCol[p] = (D.offset + d) * n + C.offset + c;
        xBase[p] = n * kOff[q] + c * D.nfunc + d;
        xStride[p] = ncd;
      }
  }
  // per occupied orbital: X (n·npk) + H (no2·n²) + T (nv·no2·nv2)
  const perOcc = 8 * (n * npk + no2 * nn + nv * no2 * nv2);
  const batch = Math.max(1, Math.min(no, Math.floor(memoryBytes / perOcc)));
  // workspace: coefficients (transposed: one orbital per row), the gathered matrices of one ket
  // pair, one unpacked X_i(ν, ·), then the batch's X, H and T
  const mem = regions();
  const take = mem.take;
  const cot = take(batch * n), c2ot = take(no2 * n), cv1t = take(nv * n), cv2t = take(nv2 * n);
  const mq = take(n * maxPair * n), w = take(nn), bvt = take(nv2 * n);
  const X = take(batch * n * npk), H = take(batch * no2 * nn), T = take(batch * nv * no2 * nv2);
  const ws = dotWorkspace(mem.size, { simd: options.simd });
  const f = ws.f64;
  const putT = (dst: number, blk: OrbitalBlock, from = 0, count = blk.ncols) => {
    for (let mu = 0; mu < n; mu++) for (let c = 0; c < count; c++) f[dst + c * n + mu] = blk.C[mu * blk.ncols + from + c];
  };
  putT(c2ot, occ2);
  putT(cv1t, virt1);
  putT(cv2t, virt2);
  let batches = 0;
  for (let i0 = 0; i0 < no; i0 += batch) {
    const nb = Math.min(batch, no - i0);
    batches++;
    putT(cot, occ1, i0, nb);
    // 1. X_i(ν, λσ) = Σ_μ C_μi (μν|λσ), one ket shell pair at a time: its integrals gathered as
    // M[ν][cd][μ], then one product for all its λσ, written straight into X
    for (let q = 0; q < pairs.length; q++) {
      const K = pairs[q];
      const ncd = K.a.nfunc * K.b.nfunc;
      f.fill(0, mq, mq + n * ncd * n);
      jk.forEachBlockOfPair(q, (P, Q, blk, off) => gather(P, Q, K, blk, off, n, ncd, f, mq));
      ws.abt(cot, mq, nb, n, n * ncd, X + n * kOff[q], n, n, n * npk);
    }
    // 2. H[i][j][ν][σ] = Σ_λ C_λj X[i][ν][λσ]: X's row unpacked to n × n, one product per (i, ν),
    // written with row stride n²
    for (let i = 0; i < nb; i++)
      for (let nu = 0; nu < n; nu++) {
        const row = X + i * n * npk;
        for (let p = 0; p < npk; p++) {
          const v = f[row + xBase[p] + nu * xStride[p]];
          f[w + wRow[p]] = v;
          f[w + wCol[p]] = v;
        }
        ws.abt(c2ot, w, no2, n, n, H + (i * no2 * n + nu) * n, n, n, nn);
      }
    // 3. (ia|jb) = Σ_ν C_νa Σ_σ H[i][j][ν][σ] C_σb, per (i, j), into T with row stride no2·nv2
    for (let i = 0; i < nb; i++)
      for (let j = 0; j < no2; j++) {
        ws.abt(cv2t, H + (i * no2 + j) * nn, nv2, n, n, bvt);
        ws.abt(cv1t, bvt, nv, n, nv2, T + (i * nv * no2 + j) * nv2, n, n, no2 * nv2);
      }
    visit(i0, nb, f.subarray(T, T + nb * nv * no2 * nv2));
  }
  return { batches, batchSize: batch, peakBytes: 8 * mem.size };
}

/**
 * One stored block that has ket pair K as its bra or ket, into M[ν][cd][μ] = (μν|cd) for the
 * other pair's functions μ ∈ A, ν ∈ B, both ways round ((μν|cd) = (νμ|cd)). The block is
 * (AB|K) when K is its ket, (K|AB) otherwise (layouts as EriEngine.compute).
 */
function gather(
  P: ShellPair, Q: ShellPair, K: ShellPair, blk: Float64Array, off: number, n: number, ncd: number, f: Float64Array, mq: number,
): void {
  const ket = Q === K;
  const O = ket ? P : Q;
  const A = O.a, B = O.b, na = A.nfunc, nb = B.nfunc;
  // element (a, b, cd) of the block at off + a·sa + b·sb + cd·sc
  const sc = ket ? 1 : na * nb, sa = ket ? nb * ncd : nb, sb = ket ? ncd : 1;
  const rowStride = ncd * n;
  for (let a = 0; a < na; a++) {
    const mu = A.offset + a;
    for (let b = 0; b < nb; b++) {
      const nu = B.offset + b;
      const u = mq + nu * rowStride + mu, v = mq + mu * rowStride + nu;
      const src = off + a * sa + b * sb;
      for (let cd = 0; cd < ncd; cd++) {
        const val = blk[src + cd * sc];
        f[u + cd * n] = val;
        f[v + cd * n] = val;
      }
    }
  }
}
