// Astro configuration for the fieldbook site (static output in dist/).
//
// - FIELDBOOK_ROOT: the archive whose content/records/ the pages read (default: this folder);
//   the site tests point it at a scratch archive.
// - FIELDBOOK_OUT_DIR: where the site is written (default ./dist).
// - After the pages are written, the Pagefind search index is built into <outDir>/pagefind/
//   (the same as running `npx pagefind --site dist`), so `astro build` alone gives a site whose
//   search works from the built files.
import { defineConfig } from "astro/config";
import { fileURLToPath } from "node:url";

const here = fileURLToPath(new URL(".", import.meta.url));
process.env.FIELDBOOK_ROOT ||= here;
// the method notes are part of the site, not of the archive: always read from this folder
process.env.FIELDBOOK_SITE_DIR = here;

/** Astro integration: run Pagefind over the built site. */
function pagefindIndex() {
  return {
    name: "fieldbook-pagefind",
    hooks: {
      "astro:build:done": async ({ dir, logger }) => {
        const pagefind = await import("pagefind");
        const site = fileURLToPath(dir);
        const { index, errors } = await pagefind.createIndex({});
        if (!index) throw new Error(`pagefind: ${errors.join("; ")}`);
        const added = await index.addDirectory({ path: site });
        if (added.errors.length) throw new Error(`pagefind: ${added.errors.join("; ")}`);
        const written = await index.writeFiles({ outputPath: `${site.replace(/\/$/, "")}/pagefind` });
        if (written.errors.length) throw new Error(`pagefind: ${written.errors.join("; ")}`);
        await pagefind.close();
        logger.info(`search index: ${added.page_count} pages indexed into pagefind/`);
      },
    },
  };
}

export default defineConfig({
  output: "static",
  outDir: process.env.FIELDBOOK_OUT_DIR || "./dist",
  trailingSlash: "always",
  build: { format: "directory" },
  integrations: [pagefindIndex()],
});
