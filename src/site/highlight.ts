/**
 * Syntax highlighting at build time with Shiki: one highlighter per build, created once and
 * reused (deterministic output, no client script).
 */
import { createHighlighter, type Highlighter } from "shiki";

let highlighter: Promise<Highlighter> | null = null;

function get(): Promise<Highlighter> {
  highlighter ??= createHighlighter({ themes: ["github-light"], langs: ["yaml", "json"] });
  return highlighter;
}

export async function highlight(code: string, lang: "yaml" | "json"): Promise<string> {
  const h = await get();
  return h.codeToHtml(code, { lang, theme: "github-light" });
}
