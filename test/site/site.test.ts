// The built site: one `astro build` of a scratch archive (the repository's records plus small
// fixtures computed here) in beforeAll; every assertion reads the generated files.
import { existsSync, readdirSync, statSync } from "node:fs";
import { join, posix } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { listRecords } from "../../src/archive/store.ts";
import type { FieldbookRecord } from "../../src/archive/record.ts";
import { buildSite, HOSTILE_ID, read, TWO_VERSIONS_ID, type BuiltSite } from "./build-fixture.ts";
import { CAUTION } from "../../src/site/caution.ts";

let site: BuiltSite;
let records: FieldbookRecord[];
let ids: string[];
const prefix = (r: FieldbookRecord) => r.input_hash.replace(/^sha256:/, "").slice(0, 12);
const current = (id: string) => records.filter((r) => r.id === id).at(-1)!;
const SECTIONS = ["summary", "molecule", "model", "equations", "convergence", "results", "checks", "input", "downloads", "cite", "versions"];

function htmlFiles(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d).sort()) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else if (name.endsWith(".html")) out.push(p);
    }
  };
  walk(dir);
  return out;
}

/** The HTML between a section's opening tag and the next </section>. */
function section(html: string, id: string): string {
  const start = html.indexOf(`<section id="${id}"`);
  if (start < 0) return "";
  return html.slice(start, html.indexOf("</section>", start));
}

beforeAll(() => {
  site = buildSite();
  records = listRecords(site.root);
  ids = [...new Set(records.map((r) => r.id))];
}, 300_000);

describe("the built site", () => {
  it("builds pages from a scratch archive with the fixture calculations in it", () => {
    expect(ids).toContain(HOSTILE_ID);
    expect(records.filter((r) => r.id === TWO_VERSIONS_ID)).toHaveLength(2);
    expect(existsSync(join(site.dist, "index.html"))).toBe(true);
  });

  it("has a page for every calculation's current version and for every version, with its downloads", () => {
    for (const id of ids) expect(existsSync(join(site.dist, "calc", ...id.split("/"), "index.html")), id).toBe(true);
    for (const r of records) {
      const dir = join(site.dist, "calc", ...r.id.split("/"), "v", prefix(r));
      for (const f of ["index.html", "spec.yaml", "record.json", "geometry.xyz"]) expect(existsSync(join(dir, f)), `${r.id} ${f}`).toBe(true);
      expect(read(site.dist, `/calc/${r.id}/v/${prefix(r)}/spec.yaml`)).toBe(r.spec_source);
      expect(JSON.parse(read(site.dist, `/calc/${r.id}/v/${prefix(r)}/record.json`)).input_hash).toBe(r.input_hash);
    }
    for (const id of ids) for (const f of ["spec.yaml", "record.json", "geometry.xyz"]) expect(existsSync(join(site.dist, "calc", ...id.split("/"), f)), `${id} ${f}`).toBe(true);
  });

  it("shows the sections of every calculation page in the fixed order, with the caution", () => {
    for (const r of records) {
      for (const url of [`/calc/${r.id}/v/${prefix(r)}/`, ...(current(r.id) === r ? [`/calc/${r.id}/`] : [])]) {
        const html = read(site.dist, url);
        const at = SECTIONS.map((s) => html.indexOf(`<section id="${s}"`));
        expect(at.every((i) => i > 0), `${url}: ${SECTIONS.filter((_, k) => at[k] < 0).join(", ")} missing`).toBe(true);
        expect([...at].sort((a, b) => a - b)).toEqual(at);
        // the caution in the page body and in the footer
        expect(html.split(CAUTION).length - 1, url).toBeGreaterThanOrEqual(2);
        expect(html).toMatch(/CC BY 4\.0/);
      }
    }
  });

  it("renders the equations with KaTeX at build time and cites their papers", () => {
    for (const id of ids) {
      const eq = section(read(site.dist, `/calc/${id}/`), "equations");
      expect(eq, id).toContain('class="katex"');
      expect(eq).toContain("doi.org/");
      // no raw TeX left outside KaTeX's MathML annotation
      expect(eq.replace(/<annotation[^>]*>[\s\S]*?<\/annotation>/g, "")).not.toMatch(/\\mathbf|\\sum/);
    }
    const hostile = section(read(site.dist, `/calc/${HOSTILE_ID}/`), "equations");
    expect(hostile).toContain("Roothaan–Hall");
    expect(hostile).toContain("RMP2");
    expect(hostile).not.toContain("Pople–Nesbet");
  });

  it("draws the convergence history as SVG with one point per iteration and series, and the table behind it", () => {
    type It = { delta_energy: number | null; density_rms: number | null; diis_error: number | null };
    const plottable = (x: FieldbookRecord) => ((x.scf?.iterations ?? []) as It[]).some((it) => [it.delta_energy, it.density_rms, it.diis_error].some((v) => typeof v === "number" && v !== 0));
    expect(records.filter(plottable).length).toBeGreaterThan(0);
    for (const r of records.filter(plottable)) {
      const html = section(read(site.dist, `/calc/${r.id}/v/${prefix(r)}/`), "convergence");
      const svg = html.slice(html.indexOf('<svg class="plot convergence"'), html.indexOf("</svg>") + 6);
      expect(svg, r.id).toMatch(/^<svg/);
      const its = r.scf!.iterations as { delta_energy: number | null }[];
      const withDelta = its.filter((it) => typeof it.delta_energy === "number" && it.delta_energy !== 0).length;
      const energySeries = svg.slice(svg.indexOf('data-series="delta_energy"'), svg.indexOf("</g>", svg.indexOf('data-series="delta_energy"')));
      expect((energySeries.match(/<circle class="pt"/g) ?? []).length).toBe(withDelta);
      expect((html.match(/<tr>/g) ?? []).length).toBeGreaterThanOrEqual(its.length);
    }
  });

  it("gives coordinates in Å with 6 decimals in plain ASCII, and bohr", () => {
    const r = current(HOSTILE_ID);
    const mol = section(read(site.dist, `/calc/${r.id}/`), "molecule");
    expect(mol).toContain("0.740000");
    expect(mol).not.toContain("\u2212");
    expect(mol).toMatch(/<svg class="structure"[\s\S]*<circle[\s\S]*>H<tspan/);
    const xyz = read(site.dist, `/calc/${r.id}/geometry.xyz`);
    expect(xyz.split("\n")[0]).toBe("2");
    expect(xyz).toMatch(/^H\s+0\.0000000000\s+0\.0000000000\s+0\.7400000000$/m);
  });

  it("renders a hostile note inert: escaped text, no script, no event handlers, no javascript: links", () => {
    for (const url of [`/calc/${HOSTILE_ID}/`, `/calc/${HOSTILE_ID}/v/${prefix(current(HOSTILE_ID))}/`]) {
      const html = read(site.dist, url);
      const notes = html.slice(html.indexOf("data-notes"), html.indexOf("</div>", html.indexOf("data-notes")));
      expect(notes).toContain("<strong>bold</strong>");
      expect(notes).toContain("&lt;script&gt;");
      expect(html).not.toMatch(/<script/i); // calculation pages carry no script at all
      expect(html).not.toMatch(/<img[^>]*onerror/i);
      expect(html).not.toMatch(/<iframe/i);
      const tags = html.match(/<[a-z][^<>]*>/gi) ?? [];
      expect(tags.filter((t) => /\s(href|src)="\s*javascript:/i.test(t))).toEqual([]);
      expect(tags.filter((t) => /\son[a-z]+=/i.test(t))).toEqual([]);
    }
  });

  it("lists every calculation on the index with model chemistry, energy to 10 decimals, status in words and tags", () => {
    const html = read(site.dist, "/");
    for (const id of ids) expect(html, id).toContain(`href="/calc/${id}/"`);
    const h2 = current(HOSTILE_ID);
    const e = (h2.mp2 as { total: number }).total.toFixed(10);
    expect(html).toContain(e);
    expect(html).toContain("MP2/STO-3G");
    expect(html).toMatch(/converged|failed/);
    expect(html).toMatch(/checks: (\d+ passed|none)/);
    expect(html).toContain('href="/browse/tag/site-test/"');
    expect(html).toContain('id="filters"');
    expect(existsSync(join(site.dist, "pagefind", "pagefind-ui.js"))).toBe(true);
    expect(existsSync(join(site.dist, "pagefind", "pagefind-entry.json"))).toBe(true);
  });

  it("shows what changed between two versions", () => {
    const html = section(read(site.dist, `/calc/${TWO_VERSIONS_ID}/`), "versions");
    expect(html).toContain("convergence.energy");
    expect(html).toMatch(/1\.000000e-6[\s\S]*1\.000000e-10/);
    const first = records.filter((r) => r.id === TWO_VERSIONS_ID)[0];
    expect(section(read(site.dist, `/calc/${TWO_VERSIONS_ID}/v/${prefix(first)}/`), "versions")).toContain("first version");
  });

  it("renders the method notes with KaTeX", () => {
    const index = read(site.dist, "/methods/");
    for (const slug of ["scf", "diis", "mp2", "basis-sets", "integrals"]) {
      expect(index).toContain(`href="/methods/${slug}/"`);
      expect(read(site.dist, `/methods/${slug}/`)).toContain('class="katex"');
    }
  });

  it("has no broken internal links or fragment targets", () => {
    const broken: string[] = [];
    for (const file of htmlFiles(site.dist)) {
      if (file.includes(`${join(site.dist, "pagefind")}`)) continue;
      const html = read(site.dist, "/" + file.slice(site.dist.length + 1).split("\\").join("/"));
      const pageUrl = "/" + posix.dirname(file.slice(site.dist.length + 1).split("\\").join("/")) + "/";
      const ids = new Set([...html.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]));
      const links = (html.match(/<[a-z][^<>]*>/gi) ?? []).flatMap((tag) => [...tag.matchAll(/\s(?:href|src)="([^"]*)"/g)].map((m) => m[1]));
      for (const raw of links) {
        const link = raw.replace(/&amp;/g, "&");
        if (/^(https?:|mailto:|data:)/.test(link)) continue;
        if (link.startsWith("#")) {
          if (link.length > 1 && !ids.has(decodeURIComponent(link.slice(1)))) broken.push(`${pageUrl} → ${link}`);
          continue;
        }
        const target = posix.normalize(posix.join(link.startsWith("/") ? "/" : pageUrl, link.split("#")[0].split("?")[0]));
        const p = join(site.dist, ...decodeURIComponent(target).split("/").filter(Boolean));
        const ok = link.endsWith("/") || (existsSync(p) && statSync(p).isDirectory()) ? existsSync(join(p, "index.html")) : existsSync(p);
        if (!ok) broken.push(`${pageUrl} → ${link}`);
      }
    }
    expect(broken).toEqual([]);
  });

  it("uses no timestamps in the HTML other than the records' own dates", () => {
    const html = read(site.dist, `/calc/${HOSTILE_ID}/`);
    const stamps = [...html.matchAll(/\d{4}-\d{2}-\d{2}[ T]\d{2}:\d{2}/g)].map((m) => m[0].slice(0, 16).replace("T", " "));
    const own = new Set(records.filter((r) => r.id === HOSTILE_ID).flatMap((r) => [r.provenance.started_at, r.provenance.finished_at]).map((s) => s.slice(0, 16).replace("T", " ")));
    for (const s of stamps) expect(own.has(s), s).toBe(true);
  });
});
