/**
 * Fixed number formatting for the site: deterministic, plain ASCII (hyphen-minus, "e" exponents),
 * so values copied from a page paste cleanly into other programs.
 */

/** `x` with `decimals` digits after the point; −0 and values that round to zero print without a sign. */
export function fixed(x: number | null | undefined, decimals: number): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "n/a";
  const s = x.toFixed(decimals);
  return /^-0\.?0*$/.test(s) ? s.slice(1) : s;
}

/** Scientific notation with `digits` digits after the point, e.g. 1.23e-10. */
export function sci(x: number | null | undefined, digits = 2): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "n/a";
  if (x === 0) return "0";
  return x.toExponential(digits).replace("e+", "e");
}

/** A total energy in hartree: 10 decimals (the archive's printed precision). */
export function hartree(x: number | null | undefined): string {
  return fixed(x, 10);
}

/** A signed number with an explicit "+" for positive values (differences). */
export function signed(x: number | null | undefined, decimals: number): string {
  const s = fixed(x, decimals);
  return s === "n/a" || s.startsWith("-") || /^0\.?0*$/.test(s) ? s : `+${s}`;
}

/** Short hex of an input hash ("sha256:abcd…" → first 12 hex digits). */
export function hashPrefix(inputHash: string, length = 12): string {
  return inputHash.replace(/^sha256:/, "").slice(0, length);
}

/** The date part (YYYY-MM-DD) of an ISO timestamp, or "unknown". */
export function isoDate(ts: string | null | undefined): string {
  return typeof ts === "string" && /^\d{4}-\d{2}-\d{2}/.test(ts) ? ts.slice(0, 10) : "unknown";
}

/** A timestamp as "YYYY-MM-DD HH:MM UTC". */
export function isoMinute(ts: string | null | undefined): string {
  if (typeof ts !== "string" || !/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/.test(ts)) return "unknown";
  return `${ts.slice(0, 10)} ${ts.slice(11, 16)} UTC`;
}

/** Chemical formula as HTML with subscripts ("H2O" → "H<sub>2</sub>O"); input is a Hill formula of letters and digits. */
export function formulaHtml(formula: string): string {
  return formula.replace(/[^A-Za-z0-9]/g, "").replace(/(\d+)/g, "<sub>$1</sub>");
}

/** Charge as a human string: 0 → "0 (neutral)", +1 → "+1", −2 → "-2". */
export function chargeText(q: number): string {
  return q === 0 ? "0 (neutral)" : q > 0 ? `+${q}` : `${q}`;
}

export function multiplicityText(m: number): string {
  const names: Record<number, string> = { 1: "singlet", 2: "doublet", 3: "triplet", 4: "quartet", 5: "quintet", 6: "sextet" };
  return names[m] ? `${m} (${names[m]})` : `${m}`;
}

/** Escape text for HTML (for strings assembled outside Astro's own escaping, e.g. SVG). */
export function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");
}
