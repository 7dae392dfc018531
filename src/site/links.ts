/** Internal URLs of the site (one place, so pages and tests agree). */
import type { FieldbookRecord } from "../archive/record.ts";
import { facetSlug, facetsOf } from "./summary.ts";
export { calcUrl, versionUrl, pageUrl } from "./records.ts";

export function facetUrl(facet: "method" | "basis" | "tag" | "status", value: string): string {
  return `/browse/${facet}/${facetSlug(value)}/`;
}

export function facetSlugUrl(facet: "method" | "basis" | "status", r: FieldbookRecord): string {
  const f = facetsOf(r);
  return facetUrl(facet, f[facet]);
}
