import { openWorkbench } from "./pages/workbench";
import { expect, test } from "@playwright/test";

test("anyone pastes two columns, fits them, and sees the plot, parameters, flags and caution", async ({ page }) => {
  await openWorkbench(page);
  const data = page.getByLabel(/Data: temperature and rate constant/);
  // Invented points on a straight Arrhenius line, with point 5 pushed far off it.
  await data.fill(
    "T\tk\n250\t2.09e-15\n270\t3.31e-15\n290\t4.90e-15\n310\t6.92e-15\n330\t2.40e-14\n350\t1.23e-14\n375\t1.66e-14\n400\t2.17e-14\n420\t2.60e-14\n450\t3.30e-14",
  );
  await page.getByLabel("Show energies in").selectOption("kcal mol-1");
  await page.getByRole("button", { name: "Fit" }).click();

  await expect(page.getByRole("heading", { name: "Result" })).toBeVisible();
  await expect(page.getByRole("img", { name: /Arrhenius plot, ln k against 1000\/T, of 10 points/ })).toBeVisible();
  await expect(page.getByText("flagged as outlier").first()).toBeVisible();
  await expect(page.getByRole("cell", { name: "Ea (kcal mol⁻¹)" }).first()).toBeVisible();
  const checks = page
    .getByRole("region", { name: "Checks" })
    .or(page.locator("section", { has: page.getByRole("heading", { name: "Checks" }) }));
  await expect(checks.first()).toContainText("Point 5");
  await expect(page.getByText(/Extrapolation outside the measured temperature range is unreliable/).first()).toBeVisible();
});

test("a non-numeric cell is reported with its line before anything is sent", async ({ page }) => {
  await openWorkbench(page);
  await page.getByLabel(/Data: temperature and rate constant/).fill("300 1e-12\n350 2e-1x\n400 3e-12");
  await expect(page.getByRole("main").getByRole("alert")).toContainText("line 2: “2e-1x” in column 2 is not a number");
  await expect(page.getByRole("button", { name: "Fit" })).toBeDisabled();
});

test("an error from the engine points at the pasted line", async ({ page }) => {
  await openWorkbench(page);
  await page.getByLabel(/Data: temperature and rate constant/).fill("300 1e-12\n350 0\n400 3e-12");
  await page.getByRole("button", { name: "Fit" }).click();
  await expect(page.getByRole("main").getByRole("alert")).toContainText("line 2:");
});

test("a reaction page compares the published datasets of the demo with their consensus", async ({ page }) => {
  await page.goto("/reactions");
  await page
    .getByRole("link", { name: /hydroxyl( radical)? \+ methane → water \+ methyl( radical)?/ })
    .first()
    .click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(/hydroxyl( radical)? \+ methane → water \+ methyl( radical)?/);
  await expect(page.getByRole("img", { name: /Arrhenius plot, ln k against 1000\/T, of \d+ datasets/ })).toBeVisible();
  await expect(page.getByRole("heading", { name: /Consensus of \d+ datasets/ })).toBeVisible();
  await expect(page.getByText(/Extrapolation outside the measured temperature range is unreliable/).first()).toBeVisible();
});

test("a published version's page shows its identifier, its fit in chosen units and the caution", async ({ page }) => {
  await page.goto("/reactions");
  await page
    .getByRole("link", { name: /chlorine atom \+ methane/ })
    .first()
    .click();
  await page.getByRole("table").getByRole("link").first().click();
  await expect(page).toHaveURL(/\/datasets\/\d+\/v\d+$/);
  await expect(page.getByText(/doi:10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{3}[0-9A-Z*~$=]\/\d+/).first()).toBeVisible();
  await page.getByLabel("Show energies in").selectOption("kcal mol-1");
  await expect(page.getByRole("cell", { name: "Ea (kcal mol⁻¹)" }).first()).toBeVisible();
  await expect(page.getByText(/Extrapolation outside the measured temperature range is unreliable/).first()).toBeVisible();
});
