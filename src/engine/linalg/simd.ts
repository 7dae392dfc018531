/**
 * C = A·Bᵀ (dot products of contiguous rows, as dense.ts `matmulABt`) with two doubles per
 * instruction: a WebAssembly module with 128-bit SIMD, assembled here (wasm.ts) at first use.
 * Scalar JavaScript reaches about two floating-point operations per cycle; the SIMD kernel does
 * a 2 × 2 block of rows with f64x2 multiply-adds (2.8× the JavaScript kernel on a 93 × 642 × 93
 * block here). It works on a Float64Array view of its own memory (a `DotWorkspace`), so
 * callers place their operands there.
 *
 * Where WebAssembly or its SIMD is not available (or not allowed), the workspace is a plain
 * Float64Array and `abt` runs `matmulABt`. The two agree to rounding, not bit for bit: the SIMD
 * lanes sum the even and the odd terms separately.
 */
import { matmulABt } from "./dense.ts";
import {
  block, compileModule, F64, f64c, f64load, f64store, get, I32, i32c, loop, moduleBytes, op, set, V128, vadd, vlane, vload, vmul, vzero,
} from "./wasm.ts";

/** A memory of doubles with C = A·Bᵀ on offsets into it. */
export interface DotWorkspace {
  /** whether the SIMD kernel runs (false: the JavaScript one) */
  readonly simd: boolean;
  /** the doubles; a new view after `reserve` grows the memory, so read it after reserving */
  readonly f64: Float64Array;
  /** make room for at least `doubles` in total (views taken before are then stale) */
  reserve(doubles: number): void;
  /**
   * f64[c + i·ldc + j] = Σ_{p<k} f64[a + i·lda + p] · f64[b + j·ldb + p] for i < n, j < m
   * (offsets in doubles; row strides default to k, k and m; C must not overlap A or B)
   */
  abt(a: number, b: number, n: number, k: number, m: number, c: number, lda?: number, ldb?: number, ldc?: number): void;
}

/** A workspace of at least `doubles`; `simd: false` forces the JavaScript kernel (tests). */
export function dotWorkspace(doubles: number, options: { simd?: boolean } = {}): DotWorkspace {
  const mod = options.simd === false ? null : simdModule();
  if (mod !== null) {
    try {
      return new SimdWorkspace(mod, doubles);
    } catch {
      // memory beyond what WebAssembly can address: the JavaScript kernel below
    }
  }
  return new PlainWorkspace(doubles);
}

class PlainWorkspace implements DotWorkspace {
  readonly simd = false;
  f64: Float64Array;
  constructor(doubles: number) {
    this.f64 = new Float64Array(doubles);
  }
  reserve(doubles: number): void {
    if (doubles <= this.f64.length) return;
    const next = new Float64Array(doubles);
    next.set(this.f64);
    this.f64 = next;
  }
  abt(a: number, b: number, n: number, k: number, m: number, c: number, lda = k, ldb = k, ldc = m): void {
    const f = this.f64;
    if (lda === k && ldb === k && ldc === m) {
      matmulABt(f, a, f, b, n, k, m, f.subarray(c, c + n * m));
      return;
    }
    for (let i = 0; i < n; i++)
      for (let j = 0; j < m; j++) f[c + i * ldc + j] = dotRows(f, a + i * lda, b + j * ldb, k);
  }
}

const PAGE = 65536;

class SimdWorkspace implements DotWorkspace {
  readonly simd = true;
  f64: Float64Array;
  private memory: WebAssembly.Memory;
  private dot: (a: number, b: number, n: number, k: number, m: number, c: number, lda: number, ldb: number, ldc: number) => void;
  constructor(mod: WebAssembly.Module, doubles: number) {
    const pages = Math.max(1, Math.ceil((doubles * 8) / PAGE));
    if (pages > 65536) throw new RangeError("beyond 4 GiB");
    this.memory = new WebAssembly.Memory({ initial: pages, maximum: 65536 });
    const inst = new WebAssembly.Instance(mod, { m: { mem: this.memory } });
    this.dot = inst.exports.dot as SimdWorkspace["dot"];
    this.f64 = new Float64Array(this.memory.buffer);
  }
  reserve(doubles: number): void {
    const need = Math.ceil((doubles * 8) / PAGE) - this.memory.buffer.byteLength / PAGE;
    if (need <= 0) return;
    this.memory.grow(need);
    this.f64 = new Float64Array(this.memory.buffer);
  }
  abt(a: number, b: number, n: number, k: number, m: number, c: number, lda = k, ldb = k, ldc = m): void {
    const n2 = n - (n % 2), m2 = m - (m % 2);
    const A = a * 8, B = b * 8, Cc = c * 8;
    this.dot(A, B, n2, k, m2, Cc, lda, ldb, ldc);
    // an odd last row or column: the kernel again on the last two (the one before is recomputed
    // to the same values), so that it, too, runs two doubles per instruction
    const lastRow = n2 < n && n >= 2, lastCol = m2 < m && m >= 2;
    if (lastRow) this.dot(A + (n - 2) * lda * 8, B, 2, k, m2, Cc + (n - 2) * ldc * 8, lda, ldb, ldc);
    if (lastCol) this.dot(A, B + (m - 2) * ldb * 8, n2, k, 2, Cc + (m - 2) * 8, lda, ldb, ldc);
    if (lastRow && lastCol) this.dot(A + (n - 2) * lda * 8, B + (m - 2) * ldb * 8, 2, k, 2, Cc + ((n - 2) * ldc + m - 2) * 8, lda, ldb, ldc);
    if (n === 1 || m === 1) {
      const f = this.f64;
      for (let i = 0; i < n; i++)
        for (let j = 0; j < m; j++) f[c + i * ldc + j] = dotRows(f, a + i * lda, b + j * ldb, k);
    }
  }
}

function dotRows(f: Float64Array, r: number, q: number, k: number): number {
  let s = 0;
  for (let p = 0; p < k; p++) s += f[r + p] * f[q + p];
  return s;
}

let cached: WebAssembly.Module | null | undefined;

/** The compiled module, or null where WebAssembly SIMD cannot be used. */
function simdModule(): WebAssembly.Module | null {
  if (cached === undefined) cached = compileModule(assembleDotModule());
  return cached;
}

/**
 * The `dot(a, b, n, k, m, c, lda, ldb, ldc)` function (byte addresses a, b, c; counts n, k, m
 * with n and m even; row strides in doubles): for every 2 × 2 block of rows (i, i+1) of A and
 * (j, j+1) of B, four f64x2 sums over k in steps of two, each reduced to its two lanes, plus the
 * last term when k is odd.
 */
function assembleDotModule(): Uint8Array<ArrayBuffer> {
  // params 0–8: a b n k m c lda ldb ldc; i32 locals from 9, v128 locals after
  const [a, b, n, k, m, c, lda, ldb, ldc] = [0, 1, 2, 3, 4, 5, 6, 7, 8];
  const [i, j, p, ra0, ra1, rb0, rb1, la, lb, k2b, cij, lc] = [9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20];
  const [s00, s01, s10, s11, x0, x1, y0, y1] = [21, 22, 23, 24, 25, 26, 27, 28];
  const { i32add: add, i32mul: mul, i32geS: geS, i32and: and, i32gtS: gtS, i32shl: shl, f64add, f64mul } = op;
  // s += x * y
  const fma = (s: number, xv: number, yv: number) => [...get(s), ...get(xv), ...get(yv), ...vmul, ...vadd, ...set(s)];
  // the two lanes of s plus, when k is odd, the last products A[r + k−1]·B[q + k−1]
  const reduce = (s: number, r: number, q: number) => [
    ...get(s), ...vlane(0), ...get(s), ...vlane(1), f64add,
    ...get(k), ...i32c(1), and,
    0x04, F64, // if (result f64)
    ...get(r), ...get(k2b), add, ...f64load(), ...get(q), ...get(k2b), add, ...f64load(), f64mul,
    op.else, ...f64c(0),
    op.end, f64add,
  ];
  const body = [
    // byte strides la = 8·lda, lb = 8·ldb, lc = 8·ldc; k2b = 8(k & ~1)
    ...get(lda), ...i32c(3), shl, ...set(la),
    ...get(ldb), ...i32c(3), shl, ...set(lb),
    ...get(ldc), ...i32c(3), shl, ...set(lc),
    ...get(k), ...i32c(-2), and, ...i32c(3), shl, ...set(k2b),
    ...i32c(0), ...set(i),
    ...block(loop( // rows of A, two at a time
      [...get(i), ...i32c(2), add, ...get(n), gtS, op.brIf, 1],
      [...get(a), ...get(i), ...get(la), mul, add, ...set(ra0)],
      [...get(ra0), ...get(la), add, ...set(ra1)],
      [...i32c(0), ...set(j)],
      block(loop( // rows of B, two at a time
        [...get(j), ...i32c(2), add, ...get(m), gtS, op.brIf, 1],
        [...get(b), ...get(j), ...get(lb), mul, add, ...set(rb0)],
        [...get(rb0), ...get(lb), add, ...set(rb1)],
        [...vzero, ...set(s00), ...vzero, ...set(s01), ...vzero, ...set(s10), ...vzero, ...set(s11)],
        [...i32c(0), ...set(p)],
        block(loop( // k in pairs
          [...get(p), ...get(k2b), geS, op.brIf, 1],
          [...get(ra0), ...get(p), add, ...vload(), ...set(x0)],
          [...get(ra1), ...get(p), add, ...vload(), ...set(x1)],
          [...get(rb0), ...get(p), add, ...vload(), ...set(y0)],
          [...get(rb1), ...get(p), add, ...vload(), ...set(y1)],
          fma(s00, x0, y0), fma(s01, x0, y1), fma(s10, x1, y0), fma(s11, x1, y1),
          [...get(p), ...i32c(16), add, ...set(p), op.br, 0],
        )),
        // cij = c + 8(i·ldc + j)
        [...get(c), ...get(i), ...get(ldc), mul, ...get(j), add, ...i32c(3), shl, add, ...set(cij)],
        [...get(cij), ...reduce(s00, ra0, rb0), ...f64store()],
        [...get(cij), ...i32c(8), add, ...reduce(s01, ra0, rb1), ...f64store()],
        [...get(cij), ...get(lc), add, ...reduce(s10, ra1, rb0), ...f64store()],
        [...get(cij), ...get(lc), add, ...i32c(8), add, ...reduce(s11, ra1, rb1), ...f64store()],
        [...get(j), ...i32c(2), add, ...set(j), op.br, 0],
      )),
      [...get(i), ...i32c(2), add, ...set(i), op.br, 0],
    )),
  ];
  return moduleBytes("dot", new Array(9).fill(I32), null, [[12, I32], [8, V128]], body);
}
