/**
 * A minimal WebAssembly assembler for the engine's few SIMD kernels (linalg/simd.ts,
 * scf/jk-simd.ts): one exported function per module over an imported memory "m"."mem", its body
 * given as opcode bytes built with the helpers below. Encodings from the WebAssembly core
 * specification 2.0 (binary format) and its fixed-width SIMD instructions.
 */

export const I32 = 0x7f, F64 = 0x7c, V128 = 0x7b;

export function uleb(n: number): number[] {
  const out: number[] = [];
  do {
    let b = n & 0x7f;
    n >>>= 7;
    if (n !== 0) b |= 0x80;
    out.push(b);
  } while (n !== 0);
  return out;
}

export function sleb(n: number): number[] {
  const out: number[] = [];
  for (;;) {
    const b = n & 0x7f;
    n >>= 7;
    if ((n === 0 && (b & 0x40) === 0) || (n === -1 && (b & 0x40) !== 0)) {
      out.push(b);
      return out;
    }
    out.push(b | 0x80);
  }
}

const str = (s: string) => [...uleb(s.length), ...[...s].map((c) => c.charCodeAt(0))];
const section = (id: number, body: number[]) => [id, ...uleb(body.length), ...body];

/** Local variable access and constants. */
export const get = (x: number) => [0x20, ...uleb(x)];
export const set = (x: number) => [0x21, ...uleb(x)];
export const i32c = (v: number) => [0x41, ...sleb(v)];
export function f64c(v: number): number[] {
  const b = new Uint8Array(new Float64Array([v]).buffer);
  return [0x44, ...b];
}

/** Numeric opcodes used by the kernels. */
export const op = {
  i32add: 0x6a, i32sub: 0x6b, i32mul: 0x6c, i32and: 0x71, i32shl: 0x74,
  i32eq: 0x46, i32gtS: 0x4a, i32geS: 0x4e,
  f64lt: 0x63, f64add: 0xa0, f64mul: 0xa2, f64max: 0xa5,
  select: 0x1b, brIf: 0x0d, br: 0x0c, end: 0x0b, else: 0x05,
} as const;

/** Memory access with a static byte offset (alignment hints: natural for scalars, 8 for v128). */
export const i32load = (offset = 0) => [0x28, 2, ...uleb(offset)];
export const f64load = (offset = 0) => [0x2b, 3, ...uleb(offset)];
export const f64store = (offset = 0) => [0x39, 3, ...uleb(offset)];
const simd = (code: number, ...imm: number[]) => [0xfd, ...uleb(code), ...imm];
export const vload = (offset = 0) => simd(0x00, 3, ...uleb(offset));
export const vstore = (offset = 0) => simd(0x0b, 3, ...uleb(offset));
export const vzero = simd(0x0c, ...new Array(16).fill(0));
export const vsplat = simd(0x14);
export const vadd = simd(0xf0);
export const vmul = simd(0xf2);
export const vlane = (l: number) => simd(0x21, l);

/** block … end and loop … end without results. */
export const block = (...body: number[][]) => [0x02, 0x40, ...body.flat(), op.end];
export const loop = (...body: number[][]) => [0x03, 0x40, ...body.flat(), op.end];

/**
 * A module importing memory m.mem (up to 4 GiB) and exporting `name`, a function of the given
 * parameter types returning `result` (a type or null), with local groups [count, type].
 */
export function moduleBytes(
  name: string, params: number[], result: number | null, locals: [number, number][], body: number[],
): Uint8Array<ArrayBuffer> {
  const fn = [...uleb(locals.length), ...locals.flatMap(([c, t]) => [...uleb(c), t]), ...body, op.end];
  const bytes = [
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, [1, 0x60, ...uleb(params.length), ...params, ...(result === null ? [0] : [1, result])]),
    ...section(2, [1, ...str("m"), ...str("mem"), 0x02, 0x01, 1, ...uleb(65536)]),
    ...section(3, [1, 0]),
    ...section(7, [1, ...str(name), 0x00, 0]),
    ...section(10, [1, ...uleb(fn.length), ...fn]),
  ];
  return Uint8Array.from(bytes);
}

/**
 * Consecutive regions of one memory (the kernels' workspaces): take(size) returns the next
 * region's start and moves past it, rounded up to a multiple of `align`; `size` is the total.
 */
export function regions(align = 1): { take: (size: number) => number; readonly size: number } {
  let at = 0;
  return {
    take: (size: number) => {
      const o = at;
      at += Math.ceil(size / align) * align;
      return o;
    },
    get size() {
      return at;
    },
  };
}

/** Compile, or null where WebAssembly (or its SIMD) is unavailable or not allowed. */
export function compileModule(bytes: Uint8Array<ArrayBuffer>): WebAssembly.Module | null {
  try {
    if (typeof WebAssembly !== "object" || !WebAssembly.validate(bytes)) return null;
    return new WebAssembly.Module(bytes);
  } catch {
    return null;
  }
}
