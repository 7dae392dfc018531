/**
 * Geometry of a spec: inline `xyz:` / `zmatrix:` text or a repository file, read with the
 * engine's readers so that their errors carry positions in the file the user edits.
 *
 * Inline text: the readers get the block's own source lines, padded with blank lines in front
 * and with their indentation kept, so the line and column numbers the readers report (and quote
 * in their messages, "line 7 has 5 fields") are those of the YAML file itself. A literal block
 * (`xyz: |`) keeps one atom per line; folded blocks (`>`) and multi-line quoted or plain
 * scalars join lines, so they are refused.
 */
import type { Scalar } from "yaml";
import { InputError } from "../engine/errors.ts";
import { type Atom, type LengthUnit, parseXyz, parseZMatrix } from "../engine/molecule.ts";
import type { SpecError } from "./errors.ts";

export interface GeometryRead {
  kind: "xyz" | "zmatrix";
  /** the geometry file (repo-relative), or null for inline text */
  file: string | null;
  /** the geometry text as written (block content, or the file's text) */
  text: string;
  atoms: Atom[];
  /** 1-based line of each atom in `where.file` */
  lines: number[];
  /** file the lines refer to: the spec or the geometry file */
  where: string;
  /** 1-based column of the first character of an atom line (for errors about a whole atom) */
  lineStart: (line: number) => number;
}

function splitLines(text: string): string[] {
  return text.split(/\r\n|\r|\n/);
}

const firstNonBlank = (line: string | undefined): number => {
  if (line === undefined) return 1;
  const m = /\S/.exec(line);
  return m ? m.index + 1 : 1;
};

export type InlineSource =
  | { ok: true; padded: string; value: string; lineStart: (line: number) => number }
  | { ok: false; error: Omit<SpecError, "file"> };

/**
 * The text to give the readers for an inline geometry scalar: its source lines at their own
 * line and column in the spec (blank-padded in front), so reader positions are file positions.
 */
export function inlineSource(specText: string, node: Scalar, key: string, linePos: (offset: number) => { line: number; col: number }): InlineSource {
  const value = String(node.value);
  const range = node.range!;
  const start = linePos(range[0]);
  const rawLines = splitLines(specText);
  const lineStart = (line: number) => firstNonBlank(rawLines[line - 1]);
  if (node.type === "BLOCK_LITERAL") {
    // content line k (1-based) of the value is source line header + k
    const valueLines = splitLines(value.replace(/\n$/, ""));
    const out: string[] = new Array<string>(start.line).fill("");
    for (let k = 0; k < valueLines.length; k++) {
      const raw = rawLines[start.line + k] ?? "";
      const v = valueLines[k];
      if (v.trim() === "") { out.push(""); continue; }
      if (!raw.endsWith(v) || raw.slice(0, raw.length - v.length).trim() !== "") {
        // unexpected layout (should not happen): fall back to the content as is, at the block start
        return { ok: true, padded: new Array<string>(start.line).fill("").join("\n") + "\n" + value, value, lineStart };
      }
      out.push(raw);
    }
    return { ok: true, padded: out.join("\n"), value, lineStart };
  }
  const end = linePos(Math.max(range[0], range[1] - 1));
  if (node.type === "BLOCK_FOLDED" || end.line !== start.line || value.includes("\n")) {
    return {
      ok: false,
      error: {
        code: "geometry-style",
        message: `write \`${key}\` as a literal block (\`${key}: |\`), so that every atom keeps its own line`,
        hint: `put "|" after "${key}:" and the atom lines below it, indented`,
        line: start.line,
        column: start.col,
      },
    };
  }
  // one line: plain, or quoted without escapes, keeps its columns
  const quoted = node.type === "QUOTE_DOUBLE" || node.type === "QUOTE_SINGLE";
  const sourceText = specText.slice(range[0] + (quoted ? 1 : 0), range[0] + (quoted ? 1 : 0) + value.length);
  const exact = sourceText === value;
  const pad = new Array<string>(start.line - 1).fill("").join("\n") + (start.line > 1 ? "\n" : "");
  const indent = " ".repeat(start.col - 1 + (quoted ? 1 : 0));
  return { ok: true, padded: exact ? pad + indent + value : pad + value, value, lineStart };
}

/** Line-level XYZ faults: the reader can go on after blanking the line. */
const XYZ_LINE_CODES = new Set(["xyz-field-count", "xyz-coordinate-invalid", "xyz-coordinate-not-finite", "element-unknown"]);
/** At most this many geometry errors are reported per geometry. */
const MAX_GEOMETRY_ERRORS = 20;

/**
 * Read a geometry; on failure returns its errors placed in `where` (spec or geometry file).
 * XYZ lines are independent, so every faulty atom line is reported (up to 20); a Z-matrix
 * stops at its first error, since later lines refer to earlier ones.
 */
export function readGeometry(
  kind: "xyz" | "zmatrix",
  padded: string,
  units: LengthUnit,
  where: string,
): { ok: true; atoms: Atom[]; lines: number[] } | { ok: false; errors: SpecError[] } {
  const lines = splitLines(padded);
  const errors: SpecError[] = [];
  for (;;) {
    try {
      const text = lines.join("\n");
      const g = kind === "xyz" ? parseXyz(text, { units, source: where }) : parseZMatrix(text, { units, source: where });
      if (errors.length) return { ok: false, errors };
      return { ok: true, atoms: g.atoms, lines: g.lines };
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      // once a line is blanked, the count line and emptiness no longer tell anything
      if (errors.length && (e.code === "xyz-count-mismatch" || e.code === "xyz-empty")) return { ok: false, errors };
      const line = e.where.line ?? firstContentLine(lines);
      const err: SpecError = { code: e.code, message: e.message, file: where, line, column: e.where.column ?? firstNonBlank(lines[line - 1]) };
      if (e.hint) err.hint = e.hint;
      errors.push(err);
      const retry = kind === "xyz" && XYZ_LINE_CODES.has(e.code) && e.where.line !== undefined && errors.length < MAX_GEOMETRY_ERRORS;
      if (!retry) return { ok: false, errors };
      lines[e.where.line! - 1] = "";
    }
  }
}

function firstContentLine(lines: string[]): number {
  const i = lines.findIndex((l) => l.trim() !== "");
  return i < 0 ? 1 : i + 1;
}

/** Geometry kind of a file, from its extension. */
export function geometryKindOfFile(path: string): "xyz" | "zmatrix" | null {
  const lower = path.toLowerCase();
  if (lower.endsWith(".xyz")) return "xyz";
  if (lower.endsWith(".zmat")) return "zmatrix";
  return null;
}


export { firstNonBlank };
