// Astro configuration for the fieldbook site (static output in dist/).
import { defineConfig } from "astro/config";

export default defineConfig({
  output: "static",
  outDir: "./dist",
  trailingSlash: "always",
  build: { format: "directory" },
});
