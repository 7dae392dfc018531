// The site's copy of the SCF defaults (shown as "default" on every page) matches the engine's.
import { describe, expect, it } from "vitest";
import { SCF_DEFAULTS } from "../../src/engine/scf/scf.ts";
import { SCF_DEFAULTS_VIEW } from "../../src/site/settings.ts";
import { fixed, formulaHtml, hashPrefix, sci } from "../../src/site/format.ts";
import { renderMarkdown } from "../../src/site/markdown.ts";

describe("site helpers", () => {
  it("keeps the page's SCF defaults in step with src/engine/scf/scf.ts", () => {
    expect(SCF_DEFAULTS_VIEW).toEqual({
      energy: SCF_DEFAULTS.energy, density: SCF_DEFAULTS.density, max_iterations: SCF_DEFAULTS.maxIterations,
      accelerator: SCF_DEFAULTS.accelerator, diis_size: SCF_DEFAULTS.diisSize, guess: SCF_DEFAULTS.guess,
      level_shift: SCF_DEFAULTS.levelShift, damping: SCF_DEFAULTS.damping, orth_threshold: SCF_DEFAULTS.orthThreshold,
      rebuild_every: SCF_DEFAULTS.rebuildEvery,
    });
  });

  it("formats numbers in plain ASCII without negative zero", () => {
    expect(fixed(-1e-9, 6)).toBe("0.000000");
    expect(fixed(-0.5, 3)).toBe("-0.500");
    expect(sci(1.234e-10, 2)).toBe("1.23e-10");
    expect(formulaHtml("C6H12O6")).toBe("C<sub>6</sub>H<sub>12</sub>O<sub>6</sub>");
    expect(hashPrefix("sha256:0123456789abcdef")).toBe("0123456789ab");
  });

  it("renders Markdown without raw HTML or unsafe links, with math", () => {
    const html = renderMarkdown('x <script>alert(1)</script> [a](javascript:alert(1)) [b](https://example.org) $E=mc^2$');
    expect(html).not.toContain("<script");
    expect(html).toContain("&lt;script&gt;");
    expect(html).not.toContain('href="javascript:');
    expect(html).toContain('href="https://example.org" rel="nofollow noopener"');
    expect(html).toContain('class="katex"');
  });
});
