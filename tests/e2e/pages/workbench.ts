import { expect, type Page } from "@playwright/test";

/**
 * Opens /analyse and waits until its script runs (the example text has been read: "8 points
 * read."), so that text a test types is never typed into the server-rendered box before the page
 * is live.
 */
export async function openWorkbench(page: Page): Promise<void> {
  await page.goto("/analyse");
  await expect(page.getByText("8 points read.")).toBeVisible({ timeout: 30_000 });
}
