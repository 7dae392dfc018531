/**
 * Z-matrix reader.
 *
 * Layout: one line per atom, then optionally the variables.
 *   atom 1:  E
 *   atom 2:  E  i r
 *   atom 3:  E  i r  j a
 *   atom 4+: E  i r  j a  k d
 * E is an element symbol (any case) or an atomic number, optionally followed by a label suffix
 * that starts with a non-letter (O1, H2, H_a); the leading letters must be the element symbol.
 * r is the distance to atom i (in the given length unit), a the angle (degrees) new–i–j, strictly
 * between 0 and 180, and d the dihedral angle (degrees) new–i–j–k, any finite value, IUPAC sign
 * convention (positive when, looking along i→j, the bond new–i must turn clockwise to eclipse j–k).
 *
 * A reference (i, j, k) is one of
 *   - a 1-based atom index (1, 2, …) of an earlier line;
 *   - the label of an earlier atom exactly as written on its line (case-insensitive), when the
 *     user labelled atoms (e.g. O1, H1, H2);
 *   - element symbol + 1-based atom index (O1 = atom 1, which must be an O), for unlabelled atoms.
 * A value is a decimal number or the name of a variable, optionally negated (`-phi`).
 * Variables follow the atom lines (after a blank line, a `variables:` line, or directly), one
 * per line as `name = value`.
 *
 * Cartesian placement (bohr): atom 1 at the origin; atom 2 on the +z axis; atom 3 in the xz plane
 * with x ≥ 0; every further atom from its distance, angle and dihedral ("natural extension
 * reference frame" construction). The whole frame is fixed by this choice, so the same
 * Z-matrix always gives the same coordinates.
 */
import { InputError, type InputLocation } from "../errors.ts";
import type { Element } from "../elements.ts";
import { elementBySymbol } from "../elements.ts";
import { didYouMean } from "../suggest.ts";
import { lengthToBohr, endColumn, isDigits, readNumber, splitLines, tokenize, type Token } from "./tokens.ts";
import { readElementToken } from "./xyz.ts";
import type { Atom, GeometryReadOptions, ParsedGeometry } from "./types.ts";

export interface ZMatrixGeometry extends ParsedGeometry {
  /** the first token of each atom line, as written */
  labels: string[];
  /** the variables as defined (numbers as written; not converted to bohr) */
  variables: Record<string, number>;
}

type Vec = [number, number, number];

interface RawAtom {
  line: number;
  text: string;
  tokens: Token[];
  element: Element;
  label: string;
  /** lower-cased label when the user labelled the atom (label ≠ bare symbol), else null */
  explicit: string | null;
}

interface VariableDef {
  value: number;
  line: number;
}

/** Collinearity threshold: |sin| of the angle at the middle dihedral reference atom. */
const COLLINEAR_SIN = 1e-6;

function at(source: string | undefined, line: number, column?: number): InputLocation {
  const w: InputLocation = {};
  if (source !== undefined) w.source = source;
  w.line = line;
  if (column !== undefined) w.column = column;
  return w;
}

const VARIABLES_HEADER = /^\s*variables\s*:\s*$/i;
const VARIABLE_LINE = /^(\s*)([A-Za-z_][A-Za-z0-9_]*)(\s*=\s*)(\S+)\s*$/;
const NAME = /^([+-]?)([A-Za-z_][A-Za-z0-9_]*)$/;

function elementOfLabel(tok: Token, source: string | undefined, line: number): Element {
  if (isDigits(tok.text)) return readElementToken(tok, source, line);
  const letters = /^[A-Za-z]+/.exec(tok.text);
  if (!letters) {
    throw new InputError("element-unknown", `line ${line} must start with an element symbol, not ${JSON.stringify(tok.text)}`, {
      hint: "begin each Z-matrix line with the element symbol, e.g. O or H1",
      where: at(source, line, tok.column),
    });
  }
  return elementBySymbol(letters[0], at(source, line, tok.column));
}

const sub = (a: Vec, b: Vec): Vec => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const dot = (a: Vec, b: Vec) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const cross = (a: Vec, b: Vec): Vec => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const norm = (a: Vec) => Math.sqrt(dot(a, a));
const scale = (a: Vec, s: number): Vec => [a[0] * s, a[1] * s, a[2] * s];
const unit = (a: Vec): Vec => scale(a, 1 / norm(a));

export function parseZMatrix(text: string, options: GeometryReadOptions): ZMatrixGeometry {
  const { source } = options;
  const toBohr = lengthToBohr(options.units, source);
  const lines = splitLines(text);

  // ---- split into atom lines and variable lines ----
  const raw: RawAtom[] = [];
  const variables = new Map<string, VariableDef>();
  let i = 0;
  while (i < lines.length && lines[i].trim() === "") i++;
  for (; i < lines.length; i++) {
    const l = lines[i];
    if (l.trim() === "" || VARIABLES_HEADER.test(l) || VARIABLE_LINE.test(l)) break;
    const tokens = tokenize(l);
    const element = elementOfLabel(tokens[0], source, i + 1);
    const label = tokens[0].text;
    const explicit = label.toLowerCase() === element.symbol.toLowerCase() || isDigits(label) ? null : label.toLowerCase();
    if (explicit !== null) {
      const prev = raw.find((r) => r.explicit === explicit);
      if (prev) {
        throw new InputError("zmatrix-label-duplicate", `the label ${JSON.stringify(label)} on line ${i + 1} is already used on line ${prev.line}`, {
          hint: "give each labelled atom a different label",
          where: at(source, i + 1, tokens[0].column),
        });
      }
    }
    raw.push({ line: i + 1, text: l, tokens, element, label, explicit });
  }
  for (; i < lines.length; i++) {
    const l = lines[i];
    if (l.trim() === "" || VARIABLES_HEADER.test(l)) continue;
    const m = VARIABLE_LINE.exec(l);
    if (!m) {
      throw new InputError("zmatrix-variable-syntax", `line ${i + 1} is not a variable definition`, {
        hint: "after the atom lines, define variables as name = value (and keep the atom lines free of blank lines)",
        where: at(source, i + 1, l.length - l.trimStart().length + 1),
      });
    }
    const [, lead, name, eq, valueText] = m;
    const nameCol = lead.length + 1;
    const valueCol = lead.length + name.length + eq.length + 1;
    const v = readNumber(valueText);
    if (typeof v !== "number") {
      throw new InputError("zmatrix-value-invalid", `the value ${JSON.stringify(valueText)} of variable ${name} on line ${i + 1} is not a finite number`, {
        hint: "write the value as a decimal number, e.g. 0.9572 or 104.52",
        where: at(source, i + 1, valueCol),
      });
    }
    const prev = variables.get(name);
    if (prev) {
      throw new InputError("zmatrix-variable-duplicate", `variable ${name} on line ${i + 1} is already defined on line ${prev.line}`, {
        hint: "define each variable once",
        where: at(source, i + 1, nameCol),
      });
    }
    variables.set(name, { value: v, line: i + 1 });
  }
  if (raw.length === 0) {
    throw new InputError("zmatrix-empty", "the Z-matrix has no atoms", {
      hint: "write one line per atom: the first atom alone, then E i r, E i r j a, E i r j a k d",
      where: at(source, 1, 1),
    });
  }

  // ---- helpers that read one line's references and values ----
  const names = [...variables.keys()];

  function value(tok: Token, line: number): { v: number; from: string | null } {
    const n = readNumber(tok.text);
    if (typeof n === "number") return { v: n, from: null };
    if (n === "not-finite") {
      throw new InputError("zmatrix-value-invalid", `${JSON.stringify(tok.text)} on line ${line} is not a finite number`, {
        hint: "write an ordinary decimal number or a variable name",
        where: at(source, line, tok.column),
      });
    }
    const m = NAME.exec(tok.text);
    if (!m) {
      throw new InputError("zmatrix-value-invalid", `${JSON.stringify(tok.text)} on line ${line} is neither a number nor a variable name`, {
        hint: "write a decimal number, a variable name, or -name for a negated variable",
        where: at(source, line, tok.column),
      });
    }
    const def = variables.get(m[2]);
    if (!def) {
      const near = didYouMean(m[2], names);
      throw new InputError("zmatrix-variable-unknown", `unknown variable ${JSON.stringify(m[2])} on line ${line}`, {
        hint: near ?? (names.length ? `defined variables: ${names.join(", ")}` : "define it after the atom lines as name = value"),
        where: at(source, line, tok.column),
      });
    }
    return { v: m[1] === "-" ? -def.value : def.value, from: m[2] };
  }

  function reference(tok: Token, self: number, line: number): number {
    const t = tok.text;
    const where = at(source, line, tok.column);
    if (isDigits(t)) {
      const n = Number(t);
      if (n >= 1 && n <= self) return n - 1;
      if (n > self) {
        throw new InputError("zmatrix-reference-undefined", `line ${line} (atom ${self + 1}) refers to atom ${n}, which is not defined yet`, {
          hint: `refer only to atoms on earlier lines (1 to ${self})`,
          where,
        });
      }
      throw new InputError("zmatrix-reference-unknown", `line ${line} refers to atom 0; atoms are numbered from 1`, { hint: `use 1 to ${self}`, where });
    }
    const lower = t.toLowerCase();
    const labelled = raw.findIndex((r) => r.explicit === lower);
    if (labelled >= 0 && labelled < self) return labelled;
    if (labelled >= self) {
      throw new InputError("zmatrix-reference-undefined", `line ${line} (atom ${self + 1}) refers to ${t}, which is defined later (line ${raw[labelled].line})`, {
        hint: "refer only to atoms on earlier lines",
        where,
      });
    }
    const m = /^([A-Za-z]{1,2})(\d+)$/.exec(t);
    if (m) {
      const n = Number(m[2]);
      if (n >= 1 && n <= raw.length && raw[n - 1].element.symbol.toLowerCase() === m[1].toLowerCase()) {
        if (n <= self) return n - 1;
        throw new InputError("zmatrix-reference-undefined", `line ${line} (atom ${self + 1}) refers to ${t} (atom ${n}), which is not defined yet`, {
          hint: `refer only to atoms on earlier lines (1 to ${self})`,
          where,
        });
      }
    }
    const known = raw.slice(0, self).flatMap((r, idx) => (r.explicit ? [r.label] : [`${r.element.symbol}${idx + 1}`]));
    throw new InputError("zmatrix-reference-unknown", `line ${line} refers to ${JSON.stringify(t)}, which is not an earlier atom`, {
      hint: didYouMean(t, known) ?? `refer to an earlier atom by its number (1 to ${self}) or its label (${known.join(", ")})`,
      where,
    });
  }

  // ---- build Cartesian coordinates ----
  const pos: Vec[] = [];
  for (let n = 0; n < raw.length; n++) {
    const r = raw[n];
    const want = 1 + 2 * Math.min(n, 3);
    if (r.tokens.length !== want) {
      const shape = ["E", "E i r", "E i r j a", "E i r j a k d"][Math.min(n, 3)];
      throw new InputError(
        "zmatrix-field-count",
        `line ${r.line} (atom ${n + 1}) needs ${want} field${want === 1 ? "" : "s"} (${shape}), but has ${r.tokens.length}`,
        {
          hint:
            n === 0
              ? "the first atom stands alone: only its element"
              : `atom ${n + 1} is placed by ${["", "a distance", "a distance and an angle", "a distance, an angle and a dihedral"][Math.min(n, 3)]}`,
          where: at(source, r.line, r.tokens.length > want ? r.tokens[want].column : endColumn(r.text)),
        },
      );
    }
    const refs: number[] = [];
    const refTokens: Token[] = [];
    for (let k = 0; k < Math.min(n, 3); k++) {
      const tok = r.tokens[1 + 2 * k];
      const idx = reference(tok, n, r.line);
      const dup = refs.indexOf(idx);
      if (dup >= 0) {
        throw new InputError("zmatrix-reference-repeated", `line ${r.line} uses atom ${idx + 1} twice as a reference`, {
          hint: "the distance, angle and dihedral references must be three different atoms",
          where: at(source, r.line, tok.column),
        });
      }
      refs.push(idx);
      refTokens.push(tok);
    }

    if (n === 0) {
      pos.push([0, 0, 0]);
      continue;
    }
    const rTok = r.tokens[2];
    const dist = value(rTok, r.line);
    if (!(dist.v > 0)) {
      throw new InputError("zmatrix-distance-invalid", `the distance on line ${r.line} is ${dist.v}${dist.from ? ` (variable ${dist.from})` : ""}; it must be positive`, {
        hint: "bond distances are positive lengths",
        where: at(source, r.line, rTok.column),
      });
    }
    const R = toBohr(dist.v);
    const A = pos[refs[0]];
    if (n === 1) {
      pos.push([A[0], A[1], A[2] + R]);
      continue;
    }
    const aTok = r.tokens[4];
    const ang = value(aTok, r.line);
    if (!(ang.v > 0 && ang.v < 180)) {
      throw new InputError("zmatrix-angle-range", `the angle on line ${r.line} is ${ang.v}°${ang.from ? ` (variable ${ang.from})` : ""}; it must lie strictly between 0 and 180 degrees`, {
        hint: "angles are in degrees, 0 < angle < 180; for a linear arrangement use Cartesian coordinates",
        where: at(source, r.line, aTok.column),
      });
    }
    const theta = (ang.v * Math.PI) / 180;
    const B = pos[refs[1]];
    if (n === 2) {
      // atoms 1 and 2 lie on the z axis, so u = ±z and x is perpendicular to it: place in the xz plane, x ≥ 0
      const u = unit(sub(B, A));
      const d = [Math.sin(theta) + Math.cos(theta) * u[0], Math.cos(theta) * u[1], Math.cos(theta) * u[2]] as Vec;
      pos.push([A[0] + R * d[0], A[1] + R * d[1], A[2] + R * d[2]]);
      continue;
    }
    const dTok = r.tokens[6];
    const dih = value(dTok, r.line);
    const C = pos[refs[2]];
    // new atom D bonded to A, angle D–A–B, dihedral D–A–B–C
    const ab = sub(B, A);
    const bc = sub(C, B);
    const nrm = cross(ab, bc);
    if (norm(nrm) / (norm(ab) * norm(bc)) < COLLINEAR_SIN) {
      throw new InputError(
        "zmatrix-collinear",
        `the reference atoms ${refs[0] + 1}, ${refs[1] + 1} and ${refs[2] + 1} of line ${r.line} lie on one line, so the dihedral is undefined`,
        {
          hint: "choose a dihedral reference atom that is not on the line through the other two",
          where: at(source, r.line, refTokens[2].column),
        },
      );
    }
    const phi = (dih.v * Math.PI) / 180;
    const e1 = unit(sub(A, B)); // along B→A
    const e3 = unit(cross(bc, ab)); // normal to the plane (A, B, C)
    const e2 = cross(e3, e1);
    const local: Vec = [-R * Math.cos(theta), R * Math.sin(theta) * Math.cos(phi), R * Math.sin(theta) * Math.sin(phi)];
    pos.push([
      A[0] + local[0] * e1[0] + local[1] * e2[0] + local[2] * e3[0],
      A[1] + local[0] * e1[1] + local[1] * e2[1] + local[2] * e3[1],
      A[2] + local[0] * e1[2] + local[1] * e2[2] + local[2] * e3[2],
    ]);
  }

  const atoms: Atom[] = raw.map((r, n) => ({
    symbol: r.element.symbol,
    z: r.element.z,
    xyz: [pos[n][0] + 0, pos[n][1] + 0, pos[n][2] + 0], // + 0 turns -0 into 0
  }));
  return {
    atoms,
    lines: raw.map((r) => r.line),
    labels: raw.map((r) => r.label),
    variables: Object.fromEntries([...variables].map(([k, d]) => [k, d.value])),
  };
}
