import { expect, test, type Browser } from "@playwright/test";
import { DEMO_CURATORS, signInAs } from "./pages/deposit-pages";

// The reader's choice of data and a curator's exclusion both work without JavaScript: the choice
// is a GET form (its URL can be shared), the exclusion a server-action form that posts as a plain form.

async function withoutJavaScript(
  browser: Browser,
  storageState?: Awaited<ReturnType<import("@playwright/test").BrowserContext["storageState"]>>,
) {
  const context = await browser.newContext({ javaScriptEnabled: false, storageState });
  return { context, page: await context.newPage() };
}

test("a reader chooses measured data and a temperature window, and the page says what went in", async ({ browser }) => {
  const { context, page } = await withoutJavaScript(browser);
  await page.goto("/reactions");
  await page
    .getByRole("link", { name: /hydroxyl( radical)? \+ methane → water \+ methyl( radical)?/ })
    .first()
    .click();
  const choose = page.getByRole("region", { name: "Choose the data" });
  await choose.getByLabel("Measured only").check();
  await choose.getByLabel("From (K)").fill("250");
  await choose.getByRole("button", { name: "Show this consensus" }).click();
  await expect(page).toHaveURL(/\?include=measured&Tmin=250&Tmax=$/);
  const inputs = page.getByRole("region", { name: "What went into the consensus" });
  await expect(inputs).toContainText("Measured datasets, points from 250 K and above; evaluated datasets never enter.");
  await expect(inputs).toContainText("Calculated; the choice is measured datasets only.");
  await expect(inputs).toContainText(/of its \d+ points/);

  await choose.getByLabel("From (K)").fill("warm");
  await choose.getByRole("button", { name: "Show this consensus" }).click();
  await expect(page.getByRole("alert")).toContainText("This choice could not be read");
  await expect(choose.getByLabel("From (K)")).toHaveAttribute("aria-invalid", "true");
  await context.close();
});

test("a curator leaves a dataset out with a reason and includes it again, without JavaScript", async ({ browser, page }) => {
  const reason = `Offset looks like a unit mistake (end-to-end ${Date.now()}).`;
  await signInAs(page, DEMO_CURATORS[1]);
  const session = await page.context().storageState();
  const { context, page: plain } = await withoutJavaScript(browser, session);
  await plain.goto("/reactions");
  await plain
    .getByRole("link", { name: /hydroxyl( radical)? \+ ethane → water \+ ethyl/ })
    .first()
    .click();
  const inputs = plain.getByRole("region", { name: "What went into the consensus" });
  const first = inputs
    .getByRole("listitem")
    .filter({ has: plain.getByText("Leave out of the consensus") })
    .first();
  await first.getByText("Leave out of the consensus").click();
  await first.getByLabel(/Reason/).fill(reason);
  await first.getByRole("button", { name: "Leave it out" }).click();
  await expect(inputs).toContainText(`Left out by a curator: ${reason}`);
  await expect(plain.getByRole("status").filter({ hasText: "Left out of the consensus." })).toBeVisible();

  // Including again asks first, as leaving out does.
  await expect(inputs.getByRole("button", { name: /include it again/ })).toBeHidden();
  await inputs.getByText("Include again").first().click();
  await expect(inputs).toContainText(`readers will no longer see the reason “${reason}”`);
  await inputs.getByRole("button", { name: /Yes, include it again/ }).click();
  await expect(inputs).not.toContainText(reason);
  await context.close();
});
