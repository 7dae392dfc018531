/**
 * "Did you mean …?" suggestions for misspelt names (element symbols, variables, labels).
 * Case-insensitive Levenshtein distance; candidates within a small distance, nearest first.
 */

export function editDistance(a: string, b: string): number {
  const s = a.toLowerCase();
  const t = b.toLowerCase();
  let prev = Array.from({ length: t.length + 1 }, (_, j) => j);
  for (let i = 1; i <= s.length; i++) {
    const cur = [i];
    for (let j = 1; j <= t.length; j++) {
      const cost = s[i - 1] === t[j - 1] ? 0 : 1;
      cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost);
    }
    prev = cur;
  }
  return prev[t.length];
}

/**
 * Candidates close to `word`, nearest first (ties keep the candidates' order).
 * The allowed distance grows with the word: 1 for words up to 3 characters, else 2.
 */
export function closest(word: string, candidates: readonly string[], max = 3): string[] {
  const limit = word.length <= 3 ? 1 : 2;
  const scored: { c: string; d: number; i: number }[] = [];
  const seen = new Set<string>();
  candidates.forEach((c, i) => {
    if (seen.has(c)) return;
    seen.add(c);
    const d = editDistance(word, c);
    if (d <= limit) scored.push({ c, d, i });
  });
  scored.sort((x, y) => x.d - y.d || x.i - y.i);
  return scored.slice(0, max).map((x) => x.c);
}

/** `did you mean "a" or "b"?`, or undefined when nothing is close. */
export function didYouMean(word: string, candidates: readonly string[]): string | undefined {
  const near = closest(word, candidates);
  if (near.length === 0) return undefined;
  return `did you mean ${near.map((c) => JSON.stringify(c)).join(" or ")}?`;
}
