/**
 * The equations a calculation used, rendered with KaTeX at build time (no client script), each
 * with the citation of the paper it comes from. Only the equations that apply to a record are
 * selected (reference, correlation variant, SCS, density fitting, DIIS).
 */
import katex from "katex";
import type { FieldbookRecord } from "../archive/record.ts";
import { mp2Of } from "./summary.ts";

export interface Paper {
  key: string;
  text: string;
  doi: string;
  bibtex: string;
}

/** BibTeX accents to plain text for the human-readable citation. */
export function untex(s: string): string {
  return s.replace(/\{\\o\}/g, "ø").replace(/\{\\"a\}/g, "ä").replace(/\{\\"o\}/g, "ö").replace(/\{\\"u\}/g, "ü").replace(/--/g, "–");
}

function paper(key: string, authors: string, title: string, journal: string, volume: string, pages: string, year: number, doi: string): Paper {
  const text = untex(`${authors.split(" and ").join(", ")}, "${title}", ${journal} ${volume}, ${pages} (${year}).`);
  const bibtex = [
    `@article{${key},`,
    `  author = {${authors}},`,
    `  title = {${title}},`,
    `  journal = {${journal}},`,
    `  volume = {${volume}},`,
    `  pages = {${pages}},`,
    `  year = {${year}},`,
    `  doi = {${doi}}`,
    `}`,
  ].join("\n");
  return { key, text, doi, bibtex };
}

export const PAPERS = {
  roothaan1951: paper("roothaan1951", "C. C. J. Roothaan", "New Developments in Molecular Orbital Theory", "Rev. Mod. Phys.", "23", "69--89", 1951, "10.1103/RevModPhys.23.69"),
  hall1951: paper("hall1951", "G. G. Hall", "The molecular orbital theory of chemical valency VIII. A method of calculating ionization potentials", "Proc. R. Soc. Lond. A", "205", "541--552", 1951, "10.1098/rspa.1951.0048"),
  pople1954: paper("pople1954", "J. A. Pople and R. K. Nesbet", "Self-Consistent Orbitals for Radicals", "J. Chem. Phys.", "22", "571--572", 1954, "10.1063/1.1740120"),
  roothaan1960: paper("roothaan1960", "C. C. J. Roothaan", "Self-Consistent Field Theory for Open Shells of Electronic Systems", "Rev. Mod. Phys.", "32", "179--185", 1960, "10.1103/RevModPhys.32.179"),
  guest1974: paper("guest1974", "M. F. Guest and V. R. Saunders", "On methods for converging open-shell Hartree-Fock wave-functions", "Mol. Phys.", "28", "819--828", 1974, "10.1080/00268977400102171"),
  pulay1980: paper("pulay1980", "P. Pulay", "Convergence acceleration of iterative sequences. The case of SCF iteration", "Chem. Phys. Lett.", "73", "393--398", 1980, "10.1016/0009-2614(80)80396-4"),
  pulay1982: paper("pulay1982", "P. Pulay", "Improved SCF convergence acceleration", "J. Comput. Chem.", "3", "556--560", 1982, "10.1002/jcc.540030413"),
  moller1934: paper("moller1934", "C. M{\\o}ller and M. S. Plesset", "Note on an Approximation Treatment for Many-Electron Systems", "Phys. Rev.", "46", "618--622", 1934, "10.1103/PhysRev.46.618"),
  grimme2003: paper("grimme2003", "S. Grimme", "Improved second-order M{\\o}ller-Plesset perturbation theory by separate scaling of parallel- and antiparallel-spin pair correlation energies", "J. Chem. Phys.", "118", "9095--9102", 2003, "10.1063/1.1569242"),
  feyereisen1993: paper("feyereisen1993", "M. Feyereisen and G. Fitzgerald and A. Komornicki", "Use of approximate integrals in ab initio theory. An application in MP2 energy calculations", "Chem. Phys. Lett.", "208", "359--363", 1993, "10.1016/0009-2614(93)87156-W"),
  weigend1997: paper("weigend1997", "F. Weigend and M. H{\\\"a}ser", "RI-MP2: first derivatives and global consistency", "Theor. Chem. Acc.", "97", "331--340", 1997, "10.1007/s002140050269"),
  mulliken1955: paper("mulliken1955", "R. S. Mulliken", "Electronic Population Analysis on LCAO-MO Molecular Wave Functions. I", "J. Chem. Phys.", "23", "1833--1840", 1955, "10.1063/1.1740588"),
  lowdin1950: paper("lowdin1950", "P.-O. L{\\\"o}wdin", "On the Non-Orthogonality Problem Connected with the Use of Atomic Wave Functions in the Theory of Molecules and Crystals", "J. Chem. Phys.", "18", "365--375", 1950, "10.1063/1.1747632"),
} satisfies Record<string, Paper>;

export interface Equation {
  id: string;
  title: string;
  /** KaTeX HTML (display mode) */
  html: string;
  /** what the symbols mean and how the engine uses it */
  note: string;
  papers: Paper[];
}

/** Render TeX to KaTeX HTML; a TeX error is a bug in this file, so it throws (throwOnError). */
export function tex(source: string, display = true): string {
  return katex.renderToString(source, { displayMode: display, throwOnError: true, output: "htmlAndMathml", strict: "error" });
}

function eq(id: string, title: string, source: string, note: string, papers: Paper[]): Equation {
  return { id, title, html: tex(source), note, papers };
}

/** The equations behind a record, in the order a reader needs them. */
export function equationsFor(r: FieldbookRecord): Equation[] {
  const m = r.spec.model;
  const out: Equation[] = [];
  const P = PAPERS;
  if (m.reference === "rhf") {
    out.push(eq("roothaan-hall", "Roothaan–Hall equations (RHF)", String.raw`\mathbf{F}\mathbf{C} = \mathbf{S}\mathbf{C}\boldsymbol{\varepsilon}`,
      "F: Fock matrix, C: orbital coefficients, S: overlap matrix, ε: diagonal matrix of orbital energies; solved after canonical orthogonalization.", [P.roothaan1951, P.hall1951]));
    out.push(eq("fock", "Fock matrix (closed shell)", String.raw`F_{\mu\nu} = H_{\mu\nu} + \sum_{\lambda\sigma} D_{\lambda\sigma}\left[(\mu\nu|\lambda\sigma) - \tfrac{1}{2}(\mu\lambda|\nu\sigma)\right],\quad D_{\lambda\sigma} = 2\sum_{i}^{\mathrm{occ}} C_{\lambda i}C_{\sigma i}`,
      "H: core Hamiltonian (kinetic + nuclear attraction), (μν|λσ): two-electron integrals in chemists' notation, D: total density matrix.", [P.roothaan1951]));
    out.push(eq("energy", "SCF energy", String.raw`E_{\mathrm{SCF}} = \tfrac{1}{2}\sum_{\mu\nu} D_{\nu\mu}\left(H_{\mu\nu} + F_{\mu\nu}\right) + E_{\mathrm{nuc}}`,
      "E_nuc: nuclear repulsion energy.", [P.roothaan1951]));
  } else {
    out.push(eq("pople-nesbet", "Pople–Nesbet equations (spin-unrestricted)", String.raw`\mathbf{F}^{\alpha}\mathbf{C}^{\alpha} = \mathbf{S}\mathbf{C}^{\alpha}\boldsymbol{\varepsilon}^{\alpha},\qquad \mathbf{F}^{\beta}\mathbf{C}^{\beta} = \mathbf{S}\mathbf{C}^{\beta}\boldsymbol{\varepsilon}^{\beta}`,
      m.reference === "uhf" ? "Separate orbitals for α and β electrons, coupled through the Coulomb term." : "The spin Fock matrices Fα and Fβ from which the ROHF effective Fock matrix below is assembled.", [P.pople1954]));
    out.push(eq("fock", "Spin Fock matrices", String.raw`F^{\alpha}_{\mu\nu} = H_{\mu\nu} + \sum_{\lambda\sigma}\left[D^{\mathrm{T}}_{\lambda\sigma}(\mu\nu|\lambda\sigma) - D^{\alpha}_{\lambda\sigma}(\mu\lambda|\nu\sigma)\right],\quad \mathbf{D}^{\mathrm{T}} = \mathbf{D}^{\alpha} + \mathbf{D}^{\beta}`,
      "Fβ likewise, with Dβ in the exchange term; Dα and Dβ are built from the occupied α and β orbitals.", [P.pople1954]));
    if (m.reference === "rohf") {
      out.push(eq("rohf", "ROHF effective Fock matrix (fieldbook convention)", String.raw`\tilde{\mathbf{F}} = \begin{pmatrix} F_c & F^{\beta} & F_c \\ F^{\beta} & F_c & F^{\alpha} \\ F_c & F^{\alpha} & F_c \end{pmatrix}_{\text{closed, open, virtual}},\qquad F_c = \tfrac{1}{2}\left(F^{\alpha}+F^{\beta}\right)`,
        "Blocks in the basis of the current orbitals (closed, open, virtual). Its eigenvalues are the reported ROHF orbital energies; they depend on this choice of diagonal blocks, the energy does not. Koopmans' theorem is not applied to ROHF.", [P.roothaan1960, P.guest1974]));
    }
    out.push(eq("energy", "SCF energy", String.raw`E_{\mathrm{SCF}} = \tfrac{1}{2}\sum_{\mu\nu}\left[D^{\mathrm{T}}_{\nu\mu}H_{\mu\nu} + D^{\alpha}_{\nu\mu}F^{\alpha}_{\mu\nu} + D^{\beta}_{\nu\mu}F^{\beta}_{\mu\nu}\right] + E_{\mathrm{nuc}}`,
      "E_nuc: nuclear repulsion energy.", [P.pople1954]));
  }
  if (r.spec.convergence.accelerator === "diis") {
    out.push(eq("diis", "DIIS error vector and extrapolation", String.raw`\mathbf{e}_k = \mathbf{F}_k\mathbf{D}_k\mathbf{S} - \mathbf{S}\mathbf{D}_k\mathbf{F}_k,\qquad \mathbf{F} = \sum_k c_k \mathbf{F}_k,\ \ \min_{c}\Big\|\sum_k c_k\mathbf{e}_k\Big\|\ \text{subject to}\ \sum_k c_k = 1`,
      `The commutator vanishes at convergence; the "DIIS error" in the convergence history is its largest absolute element in the orthonormal basis${m.reference === "rohf" ? " (for ROHF: of the effective Fock matrix's orbital gradient)" : ""}. Up to ${(r.scf?.settings as { diis_size?: number } | undefined)?.diis_size ?? 8} previous Fock matrices are kept.`, [P.pulay1980, P.pulay1982]));
  }
  const mp2 = mp2Of(r);
  if (m.correlation !== "none") {
    if (m.reference === "uhf") {
      out.push(eq("mp2", "UMP2 correlation energy", String.raw`E^{(2)} = \underbrace{\tfrac{1}{4}\sum_{ijab}^{\alpha\alpha}\frac{|\langle ij\|ab\rangle|^2}{\Delta_{ij}^{ab}} + \tfrac{1}{4}\sum_{ijab}^{\beta\beta}\frac{|\langle ij\|ab\rangle|^2}{\Delta_{ij}^{ab}}}_{E_{\mathrm{SS}}} + \underbrace{\sum_{ia}^{\alpha}\sum_{jb}^{\beta}\frac{(ia|jb)^2}{\Delta_{ij}^{ab}}}_{E_{\mathrm{OS}}},\quad \Delta_{ij}^{ab} = \varepsilon_i+\varepsilon_j-\varepsilon_a-\varepsilon_b`,
        "⟨ij‖ab⟩ = (ia|jb) − (ib|ja); i, j occupied (active) and a, b virtual spin orbitals of the UHF reference.", [P.moller1934]));
    } else {
      out.push(eq("mp2", "RMP2 correlation energy", String.raw`E^{(2)} = \underbrace{\sum_{ijab}\frac{(ia|jb)^2}{\Delta_{ij}^{ab}}}_{E_{\mathrm{OS}}} + \underbrace{\sum_{ijab}\frac{(ia|jb)\left[(ia|jb)-(ib|ja)\right]}{\Delta_{ij}^{ab}}}_{E_{\mathrm{SS}}},\quad \Delta_{ij}^{ab} = \varepsilon_i+\varepsilon_j-\varepsilon_a-\varepsilon_b`,
        "i, j: active occupied, a, b: virtual spatial orbitals of the RHF reference; (ia|jb) in the molecular orbital basis.", [P.moller1934]));
    }
    if (m.correlation === "scs-mp2") {
      const cos = mp2?.scs.opposite_spin_scale ?? 6 / 5;
      const css = mp2?.scs.same_spin_scale ?? 1 / 3;
      out.push(eq("scs", "Spin-component scaling", String.raw`E_{\mathrm{SCS}}^{(2)} = c_{\mathrm{OS}}\,E_{\mathrm{OS}} + c_{\mathrm{SS}}\,E_{\mathrm{SS}},\qquad c_{\mathrm{OS}} = ${fracTex(cos)},\ \ c_{\mathrm{SS}} = ${fracTex(css)}`,
        "The same-spin and opposite-spin parts above, scaled separately.", [P.grimme2003]));
    }
    if (m.density_fitting) {
      out.push(eq("df", "Density fitting of the MP2 integrals", String.raw`(ia|jb) \approx \sum_{PQ}(ia|P)\,\left[\mathbf{J}^{-1}\right]_{PQ}\,(Q|jb),\qquad J_{PQ} = (P|Q)`,
        `P, Q: functions of the auxiliary (fitting) basis${mp2?.fitting_basis ? ` ${mp2.fitting_basis}` : ""}; Coulomb metric.`, [P.feyereisen1993, P.weigend1997]));
    }
  }
  return out;
}

function fracTex(x: number): string {
  for (let d = 1; d <= 12; d++) {
    const n = Math.round(x * d);
    if (Math.abs(n / d - x) < 1e-12) return d === 1 ? `${n}` : `\\tfrac{${n}}{${d}}`;
  }
  return x.toPrecision(6);
}
