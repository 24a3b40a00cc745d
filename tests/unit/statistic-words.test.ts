import { describe, expect, it } from "vitest";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { StatisticGlossary, StatisticTerm } from "@/components/statistic-term";
import { STATISTIC_WORDS } from "@/lib/statistic-words";

describe("statistics in plain words", () => {
  it("every statistic has plain words, a different technical name and one sentence of meaning", () => {
    for (const [id, w] of Object.entries(STATISTIC_WORDS)) {
      expect(w.plain.length, id).toBeGreaterThan(3);
      expect(w.plain.toLowerCase(), id).not.toBe(w.term.toLowerCase());
      expect(w.explain, id).toMatch(/^[A-Z0-9τ].*\.$/);
    }
  });

  it("shows the plain words first and the technical name after, with its meaning on hover", () => {
    const html = renderToStaticMarkup(createElement(StatisticTerm, { id: "spread" }));
    expect(html.indexOf("How far apart")).toBeLessThan(html.indexOf("(spread)"));
    expect(html).toContain(`title="${STATISTIC_WORDS.spread.explain.replace(/'/g, "&#x27;")}"`);
    const glossary = renderToStaticMarkup(createElement(StatisticGlossary, { ids: ["consensus", "residual"] }));
    expect(glossary).toContain("What these numbers mean");
    expect(glossary).toContain("Combined expression (consensus)");
  });
});
