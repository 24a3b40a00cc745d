import { expect, test } from "@playwright/test";
import { DEMO_RESEARCHER, signInAs } from "./pages/deposit-pages";

// The demo mechanism (lib/mechanisms/demo.ts) against the demo data gives every verdict.
test("a modeller pastes the demo mechanism, sees every verdict, filters them and opens one reaction's plot", async ({ page }) => {
  await signInAs(page, DEMO_RESEARCHER);
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Mechanisms" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Check a mechanism against the published data" })).toBeVisible();
  await page.getByRole("button", { name: "Paste the demo mechanism" }).click();
  await page.getByRole("button", { name: "Check the mechanism" }).click();
  await expect(page).toHaveURL(/\/mechanisms\/\d+$/);
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
});
