import { mkdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { expect, test, type Page } from "@playwright/test";
import { widthAndAxeProblems } from "./pages/layout-checks";

// The public page of a dataset version, from the demo data: the data table and plot follow the
// reader's unit, the points download, an older version points to the newest, a retracted one
// says so, nothing is cut off on a 390 px phone, and axe finds nothing serious.

const PHONE = { width: 390, height: 844 };
const DESKTOP = { width: 1366, height: 900 };
const SHOTS = process.env.SCREENSHOT_DIR ?? path.join(process.env.TEST_REPORTS_DIR ?? "test-results", "dataset-page");

/** Every dataset version page linked from the reaction pages, as [datasetId, version number, path]. */
async function demoVersions(page: Page): Promise<{ dataset: number; number: number; path: string }[]> {
  await page.goto("/reactions");
  const reactions = await page
    .locator("main a[href]")
    .evaluateAll((as) => [...new Set(as.map((a) => a.getAttribute("href") ?? "").filter((h) => /^\/reactions\/[^/?#]+$/.test(h)))]);
  const links = new Set<string>();
  for (const r of reactions) {
    await page.goto(r);
    for (const h of await page.locator("main a[href]").evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""))) {
      if (/^\/datasets\/\d+\/v\d+$/.test(h)) links.add(h);
    }
  }
  return [...links].map((p) => {
    const [, dataset, number] = /^\/datasets\/(\d+)\/v(\d+)$/.exec(p)!;
    return { dataset: Number(dataset), number: Number(number), path: p };
  });
}

let versions: { dataset: number; number: number; path: string }[] = [];
/** A retracted version and a version with a point marked as an outlier, among the demo's pages. */
const found: { retracted?: string; outlier?: string } = {};
test.beforeAll(async ({ browser }) => {
  test.setTimeout(300_000);
  const page = await browser.newPage();
  versions = await demoVersions(page);
  for (const v of versions) {
    if (found.retracted && found.outlier) break;
    await page.goto(v.path);
    if (!found.retracted && (await page.getByTestId("retraction-notice").count())) found.retracted = v.path;
    if (!found.outlier && (await page.getByText("× outlier").count())) found.outlier = v.path;
  }
  await page.close();
});

/** The demo dataset with a second published version (scripts/seed/seed-revisions.ts). */
const revised = () => {
  const v2 = versions.find((v) => v.number === 2);
  expect(v2, "a demo dataset with a second version").toBeDefined();
  return v2!;
};

const retractedPath = () => {
  expect(found.retracted, "a retracted version in the demo").toBeDefined();
  return found.retracted!;
};

test("switching k's unit moves the table, the plot's axis and the address; a reload keeps it", async ({ page }) => {
  await page.setViewportSize(DESKTOP);
  await page.goto(revised().path);
  const table = page.getByRole("region", { name: "The data (scrollable table)" });
  await expect(table).toBeVisible();
  const chosen = page.getByTestId("chosen-k-header");
  await expect(chosen).toHaveText("k (cm³ molecule⁻¹ s⁻¹)");
  const cellOf = async (row: number) => {
    const headers = await table.locator("thead th").allTextContents();
    const col = headers.findIndex((h) => h === "k (cm³ molecule⁻¹ s⁻¹)" || h === "k (L mol⁻¹ s⁻¹)");
    return (await table.locator("tbody tr").nth(row).locator("td").nth(col).textContent())!;
  };
  const asNumber = (s: string) => Number(s.replace("\u2212", "-"));
  const before = asNumber(await cellOf(0));
  const yLabel = page.locator("figure .recharts-label", { hasText: "ln k" });
  await expect(yLabel).toContainText("cm³ molecule⁻¹ s⁻¹");
  const firstTick = await page.locator("figure .recharts-yAxis-tick-labels .recharts-cartesian-axis-tick-value").first().textContent();

  await page.getByLabel("Show k in").selectOption("L mol-1 s-1");
  await expect(chosen).toHaveText("k (L mol⁻¹ s⁻¹)");
  // cm³ molecule⁻¹ s⁻¹ → L mol⁻¹ s⁻¹: × N_A / 1000 (N_A = 6.02214076e23, CODATA 2018).
  expect(asNumber(await cellOf(0)) / (before * 6.02214076e20)).toBeCloseTo(1, 3);
  await expect(yLabel).toContainText("L mol⁻¹ s⁻¹");
  await expect
    .poll(() => page.locator("figure .recharts-yAxis-tick-labels .recharts-cartesian-axis-tick-value").first().textContent())
    .not.toBe(firstTick);
  await expect(page).toHaveURL(/[?&]k=L\+mol-1\+s-1/);
  await page.reload();
  await expect(chosen).toHaveText("k (L mol⁻¹ s⁻¹)");
  await expect(page.getByLabel("Show k in")).toHaveValue("L mol-1 s-1");
});

test("the plot draws error bars and the band, on round ticks, with T in K above", async ({ page }) => {
  await page.setViewportSize(DESKTOP);
  await page.goto(revised().path);
  const figure = page.locator("figure").first();
  await expect(figure.locator(".recharts-errorBar").first()).toBeAttached();
  await expect(figure.locator(".recharts-area-area")).toBeAttached();
  await expect(figure.locator("figcaption")).toContainText("Bars: the stated ±1σ of each point.");
  await expect(figure.locator("figcaption")).toContainText("Shaded: 95 % confidence band");
  const labels = (await figure.locator(".recharts-label").allTextContents()).join(" | ");
  expect(labels).toContain("1000 / T");
  // SVG text collapses the double space of the label.
  expect(labels).toMatch(/(^| \| )T \(K\)( \| |$)/);
  // The top axis labels round temperatures in kelvin.
  const xAxes = await figure
    .locator(".recharts-xAxis-tick-labels")
    .evaluateAll((axes) => axes.map((a) => [...a.querySelectorAll(".recharts-cartesian-axis-tick-value")].map((t) => t.textContent ?? "")));
  const tops = xAxes.find((labels) => labels.length > 1 && labels.every((t) => Number(t) >= 100));
  expect(tops, `x axes: ${JSON.stringify(xAxes)}`).toBeDefined();
  for (const t of tops!) expect(Number(t), t).toBe(Number(Number(t).toPrecision(2)));
  await page.getByRole("radio", { name: "log₁₀ k" }).check();
  await expect(figure.locator(".recharts-label", { hasText: "log₁₀ k" })).toBeVisible();
});

test("the points download as CSV with the identifier, licence, citation and caution", async ({ page }) => {
  await page.goto(revised().path);
  const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Points as CSV" }).click()]);
  expect(download.suggestedFilename()).toMatch(/^ARH-[0-9A-Z]{4}-[0-9A-Z]{4}-2-points\.csv$/);
  const text = readFileSync((await download.path())!, "utf8");
  // Each header line is one quoted cell starting with "#" (a comma or quote in it never opens a cell of its own).
  expect(text).toMatch(/^"# version identifier: doi:10\.5072\/ARH-[0-9A-Z-]+\/2"\r$/m);
  expect(text).toMatch(/^"# licence: CC-BY-4\.0"\r$/m);
  expect(text).toMatch(/^"# cite as: .*Version 2\. Arrhenia\. doi:/m);
  expect(text).toMatch(/^"# caution: Extrapolation outside the measured temperature range is unreliable/m);
  expect(text).toMatch(/^row,T_deposited,T_deposited_unit,k_deposited,k_deposited_unit,/m);
  const json = await page.request.get((await page.getByRole("link", { name: "Points as JSON" }).getAttribute("href"))!);
  expect(json.headers()["content-type"]).toMatch(/^application\/json/);
  expect((await json.json()).about.version).toBe(2);
});

test("an older version says a newer one exists and links it; the versions table lists both", async ({ page }) => {
  const v2 = revised();
  await page.goto(`/datasets/${v2.dataset}/v1`);
  const note = page.getByTestId("newer-version");
  await expect(note).toContainText("A newer version exists");
  await expect(note.getByRole("link")).toHaveAttribute("href", v2.path);
  const rows = page.getByRole("region", { name: "Versions (scrollable table)" }).locator("tbody tr");
  await expect(rows).toHaveCount(2);
  await expect(rows.nth(0)).toContainText("doi:10.5072/ARH-");
  await expect(rows.nth(1)).toContainText("Version 1 (this page)");
  await page.goto(v2.path);
  await expect(page.getByTestId("newer-version")).toHaveCount(0);
});

test("a retracted version shows its notice with the date, above everything else", async ({ page }) => {
  const p = retractedPath();
  await page.goto(p);
  const notice = page.getByTestId("retraction-notice");
  await expect(notice.getByRole("heading")).toHaveText(/^This version was retracted on \d{4}-\d\d-\d\d$/);
  // The notice's own words follow the heading (the demo has more than one retracted version, each with its reason).
  await expect(notice).toContainText(/\d{4}-\d\d-\d\d\s*\S.{5,}/);
  // Its citation says it is retracted, in the line and in every formatted reference of the Cite panel.
  await expect(page.getByTestId("citation")).toContainText("Retracted.");
  await expect(page.getByTestId("cite-reference")).toContainText(/retracted/i);
  const [noticeTop, titleTop] = await Promise.all([notice.boundingBox(), page.getByRole("heading", { level: 1 }).boundingBox()]);
  expect(noticeTop!.y).toBeLessThan(titleTop!.y);
});

for (const [name, size] of [
  ["390", PHONE],
  ["1366", DESKTOP],
] as const) {
  test(`at ${name} px: no value cut off, nothing wider than the screen, axe finds nothing serious; screenshot`, async ({ page }) => {
    test.setTimeout(300_000);
    await page.setViewportSize(size);
    mkdirSync(SHOTS, { recursive: true });
    const paths = [revised().path, `/datasets/${revised().dataset}/v1`, retractedPath()];
    const problems: string[] = [];
    for (const [i, p] of paths.entries()) {
      await page.goto(p);
      await page.waitForLoadState("networkidle");
      const cut = await page.evaluate(() =>
        [...document.querySelectorAll<HTMLElement>("main table td, main table th")]
          .filter((c) => c.scrollWidth > c.clientWidth)
          .map((c) => `${c.textContent} (${c.scrollWidth} > ${c.clientWidth})`),
      );
      problems.push(...cut.map((c) => `${p}: cell cut off: ${c}`));
      problems.push(...(await widthAndAxeProblems(page, p)));
      await page.screenshot({ path: path.join(SHOTS, `dataset-${["newest", "older", "retracted"][i]}-${name}.png`), fullPage: true });
    }
    expect(problems).toEqual([]);
  });
}

test("an outlier's reason shows on keyboard focus and is in the text for screen readers", async ({ page }) => {
  expect(found.outlier, "a demo version with an outlier").toBeDefined();
  await page.goto(found.outlier!);
  const mark = page.getByText("× outlier").first();
  await mark.focus();
  await expect(mark).toHaveAccessibleDescription(/times the typical scatter away from the line .* the limit for any point of this set/);
  await expect(
    page
      .locator("[aria-hidden=true]")
      .filter({ hasText: /times the typical scatter away from the line/ })
      .first(),
  ).toBeVisible();
});
