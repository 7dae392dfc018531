import { describe, expect, it } from "vitest";
import { buildRecord, evaluateChecks, failedRecord, type FieldbookRecord, jsonSafe } from "../../src/archive/record.ts";
import { HARTREE_EV, HARTREE_KCAL_PER_MOL, HARTREE_KJ_PER_MOL, hartreeTo } from "../../src/engine/constants.ts";
import { InputError } from "../../src/engine/errors.ts";
import type { RunResult } from "../../src/engine/run.ts";
import { ENGINE_VERSION, NUMERICS_VERSION } from "../../src/engine/version.ts";
import type { NormalizedSpec, SpecCheck } from "../../src/spec/types.ts";
import { h2Spec, hashOf, runSpec, schemaErrors, SZABO_OSTLUND_H2 } from "./fixtures.ts";

const SO = "A. Szabo, N. S. Ostlund, Modern Quantum Chemistry (1989), §3.5.2";
const provenance = {
  repository_commit: "0123456789abcdef0123456789abcdef01234567",
  started_at: "2026-01-02T03:04:05.000Z",
  finished_at: "2026-01-02T03:04:06.500Z",
};

function recordOf(spec: NormalizedSpec, result?: RunResult): FieldbookRecord {
  const r = result ?? runSpec(spec);
  return buildRecord({ spec, specSource: "fieldbook: 1\n", result: r, inputHash: hashOf(spec), provenance });
}

const check = (c: Partial<SpecCheck> & Pick<SpecCheck, "quantity" | "expected">): SpecCheck => ({
  tolerance: 1e-4, unit: "hartree", source: SO, ...c,
});

describe("evaluateChecks on a real run (H2, STO-3G, R = 1.4 bohr)", () => {
  const spec = h2Spec();
  const result = runSpec(spec);

  it("reproduces Szabo and Ostlund's SCF energy, −1.1167 Eh", () => {
    expect(result.status).toBe("ok");
    expect(result.scf.energy).toBeCloseTo(-1.1167, 4);
    const [c] = evaluateChecks([SZABO_OSTLUND_H2], result);
    expect(c.status).toBe("pass");
    expect(c.computed).toBe(result.scf.energy);
    expect(c.difference).toBeCloseTo(result.scf.energy + 1.1167, 15);
    expect(c.reason).toBeNull();
  });

  it("converts to the check's unit: kcal/mol, kJ/mol, eV, debye", () => {
    const e = result.scf.energy;
    const checks = evaluateChecks([
      check({ quantity: "scf_energy", expected: -1.1167 * HARTREE_KCAL_PER_MOL, tolerance: 0.05, unit: "kcal/mol" }),
      check({ quantity: "scf_energy", expected: -1.1167 * HARTREE_KJ_PER_MOL, tolerance: 0.2, unit: "kJ/mol" }),
      check({ quantity: "scf_energy", expected: -1.1167 * HARTREE_EV, tolerance: 0.01, unit: "eV" }),
      // the same expected value taken as kcal/mol when it is hartree: fails
      check({ quantity: "scf_energy", expected: -1.1167, tolerance: 0.05, unit: "kcal/mol" }),
      // the deviation is 1.4e-5 Eh = 0.009 kcal/mol: a 0.005 kcal/mol tolerance fails
      check({ quantity: "scf_energy", expected: -1.1167 * HARTREE_KCAL_PER_MOL, tolerance: 0.005, unit: "kcal/mol" }),
      check({ quantity: "dipole_magnitude", expected: 0, tolerance: 1e-8, unit: "debye" }),
      check({ quantity: "dipole_magnitude", expected: 0, tolerance: 1e-8, unit: "au" }),
    ], result);
    expect(checks.map((c) => c.status)).toEqual(["pass", "pass", "pass", "fail", "fail", "pass", "pass"]);
    expect(checks[0].computed).toBeCloseTo(e * 627.509474, 4);
    expect(checks[0].computed).toBe(hartreeTo("kcal/mol", e));
    expect(checks[1].computed).toBe(e * HARTREE_KJ_PER_MOL);
    expect(checks[2].computed).toBe(e * HARTREE_EV);
    expect(checks[3].difference).toBeCloseTo(e * HARTREE_KCAL_PER_MOL + 1.1167, 10);
    expect(Math.abs(checks[4].difference!)).toBeGreaterThan(0.005);
    expect(checks[5].unit).toBe("debye");
  });

  it("evaluates the other quantities, and marks missing ones not-run", () => {
    const checks = evaluateChecks([
      check({ quantity: "nuclear_repulsion", expected: 1 / 1.4, tolerance: 1e-12 }),
      check({ quantity: "total_energy", expected: -1.1167 }),
      // orbital energies ε1 = −0.578, ε2 = 0.6703 Eh (same section)
      check({ quantity: "homo", expected: -0.578, tolerance: 1e-3 }),
      check({ quantity: "lumo", expected: 0.6703, tolerance: 1e-3 }),
      check({ quantity: "homo", expected: -0.578 * HARTREE_EV, tolerance: 0.03, unit: "eV" }),
      check({ quantity: "s_squared", expected: 0, tolerance: 1e-12, unit: "au" }),
      check({ quantity: "mp2_correlation", expected: -0.0132 }),
      check({ quantity: "s_squared", expected: 0, unit: "hartree" }),
      check({ quantity: "scf_energy", expected: -1.1167, unit: "debye" }),
    ], result);
    expect(checks.map((c) => c.status)).toEqual(["pass", "pass", "pass", "pass", "pass", "pass", "not-run", "not-run", "not-run"]);
    expect(checks[6].reason).toMatch(/correlation: none/);
    expect(checks[7].reason).toMatch(/unit hartree does not fit s_squared/);
    for (const c of checks.slice(6)) expect([c.computed, c.difference]).toEqual([null, null]);
  });

  it("uses the MP2 total for total_energy and the SCS numbers for scs-mp2", () => {
    const mp2 = runSpec(h2Spec({ model: { correlation: "mp2" } }));
    const scs = runSpec(h2Spec({ model: { correlation: "scs-mp2" } }));
    if (!mp2.mp2?.valid || !scs.mp2?.valid) throw new Error("MP2 expected");
    const q = [
      check({ quantity: "total_energy", expected: -1.1299 }),
      check({ quantity: "mp2_correlation", expected: -0.0132 }),
      check({ quantity: "scf_energy", expected: -1.1167 }),
    ];
    const a = evaluateChecks(q, mp2);
    expect(a.map((c) => c.computed)).toEqual([mp2.mp2.total, mp2.mp2.correlation, mp2.scf.energy]);
    expect(a.map((c) => c.status)).toEqual(["pass", "pass", "pass"]);
    const b = evaluateChecks(q, scs);
    expect(b.map((c) => c.computed)).toEqual([scs.mp2.scs_total, scs.mp2.scs.correlation, scs.scf.energy]);
    expect(scs.mp2.scs_total).not.toBe(scs.mp2.total);
  });

  it("never passes a check of a non-converged SCF, nor of a failed run", () => {
    const nc = runSpec(h2Spec({ model: { correlation: "mp2" }, convergence: { max_iterations: 1 } }));
    expect(nc.status).toBe("not-converged");
    const checks = [SZABO_OSTLUND_H2, check({ quantity: "nuclear_repulsion", expected: 1 / 1.4 }), check({ quantity: "total_energy", expected: -1.13 })];
    for (const c of evaluateChecks(checks, nc)) {
      expect(c.status).toBe("not-run");
      expect(c.reason).toMatch(/did not converge/);
    }
    for (const c of evaluateChecks(checks, null)) expect([c.status, c.reason]).toEqual(["not-run", "the calculation failed"]);
  });
});

describe("records", () => {
  it("builds an ok record with everything the record format asks for, valid against the schema", () => {
    const spec = h2Spec();
    const rec = recordOf(spec);
    expect(schemaErrors(rec)).toEqual([]);
    expect(rec.format).toBe("fieldbook-record/1");
    expect(rec.id).toBe("test/h2-sto3g");
    expect(rec.input_hash).toBe(hashOf(spec));
    expect(rec.status).toBe("ok");
    expect(rec.spec).toEqual(spec);
    expect(rec.provenance.engine).toEqual({ name: "fieldbook", version: ENGINE_VERSION, numerics: NUMERICS_VERSION });
    expect(rec.provenance.node).toBe(process.version);
    expect(rec.provenance.repository_commit).toBe(provenance.repository_commit);
    expect(Object.keys(rec.provenance.wall_seconds).sort()).toEqual(["basis", "integrals", "mp2", "properties", "scf", "total"]);
    expect(rec.provenance.wall_seconds.mp2).toBeNull();
    expect(rec.molecule).toMatchObject({ formula: "H2", units: "bohr", electrons: 2, charge: 0, multiplicity: 1 });
    expect(rec.basis).toMatchObject({ name: "STO-3G", functions: 2, shells: 2, dropped_by_orthogonalization: 0 });
    const scf = rec.scf as Record<string, any>;
    expect(scf.energy).toBeCloseTo(-1.1167, 4);
    expect(scf.iterations[0].delta_energy).toBeNull(); // NaN in the engine: undefined, null in JSON
    expect(scf.settings.max_iterations).toBe(128);
    expect(scf.components.total).toBeCloseTo(scf.energy, 12);
    expect(rec.mp2).toBeNull();
    expect(rec.checks[0].status).toBe("pass");
    expect(rec.consistency.length).toBeGreaterThan(0);
    // JSON round trip is lossless
    expect(JSON.parse(JSON.stringify(rec))).toEqual(rec);
  });

  it("keeps open-shell, MP2, RI-MP2 and SCS-MP2 records valid", () => {
    const specs = [
      h2Spec({ molecule: { charge: 1, multiplicity: 2 }, model: { reference: "uhf" }, checks: [check({ quantity: "s_squared", expected: 0.75, tolerance: 1e-10, unit: "au" })] }),
      h2Spec({ molecule: { charge: 1, multiplicity: 2 }, model: { reference: "rohf" }, checks: [] }),
      h2Spec({ model: { correlation: "mp2" }, checks: [check({ quantity: "mp2_correlation", expected: -0.0132 })] }),
      h2Spec({ model: { basis: "cc-pVDZ", correlation: "mp2", density_fitting: true }, checks: [] }),
      h2Spec({ model: { basis: "cc-pVDZ", correlation: "scs-mp2", frozen_core: false }, checks: [] }),
    ];
    for (const spec of specs) {
      const rec = recordOf(spec);
      expect(schemaErrors(rec), JSON.stringify(spec.model)).toEqual([]);
      expect(rec.status).toBe("ok");
      for (const c of rec.checks) expect(c.status).toBe("pass");
    }
    const ri = recordOf(specs[3]);
    expect(ri.mp2).toMatchObject({ valid: true, integrals: "density-fitting", fitting_basis: "cc-pVDZ-RIFIT" });
    const uhf = recordOf(specs[0]);
    expect((uhf.scf as any).s_squared.value).toBeCloseTo(0.75, 10);
    expect((uhf.scf as any).orbitals.beta.energies).toHaveLength(2);
  });

  it("records a non-converged run as a result, with checks not run", () => {
    const spec = h2Spec({ model: { correlation: "mp2" }, convergence: { max_iterations: 1 } });
    const rec = recordOf(spec);
    expect(schemaErrors(rec)).toEqual([]);
    expect(rec.status).toBe("not-converged");
    expect((rec.scf as any).converged).toBe(false);
    expect(rec.mp2).toMatchObject({ valid: false });
    expect(rec.checks.every((c) => c.status === "not-run")).toBe(true);
    // the schema refuses a "pass" on a non-converged record
    const forged = structuredClone(rec);
    forged.checks[0] = { ...forged.checks[0], status: "pass", computed: -1.1167, difference: 0, reason: null };
    expect(schemaErrors(forged).length).toBeGreaterThan(0);
  });

  it("builds failed records for input errors and for bugs", () => {
    const spec = h2Spec({ molecule: { multiplicity: 3 } });
    let thrown: unknown;
    try {
      runSpec(spec);
    } catch (e) {
      thrown = e;
    }
    expect(thrown).toBeInstanceOf(InputError);
    const input = failedRecord({ spec, specSource: "x", inputHash: hashOf(spec), provenance, error: thrown });
    expect(schemaErrors(input)).toEqual([]);
    expect(input.status).toBe("failed");
    expect(input.error).toMatchObject({ code: (thrown as InputError).code, kind: "input" });
    expect(input.error!.message).toBe((thrown as Error).message);
    expect(input.checks.map((c) => c.status)).toEqual(["not-run"]);
    expect(input.molecule.nuclear_repulsion).toBeCloseTo(1 / 1.4, 14);
    expect(input.provenance.wall_seconds.total).toBeCloseTo(1.5, 9);
    expect([input.basis, input.scf, input.mp2, input.properties]).toEqual([null, null, null, null]);

    const bug = failedRecord({ spec: h2Spec(), specSource: "x", inputHash: hashOf(h2Spec()), provenance, error: new TypeError("x is undefined"), stage: "scf" });
    expect(schemaErrors(bug)).toEqual([]);
    expect(bug.error).toEqual({
      message: "TypeError: x is undefined", code: "internal-error", kind: "internal",
      hint: expect.any(String), where: { source: null, line: null, column: null, stage: "scf" },
    });
  });

  it("refuses a malformed input hash; the schema refuses malformed records", () => {
    const spec = h2Spec();
    const result = runSpec(spec);
    expect(() => buildRecord({ spec, specSource: "", result, inputHash: "abc", provenance })).toThrow(/input hash/);
    const rec = recordOf(spec, result);
    expect(schemaErrors({ ...rec, status: "done" }).length).toBeGreaterThan(0);
    expect(schemaErrors({ ...rec, extra: 1 }).length).toBeGreaterThan(0);
    const { provenance: _p, ...noProv } = rec;
    expect(schemaErrors(noProv)).toContain('$: missing "provenance"');
    expect(schemaErrors({ ...rec, status: "failed" }).length).toBeGreaterThan(0);
  });

  it("jsonSafe maps non-finite numbers to null and −0 to 0", () => {
    expect(jsonSafe({ a: NaN, b: [Infinity, -0, 1], c: Float64Array.from([2]), d: undefined })).toEqual({ a: null, b: [null, 0, 1], c: [2] });
  });
});
