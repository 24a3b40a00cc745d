import { expect, test } from "@playwright/test";
import { DEMO_RESEARCHER, signInAs } from "./pages/deposit-pages";

// Every page names itself in the browser tab: a reaction by its equation, a dataset by its title,
// a missing page as "Not found".

test("reaction and dataset pages are titled by what they show; missing pages 'Not found · Arrhenia'", async ({ page }) => {
  await page.goto("/reactions");
  const reaction = (await page.locator("main a[href]").evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""))).find((h) =>
    /^\/reactions\/[A-Z0-9.*+~-]+$/.test(h),
  );
  expect(reaction).toBeTruthy();
  await page.goto(reaction!);
  const equation = (await page.getByRole("heading", { level: 1 }).textContent())!.trim();
  await expect(page).toHaveTitle(`${equation} · Arrhenia`);
  const version = (await page.locator("main a[href]").evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""))).find((h) =>
    /^\/datasets\/\d+\/v\d+$/.test(h),
  );
  expect(version).toBeTruthy();
  await page.goto(version!);
  const title = (await page.getByRole("heading", { level: 1 }).textContent())!.trim();
  await expect(page).toHaveTitle(new RegExp(`^${title.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")} \\(version \\d+\\) · Arrhenia$`));
  for (const missing of ["/no-such-page", "/reactions/2147483646", "/datasets/2147483646/v1", "/id/10.5072/ARH-0000-0001"]) {
    await page.goto(missing);
    await expect(page, missing).toHaveTitle("Not found · Arrhenia");
  }
});

test("a refused page names the tab 'You do not have access · Arrhenia', not the page it refused", async ({ page }) => {
  await signInAs(page, DEMO_RESEARCHER);
  const answer = await page.goto("/admin/people");
  expect(answer?.status()).toBe(403);
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("You do not have access");
  await expect(page).toHaveTitle("You do not have access · Arrhenia");
});
