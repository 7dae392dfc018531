/**
 * Repository paths in specs (`molecule.file`, `model.basis.file`): written from the repository
 * root with "/" separators. Absolute paths, backslashes and paths that leave the repository
 * are refused; "." and inner ".." segments are normalized away.
 */

export type RepoPathResult =
  | { ok: true; path: string }
  | { ok: false; code: "path-absolute" | "path-backslash" | "path-escapes" | "path-invalid"; message: string; hint: string };

export function checkRepoPath(written: string): RepoPathResult {
  const p = written.trim();
  const example = "write it from the repository root with \"/\" between folders, e.g. geometries/water.xyz";
  if (p.includes("\\"))
    return { ok: false, code: "path-backslash", message: `the path ${JSON.stringify(written)} contains a backslash`, hint: 'use "/" between folders, e.g. geometries/water.xyz' };
  if (p.startsWith("/") || /^[A-Za-z]:/.test(p) || p.startsWith("~") || /^[a-z][a-z0-9+.-]*:\/\//i.test(p))
    return { ok: false, code: "path-absolute", message: `the path ${JSON.stringify(written)} is absolute; files must be inside the repository`, hint: example };
  // eslint-disable-next-line no-control-regex
  if (/[\u0000-\u001f\u007f]/.test(p))
    return { ok: false, code: "path-invalid", message: `the path ${JSON.stringify(written)} contains control characters`, hint: example };
  const parts: string[] = [];
  for (const seg of p.split("/")) {
    if (seg === "") return { ok: false, code: "path-invalid", message: `the path ${JSON.stringify(written)} has an empty part ("//" or a trailing "/")`, hint: example };
    if (seg === ".") continue;
    if (seg === "..") {
      if (parts.length === 0)
        return { ok: false, code: "path-escapes", message: `the path ${JSON.stringify(written)} leaves the repository ("..")`, hint: "files must be inside the repository; write the path from the repository root, e.g. geometries/water.xyz" };
      parts.pop();
      continue;
    }
    parts.push(seg);
  }
  if (parts.length === 0) return { ok: false, code: "path-invalid", message: `the path ${JSON.stringify(written)} names no file`, hint: example };
  return { ok: true, path: parts.join("/") };
}
