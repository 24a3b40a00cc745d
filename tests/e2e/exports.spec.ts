import { readFileSync } from "node:fs";
import { expect, test, type Locator, type Page } from "@playwright/test";
import Papa from "papaparse";
import { parse as parseYaml } from "yaml";

// Exports against the demo data: the mechanism parameters of a dataset version downloaded in kcal
// carry the numbers the page shows, and a whole search result exports as CSV with progress and opens.

/** A number as the page writes it ("−1.234e−12", "2.345") → a JavaScript number. */
const pageNumber = (text: string | null) => Number((text ?? "").trim().replace(/−/g, "-"));

/** The value cell of a row of the page's fitted-parameter table whose label starts with `label` (the Arrhenius one comes first). */
async function parameterOnPage(table: Locator, label: string): Promise<number> {
  const row = table
    .getByRole("row")
    .filter({ has: table.page().getByRole("cell", { name: label, exact: true }) })
    .first();
  return pageNumber(await row.getByRole("cell").nth(1).textContent());
}

/** A published (not retracted) demo version, from the search API. */
async function publishedVersion(page: Page): Promise<{ datasetId: number; versionNumber: number }> {
  const res = await page.request.get("/api/v1/search?limit=20");
  expect(res.ok()).toBe(true);
  // Second order, so A is in cm³ molecule⁻¹ s⁻¹ on the page by default.
  const hit = (await res.json()).hits.find(
    (h: { retracted: boolean; ea: number | null; aUnit: string | null }) =>
      // The API writes units as files do (ASCII ids); the page shows them with superscripts.
      !h.retracted && h.ea !== null && h.aUnit === "cm3 molecule-1 s-1",
  );
  expect(hit, "a published demo dataset with a fit").toBeDefined();
  return hit;
}

test("mechanism parameters downloaded in kcal carry the numbers the page shows; the YAML reads in kcal/mol", async ({ page }) => {
  const { datasetId, versionNumber } = await publishedVersion(page);
  await page.goto(`/datasets/${datasetId}/v${versionNumber}?energy=kcal%20mol-1`);
  const table = page.getByRole("table", { name: "Parameters of each model with standard errors" });
  const kLabel = "cm³ molecule⁻¹ s⁻¹";
  const shownEa = await parameterOnPage(table, "Ea (kcal mol⁻¹)");
  const shownA = await parameterOnPage(table, `A (${kLabel})`);
  expect(Number.isFinite(shownEa)).toBe(true);

  const section = page.getByRole("region", { name: "Parameters for a mechanism" });
  await expect(section.getByLabel("Ea in")).toHaveValue("kcal mol-1");
  const [download] = await Promise.all([
    page.waitForEvent("download"),
    section.getByRole("link", { name: "Parameters as a table (text)" }).click(),
  ]);
  expect(download.suggestedFilename()).toMatch(/-parameters\.txt$/);
  const text = readFileSync((await download.path())!, "utf8");
  expect(text).toMatch(/^caution: .+/m);
  const lines = text.trimEnd().split("\n");
  const head = lines.find((l) => l.startsWith("fit "))!;
  expect(head).toContain("Ea (kcal mol-1)");
  const heads = ["fit", "preferred", "A (", "n ", "Ea (", "T0 (K)", "A/T0^n"];
  const at = heads.map((h) => head.indexOf(h));
  const arrhenius = lines.find((l) => l.startsWith("Arrhenius "))!;
  const cell = (i: number) => Number(arrhenius.slice(at[i], at[i + 1]).trim());
  // The page rounds to 4 significant digits: the file's 7 agree within half a unit of the 4th.
  expect(Math.abs(cell(4) / shownEa - 1)).toBeLessThan(1e-3);
  expect(Math.abs(cell(2) / shownA - 1)).toBeLessThan(1e-3);

  const [yamlDownload] = await Promise.all([
    page.waitForEvent("download"),
    section.getByRole("link", { name: "Parameters as Cantera YAML" }).click(),
  ]);
  const doc = parseYaml(readFileSync((await yamlDownload.path())!, "utf8"));
  expect(doc.units).toMatchObject({ length: "cm", quantity: "molec", "activation-energy": "kcal/mol" });
  expect(doc.reactions[0].equation).toContain("=>");

  // Units switched on the page: the pickers follow them (the page is not loaded again).
  await page.getByLabel("Show energies in").selectOption("kJ mol-1");
  await page.getByLabel("Show k in").selectOption("L mol-1 s-1");
  await expect(page).toHaveURL(/[?&]k=L\+mol-1\+s-1/);
  await expect(section.getByLabel("Ea in")).toHaveValue("kJ mol-1");
  // (The select sits inside its label, so "A in" would also name the "Ea in" one.)
  await expect(section.getByRole("combobox").first()).toHaveValue("L mol-1 s-1");
});

test("a whole search result exports as CSV with progress, and the file opens with every row", async ({ page }) => {
  await page.goto("/search?q=methane");
  const status = page.getByRole("region", { name: "Results" }).getByRole("status");
  await expect(status).toHaveText(/^\d[\d,]* datasets? found$/);
  const found = Number((await status.textContent())!.replace(/[^\d].*$/, "").replace(/,/g, ""));
  const panel = page.getByTestId("search-export");
  await panel.getByText("Export every result").click();
  await panel.getByLabel("for spreadsheet programs (byte order mark)").check();
  const [download] = await Promise.all([page.waitForEvent("download"), panel.getByRole("button", { name: "Export", exact: true }).click()]);
  await expect(panel.getByTestId("search-export-status")).toHaveText(new RegExp(`^Saved arrhenia-search-.*\\.csv: ${found} rows`));
  expect(download.suggestedFilename()).toMatch(/^arrhenia-search-\d{4}-\d{2}-\d{2}\.csv$/);
  const bytes = readFileSync((await download.path())!);
  expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
  const text = bytes.subarray(3).toString("utf8");
  const lines = text.split("\r\n");
  expect(lines.some((l) => l.startsWith('"# caution: '))).toBe(true);
  const table = Papa.parse<Record<string, string>>(lines.filter((l) => !l.startsWith('"#')).join("\n"), {
    header: true,
    skipEmptyLines: true,
  });
  expect(table.errors).toEqual([]);
  expect(table.data).toHaveLength(found);
  for (const row of table.data) expect(row.page).toMatch(/\/datasets\/\d+\/v\d+$/);
});
