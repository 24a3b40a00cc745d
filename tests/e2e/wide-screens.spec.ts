import { expect, test, type Page } from "@playwright/test";

// A 1366 px laptop screen: every value and footnote of a published version's tables is visible,
// no cell cut off and no table scrolled sideways out of sight.

const LAPTOP = { width: 1366, height: 768 };

/** The addresses of the published versions linked from the first reaction in the demo. */
async function versionPages(page: Page): Promise<string[]> {
  await page.goto("/reactions");
  const reactions = await page.locator("main a[href]").evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""));
  const reaction = reactions.find((h) => /^\/reactions\/\d+$/.test(h));
  expect(reaction, "a reaction page in the demo").toBeTruthy();
  await page.goto(reaction!);
  const links = await page.locator("main a[href]").evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""));
  return [...new Set(links.filter((h) => /^\/datasets\/\d+\/v\d+$/.test(h)))].slice(0, 3);
}

test("a dataset page at 1366 px shows every table cell whole", async ({ page }) => {
  await page.setViewportSize(LAPTOP);
  const paths = await versionPages(page);
  expect(paths.length).toBeGreaterThan(0);
  const problems: string[] = [];
  for (const path of paths) {
    await page.goto(path);
    await page.waitForLoadState("networkidle");
    await expect(page.getByRole("heading", { name: "Fitted parameters" })).toBeVisible();
    const clipped = await page.evaluate(() => {
      const out: string[] = [];
      for (const cell of document.querySelectorAll<HTMLElement>("main td, main th")) {
        if (cell.scrollWidth > cell.clientWidth + 1)
          out.push(`cell "${cell.textContent?.slice(0, 40)}" ${cell.scrollWidth} > ${cell.clientWidth}`);
      }
      for (const table of document.querySelectorAll<HTMLTableElement>("main table")) {
        const box = table.parentElement!;
        if (box.scrollWidth > box.clientWidth + 1)
          out.push(`table "${table.caption?.textContent}" ${box.scrollWidth} px in ${box.clientWidth} px`);
      }
      return out;
    });
    problems.push(...clipped.map((c) => `${path}: ${c}`));
  }
  expect(problems).toEqual([]);
});
