import { randomBytes } from "node:crypto";
import { expect, test, type Page } from "@playwright/test";
import { DEMO_RESEARCHER, signInAs } from "./pages/deposit-pages";

/** The check runs as a background job: the page shows its progress, then the report (the job worker polls every second). */
async function waitForReport(page: Page) {
  await expect(page).toHaveURL(/\/mechanisms\/\d+$/);
  await expect(page.getByRole("heading", { level: 2, name: "Summary" })).toBeVisible({ timeout: 60_000 });
  await expect(page.getByTestId("check-progress")).toHaveCount(0);
}

// The demo mechanism (lib/mechanisms/demo.ts) against the demo data gives every verdict.
test("a modeller pastes the demo mechanism, sees every verdict, filters them and opens one reaction's plot", async ({ page }) => {
  await signInAs(page, DEMO_RESEARCHER);
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Mechanisms" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Check a mechanism against the published data" })).toBeVisible();
  await page.getByRole("button", { name: "Paste the demo mechanism" }).click();
  await page.getByRole("button", { name: "Check the mechanism" }).click();
  await waitForReport(page);
  await expect(page.getByRole("heading", { level: 1 })).toContainText("Mechanism check: Invented demo mechanism");
  await expect(page.getByText(/extrapolation outside the measured/i).first()).toBeVisible();

  const rows = page.locator("tbody tr[data-verdict]");
  await expect(rows).toHaveCount(6);
  for (const verdict of ["agrees", "disagrees", "no_data", "not_checked"])
    await expect(page.locator(`tr[data-verdict="${verdict}"]`).first()).toBeVisible();
  // Earlier end-to-end tests publish datasets of the demo's reactions into the same database, which can move a
  // verdict of the demo mechanism (OH + CH4 above all): the counts here are the ones no other test touches.
  await expect(page.locator('tr[data-verdict="disagrees"]', { hasText: "Cl+CH4=>HCl+CH3" })).toHaveCount(1);
  await expect(page.locator('tr[data-verdict="not_checked"]')).toHaveCount(1);
  await expect(page.locator("tr", { hasText: "H2O+CH3=>OH+CH4" })).toContainText("reverse direction only");

  await page.getByLabel("Show").selectOption("extrapolated");
  await expect(page.getByRole("status").filter({ hasText: "of 6 reactions" })).toHaveText(/^[1-6] of 6 reactions$/);
  await page.getByLabel("Show").selectOption("disagrees");
  const chlorine = rows.filter({ hasText: "Cl+CH4=>HCl+CH3" });
  await expect(chlorine).toHaveCount(1);
  await chlorine.getByRole("link", { name: "Plot" }).click();
  const plot = page.getByRole("region", { name: /Cl\+CH4=>HCl\+CH3 \(line \d+\): disagrees/ });
  await expect(plot).toBeVisible();
  await expect(plot.locator("svg").first()).toBeVisible();
  await expect(plot).toContainText("Mechanism, line");
  // A dataset's line is named by its title and "version n", never a bare "v1 ·".
  await expect(plot.getByTestId("plot-legend")).toContainText(/, version \d+/);
  await expect(plot.getByTestId("plot-legend")).not.toContainText(/\bv\d+ ·/);
});

// Isomers of C3H6 (cyclopropane and propene) are both among the demo's species. The mechanism's name for them is new
// on every run, so no choice remembered by an earlier run (or another test) settles it.
test("a modeller chooses the species of an ambiguous name in the table and the check runs again with it", async ({ page }) => {
  const name = `isomer${randomBytes(4).toString("hex")}`;
  const yaml = [
    "description: invented test mechanism",
    "units: {length: cm, quantity: molec, activation-energy: K}",
    "species:",
    `- name: ${name}`,
    "  composition: {C: 3, H: 6}",
    "- name: OH",
    "  composition: {O: 1, H: 1}",
    "reactions:",
    `- equation: OH + ${name} => OH + ${name}`,
    "  rate-constant: {A: 1.0e-11, b: 0.0, Ea: 500.0}",
  ].join("\n");
  await signInAs(page, DEMO_RESEARCHER);
  await page.goto("/mechanisms");
  await page.getByLabel("Mechanism text").fill(yaml);
  await page.getByRole("button", { name: "Check the mechanism" }).click();
  await waitForReport(page);

  const chooser = page.getByTestId("species-chooser");
  const row = chooser.locator(`tr[data-species="${name}"]`);
  await expect(row).toContainText("several candidates of C3H6");
  await row.getByLabel(`Search a species for ${name}`).fill("C=CC");
  await row.getByRole("button", { name: "Search" }).click();
  await row.getByRole("button", { name: /^Choose propene/ }).click();
  await expect(row).toContainText("Chosen: propene (C3H6)");
  await chooser.getByRole("button", { name: "Save this choice and check again" }).click();

  // The same page shows the new run's progress and then its report, where the name is the person's choice.
  await expect(page.locator(`tr[data-species="${name}"]`)).toHaveCount(0, { timeout: 60_000 });
  await waitForReport(page);
  const chosen = page.getByRole("region", { name: "Species" }).locator("tr", { hasText: name });
  await expect(chosen).toContainText("your choice");
  await expect(chosen).toContainText("propene");
});
