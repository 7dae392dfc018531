/**
 * The site's view of the record store: every calculation with its versions, read once per build.
 * Pages only read records; nothing here runs the engine.
 *
 * The archive root is process.env.FIELDBOOK_ROOT (set by astro.config.mjs; the tests point it at
 * a scratch archive), else the working directory.
 */
import { listRecords } from "../archive/store.ts";
import type { FieldbookRecord } from "../archive/record.ts";
import { hashPrefix } from "./format.ts";

export interface Calculation {
  id: string;
  /** oldest first */
  versions: FieldbookRecord[];
  current: FieldbookRecord;
}

export function archiveRoot(): string {
  return process.env.FIELDBOOK_ROOT || process.cwd();
}

let cache: { root: string; calcs: Calculation[] } | null = null;

/** Every calculation, sorted by id; versions in store order (oldest first, newest = current). */
export function calculations(): Calculation[] {
  const root = archiveRoot();
  if (cache?.root === root) return cache.calcs;
  const byId = new Map<string, FieldbookRecord[]>();
  for (const r of listRecords(root)) {
    const list = byId.get(r.id) ?? [];
    list.push(r);
    byId.set(r.id, list);
  }
  const calcs = [...byId.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([id, versions]) => ({ id, versions, current: versions[versions.length - 1] }));
  cache = { root, calcs };
  return calcs;
}

export function findCalculation(id: string): Calculation | undefined {
  return calculations().find((c) => c.id === id);
}

// ---------------------------------------------------------------- URLs (trailing slash, directory format)

export function calcUrl(id: string): string {
  return `/calc/${id}/`;
}

export function versionSlug(r: FieldbookRecord): string {
  return hashPrefix(r.input_hash);
}

export function versionUrl(r: FieldbookRecord): string {
  return `/calc/${r.id}/v/${versionSlug(r)}/`;
}

/** Base URL of a record's page: the main page for the current version, else its version page. */
export function pageUrl(r: FieldbookRecord, isCurrent: boolean): string {
  return isCurrent ? calcUrl(r.id) : versionUrl(r);
}
