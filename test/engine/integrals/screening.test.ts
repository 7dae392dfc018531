import { describe, expect, it } from "vitest";
import { buildBasis } from "../../../src/engine/basis/index.ts";
import { EriEngine } from "../../../src/engine/integrals/eri.ts";
import { computeSchwarzFactors } from "../../../src/engine/integrals/screening.ts";
import type { ShellPair } from "../../../src/engine/integrals/shell-pairs.ts";
import { prepareShells } from "../../../src/engine/integrals/shells.ts";
import { sweepUniqueQuartets } from "../../../src/engine/integrals/sweep.ts";
import type { Vec3 } from "./helpers.ts";

// water (bohr), geometry of the public SCF tutorial used in water-sto3g.test.ts
const WATER = [
  { symbol: "O", xyz: [0, -0.143225816552, 0] as Vec3 },
  { symbol: "H", xyz: [1.638036840407, 1.136548822547, 0] as Vec3 },
  { symbol: "H", xyz: [-1.638036840407, 1.136548822547, 0] as Vec3 },
];

/** diagonal (ab|ab) of each function pair of P, in P's block order */
function diag(eng: EriEngine, P: ShellPair): Float64Array {
  const n = P.a.nfunc * P.b.nfunc;
  const blk = eng.compute(P, P);
  const d = new Float64Array(n);
  for (let k = 0; k < n; k++) d[k] = blk[k * n + k];
  return d;
}

describe("Schwarz inequality and screening", () => {
  it("satisfies |(ab|cd)|² ≤ (ab|ab)(cd|cd) for every integral of water in 6-31G(d)", () => {
    // Cauchy–Schwarz for the positive-definite Coulomb metric (exact analytic result); the
    // relative slack 1e-12 covers rounding of the diagonal integrals
    const eng = new EriEngine(prepareShells(buildBasis(WATER, "6-31G*").shells));
    const diags = eng.pairs.map((P) => diag(eng, P));
    let violations = 0;
    let checked = 0;
    let tightest = 0; // largest |v|²/((ab|ab)(cd|cd)), for the record: 1 is reached by (ab|ab) itself
    sweepUniqueQuartets(eng, null, (P, Q, blk) => {
      const dP = diags[eng.pairs.indexOf(P)];
      const dQ = diags[eng.pairs.indexOf(Q)];
      for (let i = 0; i < dP.length; i++)
        for (let j = 0; j < dQ.length; j++) {
          const v = blk[i * dQ.length + j];
          const bound = dP[i] * dQ[j];
          checked++;
          if (v * v > bound * (1 + 1e-12) + 1e-300) violations++;
          if (bound > 0) tightest = Math.max(tightest, (v * v) / bound);
        }
    });
    expect(checked).toBeGreaterThan(10000);
    expect(violations).toBe(0);
    expect(Math.abs(tightest - 1)).toBeLessThanOrEqual(1e-12);
    // every diagonal (ab|ab) is a self-repulsion, hence positive
    for (const d of diags) for (const v of d) expect(v).toBeGreaterThan(0);
  });

  it("sets each pair's Schwarz factor to √ of its largest diagonal (ab|ab)", () => {
    const eng = new EriEngine(prepareShells(buildBasis(WATER, "cc-pVDZ").shells));
    const max = computeSchwarzFactors(eng);
    let m = 0;
    for (const P of eng.pairs) {
      const d = diag(eng, P);
      const ref = Math.sqrt(Math.max(...Array.from(d, Math.abs)));
      expect(P.schwarz).toBe(ref);
      m = Math.max(m, ref);
    }
    expect(max).toBe(m);
  });

  it("visits M(M+1)/2 unique shell quartets, M = N(N+1)/2 shell pairs, each once, without a threshold", () => {
    // exact combinatorial result: 8-fold symmetry leaves pairs P ≥ Q of pairs a ≥ b
    const shells = buildBasis(WATER, "cc-pVDZ").shells;
    const eng = new EriEngine(prepareShells(shells));
    const N = shells.length;
    const M = (N * (N + 1)) / 2;
    const seen = new Set<string>();
    let integrals = 0;
    const stats = sweepUniqueQuartets(eng, null, (P, Q) => {
      const key = [P.ia, P.ib, Q.ia, Q.ib]
        .map(String)
        .join(",");
      seen.add(key);
      integrals += P.a.nfunc * P.b.nfunc * Q.a.nfunc * Q.b.nfunc;
    });
    expect(stats.quartets).toBe((M * (M + 1)) / 2);
    expect(stats.computed).toBe(stats.quartets);
    expect(seen.size).toBe(stats.quartets);
    expect(stats.integrals).toBe(integrals);
    // the blocks hold every symmetry-unique function quartet (m(m+1)/2 of them, m = n(n+1)/2),
    // plus some repeats inside diagonal shell pairs, and never more than all n⁴
    const nbf = eng.basis.nbf;
    const m = (nbf * (nbf + 1)) / 2;
    expect(integrals).toBeGreaterThanOrEqual((m * (m + 1)) / 2);
    expect(integrals).toBeLessThanOrEqual(nbf ** 4);
  });

  it("skips, with a threshold, only quartets whose computed blocks are indeed below it", () => {
    // two water molecules 12 bohr apart: many distant pairs have tiny overlap densities
    const far = WATER.map((a) => ({ symbol: a.symbol, xyz: [a.xyz[0], a.xyz[1], a.xyz[2] + 12] as Vec3 }));
    const eng = new EriEngine(prepareShells(buildBasis([...WATER, ...far], "6-31G*").shells));
    const threshold = 1e-10;
    const visited = new Set<string>();
    const stats = sweepUniqueQuartets(eng, threshold, (P, Q) => {
      visited.add(`${eng.pairs.indexOf(P)},${eng.pairs.indexOf(Q)}`);
    });
    expect(stats.computed).toBeLessThan(stats.quartets);
    expect(stats.computed).toBe(visited.size);
    const pairs = eng.pairs;
    let skippedChecked = 0;
    let largestSkipped = 0;
    for (let i = 0; i < pairs.length; i++)
      for (let j = 0; j <= i; j++) {
        if (visited.has(`${i},${j}`)) continue;
        // skipped: the Schwarz bound is below the threshold, and so is every integral of the block
        expect(pairs[i].schwarz * pairs[j].schwarz).toBeLessThan(threshold);
        if ((i * 7 + j) % 13 !== 0) continue; // compute a sample of the skipped blocks
        const P = pairs[i];
        const Q = pairs[j];
        const blk = eng.compute(P, Q);
        const n = P.a.nfunc * P.b.nfunc * Q.a.nfunc * Q.b.nfunc;
        for (let k = 0; k < n; k++) largestSkipped = Math.max(largestSkipped, Math.abs(blk[k]));
        skippedChecked++;
      }
    expect(skippedChecked).toBeGreaterThan(100);
    expect(largestSkipped).toBeLessThan(threshold);
  });

  it("keeps every integral within the primitive-quartet cutoff of the exact one, and skips nothing at 0", () => {
    // the skipped primitive quartets of one shell quartet are estimated (shell-pairs.ts `bound`)
    // to add up to less than the cutoff; the estimate is ours, so this checks it (common
    // practice, no source): measured errors are 0.03–0.3× the cutoff
    const far = WATER.map((a) => ({ symbol: a.symbol, xyz: [a.xyz[0] + 1, a.xyz[1], a.xyz[2] + 6] as Vec3 }));
    const basis = prepareShells(buildBasis([...WATER, ...far], "cc-pVDZ").shells);
    // the same code path for both (the tables), so that "nothing skipped" means bitwise equal
    const exact = new EriEngine(basis, { warmCalls: Infinity });
    const zero = new EriEngine(basis, { warmCalls: Infinity });
    zero.primitiveCutoff = 0;
    // both the table-driven and the generated contraction apply the cutoff (eri.ts WARM_CALLS)
    for (const [cutoff, warmCalls] of [[1e-14, 0], [1e-10, 0], [1e-14, Infinity], [1e-10, Infinity]]) {
      const cut = new EriEngine(basis, { warmCalls });
      cut.primitiveCutoff = cutoff;
      let largest = 0;
      let differ = 0;
      let same = true;
      const pairs = exact.pairs;
      for (let i = 0; i < pairs.length; i++)
        for (let j = 0; j <= i; j += 3) {
          const n = pairs[i].a.nfunc * pairs[i].b.nfunc * pairs[j].a.nfunc * pairs[j].b.nfunc;
          const ref = exact.compute(pairs[i], pairs[j]).slice(0, n);
          const z = zero.compute(zero.pairs[i], zero.pairs[j]);
          const c = cut.compute(cut.pairs[i], cut.pairs[j]);
          for (let k = 0; k < n; k++) {
            if (z[k] !== ref[k]) same = false;
            const d = Math.abs(c[k] - ref[k]);
            if (d > 0) differ++;
            largest = Math.max(largest, d);
          }
        }
      expect(same).toBe(true);
      expect(differ).toBeGreaterThan(0); // the cutoff did skip primitive quartets
      expect(largest).toBeLessThanOrEqual(cutoff);
    }
  });
});
