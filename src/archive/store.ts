/**
 * The record store: content/records/<id>/<input-hash-hex>.json under a repository root.
 *
 * - Append-only: a record file is written once and never modified or deleted by the tool.
 *   writeRecord never replaces an existing file; if one is there it is left alone.
 * - Atomic: the record is written to a temporary file in the same directory (".<hex>.json.<pid>.
 *   <random>.tmp"), fsync'ed, then hard-linked to its final name (link fails if the name exists,
 *   so even a racing writer cannot overwrite) and the temporary name removed; the directory is
 *   fsync'ed. On file systems without hard links it falls back to rename after an existence
 *   check (safe under the store lock). A process dying mid-way leaves at most a temporary file,
 *   which listRecords ignores and removeTempFiles deletes.
 * - Ids may contain slashes: "water/dimer" → content/records/water/dimer/<hex>.json. Each id
 *   segment must be a non-empty name of letters, digits, ".", "_", "-" (not starting with "."),
 *   so no id can escape the records directory.
 * - A lock (acquireLock) lets one build write at a time: an exclusively created lock file
 *   (content/records/.fieldbook.lock) holding pid, host, time and a token; a lock whose pid no
 *   longer runs on this host is stale and is broken (under a second, short-lived lock so two
 *   processes cannot both break it).
 */
import * as fs from "node:fs";
import * as os from "node:os";
import * as path from "node:path";
import { randomBytes } from "node:crypto";
import { hashHex } from "./hash.ts";
import type { FieldbookRecord } from "./record.ts";

export const RECORDS_DIR = path.join("content", "records");
export const LOCK_NAME = ".fieldbook.lock";

const RECORD_FILE = /^[0-9a-f]{64}\.json$/;
const ID_SEGMENT = /^[A-Za-z0-9_-][A-Za-z0-9._-]*$/;

export class RecordStoreError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "RecordStoreError";
  }
}

export function recordsDir(root: string): string {
  return path.join(root, RECORDS_DIR);
}

/** Throws RecordStoreError unless `id` is a safe, slash-separated calculation id. */
export function checkId(id: string): void {
  const segs = typeof id === "string" ? id.split("/") : [];
  if (!segs.length || segs.some((s) => !ID_SEGMENT.test(s))) {
    throw new RecordStoreError(
      `calculation id ${JSON.stringify(id)} cannot name a record folder: use "/"-separated names of letters, digits, ".", "_", "-" (not starting with ".")`,
    );
  }
}

/** Directory of an id's records. */
export function recordDir(root: string, id: string): string {
  checkId(id);
  return path.join(recordsDir(root), ...id.split("/"));
}

/** Path of one record: content/records/<id>/<hex>.json. `hash` as "sha256:<hex>" or bare hex. */
export function recordPath(root: string, id: string, hash: string): string {
  return path.join(recordDir(root, id), `${hashHex(hash)}.json`);
}

export function hasRecord(root: string, id: string, hash: string): boolean {
  return fs.existsSync(recordPath(root, id, hash));
}

function fsyncDir(dir: string): void {
  let fd: number | undefined;
  try {
    fd = fs.openSync(dir, "r");
    fs.fsyncSync(fd);
  } catch {
    // some platforms cannot fsync a directory; the rename/link is still atomic
  } finally {
    if (fd !== undefined) fs.closeSync(fd);
  }
}

export interface WriteOptions {
  /**
   * Test hook: called after the temporary file is written and fsync'ed, before it gets its final
   * name. Throwing here simulates a crash mid-write.
   */
  beforeCommit?: (tempPath: string) => void;
}

export interface WriteResult {
  written: boolean;
  path: string;
}

/** The text a record file holds: JSON with 2-space indentation and a final newline. */
export function recordText(record: FieldbookRecord): string {
  return JSON.stringify(record, null, 2) + "\n";
}

/**
 * Write `record` to content/records/<id>/<hex>.json, atomically; never overwrites.
 * Returns { written: false } when a file of that name already exists (it is left untouched).
 */
export function writeRecord(root: string, record: FieldbookRecord, options: WriteOptions = {}): WriteResult {
  const final = recordPath(root, record.id, record.input_hash);
  if (fs.existsSync(final)) return { written: false, path: final };
  const dir = path.dirname(final);
  fs.mkdirSync(dir, { recursive: true });
  const temp = path.join(dir, `.${path.basename(final)}.${process.pid}.${randomBytes(6).toString("hex")}.tmp`);
  const text = recordText(record);
  try {
    const fd = fs.openSync(temp, "wx", 0o644);
    try {
      fs.writeFileSync(fd, text, "utf8");
      fs.fsyncSync(fd);
    } finally {
      fs.closeSync(fd);
    }
    options.beforeCommit?.(temp);
    try {
      fs.linkSync(temp, final);
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (code === "EEXIST") return { written: false, path: final };
      if (code !== "EPERM" && code !== "ENOTSUP" && code !== "EOPNOTSUPP" && code !== "ENOSYS" && code !== "EXDEV") throw e;
      // no hard links here: rename, after checking again (writers hold the store lock)
      if (fs.existsSync(final)) return { written: false, path: final };
      fs.renameSync(temp, final);
    }
    fsyncDir(dir);
    return { written: true, path: final };
  } finally {
    try {
      fs.rmSync(temp, { force: true });
    } catch {
      // leave it: listRecords ignores temporary files
    }
  }
}

function readRecordFile(file: string): FieldbookRecord {
  let value: unknown;
  try {
    value = JSON.parse(fs.readFileSync(file, "utf8"));
  } catch (e) {
    throw new RecordStoreError(`${file}: not a readable record (${(e as Error).message})`);
  }
  const r = value as FieldbookRecord;
  if (!r || typeof r !== "object" || typeof r.id !== "string" || typeof r.input_hash !== "string") {
    throw new RecordStoreError(`${file}: not a fieldbook record (no id or input_hash)`);
  }
  if (`${hashHex(r.input_hash)}.json` !== path.basename(file)) {
    throw new RecordStoreError(`${file}: its input_hash ${r.input_hash} does not match its file name`);
  }
  return r;
}

/** Record files (absolute paths) directly in `dir`; temporary and other files are ignored. */
function recordFilesIn(dir: string): string[] {
  let names: string[];
  try {
    names = fs.readdirSync(dir);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === "ENOENT") return [];
    throw e;
  }
  return names.filter((n) => RECORD_FILE.test(n)).sort().map((n) => path.join(dir, n));
}

/** Orders versions by provenance.started_at (then finished_at, then hash), oldest first. */
export function compareVersions(a: FieldbookRecord, b: FieldbookRecord): number {
  const key = (r: FieldbookRecord): [number, number] => [Date.parse(r.provenance?.started_at ?? ""), Date.parse(r.provenance?.finished_at ?? "")];
  const [sa, fa] = key(a);
  const [sb, fb] = key(b);
  const cmp = (x: number, y: number) => (Number.isNaN(x) ? (Number.isNaN(y) ? 0 : -1) : Number.isNaN(y) ? 1 : x - y);
  return cmp(sa, sb) || cmp(fa, fb) || (a.input_hash < b.input_hash ? -1 : a.input_hash > b.input_hash ? 1 : 0);
}

/** Every record in the store (all ids), sorted by id then version order. */
export function listRecords(root: string): FieldbookRecord[] {
  const out: FieldbookRecord[] = [];
  const base = recordsDir(root);
  const walk = (dir: string, segs: string[]): void => {
    let entries: fs.Dirent[];
    try {
      entries = fs.readdirSync(dir, { withFileTypes: true });
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code === "ENOENT") return;
      throw e;
    }
    for (const ent of entries) {
      if (ent.isDirectory() && ID_SEGMENT.test(ent.name)) walk(path.join(dir, ent.name), [...segs, ent.name]);
      else if (ent.isFile() && RECORD_FILE.test(ent.name)) {
        const file = path.join(dir, ent.name);
        const r = readRecordFile(file);
        if (r.id !== segs.join("/")) throw new RecordStoreError(`${file}: its id ${JSON.stringify(r.id)} does not match its folder`);
        out.push(r);
      }
    }
  };
  walk(base, []);
  return out.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : compareVersions(a, b)));
}

/** The versions of one calculation, oldest first (newest last). */
export function versionsOf(root: string, id: string): FieldbookRecord[] {
  return recordFilesIn(recordDir(root, id)).map((file) => {
    const r = readRecordFile(file);
    if (r.id !== id) throw new RecordStoreError(`${file}: its id ${JSON.stringify(r.id)} does not match its folder`);
    return r;
  }).sort(compareVersions);
}

/** The newest version (whatever its status), or null. */
export function currentVersion(root: string, id: string): FieldbookRecord | null {
  const v = versionsOf(root, id);
  return v.length ? v[v.length - 1] : null;
}

/** The newest version with status "ok", or null. */
export function lastGood(root: string, id: string): FieldbookRecord | null {
  const v = versionsOf(root, id).filter((r) => r.status === "ok");
  return v.length ? v[v.length - 1] : null;
}

/** Delete temporary files left by writers that died (call while holding the lock). Returns the paths removed. */
export function removeTempFiles(root: string): string[] {
  const removed: string[] = [];
  const walk = (dir: string): void => {
    let entries: fs.Dirent[];
    try {
      entries = fs.readdirSync(dir, { withFileTypes: true });
    } catch {
      return;
    }
    for (const ent of entries) {
      const p = path.join(dir, ent.name);
      if (ent.isDirectory()) walk(p);
      else if (ent.isFile() && /^\.[0-9a-f]{64}\.json\..*\.tmp$/.test(ent.name)) {
        fs.rmSync(p, { force: true });
        removed.push(p);
      }
    }
  };
  walk(recordsDir(root));
  return removed;
}

// ---------------------------------------------------------------- lock

export interface LockInfo {
  pid: number;
  host: string;
  /** ISO time the lock was taken */
  time: string;
  token: string;
}

export interface StoreLock {
  path: string;
  info: LockInfo;
  /** whether a stale lock (its process gone) was broken to take this one */
  brokeStale: LockInfo | null;
  /** remove the lock file if it is still ours; safe to call twice */
  release(): void;
}

export class LockHeldError extends Error {
  readonly holder: LockInfo | null;
  readonly lockPath: string;
  constructor(lockPath: string, holder: LockInfo | null) {
    super(
      holder
        ? `another fieldbook process (pid ${holder.pid} on ${holder.host}, since ${holder.time}) is writing records; lock file ${lockPath}` +
            ` (if that process is gone, delete the file)`
        : `the record store is locked (${lockPath} exists but is unreadable; delete it if no fieldbook process is running)`,
    );
    this.name = "LockHeldError";
    this.holder = holder;
    this.lockPath = lockPath;
  }
}

export function lockPath(root: string): string {
  return path.join(recordsDir(root), LOCK_NAME);
}

/** Whether a process with this pid exists (on this host). */
export function processAlive(pid: number): boolean {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === "EPERM";
  }
}

function readLock(file: string): LockInfo | null {
  try {
    const v = JSON.parse(fs.readFileSync(file, "utf8")) as LockInfo;
    return typeof v.pid === "number" && typeof v.host === "string" ? v : null;
  } catch {
    return null;
  }
}

/** An unreadable lock file older than this is stale (its writer died between create and write). */
const UNREADABLE_LOCK_STALE_MS = 10_000;

function isStale(file: string, info: LockInfo | null): boolean {
  if (info === null) {
    try {
      return Date.now() - fs.statSync(file).mtimeMs > UNREADABLE_LOCK_STALE_MS;
    } catch {
      return false;
    }
  }
  return info.host === os.hostname() && !processAlive(info.pid);
}

function tryCreate(file: string, info: LockInfo): boolean {
  let fd: number;
  try {
    fd = fs.openSync(file, "wx", 0o644);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === "EEXIST") return false;
    throw e;
  }
  try {
    fs.writeFileSync(fd, JSON.stringify(info) + "\n", "utf8");
    fs.fsyncSync(fd);
  } finally {
    fs.closeSync(fd);
  }
  return true;
}

/**
 * Take the store's write lock, or throw LockHeldError if a live process holds it. A stale lock
 * (its pid gone on this host, or unreadable and older than 10 s) is removed first. A lock from
 * another host is never considered stale (its pid cannot be checked from here).
 */
export function acquireLock(root: string): StoreLock {
  const file = lockPath(root);
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const info: LockInfo = { pid: process.pid, host: os.hostname(), time: new Date().toISOString(), token: randomBytes(12).toString("hex") };
  let broke: LockInfo | null = null;
  for (let attempt = 0; attempt < 3; attempt++) {
    if (tryCreate(file, info)) return makeLock(file, info, broke);
    const holder = readLock(file);
    if (!isStale(file, holder)) throw new LockHeldError(file, holder);
    // break the stale lock under a short-lived second lock, re-checking that it is the same one
    const breaker = `${file}.break`;
    try {
      if (Date.now() - fs.statSync(breaker).mtimeMs > UNREADABLE_LOCK_STALE_MS) fs.rmSync(breaker, { force: true });
    } catch {
      // no breaker file
    }
    if (!tryCreate(breaker, info)) continue;
    try {
      const again = readLock(file);
      const same = again === null ? holder === null : holder !== null && again.token === holder.token && again.pid === holder.pid;
      if (same && isStale(file, again)) {
        fs.rmSync(file, { force: true });
        broke = holder ?? { pid: 0, host: "", time: "", token: "" };
      }
    } finally {
      fs.rmSync(breaker, { force: true });
    }
  }
  throw new LockHeldError(file, readLock(file));
}

function makeLock(file: string, info: LockInfo, broke: LockInfo | null): StoreLock {
  let released = false;
  return {
    path: file,
    info,
    brokeStale: broke,
    release() {
      if (released) return;
      released = true;
      const now = readLock(file);
      if (now && now.token === info.token) fs.rmSync(file, { force: true });
    },
  };
}

/** Run `f` (synchronous) holding the lock; the lock is released afterwards, also when `f` throws. */
export function withLock<T>(root: string, f: (lock: StoreLock) => T): T {
  const lock = acquireLock(root);
  try {
    return f(lock);
  } finally {
    lock.release();
  }
}

/** Run the async `f` holding the lock; released when its promise settles. */
export async function withLockAsync<T>(root: string, f: (lock: StoreLock) => Promise<T>): Promise<T> {
  const lock = acquireLock(root);
  try {
    return await f(lock);
  } finally {
    lock.release();
  }
}
