/**
 * Visit every symmetry-unique shell quartet once: pairs P ≥ Q over shell pairs a ≥ b, which
 * covers the 8-fold permutational symmetry (ab|cd) = (ba|cd) = (ab|dc) = (cd|ab) = … .
 * With a threshold, quartets whose Schwarz bound is below it are skipped.
 */
import type { EriEngine } from "./eri.ts";
import type { ShellPair } from "./shell-pairs.ts";
import { computeSchwarzFactors } from "./screening.ts";

export interface SweepStats {
  /** unique shell quartets in the basis */
  quartets: number;
  /** quartets actually computed */
  computed: number;
  /** integrals (basis-function quartets) in the computed blocks */
  integrals: number;
}

/**
 * Calls visit(P, Q, block) for each computed unique quartet; block holds
 * nfunc(P.a)·nfunc(P.b)·nfunc(Q.a)·nfunc(Q.b) integrals (see EriEngine.compute).
 */
export function sweepUniqueQuartets(
  engine: EriEngine,
  threshold: number | null,
  visit: (P: ShellPair, Q: ShellPair, block: Float64Array) => void,
): SweepStats {
  const pairs = engine.pairs;
  if (threshold !== null) computeSchwarzFactors(engine);
  let quartets = 0;
  let computed = 0;
  let integrals = 0;
  for (let i = 0; i < pairs.length; i++) {
    const P = pairs[i];
    const nP = P.a.nfunc * P.b.nfunc;
    for (let j = 0; j <= i; j++) {
      const Q = pairs[j];
      quartets++;
      if (threshold !== null && P.schwarz * Q.schwarz < threshold) continue;
      const block = engine.compute(P, Q);
      computed++;
      integrals += nP * Q.a.nfunc * Q.b.nfunc;
      visit(P, Q, block);
    }
  }
  return { quartets, computed, integrals };
}
