/**
 * Straight-line horizontal recurrences and scatter for one kind combination of a class: step
 * 3 of eri.ts (and the diagonal Cartesian normalization of step 4) unrolled into one function.
 *
 * The recurrence is the one of eri-class.ts, (a, b+1_i| = (a+1_i, b| + AB_i (a, b|, and the
 * same on the ket with CD, expanded symbolically with every intermediate a local constant.
 * The generic finishRows of eri.ts spends most of a small quartet's time walking its HRR
 * programs and index tables; for Pople sp shells, whose pairs have four kinds each, that is
 * the larger part of the whole integral. Only Cartesian rows are unrolled (s, p and Cartesian
 * d shells); solid-harmonic rows keep the generic path.
 */
import { cartComponents, cartIndex, cumStart } from "./cartesian.ts";
import { canGenerate } from "./eri-codegen.ts";
import type { EriClass } from "./eri-class.ts";
import { componentTransform } from "./spherical.ts";

/**
 * Writes the kind combination's block from acc[off …] ([e of the bra kind][f of the ket
 * kind]) to out[base + a·sa + b·sb + c·sc + d·sd]; ab and cd are A − B and C − D.
 */
export type Finish = (
  acc: Float64Array, off: number, out: Float64Array, base: number,
  sa: number, sb: number, sc: number, sd: number, ab: Float64Array, cd: Float64Array,
) => void;

/** Above this many statements a kind combination stays with the generic path. */
const MAX_STATEMENTS = 2500;

/** Made per row angular momenta (la lb | lc ld): the code depends on nothing else, so classes share it. */
const made = new Map<number, Finish | null>();

/** The unrolled finish of kinds (bra kind kb, ket kind kk) of a class; null when too large. */
export function generateFinish(cls: EriClass, kb: number, kk: number): Finish | null {
  const b = cls.braKinds[kb], k = cls.ketKinds[kk];
  const key = ((b.l1 * 16 + b.l2) * 16 + k.l1) * 16 + k.l2;
  let f = made.get(key);
  if (f === undefined) made.set(key, (f = makeFinish(b.l1, b.l2, k.l1, k.l2)));
  return f;
}

type Triple = [number, number, number];

const cum = (t: Triple) => cumStart(t[0] + t[1] + t[2]) + cartIndex(t[0], t[1], t[2]);
const key = (...ts: Triple[]) => ts.map((t) => t.join("")).join("|");
const moved = (t: Triple, ax: number, by: number): Triple => {
  const r = t.slice() as Triple;
  r[ax] += by;
  return r;
};

/** The diagonal of the Cartesian normalization of level l (1 for s and p). */
function cartesianScale(l: number): number[] {
  const t = componentTransform(l, false);
  return Array.from({ length: t.ncomp }, (_, i) => t.matrix[i * t.ncart + i]);
}

function makeFinish(la: number, lb: number, lc: number, ld: number): Finish | null {
  if (!canGenerate()) return null;
  // the ket kind's slice of f: levels lc … lc + ld (eri-class.ts kinds)
  const fs = cumStart(lc + ld + 1) - cumStart(lc);
  const eBase = cumStart(la), fBase = cumStart(lc);
  const lines: string[] = [];
  const memo = new Map<string, string>();
  let nv = 0;
  const bra = (a: Triple, b: Triple, f: number): string => {
    if (b[0] + b[1] + b[2] === 0) return `acc[off + ${(cum(a) - eBase) * fs + (f - fBase)}]`;
    const k = `B${key(a, b)}|${f}`;
    let v = memo.get(k);
    if (v === undefined) {
      const ax = b[0] > 0 ? 0 : b[1] > 0 ? 1 : 2;
      const up = bra(moved(a, ax, 1), moved(b, ax, -1), f);
      const lo = bra(a, moved(b, ax, -1), f);
      v = `h${nv++}`;
      lines.push(`const ${v} = ${up} + ab${ax} * ${lo};`);
      memo.set(k, v);
    }
    return v;
  };
  const ket = (a: Triple, b: Triple, c: Triple, d: Triple): string => {
    if (d[0] + d[1] + d[2] === 0) return bra(a, b, cum(c));
    const k = `K${key(a, b, c, d)}`;
    let v = memo.get(k);
    if (v === undefined) {
      const ax = d[0] > 0 ? 0 : d[1] > 0 ? 1 : 2;
      const up = ket(a, b, moved(c, ax, 1), moved(d, ax, -1));
      const lo = ket(a, b, c, moved(d, ax, -1));
      v = `h${nv++}`;
      lines.push(`const ${v} = ${up} + cd${ax} * ${lo};`);
      memo.set(k, v);
    }
    return v;
  };
  const [A, Bc, C, D] = [la, lb, lc, ld].map((l) => cartComponents(l));
  const [ta, tb, tc, td] = [la, lb, lc, ld].map(cartesianScale);
  const stride = (s: string, i: number) => (i === 0 ? "" : i === 1 ? ` + ${s}` : ` + ${i} * ${s}`);
  A.forEach((a, ia) =>
    Bc.forEach((b, ib) =>
      C.forEach((c, ic) =>
        D.forEach((d, id) => {
          const v = ket(a, b, c, d);
          const s = ta[ia] * tb[ib] * tc[ic] * td[id];
          lines.push(`out[base${stride("sa", ia)}${stride("sb", ib)}${stride("sc", ic)}${stride("sd", id)}] = ${s === 1 ? v : `${s} * ${v}`};`);
        }),
      ),
    ),
  );
  if (lines.length > MAX_STATEMENTS) return null;
  const head = "const ab0 = ab[0], ab1 = ab[1], ab2 = ab[2], cd0 = cd[0], cd1 = cd[1], cd2 = cd[2];";
  const f = new Function(`return function finish(acc, off, out, base, sa, sb, sc, sd, ab, cd) {\n${head}\n${lines.join("\n")}\n};`);
  return f() as Finish;
}
