/**
 * Method notes: content/methods/<slug>.md with a small YAML front matter (title, summary, order),
 * rendered with the same safe Markdown + KaTeX renderer as spec notes.
 */
import * as fs from "node:fs";
import * as path from "node:path";
import { parse } from "yaml";
import { renderMarkdown } from "./markdown.ts";

export interface MethodNote {
  slug: string;
  title: string;
  summary: string;
  order: number;
  html: string;
}

function methodsDir(): string {
  return path.join(process.env.FIELDBOOK_SITE_DIR || process.cwd(), "content", "methods");
}

let cache: MethodNote[] | null = null;

export function methodNotes(): MethodNote[] {
  if (cache) return cache;
  const dir = methodsDir();
  const files = fs.existsSync(dir) ? fs.readdirSync(dir).filter((f) => f.endsWith(".md")).sort() : [];
  cache = files.map((file) => {
    const text = fs.readFileSync(path.join(dir, file), "utf8");
    const m = /^---\n([\s\S]*?)\n---\n([\s\S]*)$/.exec(text);
    const front = (m ? parse(m[1]) : {}) as { title?: string; summary?: string; order?: number };
    const body = m ? m[2] : text;
    const slug = file.replace(/\.md$/, "");
    return { slug, title: front.title ?? slug, summary: front.summary ?? "", order: front.order ?? 99, html: renderMarkdown(body, { headingShift: 1 }) };
  }).sort((a, b) => a.order - b.order || (a.slug < b.slug ? -1 : 1));
  return cache;
}
