// Pople sp (and spd) shells share exponents; the ERI engine merges them into one shell so each
// primitive quartet is computed once (shells.ts mergeSharedExponents). The merged path must give
// exactly the integrals of the split path, which eri.test.ts checks against the independent
// McMurchie–Davidson reference. Exact identity of the two algorithms: no published value.
import { describe, expect, it } from "vitest";
import type { Shell } from "../../../src/engine/basis/types.ts";
import { EriEngine } from "../../../src/engine/integrals/eri.ts";
import { prepareShells } from "../../../src/engine/integrals/shells.ts";
import { sweepUniqueQuartets } from "../../../src/engine/integrals/sweep.ts";
import { buildBasis } from "../../../src/engine/basis/index.ts";

function lcg(seed: number) {
  return () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
}

/** Three atoms with s (general contraction), sp, spd (pure d), and a lone d shell. */
function mixedShells(): Shell[] {
  const rnd = lcg(11);
  const shells: Shell[] = [];
  for (let atom = 0; atom < 3; atom++) {
    const c: [number, number, number] = [rnd() * 3 - 1, rnd() * 2 - 1, rnd() - 0.5];
    const ex = Float64Array.from({ length: 3 }, () => 0.2 + 4 * rnd());
    const row = (shift: number) => Float64Array.from({ length: 3 }, () => rnd() + shift);
    shells.push({ l: 0, pure: false, atom, center: c, exponents: Float64Array.from([1 + 10 * rnd(), 1 + 10 * rnd()]),
      coefficients: [Float64Array.from([0.6, 0.5]), Float64Array.from([0.2, -0.5])] });
    shells.push({ l: 0, pure: false, atom, center: c, exponents: ex, coefficients: [row(-0.2)] });
    shells.push({ l: 1, pure: false, atom, center: c, exponents: ex, coefficients: [row(0.1)] });
    if (atom === 2) shells.push({ l: 2, pure: true, atom, center: c, exponents: ex, coefficients: [row(0.1)] });
    shells.push({ l: 2, pure: atom === 1, atom, center: c, exponents: Float64Array.from([0.8]), coefficients: [Float64Array.from([1])] });
  }
  return shells;
}

/** The full nbf⁴ tensor from a sweep over unique quartets. */
function fullTensor(eng: EriEngine, n: number): Float64Array {
  const t = new Float64Array(n ** 4);
  sweepUniqueQuartets(eng, null, (P, Q, blk) => {
    const A = P.a, B = P.b, C = Q.a, D = Q.b;
    let k = 0;
    for (let a = 0; a < A.nfunc; a++)
      for (let b = 0; b < B.nfunc; b++)
        for (let c = 0; c < C.nfunc; c++)
          for (let d = 0; d < D.nfunc; d++) {
            const v = blk[k++];
            const i = A.offset + a, j = B.offset + b, p = C.offset + c, q = D.offset + d;
            for (const [w, x, y, z] of [[i, j, p, q], [j, i, p, q], [i, j, q, p], [j, i, q, p], [p, q, i, j], [q, p, i, j], [p, q, j, i], [q, p, j, i]])
              t[((w * n + x) * n + y) * n + z] = v;
          }
  });
  return t;
}

function maxDiff(a: Float64Array, b: Float64Array): { diff: number; max: number } {
  let diff = 0, max = 0;
  for (let i = 0; i < a.length; i++) {
    diff = Math.max(diff, Math.abs(a[i] - b[i]));
    max = Math.max(max, Math.abs(b[i]));
  }
  return { diff, max };
}

describe("ERIs over merged sp and spd shells", () => {
  it("merges the sp and spd halves and nothing else", () => {
    const eng = new EriEngine(prepareShells(mixedShells()));
    expect(eng.shells.map((s) => `${s.lmin}-${s.l}`)).toEqual(["0-0", "0-1", "2-2", "0-0", "0-1", "2-2", "0-0", "0-2", "2-2"]);
  });

  it("gives the same full tensor as the split shells to 1e-13 of its largest element (tables and generated code)", () => {
    const basis = prepareShells(mixedShells());
    const split = fullTensor(new EriEngine(basis, { mergeShells: false, warmCalls: Infinity }), basis.nbf);
    for (const warmCalls of [0, Infinity]) {
      const { diff, max } = maxDiff(fullTensor(new EriEngine(basis, { warmCalls }), basis.nbf), split);
      expect(diff / max).toBeLessThan(1e-13);
    }
  });

  it("gives the same water 6-31G* tensor either way (bundled basis, Cartesian d)", () => {
    const atoms = [
      { symbol: "O", xyz: [0, -0.143225816552, 0] as [number, number, number] },
      { symbol: "H", xyz: [1.638036840407, 1.136548822547, 0] as [number, number, number] },
      { symbol: "H", xyz: [-1.638036840407, 1.136548822547, 0] as [number, number, number] },
    ];
    const basis = prepareShells(buildBasis(atoms, "6-31G*", "auto").shells);
    const merged = new EriEngine(basis);
    expect(merged.shells.length).toBeLessThan(basis.shells.length);
    const { diff, max } = maxDiff(fullTensor(merged, basis.nbf), fullTensor(new EriEngine(basis, { mergeShells: false }), basis.nbf));
    expect(diff / max).toBeLessThan(1e-13);
  });
});
