/**
 * Markdown to HTML, safe for text written by anyone (spec notes) and used for the method notes:
 * - raw HTML is never passed through (markdown-it `html: false` escapes it), so a hostile note
 *   with <script> or event-handler attributes renders as inert text;
 * - links are only kept for http(s), mailto and relative URLs (markdown-it's validateLink plus an
 *   allow-list), external links get rel="nofollow noopener";
 * - math between $…$ (inline) and $$…$$ (display) is rendered by KaTeX at build time with
 *   `trust: false` (no \href, \url or HTML extensions); a TeX error is shown as escaped text.
 */
import markdownIt, { type MarkdownIt } from "markdown-it";
import katex from "katex";
import { escapeHtml } from "./format.ts";

export interface MarkdownOptions {
  /** add this to every heading level (notes inside a page section start at h3) */
  headingShift?: number;
}

const SAFE_URL = /^(https?:|mailto:|\/|\.{0,2}\/|#)/i;

function renderer(shift: number): MarkdownIt {
  const md = markdownIt({ html: false, linkify: false, typographer: false, breaks: false });
  const defaultValidate = md.validateLink.bind(md);
  md.validateLink = (url: string) => defaultValidate(url) && (SAFE_URL.test(url.trim()) || !/^[a-z][a-z0-9+.-]*:/i.test(url.trim()));
  md.renderer.rules.link_open = (tokens, idx, options, _env, self) => {
    const href = String(tokens[idx].attrGet("href") ?? "");
    if (/^(https?:)?\/\//i.test(href)) tokens[idx].attrSet("rel", "nofollow noopener");
    return self.renderToken(tokens, idx, options);
  };
  md.renderer.rules.heading_open = (tokens, idx, options, _env, self) => {
    const level = Math.min(6, Number(tokens[idx].tag.slice(1)) + shift);
    tokens[idx].tag = `h${level}`;
    return self.renderToken(tokens, idx, options);
  };
  md.renderer.rules.heading_close = (tokens, idx, options, _env, self) => {
    const level = Math.min(6, Number(tokens[idx].tag.slice(1)) + shift);
    tokens[idx].tag = `h${level}`;
    return self.renderToken(tokens, idx, options);
  };
  return md;
}

function renderMath(source: string, display: boolean): string {
  try {
    return katex.renderToString(source, { displayMode: display, throwOnError: true, trust: false, output: "htmlAndMathml" });
  } catch (e) {
    return `<code class="tex-error" title="${escapeHtml((e as Error).message)}">${escapeHtml(source)}</code>`;
  }
}

/** Markdown (with $…$ and $$…$$ math) to HTML that is safe to insert. */
export function renderMarkdown(text: string, options: MarkdownOptions = {}): string {
  const math: string[] = [];
  const hold = (html: string) => `MATHPLACEHOLDER${math.push(html) - 1}X`;
  // protect code spans and fences from math extraction by a simple split on backtick runs
  const pieces = text.split(/(```[\s\S]*?```|`[^`\n]*`)/g);
  const withMath = pieces.map((piece, k) => {
    if (k % 2 === 1) return piece;
    return piece
      .replace(/\$\$([\s\S]+?)\$\$/g, (_m, tex: string) => `\n\n${hold(renderMath(tex.trim(), true))}\n\n`)
      .replace(/(^|[^\\$])\$([^$\n]+?)\$/g, (_m, pre: string, tex: string) => `${pre}${hold(renderMath(tex.trim(), false))}`);
  }).join("");
  const html = renderer(options.headingShift ?? 0).render(withMath);
  return html.replace(/<p>MATHPLACEHOLDER(\d+)X<\/p>/g, (_m: string, i: string) => `<div class="math-display">${math[Number(i)]}</div>`)
    .replace(/MATHPLACEHOLDER(\d+)X/g, (_m: string, i: string) => math[Number(i)]);
}
