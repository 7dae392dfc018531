/** Where the archive repository is, its specs, and its git commit. */
import { execFileSync } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import { dirname, join, relative, resolve, sep } from "node:path";

/** The nearest folder upwards from `start` that has a calculations/ folder (else `start`). */
export function repositoryRoot(start = process.cwd()): string {
  let dir = resolve(start);
  for (;;) {
    if (existsSync(join(dir, "calculations"))) return dir;
    const up = dirname(dir);
    if (up === dir) return resolve(start);
    dir = up;
  }
}

/** Repo-relative paths ("/"-separated) of the spec files under the given paths, sorted. */
export function listSpecs(root: string, paths: string[] = ["calculations"]): string[] {
  const out: string[] = [];
  const walk = (abs: string) => {
    if (!existsSync(abs)) return;
    if (statSync(abs).isDirectory()) {
      for (const name of readdirSync(abs).sort()) if (!name.startsWith(".")) walk(join(abs, name));
    } else if (/\.ya?ml$/.test(abs)) out.push(relative(root, abs).split(sep).join("/"));
  };
  for (const p of paths) walk(resolve(root, p));
  return [...new Set(out)].sort();
}

let cachedCommit: { root: string; commit: string | null } | null = null;

/** The archive repository's HEAD commit, or null outside git. */
export function repositoryCommit(root: string): string | null {
  if (cachedCommit?.root === root) return cachedCommit.commit;
  let commit: string | null = null;
  try {
    commit = execFileSync("git", ["rev-parse", "HEAD"], { cwd: root, stdio: ["ignore", "pipe", "ignore"], timeout: 10_000 }).toString().trim() || null;
  } catch {
    commit = null;
  }
  cachedCommit = { root, commit };
  return commit;
}
