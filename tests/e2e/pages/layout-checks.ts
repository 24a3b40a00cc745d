import AxeBuilder from "@axe-core/playwright";
import type { Page } from "@playwright/test";

/**
 * axe-core's findings on the page as it stands. A page of one frame (every page but the mail
 * preview, whose message is in an iframe) is checked by axe running in that frame (legacy mode): the
 * same rules and results, without the default mode's blank page opened to put the frames' results
 * together, which took 1.5–4 s more per page on this machine (4.2–7.5 s instead of 2.8–3.2 s).
 */
export function axeFindings(page: Page) {
  const builder = new AxeBuilder({ page });
  return (page.frames().length > 1 ? builder : builder.setLegacyMode()).analyze();
}

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
  const axe = await axeFindings(page);
  for (const v of axe.violations.filter((x) => x.impact === "serious" || x.impact === "critical")) {
    problems.push(`${path}: axe ${v.id} (${v.impact}) on ${v.nodes.length} element(s), e.g. ${v.nodes[0]?.target.join(" ")}`);
  }
  return problems;
}
