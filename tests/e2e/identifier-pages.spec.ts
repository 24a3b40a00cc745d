import { expect, test } from "@playwright/test";

// /id/<identifier>: a mistyped or malformed identifier is answered 404 with a page that says how
// to check it, never 200.

test("a mistyped or malformed identifier answers 404 with the page that explains it", async ({ page }) => {
  for (const path of ["/id/10.5072/ARH-0000-0001", "/id/not-an-identifier", "/id/https://doi.org/10.5072/ARH-0000-0001/2"]) {
    const res = await page.goto(path);
    expect(res?.status(), path).toBe(404);
    await expect(page.getByRole("heading", { name: "Nothing published has this identifier" })).toBeVisible();
    await expect(page.getByRole("alert").filter({ hasText: "symbol by symbol" })).toBeVisible();
  }
});
