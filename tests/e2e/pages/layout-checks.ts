import AxeBuilder from "@axe-core/playwright";
import type { Page } from "@playwright/test";

/**
 * What is wrong with the page as it stands, in words naming `path`: wider than the screen, and
 * every serious or critical accessibility violation axe-core finds.
 */
export async function widthAndAxeProblems(page: Page, path: string): Promise<string[]> {
  const problems: string[] = [];
  const { scrollWidth, clientWidth } = await page.evaluate(() => ({
    scrollWidth: document.documentElement.scrollWidth,
    clientWidth: document.documentElement.clientWidth,
  }));
  if (scrollWidth > clientWidth) problems.push(`${path}: ${scrollWidth} px wide on a ${clientWidth} px screen`);
  const axe = await new AxeBuilder({ page }).analyze();
  for (const v of axe.violations.filter((x) => x.impact === "serious" || x.impact === "critical")) {
    problems.push(`${path}: axe ${v.id} (${v.impact}) on ${v.nodes.length} element(s), e.g. ${v.nodes[0]?.target.join(" ")}`);
  }
  return problems;
}
