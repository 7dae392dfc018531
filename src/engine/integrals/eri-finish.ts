/**
 * Straight-line horizontal recurrences and scatter for one kind combination of a class: step
 * 3 of eri.ts (and the diagonal Cartesian normalization of step 4) unrolled into one function.
 *
 * The recurrence is the one of eri-class.ts, (a, b+1_i| = (a+1_i, b| + AB_i (a, b|, and the
 * same on the ket with CD, expanded symbolically with every intermediate a local constant,
 * then the Cartesian → function transform of each index in turn (solid harmonics or the
 * Cartesian normalization).
 * The generic finishRows of eri.ts spends most of a small quartet's time walking its HRR
 * programs and index tables; for Pople sp shells, whose pairs have four kinds each, that is
 * the larger part of the whole integral. Kinds too large to unroll keep the generic path.
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

/**
 * Made per row angular momenta (la lb | lc ld) and whether each row is solid-harmonic: the
 * code depends on nothing else, so classes share it.
 */
const made = new Map<number, Finish | null>();

/**
 * The unrolled finish of kinds (bra kind kb, ket kind kk) of a class, for rows that are
 * solid-harmonic (`pure`, a bit per row a b c d) or Cartesian; null when too large.
 */
export function generateFinish(cls: EriClass, kb: number, kk: number, pure: number): Finish | null {
  const b = cls.braKinds[kb], k = cls.ketKinds[kk];
  // purity matters from d functions up
  const p = (b.l1 >= 2 ? pure & 8 : 0) | (b.l2 >= 2 ? pure & 4 : 0) | (k.l1 >= 2 ? pure & 2 : 0) | (k.l2 >= 2 ? pure & 1 : 0);
  const key = (((b.l1 * 16 + b.l2) * 16 + k.l1) * 16 + k.l2) * 16 + p;
  let f = made.get(key);
  if (f === undefined) made.set(key, (f = makeFinish(b.l1, b.l2, k.l1, k.l2, p)));
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

/** Rows of the Cartesian → function transform of level l: [Cartesian index, coefficient][] per function. */
function transformRows(l: number, pure: boolean): [number, number][][] {
  const t = componentTransform(l, pure);
  return Array.from({ length: t.ncomp }, (_, o) => {
    const row: [number, number][] = [];
    for (let i = 0; i < t.ncart; i++) if (t.matrix[o * t.ncart + i] !== 0) row.push([i, t.matrix[o * t.ncart + i]]);
    return row;
  });
}

function makeFinish(la: number, lb: number, lc: number, ld: number, pure: number): Finish | null {
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
  // Cartesian (ab|cd) as expressions, then the transform of each index in turn (d, c, b, a):
  // a term that is a single coefficient-1 entry stays a name, anything else becomes a local
  let cur: string[] = [];
  for (const a of A) for (const b of Bc) for (const c of C) for (const d of D) cur.push(ket(a, b, c, d));
  const dims = [A.length, Bc.length, C.length, D.length];
  const ls = [la, lb, lc, ld];
  for (let axis = 3; axis >= 0; axis--) {
    const rows = transformRows(ls[axis], (pure & (8 >> axis)) !== 0);
    const inner = dims.slice(axis + 1).reduce((x, y) => x * y, 1);
    const outer = dims.slice(0, axis).reduce((x, y) => x * y, 1);
    const next: string[] = [];
    for (let o = 0; o < outer; o++)
      for (let r = 0; r < rows.length; r++)
        for (let i = 0; i < inner; i++) {
          const terms = rows[r].map(([c, v]) => [cur[(o * dims[axis] + c) * inner + i], v] as const);
          if (terms.length === 1 && terms[0][1] === 1) next.push(terms[0][0]);
          else {
            const v = `h${nv++}`;
            lines.push(`const ${v} = ${terms.map(([x, c]) => `${c} * ${x}`).join(" + ")};`);
            next.push(v);
          }
        }
    dims[axis] = rows.length;
    cur = next;
  }
  const stride = (s: string, i: number) => (i === 0 ? "" : i === 1 ? ` + ${s}` : ` + ${i} * ${s}`);
  let t = 0;
  for (let ia = 0; ia < dims[0]; ia++)
    for (let ib = 0; ib < dims[1]; ib++)
      for (let ic = 0; ic < dims[2]; ic++)
        for (let id = 0; id < dims[3]; id++)
          lines.push(`out[base${stride("sa", ia)}${stride("sb", ib)}${stride("sc", ic)}${stride("sd", id)}] = ${cur[t++]};`);
  if (lines.length > MAX_STATEMENTS) return null;
  const head = "const ab0 = ab[0], ab1 = ab[1], ab2 = ab[2], cd0 = cd[0], cd1 = cd[1], cd2 = cd[2];";
  const f = new Function(`return function finish(acc, off, out, base, sa, sb, sc, sd, ab, cd) {\n${head}\n${lines.join("\n")}\n};`);
  return f() as Finish;
}
