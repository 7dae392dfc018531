import { spawnSync } from "node:child_process";
import * as fs from "node:fs";
import * as os from "node:os";
import * as path from "node:path";
import { pathToFileURL } from "node:url";
import { afterEach, beforeAll, describe, expect, it } from "vitest";
import { buildRecord, failedRecord, type FieldbookRecord } from "../../src/archive/record.ts";
import {
  acquireLock, currentVersion, hasRecord, lastGood, listRecords, LockHeldError, lockPath, recordPath, recordText,
  removeTempFiles, versionsOf, withLock, writeRecord,
} from "../../src/archive/store.ts";
import type { RunResult } from "../../src/engine/run.ts";
import type { NormalizedSpec } from "../../src/spec/types.ts";
import { h2Spec, hashOf, runSpec, schemaErrors, tempRoot } from "./fixtures.ts";

const STORE_URL = pathToFileURL(path.resolve(import.meta.dirname, "../../src/archive/store.ts")).href;
const canStripTypes = Number(process.versions.node.split(".")[0]) >= 23;

/** Run an ES module snippet in a child Node process (it can import the .ts store). */
function child(code: string, ...args: string[]) {
  return spawnSync(process.execPath, ["--input-type=module", "-e", code, ...args], { encoding: "utf8", timeout: 60_000 });
}

const roots: string[] = [];
function root(): string {
  const r = tempRoot();
  roots.push(r);
  return r;
}
afterEach(() => {
  for (const r of roots.splice(0)) fs.rmSync(r, { recursive: true, force: true });
});

let okResult: RunResult;
let ncResult: RunResult;
beforeAll(() => {
  okResult = runSpec(h2Spec());
  ncResult = runSpec(h2Spec({ convergence: { max_iterations: 1 } }));
});

/** A record of the H2 spec made distinct by its convergence threshold, started at `started`. */
function version(started: string, opts: { energy?: number; id?: string; status?: "ok" | "not-converged" | "failed" } = {}): FieldbookRecord {
  const spec: NormalizedSpec = h2Spec({ ...(opts.id ? { id: opts.id } : {}), convergence: { energy: opts.energy ?? 1e-10 } });
  const provenance = { repository_commit: null, started_at: started, finished_at: started };
  const inputHash = hashOf(spec);
  if (opts.status === "failed") return failedRecord({ spec, specSource: "", inputHash, provenance, error: new Error("boom") });
  const result = opts.status === "not-converged" ? ncResult : okResult;
  return buildRecord({ spec, specSource: "", result, inputHash, provenance });
}

const filesUnder = (dir: string): string[] =>
  fs.existsSync(dir) ? (fs.readdirSync(dir, { recursive: true }) as string[]).map((f) => f.split(path.sep).join("/")).sort() : [];

describe("writeRecord", () => {
  it("writes content/records/<id>/<hash hex>.json, nested for ids with slashes", () => {
    const r = root();
    const rec = version("2026-01-01T00:00:00.000Z", { id: "water/dimer/ccpvdz" });
    const res = writeRecord(r, rec);
    const hex = rec.input_hash.slice(7);
    expect(res).toEqual({ written: true, path: path.join(r, "content", "records", "water", "dimer", "ccpvdz", `${hex}.json`) });
    expect(fs.readFileSync(res.path, "utf8")).toBe(recordText(rec));
    expect(JSON.parse(fs.readFileSync(res.path, "utf8"))).toEqual(rec);
    expect(hasRecord(r, rec.id, rec.input_hash)).toBe(true);
    expect(hasRecord(r, rec.id, hex)).toBe(true);
    expect(hasRecord(r, "water/dimer", rec.input_hash)).toBe(false);
    expect(filesUnder(path.join(r, "content/records"))).toEqual(["water", "water/dimer", "water/dimer/ccpvdz", `water/dimer/ccpvdz/${hex}.json`]);
  });

  it("never overwrites an existing record", () => {
    const r = root();
    const rec = version("2026-01-01T00:00:00.000Z");
    expect(writeRecord(r, rec).written).toBe(true);
    const file = recordPath(r, rec.id, rec.input_hash);
    const before = fs.readFileSync(file, "utf8");
    const changed = { ...rec, spec_source: "something else", provenance: { ...rec.provenance, started_at: "2030-01-01T00:00:00.000Z" } };
    expect(writeRecord(r, changed)).toEqual({ written: false, path: file });
    expect(fs.readFileSync(file, "utf8")).toBe(before);
    // even when the file appears between the existence check and the commit (a racing writer)
    const other = version("2026-01-02T00:00:00.000Z", { energy: 1e-9 });
    const res = writeRecord(r, other, { beforeCommit: () => fs.writeFileSync(recordPath(r, other.id, other.input_hash), "racer\n") });
    expect(res.written).toBe(false);
    expect(fs.readFileSync(res.path, "utf8")).toBe("racer\n");
    expect(filesUnder(path.dirname(file)).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });

  it("leaves no record and no temporary file when the write fails after the temporary file exists", () => {
    const r = root();
    const rec = version("2026-01-01T00:00:00.000Z");
    let seenTemp = "";
    expect(() =>
      writeRecord(r, rec, {
        beforeCommit: (temp) => {
          seenTemp = temp;
          expect(fs.readFileSync(temp, "utf8")).toBe(recordText(rec));
          throw new Error("simulated crash");
        },
      }),
    ).toThrow("simulated crash");
    expect(path.dirname(seenTemp)).toBe(path.dirname(recordPath(r, rec.id, rec.input_hash)));
    expect(fs.existsSync(seenTemp)).toBe(false);
    expect(hasRecord(r, rec.id, rec.input_hash)).toBe(false);
    expect(filesUnder(path.join(r, "content/records")).filter((f) => f.endsWith(".json") || f.endsWith(".tmp"))).toEqual([]);
    expect(listRecords(r)).toEqual([]);
    expect(writeRecord(r, rec).written).toBe(true);
  });

  it.skipIf(!canStripTypes)("a process killed mid-write leaves only a temporary file, which readers ignore", () => {
    const r = root();
    const rec = version("2026-01-01T00:00:00.000Z");
    const recFile = path.join(r, "rec.json");
    fs.writeFileSync(recFile, JSON.stringify(rec));
    const out = child(
      `import { writeRecord } from ${JSON.stringify(STORE_URL)};
       import { readFileSync } from "node:fs";
       const [root, file] = process.argv.slice(1);
       writeRecord(root, JSON.parse(readFileSync(file, "utf8")), { beforeCommit: () => process.kill(process.pid, "SIGKILL") });`,
      r, recFile,
    );
    expect(out.signal).toBe("SIGKILL");
    const dir = path.dirname(recordPath(r, rec.id, rec.input_hash));
    const left = fs.readdirSync(dir);
    expect(left).toHaveLength(1);
    expect(left[0]).toMatch(/^\.[0-9a-f]{64}\.json\.\d+\.[0-9a-f]+\.tmp$/);
    expect(hasRecord(r, rec.id, rec.input_hash)).toBe(false);
    expect(listRecords(r)).toEqual([]);
    expect(versionsOf(r, rec.id)).toEqual([]);
    expect(removeTempFiles(r)).toEqual([path.join(dir, left[0])]);
    expect(fs.readdirSync(dir)).toEqual([]);
    expect(writeRecord(r, rec).written).toBe(true);
    expect(listRecords(r)).toEqual([rec]);
  });

  it("refuses ids that could escape the records folder", () => {
    const r = root();
    for (const id of ["../x", "a//b", "/abs", ".hidden", "a/./b", "a\\b", "", "a/"]) {
      expect(() => writeRecord(r, { ...version("2026-01-01T00:00:00.000Z"), id }), id).toThrow(/cannot name a record folder/);
    }
    expect(fs.existsSync(path.join(r, "x"))).toBe(false);
  });
});

describe("versions", () => {
  it("orders versions by started_at (newest last); lastGood skips failed and non-converged ones", () => {
    const r = root();
    const v1 = version("2026-01-01T10:00:00.000Z", { energy: 1e-10 });
    const v2 = version("2026-02-01T10:00:00.000Z", { energy: 1e-9 });
    const v3 = version("2026-03-01T10:00:00.000Z", { energy: 1e-8, status: "not-converged" });
    const v4 = version("2026-04-01T10:00:00.000Z", { energy: 1e-7, status: "failed" });
    const other = version("2026-05-01T10:00:00.000Z", { id: "test/h2-sto3g/variant" });
    for (const v of [v3, v1, other, v4, v2]) expect(writeRecord(r, v).written).toBe(true);
    for (const v of [v1, v2, v3, v4, other]) expect(schemaErrors(v)).toEqual([]);
    expect(new Set([v1, v2, v3, v4].map((v) => v.input_hash)).size).toBe(4);

    expect(versionsOf(r, "test/h2-sto3g").map((v) => v.provenance.started_at)).toEqual([v1, v2, v3, v4].map((v) => v.provenance.started_at));
    expect(currentVersion(r, "test/h2-sto3g")).toEqual(v4);
    expect(currentVersion(r, "test/h2-sto3g")!.status).toBe("failed");
    expect(lastGood(r, "test/h2-sto3g")).toEqual(v2);
    // failed and non-converged versions are kept
    expect(versionsOf(r, "test/h2-sto3g").map((v) => v.status)).toEqual(["ok", "ok", "not-converged", "failed"]);
    // a nested id is its own calculation
    expect(versionsOf(r, "test/h2-sto3g/variant")).toEqual([other]);
    expect(listRecords(r).map((v) => [v.id, v.provenance.started_at])).toEqual([
      ["test/h2-sto3g", v1.provenance.started_at], ["test/h2-sto3g", v2.provenance.started_at],
      ["test/h2-sto3g", v3.provenance.started_at], ["test/h2-sto3g", v4.provenance.started_at],
      ["test/h2-sto3g/variant", other.provenance.started_at],
    ]);
    expect(versionsOf(r, "nothing/here")).toEqual([]);
    expect(currentVersion(r, "nothing/here")).toBeNull();
    expect(lastGood(r, "nothing/here")).toBeNull();
  });

  it("lastGood is null when no version is ok", () => {
    const r = root();
    writeRecord(r, version("2026-01-01T00:00:00.000Z", { status: "failed" }));
    writeRecord(r, version("2026-01-02T00:00:00.000Z", { energy: 1e-9, status: "not-converged" }));
    expect(lastGood(r, "test/h2-sto3g")).toBeNull();
    expect(currentVersion(r, "test/h2-sto3g")!.status).toBe("not-converged");
  });

  it("refuses a record file whose name does not match its hash, and ignores non-record files", () => {
    const r = root();
    const v = version("2026-01-01T00:00:00.000Z");
    writeRecord(r, v);
    const dir = path.dirname(recordPath(r, v.id, v.input_hash));
    fs.writeFileSync(path.join(dir, "README.md"), "not a record");
    fs.writeFileSync(path.join(dir, "notes.json"), "{}");
    expect(listRecords(r)).toEqual([v]);
    fs.copyFileSync(recordPath(r, v.id, v.input_hash), path.join(dir, `${"0".repeat(64)}.json`));
    expect(() => listRecords(r)).toThrow(/does not match its file name/);
  });
});

describe("lock", () => {
  it("is exclusive: a second acquire fails until the first is released", () => {
    const r = root();
    const a = acquireLock(r);
    const info = JSON.parse(fs.readFileSync(lockPath(r), "utf8"));
    expect(info).toMatchObject({ pid: process.pid, host: os.hostname() });
    expect(typeof info.time).toBe("string");
    expect(() => acquireLock(r)).toThrow(LockHeldError);
    try {
      acquireLock(r);
    } catch (e) {
      expect((e as LockHeldError).holder!.pid).toBe(process.pid);
      expect((e as Error).message).toMatch(/another fieldbook process \(pid \d+/);
    }
    a.release();
    expect(fs.existsSync(lockPath(r))).toBe(false);
    const b = acquireLock(r);
    expect(b.brokeStale).toBeNull();
    a.release(); // a stale handle must not remove someone else's lock
    expect(fs.existsSync(lockPath(r))).toBe(true);
    b.release();
    expect(withLock(r, () => 42)).toBe(42);
    expect(fs.existsSync(lockPath(r))).toBe(false);
    expect(() => withLock(r, () => { throw new Error("inside"); })).toThrow("inside");
    expect(fs.existsSync(lockPath(r))).toBe(false);
  });

  it.skipIf(!canStripTypes)("is exclusive across processes", () => {
    const r = root();
    const lock = acquireLock(r);
    const out = child(
      `import { acquireLock } from ${JSON.stringify(STORE_URL)};
       try { acquireLock(process.argv[1]); console.log("acquired"); } catch (e) { console.log(e.name); }`,
      r,
    );
    expect(out.stderr).toBe("");
    expect(out.stdout.trim()).toBe("LockHeldError");
    lock.release();
    const out2 = child(
      `import { acquireLock } from ${JSON.stringify(STORE_URL)};
       const l = acquireLock(process.argv[1]); console.log("acquired"); l.release();`,
      r,
    );
    expect(out2.stdout.trim()).toBe("acquired");
  });

  it("recovers a stale lock whose process no longer runs", () => {
    const r = root();
    const dead = spawnSync(process.execPath, ["-e", ""]).pid!;
    fs.mkdirSync(path.dirname(lockPath(r)), { recursive: true });
    const stale = { pid: dead, host: os.hostname(), time: "2026-01-01T00:00:00.000Z", token: "old" };
    fs.writeFileSync(lockPath(r), JSON.stringify(stale));
    const lock = acquireLock(r);
    expect(lock.brokeStale).toEqual(stale);
    expect(JSON.parse(fs.readFileSync(lockPath(r), "utf8")).pid).toBe(process.pid);
    expect(fs.existsSync(`${lockPath(r)}.break`)).toBe(false);
    lock.release();
  });

  it.skipIf(!canStripTypes)("recovers the lock of a build that was killed while holding it", () => {
    const r = root();
    const out = child(
      `import { acquireLock } from ${JSON.stringify(STORE_URL)};
       acquireLock(process.argv[1]); process.kill(process.pid, "SIGKILL");`,
      r,
    );
    expect(out.signal).toBe("SIGKILL");
    expect(JSON.parse(fs.readFileSync(lockPath(r), "utf8")).pid).toBe(out.pid);
    const lock = acquireLock(r);
    expect(lock.brokeStale!.pid).toBe(out.pid);
    lock.release();
  });

  it("does not break a live lock, a lock from another host, or a fresh unreadable lock", () => {
    const r = root();
    fs.mkdirSync(path.dirname(lockPath(r)), { recursive: true });
    // a live process (this one's parent) holds it
    fs.writeFileSync(lockPath(r), JSON.stringify({ pid: process.ppid, host: os.hostname(), time: "t", token: "x" }));
    expect(() => acquireLock(r)).toThrow(LockHeldError);
    // another host: its pid cannot be checked from here
    fs.writeFileSync(lockPath(r), JSON.stringify({ pid: 999999999, host: `${os.hostname()}-elsewhere`, time: "t", token: "y" }));
    expect(() => acquireLock(r)).toThrow(/on .*-elsewhere/);
    // written half-way by a process that just created it
    fs.writeFileSync(lockPath(r), '{"pid": 12');
    expect(() => acquireLock(r)).toThrow(/unreadable/);
    // ... but the same unreadable file, old, is stale
    const old = new Date(Date.now() - 60_000);
    fs.utimesSync(lockPath(r), old, old);
    const lock = acquireLock(r);
    expect(lock.brokeStale).not.toBeNull();
    lock.release();
  });
});
