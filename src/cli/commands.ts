/** The verbs of the `fieldbook` command (main.ts parses the arguments). */
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { availableParallelism } from "node:os";
import { basename, join, relative, resolve } from "node:path";
import { MessageChannel } from "node:worker_threads";
import { Piscina } from "piscina";
import {
  acquireLock, type FieldbookRecord, hasRecord, listRecords, LockHeldError, removeTempFiles, writeRecord,
} from "../archive/index.ts";
import { InputError } from "../engine/errors.ts";
import { calculate, formatErrors, type Prepared, prepareSpec } from "./calculate.ts";
import { newSpecText } from "./new-spec.ts";
import { createProgress } from "./progress.ts";
import { listSpecs, repositoryRoot } from "./repo.ts";
import { formatSummary } from "./summary.ts";

const out = (s: string) => process.stdout.write(s.endsWith("\n") ? s : s + "\n");
const err = (s: string) => process.stderr.write(s.endsWith("\n") ? s : s + "\n");

export function runCommand(path: string, opts: { json: boolean }): number {
  const root = repositoryRoot();
  const rel = relative(root, resolve(path)).split("\\").join("/");
  if (!existsSync(resolve(path))) {
    err(`fieldbook: no such spec: ${path}`);
    return 2;
  }
  const { prepared, errors } = prepareSpec(root, rel);
  if (!prepared) {
    err(formatErrors(errors));
    err(`${errors.length} error(s); nothing computed`);
    return 1;
  }
  const { record, result } = calculate(root, prepared, (e) => {
    if (e.type === "iteration" && !opts.json)
      err(`  SCF ${String(e.data.iteration).padStart(3)}  E = ${e.data.energy.toFixed(10)}  ΔE = ${Number.isFinite(e.data.deltaEnergy) ? e.data.deltaEnergy.toExponential(2) : "–"}  RMS ΔD = ${Number.isFinite(e.data.densityRms) ? e.data.densityRms.toExponential(2) : "–"}`);
  });
  if (opts.json) out(JSON.stringify(record, null, 2));
  else if (result) out(formatSummary(result, `${prepared.spec.title} (${prepared.spec.id})`, record.checks as never));
  else out(`${prepared.spec.id}: FAILED — ${(record as { error?: { message: string } }).error?.message ?? "unknown error"}`);
  const failedChecks = (record.checks as { status: string }[]).some((c) => c.status === "fail");
  return record.status === "ok" && !failedChecks ? 0 : 1;
}

export function checkCommand(paths: string[]): number {
  const root = repositoryRoot();
  const specs = listSpecs(root, paths.length ? paths : ["calculations"]);
  let bad = 0;
  let count = 0;
  for (const rel of specs) {
    const { errors } = prepareSpec(root, rel);
    if (errors.length) {
      bad++;
      count += errors.length;
      err(formatErrors(errors));
    }
  }
  out(`${specs.length} spec(s) checked: ${specs.length - bad} valid, ${bad} with ${count} error(s)`);
  return bad ? 1 : 0;
}

interface Pending {
  rel: string;
  id: string;
  hash: string;
}

/** The specs without a record for their input hash, in a stable order, sliced by --shard. */
function pendingWork(root: string, shard?: [number, number]): { pending: Pending[]; invalid: number } {
  const pending: Pending[] = [];
  let invalid = 0;
  for (const rel of listSpecs(root)) {
    const { prepared, errors } = prepareSpec(root, rel);
    if (!prepared) {
      invalid++;
      err(formatErrors(errors));
      continue;
    }
    if (!hasRecord(root, prepared.spec.id, prepared.hash)) pending.push({ rel, id: prepared.spec.id, hash: prepared.hash });
  }
  pending.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : a.hash < b.hash ? -1 : 1));
  if (!shard) return { pending, invalid };
  const [k, n] = shard;
  return { pending: pending.filter((_, i) => i % n === k - 1), invalid };
}

export async function computeCommand(opts: { jobs?: number; shard?: [number, number] }): Promise<number> {
  const root = repositoryRoot();
  let lock;
  try {
    lock = acquireLock(root);
  } catch (e) {
    if (e instanceof LockHeldError) {
      err(`fieldbook: ${e.message}`);
      return 3;
    }
    throw e;
  }
  try {
    removeTempFiles(root);
    const { pending, invalid } = pendingWork(root, opts.shard);
    const jobs = Math.max(1, Math.min(opts.jobs ?? availableParallelism(), pending.length || 1));
    out(`${pending.length} calculation(s) to compute${opts.shard ? ` (shard ${opts.shard[0]}/${opts.shard[1]})` : ""}, ${jobs} worker(s)`);
    if (pending.length === 0) return invalid ? 1 : 0;
    const pool = new Piscina({ filename: new URL("./worker.ts", import.meta.url).href, maxThreads: jobs, minThreads: 1 });
    const progress = createProgress(pending.length);
    let failed = 0;
    await Promise.all(pending.map(async (p) => {
      const channel = new MessageChannel();
      channel.port2.on("message", (text: string) => progress.update({ id: p.id, kind: "iteration", text }));
      progress.update({ id: p.id, kind: "start" });
      try {
        const r = (await pool.run({ root, path: p.rel, port: channel.port1 }, { transferList: [channel.port1] })) as {
          record: FieldbookRecord | null;
        };
        if (!r.record) throw new Error("the spec became invalid while computing");
        writeRecord(root, r.record);
        const ok = r.record.status === "ok";
        if (!ok) failed++;
        progress.update({ id: p.id, kind: ok ? "done" : "failed", text: r.record.status });
      } catch (e) {
        failed++;
        progress.update({ id: p.id, kind: "failed", text: e instanceof Error ? e.message : String(e) });
      } finally {
        channel.port2.close();
      }
    }));
    progress.stop();
    await pool.destroy();
    out(`${pending.length - failed} computed, ${failed} failed or not converged (recorded as such)`);
    return invalid ? 1 : 0;
  } finally {
    lock.release();
  }
}

export function buildSite(): number {
  const root = repositoryRoot();
  const astro = join(root, "node_modules", "astro", "bin", "astro.mjs");
  // this Node, with the same --no-maglev as the command itself (see main.ts)
  const r = existsSync(astro)
    ? spawnSync(process.execPath, ["--no-maglev", astro, "build"], { cwd: root, stdio: "inherit" })
    : spawnSync("astro", ["build"], { cwd: root, stdio: "inherit" });
  return r.status ?? 1;
}

/** Numbers compared by verify, with their tolerance. */
function verifiedNumbers(rec: FieldbookRecord): Record<string, [number | null, number]> {
  const r = rec as unknown as {
    scf?: { energy?: number }; mp2?: { correlation?: number; valid?: boolean } | null;
    properties?: { dipole?: { magnitude_au?: number }; mulliken?: number[] };
  };
  const nums: Record<string, [number | null, number]> = {
    "scf.energy": [r.scf?.energy ?? null, 1e-8],
    "mp2.correlation": [r.mp2?.correlation ?? null, 1e-8],
    "dipole (au)": [r.properties?.dipole?.magnitude_au ?? null, 1e-6],
  };
  (r.properties?.mulliken ?? []).forEach((q, i) => (nums[`mulliken[${i}]`] = [q, 1e-6]));
  return nums;
}

export function verifyCommand(ids: string[]): number {
  const root = repositoryRoot();
  // every archived version, not only the current one: each is a published number
  const records = listRecords(root).filter((r) => ids.length === 0 || ids.includes(r.id));
  if (ids.length) for (const id of ids) if (!records.some((r) => r.id === id)) err(`${id}: no record`);
  let moved = 0;
  for (const rec of records) {
    const label = `${rec.id} @ ${rec.input_hash.replace(/^sha256:/, "").slice(0, 12)}`;
    // recompute from the archived (normalized) spec itself, not from today's spec file
    const p: Prepared = {
      spec: rec.spec as never, text: rec.spec_source as string, hash: rec.input_hash,
      readFile: (f: string) => readFileSync(join(root, f), "utf8"),
    };
    const { record: again } = calculate(root, p);
    const a = verifiedNumbers(rec), b = verifiedNumbers(again);
    const diffs: string[] = [];
    // a run that stopped short of convergence is reproduced by stopping short again: its last
    // numbers belong to wherever the iterations happened to be, which depends on details (e.g.
    // which vectors a solver returns within degenerate levels) no result may depend on
    const statusOnly = rec.status === "not-converged" && again.status === "not-converged";
    for (const [k, [x, tol]] of statusOnly ? [] : Object.entries(a)) {
      const y = b[k]?.[0] ?? null;
      if (x === null && y === null) continue;
      if (x === null || y === null || Math.abs(x - y) > tol) diffs.push(`${k}: archived ${x}, now ${y} (tolerance ${tol})`);
    }
    if (rec.status !== again.status) diffs.push(`status: archived ${rec.status}, now ${again.status}`);
    if (diffs.length) {
      moved++;
      out(`${label}: MOVED\n  ${diffs.join("\n  ")}`);
    } else out(`${label}: reproduced${statusOnly ? " (not converged again; its unconverged numbers are not compared)" : ""}`);
  }
  out(`${records.length} record(s) verified, ${moved} with differences`);
  return moved || (ids.length && records.length === 0) ? 1 : 0;
}

export function newCommand(xyzPath: string, values: { out?: string; title?: string; basis?: string; charge?: string }): number {
  const text = readFileSync(xyzPath, "utf8");
  try {
    const spec = newSpecText(text, basename(xyzPath), {
      ...(values.title ? { title: values.title } : {}),
      ...(values.basis ? { basis: values.basis } : {}),
      ...(values.charge ? { charge: Number(values.charge) } : {}),
    });
    if (!values.out) {
      out(spec);
      return 0;
    }
    if (existsSync(values.out)) {
      err(`fieldbook: ${values.out} exists; not overwritten`);
      return 1;
    }
    writeFileSync(values.out, spec, { flag: "wx" });
    out(`wrote ${values.out}`);
    return 0;
  } catch (e) {
    if (e instanceof InputError) {
      err(e.describe());
      return 1;
    }
    throw e;
  }
}
