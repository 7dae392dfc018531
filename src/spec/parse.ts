/**
 * YAML text → NormalizedSpec, with every error located (file, line, column), explained, and
 * collected (not just the first).
 *
 * Stages: YAML syntax (and duplicate keys, alias bombs) → structure against the schema
 * (./schema.ts; unknown keys, types, enums, ranges, defaults) → meaning: id, geometry (engine
 * readers, positions translated to the spec), basis names and element coverage, fitting basis,
 * physics (charge/multiplicity parity, RHF on open shells, atoms too close), method
 * combinations, checks.
 *
 * Error codes (SpecError.code):
 *   spec-too-large, yaml-syntax, yaml-duplicate-key, yaml-alias-limit, spec-not-mapping,
 *   key-unknown, key-missing, key-invalid, keys-conflict, value-missing, type-invalid,
 *   value-unknown, number-not-finite, number-not-integer, number-out-of-range, string-empty,
 *   version-unsupported, id-invalid,
 *   path-absolute, path-backslash, path-escapes, path-invalid, file-reading-unavailable, file-unreadable,
 *   geometry-style, geometry-file-kind, and the engine's geometry codes (xyz-*, zmatrix-*,
 *   element-unknown, units-unknown),
 *   the engine's molecule codes (atoms-too-close, charge-invalid, electron-count-negative,
 *   multiplicity-invalid, multiplicity-parity, multiplicity-too-large, rhf-open-shell, …),
 *   basis-unknown, basis-role-invalid, basis-missing-element, element-duplicate,
 *   basis-file-syntax, basis-file-invalid, fitting-basis-unused, density-fitting-unused,
 *   fitting-basis-needed, mp2-reference-unsupported, frozen-core-too-large,
 *   check-unit-invalid, check-quantity-unavailable.
 */
import { isMap, isScalar, LineCounter, type Node, parseDocument, visit } from "yaml";
import { basisSetsWithElement, type BasisSetData, canonicalSymbol, findBasisSet, listBasisSets, basisLookupKey, parseBasisText } from "../engine/basis/index.ts";
import { coreOrbitals } from "../engine/elements.ts";
import { InputError } from "../engine/errors.ts";
import { electronCount, validateMolecule } from "../engine/molecule.ts";
import { FITTING_DEFAULTS } from "../engine/run.ts";
import type { SpecError } from "./errors.ts";
import { firstNonBlank, type GeometryRead, geometryKindOfFile, inlineSource, readGeometry } from "./geometry.ts";
import { checkRepoPath } from "./paths.ts";
import { ID_PATTERN, SPEC_SCHEMA, type WrittenSpec } from "./schema.ts";
import type { NormalizedSpec, SpecBasis } from "./types.ts";
import { complete, INVALID, keyHomes, type NodeInfo, nodePosition, positionOf, validate, type ValidateContext, WalkLimit } from "./validate.ts";

export interface ParseOptions {
  /** repository-relative path of the spec, e.g. calculations/water/monomer.yaml (names the file in errors, gives the default id) */
  path: string;
  /** reads a repository-relative file (molecule.file, model.basis.file); throws if it cannot */
  readFile?: (repoRelativePath: string) => string;
}

export interface ParseResult {
  /** null when there are errors */
  spec: NormalizedSpec | null;
  /** every error found, in file and position order */
  errors: SpecError[];
}

/** Specs larger than this are refused unread (a spec is a page of text). */
export const MAX_SPEC_CHARS = 1_000_000;
/** Alias expansion limit (yaml's maxAliasCount): more than this refuses the document. */
export const MAX_ALIAS_COUNT = 100;
/** Upper bound on YAML nodes visited during validation (aliases included). */
const MAX_NODES = 100_000;

const HOMES = keyHomes(SPEC_SCHEMA);

type Pos = { line: number; column: number };

/** The default id of a spec at `path`: without "calculations/" and without the extension. */
export function defaultSpecId(path: string): string {
  return path.replace(/\\/g, "/").replace(/^\.\//, "").replace(/^calculations\//, "").replace(/\.[^./]*$/, "");
}

/** Edit distance counting a swap of neighbours as one edit (optimal string alignment). */
function nameDistance(a: string, b: string): number {
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) => [i, ...new Array<number>(b.length).fill(0)]);
  for (let j = 1; j <= b.length; j++) d[0][j] = j;
  for (let i = 1; i <= a.length; i++) {
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
    }
  }
  return d[a.length][b.length];
}

export function parseSpec(text: string, options: ParseOptions): ParseResult {
  const file = options.path;
  const errors: SpecError[] = [];
  const push = (code: string, message: string, hint: string | undefined, at: Pos, inFile = file) => {
    const e: SpecError = { code, message, file: inFile, line: at.line, column: at.column };
    if (hint) e.hint = hint;
    errors.push(e);
  };
  const done = (spec: NormalizedSpec | null): ParseResult => {
    errors.sort((a, b) => Number(a.file !== file) - Number(b.file !== file) || a.file.localeCompare(b.file) || a.line - b.line || a.column - b.column);
    return { spec: errors.length ? null : spec, errors };
  };

  if (text.length > MAX_SPEC_CHARS) {
    push("spec-too-large", `the spec has ${text.length} characters; the limit is ${MAX_SPEC_CHARS}`, "move large geometries into a file (molecule.file)", { line: 1, column: 1 });
    return done(null);
  }

  // ── YAML ──
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, keepSourceTokens: true, prettyErrors: false, uniqueKeys: true, version: "1.2" });
  const pos = (offset: number): Pos => positionOf({ lineCounter }, offset);
  let fatal = false;
  const seenLines = new Set<string>();
  for (const e of doc.errors) {
    const at = pos(e.pos[0]);
    // one YAML error per line and kind: the parser's follow-on complaints add nothing
    const lineKey = `${e.code === "DUPLICATE_KEY" ? e.pos[0] : "syntax"}:${at.line}`;
    if (seenLines.has(lineKey)) { fatal ||= e.code !== "DUPLICATE_KEY"; continue; }
    seenLines.add(lineKey);
    if (e.code === "DUPLICATE_KEY") {
      const key = (/^[^:\n]*/.exec(text.slice(e.pos[0]))?.[0] ?? "").trim();
      push("yaml-duplicate-key", `the key ${JSON.stringify(key)} appears more than once in the same mapping`, "keep one of them (YAML keys must be unique)", at);
    } else if (e.code === "MISSING_CHAR" && /quote/.test(e.message)) {
      fatal = true;
      // point at the opening quote, not at the end of the file
      let open: number | undefined;
      visit(doc, { Scalar: (_k, n) => { if ((n.type === "QUOTE_DOUBLE" || n.type === "QUOTE_SINGLE") && n.range && n.range[0] < e.pos[0] && n.range[1] >= e.pos[0]) open = n.range[0]; } });
      const q = e.message.includes('"') ? '"' : "'";
      push("yaml-syntax", `YAML syntax error: the quoted text starting here has no closing ${q}`, `add the closing ${q} at the end of the value`, open !== undefined ? pos(open) : at);
    } else {
      fatal = true;
      const hint =
        e.code === "MULTIPLE_DOCS" ? 'a spec is one YAML document: remove the "---" line and what follows, or move it to its own file'
        : e.code === "TAB_AS_INDENT" ? "indent with spaces, not tabs"
        : "check the indentation, colons and quotes here (strings with ': ' or '#' need quotes)";
      push("yaml-syntax", `YAML syntax error: ${e.message.replace(/\s+at line \d+, column \d+.*$/s, "")}`, hint, at);
    }
  }
  for (const w of doc.warnings) {
    fatal = true;
    push("yaml-syntax", `YAML: ${w.message}`, w.code === "TAG_RESOLVE_FAILED" ? "remove the tag (the word starting with !)" : undefined, pos(w.pos[0]));
  }
  if (fatal) return done(null);

  // alias bombs: yaml counts alias expansion without expanding
  let firstAlias: Node | undefined;
  visit(doc, { Alias: (_k, n) => { firstAlias ??= n; return visit.BREAK; } });
  if (firstAlias) {
    try {
      doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
    } catch (e) {
      push("yaml-alias-limit", `the document's aliases (*name) expand to more than ${MAX_ALIAS_COUNT} copies; refusing it (resource exhaustion)`, "write the values out instead of nesting aliases", nodePosition({ lineCounter }, firstAlias));
      void e;
      return done(null);
    }
  }

  const root = doc.contents;
  if (!isMap(root)) {
    push("spec-not-mapping", root === null ? "the spec is empty" : "the spec must be a mapping of keys (fieldbook:, title:, molecule:, model:, …)", "start from the example in the spec format: fieldbook: 1, title: …, molecule: …, model: …", nodePosition({ lineCounter }, root));
    return done(null);
  }

  // ── structure ──
  const ctx: ValidateContext = { file, doc, lineCounter, errors, nodes: new Map(), visited: 0, maxNodes: MAX_NODES, keyHomes: HOMES };
  let tree: unknown;
  try {
    tree = validate(ctx, SPEC_SCHEMA, root, "");
  } catch (e) {
    if (!(e instanceof WalkLimit)) throw e;
    push("yaml-alias-limit", `the document expands to more than ${MAX_NODES} YAML nodes; refusing it`, "write the values out instead of nesting aliases", nodePosition({ lineCounter }, firstAlias ?? root));
    return done(null);
  }

  // ── meaning ──
  const nodes = ctx.nodes;
  const get = (path: string): unknown => {
    let v: unknown = tree;
    for (const part of path.split(".")) {
      if (v === INVALID || v === null || typeof v !== "object") return undefined;
      v = (v as Record<string, unknown>)[part];
    }
    return v === INVALID ? undefined : v;
  };
  /** position of a path's value, else its key, else its nearest written parent's key */
  const at = (path: string, prefer: "value" | "key" = "value"): Pos => {
    let p = path;
    for (;;) {
      const info: NodeInfo | undefined = nodes.get(p);
      const n = p === path ? (prefer === "value" ? (info?.value ?? info?.key) : (info?.key ?? info?.value)) : (info?.key ?? info?.value);
      if (n?.range) return pos(n.range[0]);
      if (p === "") return { line: 1, column: 1 };
      p = p.includes(".") ? p.slice(0, p.lastIndexOf(".")) : "";
    }
  };
  const written = (path: string) => nodes.has(path);
  const readRepoFile = (path: string, what: string, atPos: Pos): { path: string; text: string } | null => {
    const checked = checkRepoPath(path);
    if (!checked.ok) { push(checked.code, `${what}: ${checked.message}`, checked.hint, atPos); return null; }
    if (!options.readFile) {
      push("file-reading-unavailable", `${what}: ${JSON.stringify(checked.path)} cannot be read here: file reading not available`, "validate the spec from the repository (the command line tools read files), or write the content inline", atPos);
      return null;
    }
    try {
      return { path: checked.path, text: options.readFile(checked.path) };
    } catch (e) {
      push("file-unreadable", `${what}: ${JSON.stringify(checked.path)} cannot be read: ${e instanceof Error ? e.message : String(e)}`, "check the path; it is taken from the repository root", atPos);
      return null;
    }
  };

  // id
  let id: string | undefined;
  const idWritten = get("id");
  if (typeof idWritten === "string") id = idWritten;
  else if (idWritten === null) {
    const d = defaultSpecId(file);
    if (ID_PATTERN.test(d)) id = d;
    else push("id-invalid", `the id taken from the file name, ${JSON.stringify(d)}, is not a valid id: expected lower-case letters, digits, '.', '_', '-' and '/', starting with a letter or digit`, "rename the file (e.g. water/monomer-mp2.yaml) or set `id:` in the spec", { line: 1, column: 1 });
  }

  // geometry
  const units = get("molecule.units") as "angstrom" | "bohr" | undefined;
  let geometry: GeometryRead | undefined;
  const molecule = get("molecule") as WrittenSpec["molecule"] | undefined;
  const geomKey = (["xyz", "zmatrix", "file"] as const).filter((k) => written(`molecule.${k}`));
  if (units && geomKey.length === 1) {
    const key = geomKey[0];
    const value = get(`molecule.${key}`);
    const node = nodes.get(`molecule.${key}`)?.value;
    if (typeof value === "string" && node) {
      if (key === "file") {
        const kind = geometryKindOfFile(value);
        if (!kind) push("geometry-file-kind", `molecule.file ${JSON.stringify(value)}: the geometry format is taken from the extension, .xyz (XYZ) or .zmat (Z-matrix)`, "rename the file to end in .xyz or .zmat", at("molecule.file"));
        else {
          const read = readRepoFile(value, "molecule.file", at("molecule.file"));
          if (read) {
            const g = readGeometry(kind, read.text, units, read.path);
            if (g.ok) {
              const lines = read.text.split(/\r\n|\r|\n/);
              geometry = { kind, file: read.path, text: read.text, atoms: g.atoms, lines: g.lines, where: read.path, lineStart: (l) => firstNonBlank(lines[l - 1]) };
            } else errors.push(...g.errors);
          }
        }
      } else if (isScalar(node)) {
        const src = inlineSource(text, node, key, (o) => lineCounter.linePos(o));
        if (!src.ok) errors.push({ ...src.error, file });
        else {
          const g = readGeometry(key, src.padded, units, file);
          if (g.ok) geometry = { kind: key, file: null, text: src.value, atoms: g.atoms, lines: g.lines, where: file, lineStart: src.lineStart };
          else errors.push(...g.errors);
        }
      }
    }
  }
  const elements = geometry ? [...new Set(geometry.atoms.map((a) => a.symbol))] : [];
  const atomsOf = (sym: string) => {
    if (!geometry) return "";
    const idx = geometry.atoms.map((a, i) => (a.symbol === sym ? i : -1)).filter((i) => i >= 0);
    const shown = idx.slice(0, 3).map((i) => `atom ${i + 1}, ${geometry!.where === file ? "" : geometry!.where + " "}line ${geometry!.lines[i]}`);
    return ` (${shown.join("; ")}${idx.length > 3 ? `; and ${idx.length - 3} more` : ""})`;
  };

  // basis
  const orbitalNames = listBasisSets("orbital").map((s) => s.name);
  const fittingNames = listBasisSets("fitting").map((s) => s.name);
  const lookup = (name: string, path: string, role: "orbital" | "fitting"): BasisSetData | null => {
    const set = findBasisSet(name);
    const pool = role === "orbital" ? orbitalNames : fittingNames;
    if (!set) {
      const key = basisLookupKey(name);
      const near0 = pool.map((n) => ({ n, d: nameDistance(key, basisLookupKey(n)) })).filter((x) => x.d <= (key.length <= 4 ? 1 : 2));
      const best = Math.min(...near0.map((x) => x.d));
      const near = near0.filter((x) => x.d === best).slice(0, 3).map((x) => x.n);
      push("basis-unknown", `unknown basis set ${JSON.stringify(name)}`, `${near.length ? `did you mean ${near.map((n) => JSON.stringify(n)).join(" or ")}? ` : ""}bundled ${role} sets: ${pool.join(", ")}${role === "orbital" ? "; other sets can be given as { file: … }" : ""}`, at(path));
      return null;
    }
    if (set.role !== role) {
      push("basis-role-invalid", role === "orbital" ? `${set.name} is a density-fitting (auxiliary) set, not an orbital basis` : `${set.name} is an orbital basis, not a density-fitting set`, role === "orbital" ? `choose an orbital set (${orbitalNames.slice(0, 6).join(", ")}, …); fitting sets go in fitting_basis` : `bundled fitting sets: ${fittingNames.join(", ")}`, at(path));
      return null;
    }
    return set;
  };
  const basis = get("model.basis") as SpecBasis | undefined; // parts may be INVALID (already reported)
  let normalizedBasis: SpecBasis | undefined;
  /** element → [set, path of the node that assigned it] */
  const assigned = new Map<string, { set: BasisSetData; path: string }>();
  let defaultAssignment: { set: BasisSetData; path: string } | null = null;
  let basisOk = complete(basis) && basis !== undefined;
  if (typeof basis === "string") {
    const set = lookup(basis, "model.basis", "orbital");
    if (set) { defaultAssignment = { set, path: "model.basis" }; normalizedBasis = set.name; } else basisOk = false;
  } else if (basis && "file" in basis && typeof basis.file === "string") {
    const read = readRepoFile(basis.file, "model.basis.file", at("model.basis.file"));
    if (read) {
      try {
        const set = parseBasisText(read.text, read.path);
        defaultAssignment = { set, path: "model.basis.file" };
        normalizedBasis = { file: read.path };
      } catch (e) {
        if (!(e instanceof InputError)) throw e;
        push(e.code, e.message.replace(`${read.path}: `, ""), e.hint, { line: e.where.line ?? 1, column: e.where.column ?? 1 }, read.path);
        basisOk = false;
      }
    } else basisOk = false;
  } else if (basis && "default" in basis) {
    const set = typeof basis.default === "string" ? lookup(basis.default, "model.basis.default", "orbital") : null;
    if (set) defaultAssignment = { set, path: "model.basis.default" }; else basisOk = false;
    const els: Record<string, string> = {};
    const firstKey = new Map<string, string>();
    const given = basis.elements !== null && typeof basis.elements === "object" ? basis.elements : {};
    for (const [k, name] of Object.entries(given)) {
      if (typeof name !== "string") continue;
      const sym = canonicalSymbol(k)!;
      const path = `model.basis.elements.${k}`;
      if (firstKey.has(sym)) {
        push("element-duplicate", `model.basis.elements names ${sym} twice (${JSON.stringify(firstKey.get(sym))} and ${JSON.stringify(k)})`, "keep one of them", at(path, "key"));
        basisOk = false;
        continue;
      }
      firstKey.set(sym, k);
      const s = lookup(name, path, "orbital");
      if (s) { assigned.set(sym, { set: s, path }); els[sym] = s.name; } else basisOk = false;
    }
    if (basisOk && defaultAssignment) normalizedBasis = { default: defaultAssignment.set.name, elements: els };
  }
  const setFor = (sym: string) => assigned.get(sym) ?? defaultAssignment;
  if (geometry) {
    const missing = new Map<string, string[]>(); // path → elements
    for (const sym of elements) {
      const a = setFor(sym);
      if (a && !a.set.elements[sym]) missing.set(a.path, [...(missing.get(a.path) ?? []), sym]);
    }
    for (const [path, syms] of missing) {
      const set = setFor(syms[0])!.set;
      for (const sym of syms) {
        const others = basisSetsWithElement(sym, "orbital");
        push("basis-missing-element", `basis set ${set.name} has no functions for ${sym}${atomsOf(sym)}`, others.length ? `bundled sets that define ${sym}: ${others.join(", ")}; choose one, or give ${sym} its own set under elements: { ${sym}: … }` : `no bundled set defines ${sym}; supply a basis file`, at(path));
      }
      basisOk = false;
    }
  }

  // fitting basis
  const correlation = get("model.correlation") as WrittenSpec["model"]["correlation"] | undefined;
  const reference = get("model.reference") as WrittenSpec["model"]["reference"] | undefined;
  const densityFitting = get("model.density_fitting") as boolean | undefined;
  const fittingWritten = get("model.fitting_basis") as string | null | undefined;
  let fittingBasis: string | null | undefined = fittingWritten;
  if (typeof fittingWritten === "string" && densityFitting === false)
    push("fitting-basis-unused", "fitting_basis is set but density_fitting is false, so it would not be used", "set density_fitting: true, or remove fitting_basis", at("model.fitting_basis"));
  if (densityFitting === true && correlation === "none")
    push("density-fitting-unused", "density_fitting applies to MP2 only, but correlation is none", "set correlation: mp2 (or scs-mp2), or remove density_fitting", at("model.density_fitting"));
  if (densityFitting === true && correlation !== undefined && correlation !== "none") {
    let fit: BasisSetData | null = null;
    let fitPath = "model.fitting_basis";
    if (typeof fittingWritten === "string") fit = lookup(fittingWritten, "model.fitting_basis", "fitting");
    else if (fittingWritten === null && basisOk && defaultAssignment) {
      const names = new Set([defaultAssignment.set.name, ...[...assigned.values()].map((a) => a.set.name)]);
      const used = geometry ? new Set(elements.map((s) => setFor(s)!.set.name)) : names;
      const only = used.size === 1 ? [...used][0] : undefined;
      const dflt = only !== undefined ? FITTING_DEFAULTS[only] : undefined;
      fitPath = "model.density_fitting";
      if (!dflt)
        push("fitting-basis-needed", `no default fitting basis for ${[...used].join(" + ")}`, `name one in fitting_basis (bundled: ${fittingNames.join(", ")}); defaults exist for ${Object.keys(FITTING_DEFAULTS).join(", ")}`, at("model.density_fitting"));
      else fit = findBasisSet(dflt) ?? null;
    }
    if (fit) {
      fittingBasis = fit.name;
      for (const sym of elements) {
        if (!fit.elements[sym]) {
          const others = basisSetsWithElement(sym, "fitting");
          push("basis-missing-element", `fitting basis set ${fit.name} has no functions for ${sym}${atomsOf(sym)}`, others.length ? `bundled fitting sets that define ${sym}: ${others.join(", ")}; name one in fitting_basis` : `no bundled fitting set defines ${sym}; use exact integrals (density_fitting: false)`, at(fitPath));
        }
      }
    } else if (typeof fittingWritten === "string") fittingBasis = undefined;
  }

  // physics
  const charge = get("molecule.charge") as number | undefined;
  const multiplicity = get("molecule.multiplicity") as number | undefined;
  if (geometry && charge !== undefined && multiplicity !== undefined) {
    const g = geometry;
    const mol = { atoms: g.atoms, charge, multiplicity };
    const chargeCodes = new Set(["charge-invalid", "electron-count-negative"]);
    const placeOf = (e: InputError): { at: Pos; file: string } => {
      if (e.where.line !== undefined) return { at: { line: e.where.line, column: e.where.column ?? g.lineStart(e.where.line) }, file: g.where };
      if (e.code === "rhf-open-shell") return { at: written("model.reference") ? at("model.reference") : at("molecule.multiplicity"), file };
      if (chargeCodes.has(e.code)) return { at: at("molecule.charge"), file };
      return { at: written("molecule.multiplicity") || !written("molecule.charge") ? at("molecule.multiplicity") : at("molecule.charge"), file };
    };
    const check = (m: typeof mol) => {
      try {
        validateMolecule(m, { reference: reference ?? "uhf", source: g.where, lines: g.lines });
        return null;
      } catch (e) {
        if (!(e instanceof InputError)) throw e;
        const p = placeOf(e);
        push(e.code, e.message, e.hint, p.at, p.file);
        return e;
      }
    };
    const first = check(mol);
    if (first && first.where.line !== undefined) {
      // an atom-level fault: still check charge and multiplicity, on atoms moved apart
      check({ ...mol, atoms: g.atoms.map((a, i) => ({ ...a, xyz: [10 * i, 0, 0] as [number, number, number] })) });
    }
    // frozen core larger than the occupied β space
    const frozenCore = get("model.frozen_core");
    if (!first && frozenCore === true && correlation !== undefined && correlation !== "none") {
      const n = electronCount(mol);
      const nbeta = (n - multiplicity + 1) / 2;
      const frozen = g.atoms.reduce((t, a) => t + coreOrbitals(a.z), 0);
      if (frozen > nbeta)
        push("frozen-core-too-large", `the frozen core (${frozen} orbitals) exceeds the ${nbeta} occupied β orbitals`, "set frozen_core: false", written("model.frozen_core") ? at("model.frozen_core") : at("model.correlation"));
    }
  }

  // method combinations
  if (reference === "rohf" && correlation !== undefined && correlation !== "none") {
    push(
      "mp2-reference-unsupported",
      `${correlation === "mp2" ? "MP2" : "SCS-MP2"} from an ROHF reference is not supported; supported are restricted MP2 from rhf (closed shells) and unrestricted MP2 from uhf (open shells)`,
      multiplicity === 1 ? "use reference: rhf" : "use reference: uhf for this open-shell molecule",
      at("model.correlation"),
    );
  }

  // checks
  const checks = get("checks") as WrittenSpec["checks"] | undefined;
  const energyUnits = new Set(["hartree", "kcal/mol", "kJ/mol", "eV", "au"]);
  const unitsFor: Record<string, Set<string>> = {
    scf_energy: energyUnits, total_energy: energyUnits, mp2_correlation: energyUnits, nuclear_repulsion: energyUnits,
    homo: energyUnits, lumo: energyUnits, dipole_magnitude: new Set(["debye", "au"]), s_squared: new Set(["au"]),
  };
  (Array.isArray(checks) ? checks : []).forEach((c, i) => {
    if (!c || typeof c !== "object") return;
    const allowed = unitsFor[c.quantity];
    if (allowed && typeof c.unit === "string" && !allowed.has(c.unit))
      push("check-unit-invalid", `checks[${i + 1}]: ${c.quantity} cannot be given in ${c.unit}`, `use ${[...allowed].join(", ")}`, at(`checks.${i}.unit`));
    if (c.quantity === "mp2_correlation" && correlation === "none")
      push("check-quantity-unavailable", `checks[${i + 1}]: mp2_correlation is not computed, because correlation is none`, "set model.correlation: mp2, or check another quantity", at(`checks.${i}.quantity`));
  });

  if (errors.length) return done(null);
  const w = tree as WrittenSpec;
  const g = geometry!;
  const spec: NormalizedSpec = {
    fieldbook: 1,
    id: id!,
    title: w.title,
    summary: w.summary,
    authors: w.authors,
    tags: w.tags,
    molecule: {
      charge: molecule!.charge,
      multiplicity: molecule!.multiplicity,
      units: molecule!.units,
      geometry: { kind: g.kind, file: g.file, text: g.text },
      atoms: g.atoms,
    },
    model: { ...w.model, basis: normalizedBasis!, fitting_basis: fittingBasis ?? null },
    convergence: w.convergence,
    checks: w.checks,
    notes: w.notes,
  };
  return done(spec);
}
