import { describe, expect, it } from "vitest";
import { consistencyChecks } from "../../../src/engine/properties/index.ts";
import { calculate, ohAtoms, WATER } from "./setup.ts";

describe("built-in consistency checks", () => {
  const oh = ohAtoms();
  const runs = {
    "water RHF": calculate(WATER, "6-31G*", 0, 1, "rhf"),
    "OH UHF": calculate(oh, "6-31G*", 0, 2, "uhf"),
    "OH ROHF": calculate(oh, "6-31G*", 0, 2, "rohf"),
  };

  it("all pass for water RHF, OH UHF and OH ROHF", () => {
    for (const [label, c] of Object.entries(runs)) {
      expect(c.scf.converged, label).toBe(true);
      for (const ch of c.props.consistency) expect(ch.status, `${label}: ${ch.name}`).toMatch(/^(pass|info)$/);
    }
  });

  it("cover idempotency, electron count, orthonormality and the energy sum, per spin for open shells", () => {
    const names = (label: keyof typeof runs) => runs[label].props.consistency.map((c) => c.name).join("\n");
    for (const label of Object.keys(runs) as (keyof typeof runs)[]) {
      for (const w of ["idempotency", "electron count", "orthonormality", "energy components"]) expect(names(label)).toContain(w);
    }
    expect(runs["OH UHF"].props.consistency.filter((c) => c.name.includes("idempotency"))).toHaveLength(2);
    expect(runs["OH UHF"].props.consistency.filter((c) => c.name.includes("orthonormality"))).toHaveLength(2);
    expect(runs["water RHF"].props.consistency.filter((c) => c.name.includes("idempotency"))).toHaveLength(1);
  });

  it("report the UHF spin contamination as information, and the ROHF one as an exact check", () => {
    const u = runs["OH UHF"].props.consistency.find((c) => c.name.includes("S²"))!;
    expect(u.status).toBe("info");
    expect(u.tolerance).toBeNull();
    expect(u.value).toBeCloseTo(runs["OH UHF"].props.s_squared!.value - 0.75, 14);
    const r = runs["OH ROHF"].props.consistency.find((c) => c.name.includes("S²"))!;
    expect(r.status).toBe("pass");
  });

  it("fail when the density is not a projector or has the wrong trace", () => {
    const c = runs["water RHF"];
    const m = c.scf.matrices;
    const scaled = m.D[0].map((x) => 1.001 * x);
    const broken = { ...c.scf, matrices: { ...m, D: [scaled, scaled] as [Float64Array, Float64Array] } };
    const checks = consistencyChecks(broken, c.props.energy_components, null);
    expect(checks.find((x) => x.name.includes("idempotency"))!.status).toBe("fail");
    expect(checks.find((x) => x.name.includes("electron count"))!.status).toBe("fail");
  });

  it("fail when the energy components do not add up to the SCF energy", () => {
    const c = runs["water RHF"];
    const wrong = { ...c.props.energy_components, total: c.props.energy_components.total + 1e-6 };
    const checks = consistencyChecks(c.scf, wrong, null);
    expect(checks.find((x) => x.name.includes("energy components"))!.status).toBe("fail");
  });

  it("fail when the orbitals are not orthonormal", () => {
    const c = runs["water RHF"];
    const m = c.scf.matrices;
    const C = m.C[0].map((x) => 1.0001 * x);
    const checks = consistencyChecks({ ...c.scf, matrices: { ...m, C: [C, C] } }, c.props.energy_components, null);
    expect(checks.find((x) => x.name.includes("orthonormality"))!.status).toBe("fail");
  });

  it("fail on NaN rather than passing it", () => {
    const c = runs["water RHF"];
    const checks = consistencyChecks(c.scf, { ...c.props.energy_components, total: NaN }, null);
    expect(checks.find((x) => x.name.includes("energy components"))!.status).toBe("fail");
  });
});
