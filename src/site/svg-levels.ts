/**
 * Orbital energy level diagram (SVG): one column per spin (one for RHF and ROHF), a line per
 * orbital at its energy, occupation written beside it and marked by filled (occupied), half
 * (singly occupied) or open (virtual) end markers, so it reads without colour. Shows the occupied
 * orbitals and up to `virtuals` virtual ones; energies in hartree.
 */
import { scaleLinear } from "d3-scale";
import { escapeHtml, fixed } from "./format.ts";

export interface SpinLevels {
  label: string;
  energies: number[];
  occupations: number[];
}

export function levelsSvg(columns: SpinLevels[], virtuals = 6, idPrefix = "lev"): string {
  const shown = columns.map((c) => {
    const occ = c.occupations.map((o, i) => ({ i, e: c.energies[i], o })).filter((x) => x.o > 0);
    const virt = c.occupations.map((o, i) => ({ i, e: c.energies[i], o })).filter((x) => x.o === 0).slice(0, virtuals);
    // valence window: core levels (below -3 hartree) and all but the 6 highest occupied are left
    // out so the frontier region stays readable; the HOMO is always shown
    const keep = occ.slice(-6).filter((x, k, a) => x.e > -3 || k === a.length - 1);
    return { label: c.label, levels: [...keep, ...virt], hidden: occ.length - keep.length };
  });
  const all = shown.flatMap((c) => c.levels.map((l) => l.e));
  const W = 140 + 170 * columns.length, H = 380, mt = 20, mb = 36;
  const lo = Math.min(...all), hi = Math.max(...all);
  const y = scaleLinear().domain([lo - 0.05 * (hi - lo || 1), hi + 0.05 * (hi - lo || 1)]).range([H - mb, mt]).nice();
  const f = (v: number) => (Math.round(v * 10) / 10).toString();
  const p: string[] = [];
  p.push(`<svg class="plot levels" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${idPrefix}-title" xmlns="http://www.w3.org/2000/svg">`);
  p.push(`<title id="${idPrefix}-title">Orbital energy levels (hartree) with occupations; the values are in the table beside it</title>`);
  for (const t of y.ticks(6)) {
    p.push(`<line x1="58" x2="${W - 10}" y1="${f(y(t))}" y2="${f(y(t))}" stroke="#e4e1da"/>`);
    p.push(`<text x="52" y="${f(y(t) + 4)}" text-anchor="end" font-size="11">${fixed(t, 2)}</text>`);
  }
  p.push(`<text x="14" y="${H / 2}" transform="rotate(-90 14 ${H / 2})" text-anchor="middle" font-size="12">energy (hartree)</text>`);
  shown.forEach((c, k) => {
    const x0 = 90 + k * 170, x1 = x0 + 70;
    p.push(`<text x="${x0 + 35}" y="${H - 20}" text-anchor="middle" font-size="12">${escapeHtml(c.label)}</text>`);
    if (c.hidden) p.push(`<text x="${x0 + 35}" y="${H - 6}" text-anchor="middle" font-size="10">${c.hidden} lower occupied not shown</text>`);
    // label positions pushed apart (at least 11 px) so near-degenerate levels stay readable
    const sorted = [...c.levels].sort((a, b) => a.e - b.e || a.i - b.i);
    const labelY = new Map<number, number>();
    let last = Infinity;
    const ys: number[] = [];
    for (const l of sorted) {
      const want = Math.min(y(l.e), last - 11);
      ys.push(want);
      last = want;
    }
    const overflow = Math.max(0, mt + 4 - Math.min(...ys));
    sorted.forEach((l, k) => labelY.set(l.i, ys[k] + overflow));
    for (const l of c.levels) {
      const yy = y(l.e);
      const ly = labelY.get(l.i) ?? yy;
      const occ = l.o;
      const stroke = occ > 0 ? "#1f3f5f" : "#8a8a8a";
      p.push(`<g class="level"><line x1="${x0}" x2="${x1}" y1="${f(yy)}" y2="${f(yy)}" stroke="${stroke}" stroke-width="${occ > 0 ? 2.4 : 1.4}"${occ > 0 ? "" : ' stroke-dasharray="4 2"'}><title>orbital ${l.i + 1}: ${fixed(l.e, 6)} hartree, occupation ${occ}</title></line>`);
      const mark = occ >= 2 || (occ === 1 && columns.length > 1) ? "#1f3f5f" : occ === 1 ? "url(#${idPrefix}-half)" : "#fff";
      p.push(`<circle cx="${x1 + 8}" cy="${f(yy)}" r="3.5" fill="${mark}" stroke="#1f3f5f"/>`);
      p.push(`<text x="${x1 + 16}" y="${f(ly + 4)}" font-size="10">${l.i + 1}: ${fixed(l.e, 4)} (${occ})</text></g>`);
    }
  });
  p.push(`<defs><linearGradient id="${idPrefix}-half"><stop offset="50%" stop-color="#1f3f5f"/><stop offset="50%" stop-color="#fff"/></linearGradient></defs>`);
  p.push(`</svg>`);
  return p.join("");
}
