/**
 * XYZ reader.
 *
 * Accepts either
 *   - a standard XYZ file: a line with the atom count alone, a comment line (any text, may be
 *     empty), then one line per atom; or
 *   - a bare list of atom lines (no count, no comment), as written inline in a spec.
 * The text is read as a standard file when its first non-blank line is a single non-negative
 * integer; otherwise as a bare list. Blank lines between atom lines are ignored.
 *
 * An atom line is `E x y z`: E an element symbol (any letter case) or an atomic number,
 * then three decimal numbers in the given unit. Errors carry the 1-based line and column of the
 * offending token.
 */
import { InputError, type InputLocation } from "../errors.ts";
import { elementBySymbol, elementByZ, type Element } from "../elements.ts";
import { lengthToBohr, endColumn, isDigits, readNumber, splitLines, tokenize, type Token } from "./tokens.ts";
import type { Atom, GeometryReadOptions, ParsedGeometry } from "./types.ts";

export interface XyzGeometry extends ParsedGeometry {
  /** the comment line of a standard XYZ file; null for a bare atom list */
  comment: string | null;
}

function at(source: string | undefined, line: number, column?: number): InputLocation {
  const w: InputLocation = {};
  if (source !== undefined) w.source = source;
  w.line = line;
  if (column !== undefined) w.column = column;
  return w;
}

/** Element named by a token: symbol (case-insensitive) or atomic number. */
export function readElementToken(tok: Token, source: string | undefined, line: number): Element {
  const where = at(source, line, tok.column);
  if (isDigits(tok.text)) return elementByZ(Number(tok.text), where);
  return elementBySymbol(tok.text, where);
}

export function parseXyz(text: string, options: GeometryReadOptions): XyzGeometry {
  const { source } = options;
  const toBohr = lengthToBohr(options.units, source);
  const lines = splitLines(text);
  const first = lines.findIndex((l) => l.trim() !== "");
  if (first < 0) {
    throw new InputError("xyz-empty", "the geometry has no atoms", {
      hint: "write one line per atom: symbol x y z",
      where: at(source, 1, 1),
    });
  }

  const firstTokens = tokenize(lines[first]);
  const standard = firstTokens.length === 1 && isDigits(firstTokens[0].text);
  let comment: string | null = null;
  let start = first;
  let declared = -1;
  if (standard) {
    declared = Number(firstTokens[0].text);
    comment = first + 1 < lines.length ? lines[first + 1] : "";
    start = first + 2;
  }

  const atoms: Atom[] = [];
  const atomLines: number[] = [];
  for (let i = start; i < lines.length; i++) {
    const raw = lines[i];
    const lineNo = i + 1;
    const toks = tokenize(raw);
    if (toks.length === 0) continue;
    if (toks.length !== 4) {
      const column = toks.length > 4 ? toks[4].column : endColumn(raw);
      throw new InputError(
        "xyz-field-count",
        `an atom line needs 4 fields (element x y z), but line ${lineNo} has ${toks.length}`,
        {
          hint:
            toks.length > 4
              ? "remove the extra fields after the z coordinate"
              : standard && i === start && atoms.length === 0 && declared > 0
                ? "an XYZ file has a count line, a comment line, then atom lines"
                : "write the element and its three coordinates, separated by spaces",
          where: at(source, lineNo, column),
        },
      );
    }
    const el = readElementToken(toks[0], source, lineNo);
    const xyz = [0, 0, 0] as [number, number, number];
    for (let k = 0; k < 3; k++) {
      const tok = toks[k + 1];
      const v = readNumber(tok.text);
      const axis = "xyz"[k];
      if (v === "not-finite") {
        throw new InputError("xyz-coordinate-not-finite", `the ${axis} coordinate ${JSON.stringify(tok.text)} on line ${lineNo} is not a finite number`, {
          hint: "coordinates must be ordinary finite numbers",
          where: at(source, lineNo, tok.column),
        });
      }
      if (v === "not-a-number") {
        throw new InputError("xyz-coordinate-invalid", `the ${axis} coordinate ${JSON.stringify(tok.text)} on line ${lineNo} is not a number`, {
          hint: "write coordinates as decimal numbers such as -0.757 or 1.2e-3",
          where: at(source, lineNo, tok.column),
        });
      }
      xyz[k] = toBohr(v) + 0; // + 0 turns -0 into 0
    }
    atoms.push({ symbol: el.symbol, z: el.z, xyz });
    atomLines.push(lineNo);
  }

  if (standard && declared !== atoms.length) {
    throw new InputError(
      "xyz-count-mismatch",
      `the count line says ${declared} atom${declared === 1 ? "" : "s"}, but ${atoms.length} atom line${atoms.length === 1 ? "" : "s"} follow${atoms.length === 1 ? "s" : ""}`,
      {
        hint: `change the count to ${atoms.length}, or add or remove atom lines`,
        where: at(source, first + 1, firstTokens[0].column),
      },
    );
  }
  if (atoms.length === 0) {
    throw new InputError("xyz-empty", "the geometry has no atoms", {
      hint: "write one line per atom: symbol x y z",
      where: at(source, first + 1, 1),
    });
  }
  return { atoms, lines: atomLines, comment };
}
