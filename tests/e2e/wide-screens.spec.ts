import { expect, test, type Page } from "@playwright/test";
import { axeFindings } from "./pages/layout-checks";
import { DEMO_RESEARCHER, signInAs } from "./pages/deposit-pages";

// A 1366 px laptop screen: every value and footnote of a published version's tables is visible,
// no cell cut off and no table scrolled sideways out of sight.

const LAPTOP = { width: 1366, height: 768 };

/** The addresses of the published versions linked from the first reaction in the demo. */
async function versionPages(page: Page): Promise<string[]> {
  await page.goto("/reactions");
  const reactions = await page.locator("main a[href]").evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""));
  const reaction = reactions.find((h) => /^\/reactions\/[A-Z0-9.*+~-]+$/.test(h));
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

/** The first link in the main content of `path` whose address matches `pattern`, or null. */
async function firstLink(page: Page, path: string, pattern: RegExp): Promise<string | null> {
  await page.goto(path);
  const hrefs = await page.locator("main a[href]").evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""));
  return hrefs.find((h) => pattern.test(h)) ?? null;
}

/** Sideways scroll and serious or critical axe violations of the page as it stands. */
async function pageProblems(page: Page, path: string): Promise<string[]> {
  const out: string[] = [];
  const { scrollWidth, clientWidth } = await page.evaluate(() => ({
    scrollWidth: document.documentElement.scrollWidth,
    clientWidth: document.documentElement.clientWidth,
  }));
  if (scrollWidth > clientWidth) out.push(`${path}: ${scrollWidth} px wide on a ${clientWidth} px screen`);
  const axe = await axeFindings(page);
  for (const v of axe.violations.filter((x) => x.impact === "serious" || x.impact === "critical"))
    out.push(`${path}: axe ${v.id} (${v.impact}) on ${v.nodes.length} element(s), e.g. ${v.nodes[0]?.target.join(" ")}`);
  return out;
}

test("the newer pages at 1366 px: no sideways scroll, no serious axe violation", async ({ page }) => {
  test.setTimeout(180_000);
  await page.setViewportSize(LAPTOP);
  const problems: string[] = [];
  await page.goto("/verify/resend");
  problems.push(...(await pageProblems(page, "/verify/resend")));
  await page.goto("/analyse");
  await page.getByLabel(/Data: temperature and rate constant/).fill("250 2.09e-15\n290 4.90e-15\n330 9.1e-15\n370 1.5e-14\n410 2.3e-14");
  await page.getByRole("button", { name: "Fit" }).click();
  await expect(page.getByRole("heading", { name: "Result" })).toBeVisible();
  problems.push(...(await pageProblems(page, "/analyse (with a result)")));
  await signInAs(page, DEMO_RESEARCHER);
  // The 403 page of a researcher, a deposit page with its invitations list, and its audit trail.
  const paths = ["/review"];
  const deposit = await firstLink(page, "/deposits", /^\/deposits\/\d+$/);
  expect(deposit, "a deposit of the demo researcher").not.toBeNull();
  paths.push(deposit!);
  const audit = await firstLink(page, deposit!, /^\/datasets\/\d+\/audit$/);
  expect(audit, "the deposit page links its audit trail").not.toBeNull();
  paths.push(audit!);
  for (const path of paths) {
    await page.goto(path);
    await page.waitForLoadState("networkidle");
    problems.push(...(await pageProblems(page, path)));
  }
  expect(problems).toEqual([]);
});
