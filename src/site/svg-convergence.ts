/**
 * Convergence history as an inline SVG (built at build time, no script): |ΔE|, RMS ΔD and the
 * DIIS error per iteration on a log scale, with the thresholds dashed. Each series has its own
 * marker shape as well as colour, so it reads in grey print too. Ticks come from d3-scale.
 */
import { scaleLinear, scaleLog } from "d3-scale";
import { escapeHtml, sci } from "./format.ts";

export interface IterationRow {
  iteration: number;
  energy: number | null;
  delta_energy: number | null;
  density_rms: number | null;
  diis_error: number | null;
}

interface Series {
  key: "delta_energy" | "density_rms" | "diis_error";
  label: string;
  colour: string;
  marker: "circle" | "square" | "triangle";
}

export const SERIES: Series[] = [
  { key: "delta_energy", label: "|ΔE| (hartree)", colour: "#1f5f8b", marker: "circle" },
  { key: "density_rms", label: "RMS ΔD", colour: "#a23b1c", marker: "square" },
  { key: "diis_error", label: "DIIS error (max |FDS−SDF|)", colour: "#4c6b1f", marker: "triangle" },
];

const r2 = (x: number) => (Math.round(x * 100) / 100).toString();

function marker(kind: Series["marker"], x: number, y: number, colour: string, title: string): string {
  const t = `<title>${escapeHtml(title)}</title>`;
  if (kind === "circle") return `<circle class="pt" cx="${r2(x)}" cy="${r2(y)}" r="3.2" fill="${colour}">${t}</circle>`;
  if (kind === "square") return `<rect class="pt" x="${r2(x - 3)}" y="${r2(y - 3)}" width="6" height="6" fill="${colour}">${t}</rect>`;
  return `<path class="pt" d="M${r2(x)},${r2(y - 3.8)}L${r2(x + 3.6)},${r2(y + 2.6)}L${r2(x - 3.6)},${r2(y + 2.6)}Z" fill="${colour}">${t}</path>`;
}

export interface ConvergenceOptions {
  energyThreshold: number;
  densityThreshold: number;
  /** id prefix for title/desc elements (unique per page) */
  idPrefix?: string;
}

/** The SVG markup, or null when there is nothing to plot (no iterations with positive values). */
export function convergenceSvg(rows: IterationRow[], opt: ConvergenceOptions): string | null {
  const values: number[] = [];
  for (const r of rows) for (const s of SERIES) {
    const v = r[s.key];
    if (typeof v === "number" && Number.isFinite(v) && Math.abs(v) > 0) values.push(Math.abs(v));
  }
  if (!values.length) return null;
  values.push(opt.energyThreshold, opt.densityThreshold);
  const W = 640, H = 320, m = { l: 64, r: 16, t: 14, b: 74 };
  const lo = Math.min(...values), hi = Math.max(...values);
  const y = scaleLog().domain([lo / 2, hi * 2]).range([H - m.b, m.t]).nice();
  const maxIt = Math.max(2, ...rows.map((r) => r.iteration));
  const x = scaleLinear().domain([1, maxIt]).range([m.l, W - m.r]);
  const id = opt.idPrefix ?? "conv";
  const parts: string[] = [];
  parts.push(`<svg class="plot convergence" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${id}-title ${id}-desc" xmlns="http://www.w3.org/2000/svg">`);
  parts.push(`<title id="${id}-title">SCF convergence history</title>`);
  parts.push(`<desc id="${id}-desc">Log-scale plot of |ΔE|, RMS density change and DIIS error over ${rows.length} iterations; the same numbers are in the table below.</desc>`);
  // grid and y ticks (powers of ten only)
  const [d0, d1] = y.domain();
  const e0 = Math.floor(Math.log10(d0)), e1 = Math.ceil(Math.log10(d1));
  const step = Math.max(1, Math.ceil((e1 - e0) / 8));
  for (let e = e0; e <= e1; e += step) {
    const v = 10 ** e;
    if (v < d0 * 0.999 || v > d1 * 1.001) continue;
    const yy = y(v);
    parts.push(`<line class="grid" x1="${m.l}" x2="${W - m.r}" y1="${r2(yy)}" y2="${r2(yy)}" stroke="#d9d6cf" stroke-width="1"/>`);
    parts.push(`<text class="tick" x="${m.l - 6}" y="${r2(yy + 4)}" text-anchor="end" font-size="11">1e${e}</text>`);
  }
  for (const t of x.ticks(Math.min(maxIt - 1, 10)).filter((t) => Number.isInteger(t))) {
    const xx = x(t);
    parts.push(`<line x1="${r2(xx)}" x2="${r2(xx)}" y1="${H - m.b}" y2="${H - m.b + 4}" stroke="#555"/>`);
    parts.push(`<text class="tick" x="${r2(xx)}" y="${H - m.b + 16}" text-anchor="middle" font-size="11">${t}</text>`);
  }
  parts.push(`<line x1="${m.l}" x2="${W - m.r}" y1="${H - m.b}" y2="${H - m.b}" stroke="#555"/>`);
  parts.push(`<line x1="${m.l}" x2="${m.l}" y1="${m.t}" y2="${H - m.b}" stroke="#555"/>`);
  parts.push(`<text x="${(m.l + W - m.r) / 2}" y="${H - m.b + 32}" text-anchor="middle" font-size="12">iteration</text>`);
  // thresholds
  const thr = (v: number, label: string) => {
    const yy = y(v);
    parts.push(`<line class="threshold" x1="${m.l}" x2="${W - m.r}" y1="${r2(yy)}" y2="${r2(yy)}" stroke="#777" stroke-dasharray="5 4"/>`);
    parts.push(`<text x="${W - m.r - 4}" y="${r2(yy - 4)}" text-anchor="end" font-size="10" fill="#444">${escapeHtml(label)}</text>`);
  };
  thr(opt.energyThreshold, `ΔE threshold ${sci(opt.energyThreshold, 0)}`);
  if (Math.abs(Math.log10(opt.densityThreshold / opt.energyThreshold)) > 0.5) thr(opt.densityThreshold, `ΔD threshold ${sci(opt.densityThreshold, 0)}`);
  // series
  for (const s of SERIES) {
    const pts = rows
      .map((r) => ({ it: r.iteration, v: r[s.key] }))
      .filter((p): p is { it: number; v: number } => typeof p.v === "number" && Number.isFinite(p.v) && Math.abs(p.v) > 0);
    if (!pts.length) continue;
    const d = pts.map((p, k) => `${k ? "L" : "M"}${r2(x(p.it))},${r2(y(Math.abs(p.v)))}`).join("");
    parts.push(`<g class="series" data-series="${s.key}">`);
    parts.push(`<path d="${d}" fill="none" stroke="${s.colour}" stroke-width="1.6"/>`);
    for (const p of pts) parts.push(marker(s.marker, x(p.it), y(Math.abs(p.v)), s.colour, `iteration ${p.it}: ${s.label} = ${sci(Math.abs(p.v), 3)}`));
    parts.push(`</g>`);
  }
  // legend
  SERIES.forEach((s, k) => {
    const lx = m.l + k * 190, ly = H - 16;
    parts.push(`<line x1="${lx}" x2="${lx + 22}" y1="${ly}" y2="${ly}" stroke="${s.colour}" stroke-width="1.6"/>`);
    parts.push(marker(s.marker, lx + 11, ly, s.colour, s.label).replace(/<title>.*<\/title>/, ""));
    parts.push(`<text x="${lx + 28}" y="${ly + 4}" font-size="11">${escapeHtml(s.label)}</text>`);
  });
  parts.push(`</svg>`);
  return parts.join("");
}
