/** Facet values over the archive (method, basis, tag, status) with their calculations. */
import { calculations, type Calculation } from "./records.ts";
import { facetSlug, facetsOf } from "./summary.ts";

export type FacetName = "method" | "basis" | "tag" | "status";
export const FACET_LABELS: Record<FacetName, string> = { method: "Method", basis: "Basis set", tag: "Tag", status: "Status" };

export interface FacetValue {
  facet: FacetName;
  value: string;
  slug: string;
  calcs: Calculation[];
}

export function facetValues(facet: FacetName): FacetValue[] {
  const map = new Map<string, FacetValue>();
  for (const c of calculations()) {
    const f = facetsOf(c.current);
    const values = facet === "tag" ? f.tags : [f[facet]];
    for (const v of values) {
      const slug = facetSlug(v);
      const entry = map.get(slug) ?? { facet, value: v, slug, calcs: [] };
      entry.calcs.push(c);
      map.set(slug, entry);
    }
  }
  return [...map.values()].sort((a, b) => (a.slug < b.slug ? -1 : a.slug > b.slug ? 1 : 0));
}

export const FACETS: FacetName[] = ["method", "basis", "tag", "status"];
