import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { MarkdownText } from "@/components/markdown-text";
import DepositFormatPage from "@/app/docs/deposit-format/page";
import { REACTION_CLASSES } from "@/lib/deposits/vocabulary";

describe("/docs/deposit-format", () => {
  const html = renderToStaticMarkup(DepositFormatPage());

  it("renders the field list, the reaction classes, the units and the example", () => {
    expect(html).toContain("<h1");
    expect(html).toContain('href="/schemas/deposit/v1.json"');
    for (const c of REACTION_CLASSES) expect(html).toContain(c.label);
    expect(html).toContain("cm3 molecule-1 s-1");
    expect(html).toContain("Torr");
    expect(html).toContain("&quot;class&quot;: &quot;hydrogen-abstraction&quot;");
    expect(html).toContain('id="field-reaction-reactants"');
  });

  it("states the rule for text the database cannot store: refused with a pointer, never stripped", () => {
    expect(html).toMatch(/except U\+0000 \(NUL\) and lone surrogates/);
    expect(html).toContain("nothing is removed or replaced");
  });

  it("states the cautions", () => {
    expect(html).toContain(
      "Extrapolation outside the measured temperature range is unreliable, and safety-critical use (reactor, storage, process hazards) needs qualified review under local codes.",
    );
  });

  it("shows real error messages for a broken copy of the example", () => {
    expect(html).toContain("Reaction order is required.");
    expect(html).toContain("Point 3: rate constant must be greater than 0 (got -4.33e-15).");
    expect(html).toContain("Point 2: rate constant must be a number; &quot;2.89e-15x&quot; is not a number.");
  });

  it("renders the Markdown description sanitised", () => {
    expect(html).toContain("<strong>OH + CH₄ → H₂O + CH₃</strong>");
    expect(html).toContain("<em>invented example</em>");
  });

  it("drops raw HTML and script links from a description", () => {
    const out = renderToStaticMarkup(
      MarkdownText({ text: 'Hi <script>alert(1)</script> [click](javascript:alert(2)) <img src=x onerror="alert(3)">' }),
    );
    expect(out).not.toContain("<script");
    expect(out).not.toContain("javascript:");
    expect(out).not.toContain("onerror");
    expect(out).toContain("click");
  });
});
