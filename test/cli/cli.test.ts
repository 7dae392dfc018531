// The `fieldbook` command end to end, in a scratch archive repository: check, run, compute
// (records written once, never rewritten), verify, new. H2/STO-3G at R = 1.4 bohr keeps it fast;
// its SCF energy −1.1167 Eh is from A. Szabo, N. S. Ostlund, Modern Quantum Chemistry (1989), §3.5.2.
import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

// --no-maglev as in the command's own start line (see src/cli/main.ts)
const MAIN = fileURLToPath(new URL("../../src/cli/main.ts", import.meta.url));
let repo = "";

function cli(...args: string[]) {
  const r = spawnSync(process.execPath, ["--no-maglev", MAIN, ...args], { cwd: repo, encoding: "utf8", env: { ...process.env, CI: "true" }, timeout: 120_000 });
  return { code: r.status, out: r.stdout, err: r.stderr + (r.signal ? ` [signal ${r.signal}] ${r.error?.message ?? ''}` : '') };
}

const H2 = `fieldbook: 1
title: Hydrogen molecule, minimal basis
tags: [test]
molecule:
  units: bohr
  xyz: |
    H 0 0 0
    H 0 0 1.4
model:
  basis: STO-3G
checks:
  - quantity: scf_energy
    expected: -1.1167
    tolerance: 1.0e-4
    unit: hartree
    source: "A. Szabo, N. S. Ostlund, Modern Quantum Chemistry (1989), §3.5.2"
`;

beforeAll(() => {
  repo = mkdtempSync(join(tmpdir(), "fieldbook-cli-"));
  mkdirSync(join(repo, "calculations", "h2"), { recursive: true });
  writeFileSync(join(repo, "calculations", "h2", "sto3g.yaml"), H2);
});
afterAll(() => rmSync(repo, { recursive: true, force: true }));

describe("the fieldbook command", () => {
  it("prints help for every verb", () => {
    for (const verb of ["run", "check", "compute", "build", "verify", "new"]) {
      const r = cli(verb, "--help");
      expect(r.code).toBe(0);
      expect(r.out).toMatch(/Usage: fieldbook/);
    }
  });

  it("checks valid specs and reports every error of a broken one with file:line:column", () => {
    expect(cli("check").code).toBe(0);
    writeFileSync(join(repo, "calculations", "broken.yaml"), "fieldbook: 1\ntitle: x\nmolecule:\n  charge: 0\n  multiplicty: 1\n  xyz: |\n    H 0 0 0\nmodel:\n  basis: STO-3G\n");
    const r = cli("check");
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/calculations\/broken\.yaml:5:3: .*multiplicty/);
    rmSync(join(repo, "calculations", "broken.yaml"));
  });

  it("runs one spec and prints the energy and the passed check", () => {
    const r = cli("run", "calculations/h2/sto3g.yaml");
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/E\(SCF\)\s+-1\.11671/);
    expect(r.out).toMatch(/check scf_energy: PASS/);
  });

  it("computes missing records once and never rewrites them", () => {
    const first = cli("compute", "--jobs", "1");
    expect(first.code).toBe(0);
    const dir = join(repo, "content", "records", "h2", "sto3g");
    const files = readdirSync(dir).filter((f) => f.endsWith(".json"));
    expect(files).toHaveLength(1);
    const before = readFileSync(join(dir, files[0]), "utf8");
    const record = JSON.parse(before);
    expect(record.status).toBe("ok");
    expect(record.checks[0].status).toBe("pass");
    const second = cli("compute");
    expect(second.out).toMatch(/0 calculation\(s\) to compute/);
    expect(readFileSync(join(dir, files[0]), "utf8")).toBe(before);
  });

  it("verifies that the archived numbers reproduce", () => {
    const r = cli("verify");
    expect(r.err).toBe("");
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/h2\/sto3g @ [0-9a-f]{12}: reproduced/);
  });

  it("verifies a run that did not converge by its status, and reports a tampered number as moved", () => {
    // plain iterations capped at 2 cannot meet the 1e-10 Eh default (common practice, no source)
    writeFileSync(join(repo, "calculations", "h2", "capped.yaml"),
      H2.replace("checks:", "convergence:\n  accelerator: none\n  max_iterations: 2\nchecks:").replace("title: Hydrogen molecule, minimal basis", "title: capped"));
    expect(cli("compute", "--jobs", "1").code).toBe(0);
    const capped = cli("verify", "h2/capped");
    expect(capped.code).toBe(0);
    expect(capped.out).toMatch(/h2\/capped @ [0-9a-f]{12}: reproduced \(not converged again/);
    const dir = join(repo, "content", "records", "h2", "sto3g");
    const file = join(dir, readdirSync(dir).find((f) => f.endsWith(".json"))!);
    const original = readFileSync(file, "utf8");
    const rec = JSON.parse(original);
    rec.scf.energy += 1e-6;
    writeFileSync(file, JSON.stringify(rec));
    const moved = cli("verify", "h2/sto3g");
    writeFileSync(file, original);
    expect(moved.code).toBe(1);
    expect(moved.out).toMatch(/h2\/sto3g @ [0-9a-f]{12}: MOVED\n  scf\.energy: archived/);
    rmSync(join(repo, "calculations", "h2", "capped.yaml"));
    rmSync(join(repo, "content", "records", "h2", "capped"), { recursive: true });
  });

  it("starts a spec from an XYZ file and refuses to overwrite", () => {
    writeFileSync(join(repo, "water.xyz"), "3\nwater\nO 0 0 0.1173\nH 0 0.7572 -0.4692\nH 0 -0.7572 -0.4692\n");
    const r = cli("new", "water.xyz", "--out", "calculations/water.yaml");
    expect(r.code).toBe(0);
    expect(cli("check", "calculations/water.yaml").code).toBe(0);
    expect(cli("new", "water.xyz", "--out", "calculations/water.yaml").code).toBe(1);
  });
});
