/**
 * Structural validation: walks the YAML nodes of a document against a schema (./schema.ts),
 * fills in defaults, and collects every error with its position. Semantic checks (geometry,
 * basis names, physics) are in ./parse.ts; they find their YAML positions in `nodes`.
 */
import { type Document, isAlias, isMap, isPair, isScalar, isSeq, type LineCounter, type Node, type Pair, type YAMLMap } from "yaml";
import { didYouMean } from "../engine/suggest.ts";
import type { ListSchema, MapSchema, ObjectSchema, Schema, UnionSchema } from "./schema.ts";
import type { SpecError } from "./errors.ts";

/** Marks a value that failed validation (its error is already reported). */
export const INVALID: unique symbol = Symbol("invalid");

/** The YAML nodes behind one path ("model.basis.elements.H", "checks.0.unit"). */
export interface NodeInfo {
  /** the key node (absent for the document root and list items) */
  key?: Node;
  /** the value node (absent when the key has no value or the field was filled by a default) */
  value?: Node;
}

export interface ValidateContext {
  file: string;
  doc: Document;
  lineCounter: LineCounter;
  errors: SpecError[];
  nodes: Map<string, NodeInfo>;
  /** nodes visited; bounds the work on documents full of aliases */
  visited: number;
  /** the walk gives up after this many nodes */
  maxNodes: number;
  /** key → the dotted paths of the objects that know it (for "belongs under" hints) */
  keyHomes: Map<string, string[]>;
}

export class WalkLimit extends Error {}

type Pos = { line: number; column: number };

export function positionOf(ctx: Pick<ValidateContext, "lineCounter">, offset: number): Pos {
  const p = ctx.lineCounter.linePos(offset);
  return { line: p.line, column: p.col };
}

export function nodePosition(ctx: Pick<ValidateContext, "lineCounter">, node: Node | undefined | null, fallback: Pos = { line: 1, column: 1 }): Pos {
  const r = node?.range;
  return r ? positionOf(ctx, r[0]) : fallback;
}

function report(ctx: ValidateContext, code: string, message: string, hint: string | undefined, at: Pos): void {
  const e: SpecError = { code, message, file: ctx.file, line: at.line, column: at.column };
  if (hint) e.hint = hint;
  ctx.errors.push(e);
}

/** A path for messages: `checks[1].unit` (list items counted from 1). */
export function showPath(path: string): string {
  return path.split(".").reduce((acc, part) => (/^\d+$/.test(part) ? `${acc}[${Number(part) + 1}]` : acc === "" ? part : `${acc}.${part}`), "");
}
const show = (path: string) => (path === "" ? "the spec" : `\`${showPath(path)}\``);

function join(path: string, key: string | number): string {
  return path === "" ? String(key) : `${path}.${key}`;
}

/** What a node holds, in words: "the number 12", "the text \"abc\"", "a mapping", … */
export function describeNode(node: Node | null | undefined): string {
  if (!node) return "nothing";
  if (isMap(node)) return "a mapping (key: value lines)";
  if (isSeq(node)) return "a list";
  if (isScalar(node)) {
    const v = node.value;
    if (v === null || v === undefined) return "nothing (null)";
    if (typeof v === "number") return Number.isFinite(v) ? `the number ${v}` : `${v}`;
    if (typeof v === "boolean") return `the boolean ${v}`;
    if (typeof v === "string") return `the text ${JSON.stringify(v.length > 40 ? v.slice(0, 40) + "…" : v)}`;
    return `a value of type ${typeof v}`;
  }
  return "an unsupported value";
}

/** "did you mean …?": a case-insensitive exact match alone, else the nearest names. */
export function suggest(word: string, candidates: readonly string[]): string | undefined {
  const exact = candidates.find((c) => c.toLowerCase() === word.toLowerCase());
  return exact !== undefined ? `did you mean ${JSON.stringify(exact)}?` : didYouMean(word, candidates);
}

/** True when no part of a validated value failed. */
export function complete(v: unknown): boolean {
  if (v === INVALID) return false;
  if (Array.isArray(v)) return v.every(complete);
  if (v !== null && typeof v === "object") return Object.values(v).every(complete);
  return true;
}

function resolve(ctx: ValidateContext, node: unknown): Node | null {
  ctx.visited += 1;
  if (ctx.visited > ctx.maxNodes) throw new WalkLimit();
  let n = node;
  for (let hops = 0; isAlias(n); hops++) {
    if (hops > 100) throw new WalkLimit();
    n = n.resolve(ctx.doc);
  }
  return (n as Node | null | undefined) ?? null;
}

const isNull = (n: Node | null): boolean => n === null || (isScalar(n) && (n.value === null || n.value === undefined));

/** The default of a field when its key is absent, or `undefined` when it has none. */
function absentValue(s: Schema): unknown {
  if ("default" in s && s.default !== undefined) return s.default;
  if (s.type === "list" && s.defaultEmpty) return [];
  if (s.type === "map" && s.defaultEmpty) return {};
  if (s.nullable) return null;
  if (s.type === "object" && !s.required) return fillObject(s);
  return undefined;
}

function fillObject(s: ObjectSchema): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(s.properties)) out[k] = absentValue(v);
  return out;
}

function defaultText(s: Schema): string {
  const d = absentValue(s);
  if (d === undefined || d === null || typeof d === "object") return "";
  return JSON.stringify(d);
}

/** Validate `node` (already resolved) against `s`; returns the normalized value or INVALID. */
export function validate(ctx: ValidateContext, s: Schema, rawNode: unknown, path: string, keyNode?: Node): unknown {
  const node = resolve(ctx, rawNode);
  ctx.nodes.set(path, { ...(keyNode ? { key: keyNode } : {}), ...(node ? { value: node } : {}) });
  const at = nodePosition(ctx, node ?? keyNode);
  if (isNull(node)) {
    if (s.nullable) return null;
    report(ctx, "value-missing", `${show(path)} has no value`, s.required ? "write a value after the colon" : `write a value after the colon, or remove the line to use the default${defaultText(s) ? ` (${defaultText(s)})` : ""}`, nodePosition(ctx, keyNode ?? node));
    return INVALID;
  }
  const mismatch = (expected: string, hint?: string): typeof INVALID => {
    report(ctx, "type-invalid", `${show(path)} must be ${expected}, but it is ${describeNode(node)}`, hint, at);
    return INVALID;
  };
  switch (s.type) {
    case "string": {
      if (!isScalar(node) || typeof node.value !== "string") {
        if (isScalar(node)) return mismatch("text", `put it in quotes: "${String(node.source ?? node.value)}"`);
        return mismatch("text", isSeq(node) ? "write a single value, not a list" : undefined);
      }
      const v = node.value;
      if (s.nonEmpty && v.trim() === "") {
        report(ctx, "string-empty", `${show(path)} is empty`, "write some text, or remove the line", at);
        return INVALID;
      }
      if (s.pattern && !s.pattern.regex.test(v)) {
        report(ctx, s.pattern.code, `${show(path)} ${JSON.stringify(v)} is not valid: expected ${s.pattern.expected}`, s.pattern.hint, at);
        return INVALID;
      }
      return v;
    }
    case "integer":
    case "number": {
      const what = s.type === "integer" ? "an integer" : "a number";
      if (!isScalar(node) || typeof node.value !== "number") {
        if (isScalar(node) && typeof node.value === "string" && node.value.trim() !== "" && Number.isFinite(Number(node.value)))
          return mismatch(what, "remove the quotes");
        return mismatch(what);
      }
      const v = node.value;
      if (!Number.isFinite(v)) {
        report(ctx, "number-not-finite", `${show(path)} must be a finite number, not ${node.source ?? v}`, "write an ordinary number", at);
        return INVALID;
      }
      if (s.type === "integer" && !Number.isInteger(v)) {
        report(ctx, "number-not-integer", `${show(path)} must be an integer, not ${v}`, `use ${Math.round(v)}?`, at);
        return INVALID;
      }
      const ranges: string[] = [];
      let ok = true;
      if (s.min !== undefined) { ranges.push(`≥ ${s.min}`); ok &&= v >= s.min; }
      if (s.type === "number" && s.exclusiveMin !== undefined) { ranges.push(`> ${s.exclusiveMin}`); ok &&= v > s.exclusiveMin; }
      if (s.max !== undefined) { ranges.push(`≤ ${s.max}`); ok &&= v <= s.max; }
      if (s.type === "number" && s.exclusiveMax !== undefined) { ranges.push(`< ${s.exclusiveMax}`); ok &&= v < s.exclusiveMax; }
      if (!ok) {
        report(ctx, "number-out-of-range", `${show(path)} is ${v}, but it must be ${ranges.join(" and ")}`, `choose a value ${ranges.join(" and ")}${defaultText(s) ? ` (the default is ${defaultText(s)})` : ""}`, at);
        return INVALID;
      }
      return v;
    }
    case "boolean":
      if (!isScalar(node) || typeof node.value !== "boolean") return mismatch("true or false", "write true or false (without quotes)");
      return node.value;
    case "enum": {
      const allowed = s.values.map((v) => JSON.stringify(v)).join(", ");
      if (!isScalar(node) || (typeof node.value !== "string" && typeof node.value !== "number")) return mismatch(`one of ${allowed}`);
      const v = String(node.value);
      if (!s.values.includes(v)) {
        report(ctx, "value-unknown", `${show(path)} is ${JSON.stringify(v)}, which is not one of ${allowed}`, suggest(v, s.values) ?? `use one of ${allowed}`, at);
        return INVALID;
      }
      return v;
    }
    case "const":
      if (!isScalar(node) || node.value !== s.value) {
        report(ctx, s.code, `${show(path)} must be ${JSON.stringify(s.value)}, but it is ${describeNode(node)}`, s.hint, at);
        return INVALID;
      }
      return s.value;
    case "list":
      return validateList(ctx, s, node, path, mismatch);
    case "map":
      return validateMap(ctx, s, node, path, mismatch);
    case "object":
      if (!isMap(node)) return mismatch("a mapping (indented `key: value` lines)");
      return validateObject(ctx, s, node, path, keyNode);
    case "union":
      return validateUnion(ctx, s, node, path, keyNode, mismatch);
  }
}

function validateList(ctx: ValidateContext, s: ListSchema, node: Node | null, path: string, mismatch: (e: string, h?: string) => typeof INVALID): unknown {
  if (!isSeq(node)) {
    const hint = isScalar(node) ? `write a list: [${String(node.source ?? node.value)}], or one "- item" line per entry` : `write one "- item" line per entry`;
    return mismatch("a list", hint);
  }
  return node.items.map((item, i) => validate(ctx, s.items, item, join(path, i)));
}

function keyText(ctx: ValidateContext, pair: Pair, path: string): { key: string; node: Node } | null {
  const k = resolve(ctx, pair.key);
  if (isScalar(k) && (typeof k.value === "string" || typeof k.value === "number") && String(k.value) !== "") return { key: String(k.value), node: k };
  report(ctx, "key-invalid", `a key in ${show(path)} must be a plain name, but it is ${describeNode(k)}`, "write keys as plain names followed by a colon", nodePosition(ctx, k ?? (pair.value as Node | null)));
  return null;
}

function validateMap(ctx: ValidateContext, s: MapSchema, node: Node | null, path: string, mismatch: (e: string, h?: string) => typeof INVALID): unknown {
  if (!isMap(node)) return mismatch(`a mapping of ${s.keyDescription} → value`);
  const out: Record<string, unknown> = {};
  for (const pair of node.items) {
    if (!isPair(pair)) continue;
    const k = keyText(ctx, pair, path);
    if (!k) continue;
    const problem = s.checkKey?.(k.key) ?? (s.keyPattern.test(k.key) ? null : { code: "key-invalid", message: `${JSON.stringify(k.key)} is not a valid ${s.keyDescription}` });
    if (problem) {
      report(ctx, problem.code, `${show(path)}: ${problem.message}`, problem.hint, nodePosition(ctx, k.node));
      out[k.key] = INVALID;
      continue;
    }
    out[k.key] = validate(ctx, s.values, pair.value, join(path, k.key), k.node);
  }
  return out;
}

/**
 * An object's value is always returned (so that later checks can use its valid parts); fields
 * that failed are INVALID, and so are required fields that are missing.
 */
function validateObject(ctx: ValidateContext, s: ObjectSchema, node: YAMLMap, path: string, keyNode: Node | undefined): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  const known = Object.keys(s.properties);
  const seen = new Map<string, Node>();
  for (const pair of node.items) {
    if (!isPair(pair)) continue;
    const k = keyText(ctx, pair, path);
    if (!k) continue;
    const field = s.properties[k.key];
    if (!field) {
      const suggestion = suggest(k.key, known);
      const homes = (ctx.keyHomes.get(k.key) ?? []).filter((h) => h !== path);
      const hint = suggestion ?? (homes.length ? `${k.key} belongs under ${homes.map((h) => (h === "" ? "the top level" : `${h}:`)).join(" or ")}` : `known keys here: ${known.join(", ")}`);
      report(ctx, "key-unknown", `unknown key ${JSON.stringify(k.key)} in ${show(path)}`, hint, nodePosition(ctx, k.node));
      continue;
    }
    if (seen.has(k.key)) continue; // duplicate keys are reported by the YAML parser
    seen.set(k.key, k.node);
    if (s.exactlyOne?.includes(k.key) && isNull(resolve(ctx, pair.value))) {
      // one of the alternatives was chosen, so it needs a value
      ctx.nodes.set(join(path, k.key), { key: k.node });
      report(ctx, "value-missing", `${show(join(path, k.key))} has no value`, "write a value after the colon", nodePosition(ctx, k.node));
      out[k.key] = INVALID;
      continue;
    }
    out[k.key] = validate(ctx, field, pair.value, join(path, k.key), k.node);
  }
  const exclusive: readonly string[] = s.exactlyOne ?? [];
  const mapStart = nodePosition(ctx, keyNode ?? node);
  for (const [k, field] of Object.entries(s.properties)) {
    if (seen.has(k)) continue;
    if (exclusive.includes(k)) { out[k] = null; continue; }
    const d = absentValue(field);
    if (d !== undefined && !field.required) { out[k] = d; continue; }
    report(ctx, "key-missing", `${show(path)} needs \`${k}\`: ${field.description.replace(/\.$/, "")}`, `add a line \`${k}: …\`${path === "" ? "" : ` under ${path}:`}`, mapStart);
    out[k] = INVALID;
  }
  if (exclusive.length) {
    const given = exclusive.filter((k) => seen.has(k));
    const what = s.exactlyOneWhat ?? "one of them";
    if (given.length === 0) {
      report(ctx, "key-missing", `${show(path)} needs ${what}: one of ${exclusive.map((k) => `\`${k}\``).join(", ")}`, `add one of ${exclusive.map((k) => `\`${k}:\``).join(", ")}`, mapStart);
    } else if (given.length > 1) {
      for (const k of given.slice(1)) {
        const first = positionOf(ctx, seen.get(given[0])!.range![0]);
        report(ctx, "keys-conflict", `${show(path)} has ${what} in both \`${given[0]}\` (line ${first.line}) and \`${k}\``, `keep only one of ${given.map((g) => `\`${g}\``).join(", ")}`, nodePosition(ctx, seen.get(k)));
      }
    }
  }
  // the schema's key order, whatever the order written
  const ordered: Record<string, unknown> = {};
  for (const k of Object.keys(s.properties)) if (k in out) ordered[k] = out[k];
  return ordered;
}

function validateUnion(ctx: ValidateContext, s: UnionSchema, node: Node | null, path: string, keyNode: Node | undefined, mismatch: (e: string, h?: string) => typeof INVALID): unknown {
  const objects = s.variants.filter((v): v is ObjectSchema => v.type === "object");
  const scalarVariant = s.variants.find((v) => v.type !== "object" && v.type !== "list" && v.type !== "map");
  if (isScalar(node) && scalarVariant) return validate(ctx, scalarVariant, node, path, keyNode);
  if (isMap(node) && objects.length) {
    const keys = node.items.map((p) => (isScalar(p.key) ? String(p.key.value) : ""));
    let best = objects[0];
    let bestScore = -1;
    for (const o of objects) {
      const score = keys.filter((k) => k in o.properties).length;
      if (score > bestScore) { best = o; bestScore = score; }
    }
    if (bestScore === 0 && objects.length > 1) {
      // nothing familiar: say what the forms are
      const forms = objects.map((o) => `{ ${Object.keys(o.properties).join(", ")} }`).join(" or ");
      report(ctx, "type-invalid", `${show(path)} must be ${scalarVariant ? "a name, or " : ""}${forms}, but its keys are none of these`, s.description, nodePosition(ctx, node));
      return INVALID;
    }
    return validateObject(ctx, best, node, path, keyNode);
  }
  return mismatch(s.description.replace(/^The [^:]*: /, "").replace(/\.$/, ""));
}

/** key → dotted paths of the objects whose schema knows it. */
export function keyHomes(root: Schema): Map<string, string[]> {
  const out = new Map<string, string[]>();
  const walk = (s: Schema, path: string) => {
    if (s.type === "object") {
      for (const [k, v] of Object.entries(s.properties)) {
        const list = out.get(k) ?? [];
        if (!list.includes(path)) list.push(path);
        out.set(k, list);
        walk(v, join(path, k));
      }
    } else if (s.type === "union") s.variants.forEach((v) => walk(v, path));
    else if (s.type === "list") walk(s.items, `${path}[]`);
  };
  walk(root, "");
  return out;
}

