import { expect, test } from "@playwright/test";
import { DEMO_CURATORS, signInAs } from "./pages/deposit-pages";

test("a reader signed out is offered to sign in to watch a reaction", async ({ page }) => {
  await page.goto("/reactions/1");
  await expect(page.getByRole("link", { name: "Sign in to watch this reaction" })).toBeVisible();
});

test("watch a reaction from its page, find it on the watch list, choose the daily mail, and stop", async ({ page }) => {
  await signInAs(page, DEMO_CURATORS[1]);
  await page.goto("/reactions/1");
  // A run before this one (a retry) may have left the watch on: start from none.
  const stop = page.getByRole("button", { name: "Stop watching this reaction" });
  if (await stop.isVisible()) {
    await stop.click();
    await expect(page.getByText("You no longer watch this.")).toBeVisible();
  }
  await page.getByRole("button", { name: "Watch this reaction" }).click();
  await expect(stop).toBeVisible();
  await expect(page.getByText("You will hear of new and retracted versions by mail.")).toBeVisible();

  await page.goto("/watches");
  const list = page.getByRole("list", { name: "What you watch" });
  // The reaction's display names can change as earlier tests publish datasets naming its species: match the kind only.
  await expect(list.getByRole("link", { name: /^the reaction / })).toHaveCount(1);
  await page.getByRole("radio", { name: /One mail a day/ }).check();
  await page.getByRole("button", { name: "Save" }).click();
  await expect(page.getByText("You will get one mail a day.")).toBeVisible();
  await list.getByRole("button", { name: /Stop watching the reaction/ }).click();
  await expect(page.getByText("Nothing yet.")).toBeVisible();
});
