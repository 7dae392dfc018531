/**
 * One spec from text to record: parse and validate, hash, run the engine, evaluate checks,
 * build the record (a failed record when the run throws). Used by `run`, by the compute
 * workers and by `verify`; it writes nothing.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { basisHashData, buildRecord, failedRecord, type FieldbookRecord, inputHash } from "../archive/index.ts";
import { run, type RunEvent, type RunResult } from "../engine/run.ts";
import { NUMERICS_VERSION } from "../engine/version.ts";
import { parseSpec, type SpecError } from "../spec/index.ts";
import { specToRunInput } from "../spec/index.ts";
import type { NormalizedSpec } from "../spec/types.ts";
import { repositoryCommit } from "./repo.ts";

export interface Prepared {
  spec: NormalizedSpec;
  text: string;
  hash: string;
  readFile: (rel: string) => string;
}

/** Parse and hash one spec (repo-relative path); errors instead when it is invalid. */
export function prepareSpec(root: string, rel: string, text?: string): { prepared: Prepared | null; errors: SpecError[] } {
  const readFile = (p: string) => readFileSync(join(root, p), "utf8");
  const source = text ?? readFile(rel);
  const { spec, errors } = parseSpec(source, { path: rel, readFile });
  if (!spec) return { prepared: null, errors };
  const input = specToRunInput(spec, readFile);
  const resolved = { orbital: input.basis, ...(input.fittingBasis ? { fitting: input.fittingBasis } : {}) };
  const hash = inputHash(spec, basisHashData(spec, resolved), NUMERICS_VERSION);
  return { prepared: { spec, text: source, hash, readFile }, errors: [] };
}

/** Compute a prepared spec into a record (never throws for a failed calculation). */
export function calculate(root: string, p: Prepared, onEvent?: (e: RunEvent) => void): { record: FieldbookRecord; result: RunResult | null } {
  const started = new Date().toISOString();
  const commit = repositoryCommit(root);
  try {
    const result = run(specToRunInput(p.spec, p.readFile), onEvent);
    const record = buildRecord({
      spec: p.spec, specSource: p.text, result, inputHash: p.hash,
      provenance: { repository_commit: commit, started_at: started, finished_at: new Date().toISOString() },
    });
    return { record, result };
  } catch (error) {
    const record = failedRecord({
      spec: p.spec, specSource: p.text, inputHash: p.hash, error,
      provenance: { repository_commit: commit, started_at: started, finished_at: new Date().toISOString() },
    });
    return { record, result: null };
  }
}

/** "file:line:col: message" lines (with hints) for spec errors. */
export function formatErrors(errors: SpecError[]): string {
  return errors
    .map((e) => `${e.file}:${e.line}:${e.column}: ${e.message}${e.hint ? `\n  hint: ${e.hint}` : ""}`)
    .join("\n");
}
