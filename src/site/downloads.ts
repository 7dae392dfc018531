/** The download files of a record (spec YAML, record JSON, XYZ), shared by the endpoint routes. */
import type { FieldbookRecord } from "../archive/record.ts";
import { recordText } from "../archive/store.ts";
import { calculations, versionSlug } from "./records.ts";
import { xyzText } from "./geometry.ts";

export type DownloadKind = "spec.yaml" | "record.json" | "geometry.xyz";

export function downloadBody(r: FieldbookRecord, kind: DownloadKind): string {
  if (kind === "spec.yaml") return r.spec_source;
  if (kind === "record.json") return recordText(r);
  return xyzText(r);
}

const TYPES: Record<DownloadKind, string> = {
  "spec.yaml": "text/yaml; charset=utf-8",
  "record.json": "application/json; charset=utf-8",
  "geometry.xyz": "chemical/x-xyz; charset=utf-8",
};

export function downloadResponse(r: FieldbookRecord, kind: DownloadKind): Response {
  return new Response(downloadBody(r, kind), { headers: { "content-type": TYPES[kind] } });
}

export function currentPaths() {
  return calculations().map((c) => ({ params: { id: c.id }, props: { record: c.current } }));
}

export function versionPaths() {
  return calculations().flatMap((c) => c.versions.map((v) => ({ params: { id: c.id, version: versionSlug(v) }, props: { record: v } })));
}
