/**
 * Cauchy–Schwarz screening: |(ab|cd)| ≤ √|(ab|ab)| · √|(cd|cd)| (the Schwarz inequality for
 * the positive-definite Coulomb metric; M. Häser, R. Ahlrichs, J. Comput. Chem. 10, 104 (1989)).
 * Each pair's factor is √ of the largest diagonal element of its (ab|ab) block.
 */
import type { EriEngine } from "./eri.ts";
import type { ShellPair } from "./shell-pairs.ts";

/** √ of the largest diagonal element of (ab|ab) for one pair. */
export function schwarzFactor(engine: EriEngine, P: ShellPair): number {
  const blk = engine.compute(P, P);
  const n = P.a.nfunc * P.b.nfunc;
  let m = 0;
  for (let i = 0; i < n; i++) m = Math.max(m, Math.abs(blk[i * n + i]));
  return Math.sqrt(m);
}

/** Fill pair.schwarz for every pair of the engine; returns the largest factor. */
export function computeSchwarzFactors(engine: EriEngine): number {
  let max = 0;
  for (const P of engine.pairs) {
    P.schwarz = schwarzFactor(engine, P);
    if (P.schwarz > max) max = P.schwarz;
  }
  return max;
}
