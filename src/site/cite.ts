/**
 * How to cite a calculation: the method papers (from the equations used), the basis-set papers
 * (from the record's basis.references, stored as "authors\ntitle\njournal volume, pages (year)\ndoi"),
 * and the program with its version and numerics version; as text and as BibTeX.
 */
import type { FieldbookRecord } from "../archive/record.ts";
import { equationsFor, PAPERS, type Paper } from "./equations.ts";
import { mp2Of } from "./summary.ts";
import { getBasisSet } from "../engine/basis/index.ts";

function bibEscape(s: string): string {
  return s.replace(/[{}]/g, "").replace(/\s+/g, " ").trim();
}

/** Parse one stored basis reference into a Paper (falls back to a @misc entry). */
export function basisPaper(key: string, stored: string): Paper {
  const lines = stored.split("\n").map((l) => l.trim()).filter(Boolean);
  const [authors = "", title = "", journalLine = "", doi = ""] = lines;
  const m = /^(.*?)\s+(\S+),\s*([^()]*?)\s*\((\d{4})\)\s*$/.exec(journalLine);
  const authorList = authors.split(/\.,\s*/).map((a, i, all) => (i < all.length - 1 ? `${a}.` : a)).filter(Boolean);
  const text = `${authorList.join(", ")}, "${title}", ${journalLine}.${doi ? ` doi:${doi}` : ""}`;
  const bib = m
    ? [`@article{${key},`, `  author = {${bibEscape(authorList.join(" and "))}},`, `  title = {${bibEscape(title)}},`, `  journal = {${bibEscape(m[1])}},`,
        `  volume = {${bibEscape(m[2])}},`, `  pages = {${bibEscape(m[3]).replace(/-/g, "--")}},`, `  year = {${m[4]}},`, ...(doi ? [`  doi = {${bibEscape(doi)}}`] : []), `}`]
    : [`@misc{${key},`, `  note = {${bibEscape(lines.join(". "))}}`, `}`];
  return { key, text, doi, bibtex: bib.join("\n").replace(/,\n}$/, "\n}") };
}

export interface Citations {
  methods: Paper[];
  basis: Paper[];
  fitting: Paper[];
  program: Paper;
}

export function citationsFor(r: FieldbookRecord): Citations {
  const seen = new Set<string>();
  const methods: Paper[] = [];
  for (const e of equationsFor(r)) for (const p of e.papers) if (!seen.has(p.key)) { seen.add(p.key); methods.push(p); }
  for (const p of [PAPERS.mulliken1955, PAPERS.lowdin1950]) if (r.properties && !seen.has(p.key)) { seen.add(p.key); methods.push(p); }
  const refs = (r.basis?.references ?? {}) as Record<string, string>;
  const basis = Object.keys(refs).sort().map((k) => basisPaper(k, refs[k]));
  const fitting: Paper[] = [];
  const mp2 = mp2Of(r);
  if (mp2?.fitting_basis) {
    // the record names the fitting set; its citation is the bundled library's static data
    try {
      const refsF = getBasisSet(mp2.fitting_basis).references as Record<string, string>;
      for (const k of Object.keys(refsF).sort()) if (!refs[k]) fitting.push(basisPaper(k, refsF[k]));
    } catch {
      // a fitting set not in this build's library: named on the page, no citation
    }
  }
  const e = r.provenance.engine;
  const key = `fieldbook${e.version.replace(/\W/g, "")}n${e.numerics}`;
  const program: Paper = {
    key,
    text: `${e.name} ${e.version} (numerics version ${e.numerics}), a TypeScript Hartree–Fock and MP2 program; input hash ${r.input_hash}.`,
    doi: "",
    bibtex: [`@software{${key},`, `  title = {${e.name}: Hartree-Fock and MP2 calculation archive},`, `  version = {${e.version}, numerics ${e.numerics}},`, `  note = {input hash ${r.input_hash}}`, `}`].join("\n"),
  };
  return { methods, basis, fitting, program };
}
