import { readFileSync } from "node:fs";
import { expect, test } from "@playwright/test";
import { DEMO_RESEARCHER, signInAs } from "./pages/deposit-pages";

// From the demo mechanism's check report to a published, citable collection. The collection is this test's own
// (a unique title); the versions offered are whatever the matched reactions' consensus uses in the shared database.
test("a modeller makes a collection from a mechanism check's matches, publishes it and downloads its citation", async ({ page }) => {
  const title = `Data behind the demo mechanism ${Date.now()}`;
  await signInAs(page, DEMO_RESEARCHER);
  await page.goto("/mechanisms");
  await page.getByRole("button", { name: "Paste the demo mechanism" }).click();
  await page.getByRole("button", { name: "Check the mechanism" }).click();
  await expect(page).toHaveURL(/\/mechanisms\/\d+$/);

  // "Use these": the list to review, every version ticked.
  await page.getByRole("link", { name: /^Use these/ }).click();
  await expect(page).toHaveURL(/\/collections\/new\?check=\d+$/);
  await expect(page.getByRole("heading", { level: 1, name: "New collection" })).toBeVisible();
  const offered = page.getByRole("group", { name: /Versions to add/ }).getByRole("checkbox");
  const count = await offered.count();
  expect(count).toBeGreaterThan(1);
  for (let i = 0; i < count; i++) await expect(offered.nth(i)).toBeChecked();
  // The owner unticks one before the collection is made.
  await offered.nth(count - 1).uncheck();
  await expect(page.getByRole("group", { name: `Versions to add (${count - 1} of ${count} chosen)` })).toBeVisible();
  await page.getByLabel("Title").fill(title);
  await page.getByRole("button", { name: "Make the collection" }).click();

  // The draft: private, with its members; then published.
  await expect(page).toHaveURL(/\/collections\/\d+$/);
  await expect(page.getByRole("heading", { level: 1, name: title })).toBeVisible();
  await expect(page.getByText("draft, visible to you only")).toBeVisible();
  await expect(page.getByTestId("collection-member")).toHaveCount(count - 1);
  await page.getByRole("button", { name: "Publish this version" }).click();
  // The page becomes the published version: its identifier, the Cite section, and the next step (a new revision).
  await expect(page.getByRole("heading", { level: 2, name: "Cite this collection" })).toBeVisible();
  await expect(page.getByText("draft, visible to you only")).toHaveCount(0);
  await expect(page.getByRole("button", { name: "Start a new revision" })).toBeVisible();

  // The public page: members with their citations, the caution, the collection's citation.
  const url = page.url();
  await page.goto(url);
  await expect(page.getByTestId("collection-member")).toHaveCount(count - 1);
  await expect(page.getByTestId("collection-member").first()).toContainText("Arrhenia");
  await expect(page.getByText(/extrapolation outside the measured/i).first()).toBeVisible();
  const citation = page.getByTestId("collection-citation");
  await expect(citation).toContainText(title);
  const identifier = /10\.\d+\/ARH-[0-9A-Z]{4}-[0-9A-Z]{4}\/1/.exec((await citation.textContent()) ?? "")?.[0];
  expect(identifier).toBeTruthy();
  const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "BibTeX", exact: true }).click()]);
  expect(download.suggestedFilename()).toMatch(/^ARH-[0-9A-Z]{4}-[0-9A-Z]{4}-1\.bib$/);
  const bib = readFileSync((await download.path())!, "utf8");
  expect(bib).toContain(identifier!);
  expect(bib).toContain(title);
  // Anyone can read it now, signed out too.
  await page.context().clearCookies();
  await page.goto(url);
  await expect(page.getByRole("heading", { level: 1, name: title })).toBeVisible();
  await expect(page.getByText("Publish this version")).toHaveCount(0);
});

// From search results: tick two datasets, start a collection with them (this test's own, unpublished).
test("a modeller chooses search results and starts a collection with them", async ({ page }) => {
  await signInAs(page, DEMO_RESEARCHER);
  await page.goto("/search?q=methane");
  const boxes = page.getByRole("list", { name: "Datasets found" }).getByRole("checkbox");
  await expect(boxes.first()).toBeVisible();
  expect(await boxes.count()).toBeGreaterThan(1);
  await expect(page.getByText("Tick results to add them to a collection of your own.")).toBeVisible();
  await boxes.nth(0).check();
  await boxes.nth(1).check();
  const chosen = page.getByRole("region", { name: "Chosen for a collection" });
  await expect(chosen).toContainText("2 versions chosen");
  // With no draft collection yet the offer is a new one; with drafts, a choice of them and the same link.
  await chosen.getByRole("link", { name: /start (a collection with|a new one)/i }).click();
  await expect(page).toHaveURL(/\/collections\/new\?versions=\d+,\d+$/);
  await expect(page.getByRole("group", { name: /Versions to add \(2 of 2 chosen\)/ })).toBeVisible();
});
