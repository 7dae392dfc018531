/**
 * Builds the site once for the site tests: a scratch archive (a copy of the repository's records
 * plus a few tiny fixture calculations computed here, one with a hostile note, one with two
 * versions) rendered by `astro build` into a scratch dist/. Nothing in the repository is written.
 */
import { execFileSync } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";

export const PROJECT = fileURLToPath(new URL("../../", import.meta.url));
const NODE = process.execPath;

export const HOSTILE_ID = "site-test/hostile-note";
export const TWO_VERSIONS_ID = "site-test/two-versions";

const H2 = `molecule:
  xyz: |
    H 0 0 0
    H 0 0 0.74
`;

export const HOSTILE_SPEC = `fieldbook: 1
title: Hydrogen molecule with a hostile note <script>alert("title")</script>
tags: [site-test]
${H2}model:
  reference: rhf
  correlation: mp2
  basis: STO-3G
checks:
  - quantity: nuclear_repulsion
    expected: 0.7151043391
    tolerance: 1.0e-6
    unit: hartree
    source: "site test: 1/R for R = 0.74 Å, a0 = 0.529177210903 Å (CODATA 2018)"
notes: |
  Plain **bold** text survives.

  <script>window.HOSTILE_NOTE_RAN = true</script>
  <img src=x onerror="window.HOSTILE_NOTE_RAN = true">
  <a href="javascript:alert(1)">raw link</a> and [md link](javascript:alert(2)).
  <iframe src="https://example.org"></iframe>
`;

function twoVersionsSpec(energy: string): string {
  return `fieldbook: 1
title: Hydrogen molecule, two versions
tags: [site-test]
${H2}model:
  reference: rhf
  correlation: none
  basis: STO-3G
convergence:
  energy: ${energy}
`;
}

export interface BuiltSite {
  root: string;
  dist: string;
}

export function buildSite(): BuiltSite {
  const root = mkdtempSync(join(tmpdir(), "fieldbook-site-"));
  const calcDir = join(root, "calculations", "site-test");
  mkdirSync(calcDir, { recursive: true });
  mkdirSync(join(root, "content", "records"), { recursive: true });
  const repoRecords = join(PROJECT, "content", "records");
  if (existsSync(repoRecords)) cpSync(repoRecords, join(root, "content", "records"), { recursive: true, filter: (src) => !/\.fieldbook\.lock/.test(src) && !/\.tmp$/.test(src) });
  const cli = join(PROJECT, "src", "cli", "main.ts");
  const compute = () => execFileSync(NODE, ["--no-maglev", cli, "compute", "--jobs", "2"], { cwd: root, stdio: "pipe", env: { ...process.env, CI: "true" }, timeout: 180_000 });
  writeFileSync(join(calcDir, "hostile-note.yaml"), HOSTILE_SPEC);
  writeFileSync(join(calcDir, "two-versions.yaml"), twoVersionsSpec("1.0e-6"));
  compute();
  writeFileSync(join(calcDir, "two-versions.yaml"), twoVersionsSpec("1.0e-10"));
  compute();
  const dist = join(root, "dist");
  execFileSync(NODE, ["--no-maglev", join(PROJECT, "node_modules", "astro", "bin", "astro.mjs"), "build"], {
    cwd: PROJECT, stdio: "pipe", timeout: 240_000, env: { ...process.env, FIELDBOOK_ROOT: root, FIELDBOOK_OUT_DIR: dist, ASTRO_TELEMETRY_DISABLED: "1" },
  });
  return { root, dist };
}

export function read(dist: string, urlPath: string): string {
  const p = join(dist, ...urlPath.split("/").filter(Boolean));
  return readFileSync(urlPath.endsWith("/") ? join(p, "index.html") : p, "utf8");
}
