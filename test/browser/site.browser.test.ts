// The built site in a real browser: Debian's Chromium driven by playwright-core, pages served
// from dist/ on 127.0.0.1. Needs a built site (npm run build) and /usr/bin/chromium (.ci/run
// installs it); skipped with a visible message when either is missing.
import { existsSync, readFileSync, readdirSync, statSync } from "node:fs";
import { createServer, type Server } from "node:http";
import { extname, join, normalize } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

const DIST = fileURLToPath(new URL("../../dist/", import.meta.url));
const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
const ready = existsSync(join(DIST, "index.html")) && existsSync(CHROMIUM);
if (!ready) console.warn(`browser tests skipped: ${existsSync(CHROMIUM) ? "" : CHROMIUM + " missing; "}${existsSync(join(DIST, "index.html")) ? "" : "dist/ not built"}`);

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8", ".js": "text/javascript", ".css": "text/css", ".json": "application/json",
  ".svg": "image/svg+xml", ".wasm": "application/wasm", ".woff2": "font/woff2", ".yaml": "text/plain; charset=utf-8",
  ".xyz": "text/plain; charset=utf-8", ".pf_meta": "application/octet-stream", ".pf_fragment": "application/octet-stream",
  ".pf_index": "application/octet-stream", ".pagefind": "application/octet-stream",
};

let server: Server;
let base = "";
// eslint-disable-next-line @typescript-eslint/no-explicit-any
let browser: any;

function firstCalculationPath(): string {
  const calc = join(DIST, "calc");
  const walk = (dir: string): string | null => {
    if (existsSync(join(dir, "index.html")) && dir !== calc) return dir;
    for (const name of readdirSync(dir).sort()) {
      const p = join(dir, name);
      if (name !== "v" && statSync(p).isDirectory()) {
        const hit = walk(p);
        if (hit) return hit;
      }
    }
    return null;
  };
  const hit = walk(calc);
  if (!hit) throw new Error("no calculation page in dist/calc");
  return "/" + hit.slice(DIST.length).split("\\").join("/") + "/";
}

describe.skipIf(!ready)("the built site in Chromium", () => {
  beforeAll(async () => {
    server = createServer((req, res) => {
      const url = decodeURIComponent((req.url ?? "/").split("?")[0]);
      let file = normalize(join(DIST, url));
      if (!file.startsWith(DIST)) return void res.writeHead(403).end();
      if (existsSync(file) && statSync(file).isDirectory()) file = join(file, "index.html");
      if (!existsSync(file)) return void res.writeHead(404).end("not found");
      res.writeHead(200, { "content-type": TYPES[extname(file)] ?? "application/octet-stream" });
      res.end(readFileSync(file));
    });
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
    const addr = server.address();
    base = `http://127.0.0.1:${typeof addr === "object" && addr ? addr.port : 0}`;
    const { chromium } = await import("playwright-core");
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
        "--disable-background-networking", "--disable-component-update", "--disable-sync"],
    });
  }, 60_000);

  afterAll(async () => {
    await browser?.close();
    server?.close();
  });

  async function open(path: string) {
    const page = await browser.newPage();
    const errors: string[] = [];
    page.on("console", (m: { type(): string; text(): string }) => {
      if (m.type() === "error") errors.push(m.text());
    });
    page.on("pageerror", (e: Error) => errors.push(e.message));
    await page.goto(base + path, { waitUntil: "load" });
    return { page, errors };
  }

  async function seriousViolations(page: unknown): Promise<string[]> {
    const axe = readFileSync(fileURLToPath(import.meta.resolve("axe-core/axe.min.js")), "utf8");
    // eslint-disable-next-line @typescript-eslint/no-explicit-any
    const p = page as any;
    await p.addScriptTag({ content: axe });
    const result = await p.evaluate(async () => (globalThis as unknown as { axe: { run(): Promise<{ violations: { id: string; impact: string }[] }> } }).axe.run());
    return result.violations.filter((v: { impact: string }) => v.impact === "serious" || v.impact === "critical").map((v: { id: string }) => v.id);
  }

  it("loads the index without console errors and without serious accessibility violations", async () => {
    const { page, errors } = await open("/");
    expect(await page.locator("main").count()).toBeGreaterThan(0);
    expect(errors).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
    await page.close();
  });

  it("finds a calculation by formula and by tag with the static search", async () => {
    const { page, errors } = await open("/");
    const input = page.locator("input[type=search], .pagefind-ui__search-input").first();
    for (const query of ["H2O", "radical"]) {
      await input.fill(query);
      await page.waitForSelector(".pagefind-ui__result", { timeout: 15_000 });
      expect(await page.locator(".pagefind-ui__result").count()).toBeGreaterThan(0);
    }
    expect(errors).toEqual([]);
    await page.close();
  });

  it("shows rendered math and the convergence plot on a calculation page", async () => {
    const { page, errors } = await open(firstCalculationPath());
    expect(await page.locator(".katex").count()).toBeGreaterThan(0);
    expect(await page.locator("svg circle, svg path").count()).toBeGreaterThan(0);
    expect(errors).toEqual([]);
    expect(await seriousViolations(page)).toEqual([]);
    await page.close();
  });
});
