import { expect, test, type Page } from "@playwright/test";
import { axeFindings } from "./pages/layout-checks";

// The search page against the demo data: species by name and by SMILES, narrowing by class and
// temperature window, the reactions view, opening a dataset and coming back with the back button,
// the header box's suggestions by keyboard alone, and the page at 1366 px and 390 px (axe-core,
// nothing wider than the screen, a screenshot of each for people to look at).

const WIDE = { width: 1366, height: 900 };
const PHONE = { width: 390, height: 844 };

const results = (page: Page) => page.getByRole("region", { name: "Results" });
const status = (page: Page) => results(page).getByRole("status");
const datasetRows = (page: Page) => page.getByRole("list", { name: "Datasets found" }).getByRole("listitem");
const reactionRows = (page: Page) => page.getByRole("list", { name: "Reactions found" }).getByRole("listitem");

/** The number in "N datasets found" once the search has answered. */
async function foundCount(page: Page): Promise<number> {
  await expect(status(page)).toHaveText(/^\d[\d,]* (datasets?|reactions?) found$/);
  return Number((await status(page).textContent())!.replace(/[^\d].*$/, "").replace(/,/g, ""));
}

test("a species by name and by SMILES; narrowed by class and temperature window; reactions view; a dataset and back", async ({ page }) => {
  await page.setViewportSize(WIDE);
  await page.goto("/search?q=methane");
  await expect(page.getByTestId("understood")).toContainText(/“methane”/);
  const byName = await foundCount(page);
  expect(byName).toBeGreaterThan(0);
  await expect(datasetRows(page).first()).toContainText("methane");

  // The SMILES of methane finds the same datasets.
  const box = page.getByLabel("Species, reaction, author or any words");
  await box.fill("C");
  await box.press("Enter");
  await expect(page).toHaveURL(/[?&]q=C(&|$)/);
  // Named by its display name (the name published datasets use most), as its species page is.
  await expect(page.getByTestId("understood")).toContainText("(methane)");
  expect(await foundCount(page)).toBe(byName);

  // Narrow by the first reaction class offered.
  const classes = page.getByRole("group", { name: "Reaction class" });
  const firstClass = classes.getByRole("checkbox").first();
  const className = (await classes.locator("label").first().textContent())!.replace(/\s*\(\d+\)\s*$/, "");
  await firstClass.check();
  await expect(page).toHaveURL(/[?&]class=/);
  await expect(page.getByRole("list", { name: "Filters in force" })).toContainText(`Reaction class: ${className}`);
  const byClass = await foundCount(page);
  expect(byClass).toBeLessThanOrEqual(byName);

  // A temperature window: a minimum above the maximum is said beside the field before anything is sent.
  await page.getByLabel("From (K)").fill("500");
  await page.getByLabel("To (K)").fill("300");
  await page.getByRole("button", { name: "Apply these windows" }).click();
  await expect(page.getByLabel("To (K)")).toHaveAttribute("aria-invalid", "true");
  await expect(page.getByText(/upper end \(300 K\) is below the lower end/)).toBeVisible();
  await expect(page).not.toHaveURL(/tMin=/);
  await page.getByLabel("From (K)").fill("250");
  await page.getByLabel("To (K)").fill("400");
  await page.getByRole("button", { name: "Apply these windows" }).click();
  await expect(page).toHaveURL(/tMin=250/);
  await expect(page).toHaveURL(/tMax=400/);
  await expect(page.getByRole("list", { name: "Filters in force" })).toContainText("Temperature: measured somewhere in 250–400 K");
  const narrowed = await foundCount(page);
  expect(narrowed).toBeLessThanOrEqual(byClass);
  const narrowedUrl = page.url();

  // The reactions view of the same search.
  await page.getByRole("navigation", { name: "Show results as" }).getByRole("link", { name: "Reactions" }).click();
  await expect(page).toHaveURL(/view=reactions/);
  await expect(status(page)).toHaveText(/reactions? found$/);
  if ((await foundCount(page)) > 0) await expect(reactionRows(page).first()).toContainText("Datasets");
  await page.goBack();
  await expect(page).toHaveURL(narrowedUrl);

  // Open a dataset, then come back to the same search.
  if (narrowed > 0) {
    await datasetRows(page).first().getByRole("link").first().click();
    await expect(page).toHaveURL(/\/datasets\/\d+\/v\d+$/);
    await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
    await page.goBack();
  }
  await expect(page).toHaveURL(narrowedUrl);
  await expect(page.getByRole("group", { name: "Reaction class" }).getByRole("checkbox", { checked: true })).toHaveCount(1);
  await expect(page.getByLabel("From (K)")).toHaveValue("250");
  await expect(page.getByLabel("To (K)")).toHaveValue("400");
  expect(await foundCount(page)).toBe(narrowed);
});

test("a value the search refuses is named beside its field; nothing found offers to widen", async ({ page }) => {
  await page.setViewportSize(WIDE);
  await page.goto("/search?q=methane&tMin=abc");
  await expect(page.getByLabel("From (K)")).toHaveValue("abc");
  await expect(page.getByLabel("From (K)")).toHaveAttribute("aria-invalid", "true");
  await expect(page.locator("#window-tMin-error")).toContainText("tMin");

  await page.goto("/search?q=methane&tMin=5000&tMax=6000");
  await expect(status(page)).toHaveText("0 datasets found");
  await expect(results(page)).toContainText(/No published datasets match\. .*methane.*; Temperature: measured somewhere in 5000–6000 K/);
  await results(page)
    .getByRole("link", { name: /Without “Temperature/ })
    .click();
  await expect(page).not.toHaveURL(/tMin/);
  expect(await foundCount(page)).toBeGreaterThan(0);
});

test("a reaction written as a mechanism writes it finds what the spaced form finds; a dataset's identifier opens its page", async ({
  page,
  request,
}) => {
  await page.setViewportSize(WIDE);
  await page.goto("/search?q=OH%20%2B%20CH4");
  const spaced = await foundCount(page);
  expect(spaced).toBeGreaterThan(0);
  for (const q of ["OH+CH4", "oh + ch4", "OH + CH₄"]) {
    await page.goto(`/search?q=${encodeURIComponent(q)}`);
    expect(await foundCount(page), q).toBe(spaced);
  }
  const api = await (await request.get("/api/v1/search?q=methane")).json();
  const hit = api.hits.find((h: { versionIdentifier: string | null }) => h.versionIdentifier);
  await page.goto(`/search?q=${encodeURIComponent(`doi:${hit.versionIdentifier}`)}`);
  await expect(page).toHaveURL(new RegExp(`/datasets/${hit.datasetId}/v${hit.versionNumber}$`));
});

test("the header box offers species and reactions, chosen by keyboard alone", async ({ page }) => {
  await page.setViewportSize(WIDE);
  await page.goto("/");
  const box = page.getByRole("combobox", { name: "Search datasets, species and reactions" });
  await box.focus();
  await page.keyboard.type("meth");
  const list = page.getByRole("listbox", { name: "Suggestions" });
  await expect(list).toBeVisible();
  await expect(box).toHaveAttribute("aria-expanded", "true");
  const options = list.getByRole("option");
  const count = await options.count();
  expect(count).toBeGreaterThan(0);
  await expect(page.getByRole("status").filter({ hasText: /suggestions?:/ })).toHaveText(new RegExp(`^${count} suggestions?:`));

  await page.keyboard.press("ArrowDown");
  await expect(options.first()).toHaveAttribute("aria-selected", "true");
  await expect(box).toHaveAttribute("aria-activedescendant", (await options.first().getAttribute("id"))!);
  await page.keyboard.press("End");
  await expect(options.last()).toHaveAttribute("aria-selected", "true");
  await page.keyboard.press("Home");
  await expect(options.first()).toHaveAttribute("aria-selected", "true");
  await page.keyboard.press("Escape");
  await expect(box).toHaveAttribute("aria-expanded", "false");
  await expect(box).toHaveValue("meth");

  // Enter on a species suggestion opens the species page (the first ones are species).
  await page.keyboard.press("ArrowDown");
  await expect(options.first()).toHaveAttribute("aria-selected", "true");
  const label = (await options.first().locator("span").first().innerText()).split(" — ")[0];
  await page.keyboard.press("Enter");
  await expect(page).toHaveURL(/\/species\/[A-Z]{14}-[A-Z]{10}-[A-Z]$/);
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(label);

  // Enter on a reaction suggestion (they come after the species) opens the reaction page by its key.
  await box.fill("meth");
  await expect(options.last()).toBeVisible();
  await box.press("ArrowUp");
  await expect(options.last()).toHaveAttribute("aria-selected", "true");
  await expect(options.last()).toContainText("reaction");
  await box.press("Enter");
  await expect(page).toHaveURL(/\/reactions\/[^/?]*[A-Z]{14}-[A-Z]{10}-[A-Z][^/?]*~/);

  // Enter with no suggestion chosen searches for the text as typed.
  await box.fill("flash photolysis");
  await box.press("Enter");
  await expect(page).toHaveURL(/\/search\?q=flash\+photolysis$/);
});

test("the header box offers the reactions of a reaction pattern (both reactants, or reactant → product)", async ({ page }) => {
  await page.setViewportSize(WIDE);
  await page.goto("/");
  const box = page.getByRole("combobox", { name: "Search datasets, species and reactions" });
  const options = page.getByRole("listbox", { name: "Suggestions" }).getByRole("option");
  for (const typed of ["OH + CH4", "CH4 -> CH3", "CH4 → CH3"]) {
    await box.fill(typed);
    await expect(options.first(), typed).toContainText("reaction");
  }
  // The first reaction of "OH + CH4" is chosen by keyboard and opens its reaction page.
  await box.fill("OH + CH4");
  await expect(options.first()).toContainText("reaction");
  await box.press("ArrowDown");
  await box.press("Enter");
  await expect(page).toHaveURL(/\/reactions\/[^/?]*[A-Z]{14}-[A-Z]{10}-[A-Z][^/?]*~/);
});

test("the suggestion chosen by keyboard is scrolled into the list's view", async ({ page }) => {
  await page.setViewportSize(WIDE);
  await page.goto("/");
  const box = page.getByRole("combobox", { name: "Search datasets, species and reactions" });
  const list = page.getByRole("listbox", { name: "Suggestions" });
  await box.fill("OH");
  await expect(list.getByRole("option").first()).toBeVisible();
  const count = await list.getByRole("option").count();
  // Down to the last suggestion, one by one as a keyboard user goes.
  for (let i = 0; i < count; i++) await box.press("ArrowDown");
  const last = list.getByRole("option").last();
  await expect(last).toHaveAttribute("aria-selected", "true");
  // Inside the list's visible part (the list scrolls once it holds more than it shows).
  const inView = await last.evaluate((option) => {
    const box = option.parentElement!.getBoundingClientRect();
    const own = option.getBoundingClientRect();
    return own.top >= box.top - 1 && own.bottom <= box.bottom + 1;
  });
  expect(inView).toBe(true);
});

test("the header box works from the folded menu of a phone", async ({ page }) => {
  await page.setViewportSize(PHONE);
  await page.goto("/reactions");
  const box = page.getByRole("combobox", { name: "Search datasets, species and reactions" });
  await box.focus();
  await page.keyboard.type("OH");
  await expect(page.getByRole("listbox", { name: "Suggestions" }).getByRole("option").first()).toBeVisible();
  const { scrollWidth, clientWidth } = await page.evaluate(() => ({
    scrollWidth: document.documentElement.scrollWidth,
    clientWidth: document.documentElement.clientWidth,
  }));
  expect(scrollWidth).toBeLessThanOrEqual(clientWidth);
});

for (const [name, size] of [
  ["1366", WIDE],
  ["390", PHONE],
] as const) {
  test(`/search at ${name} px: fits the screen, passes axe, screenshot`, async ({ page }, info) => {
    await page.setViewportSize(size);
    await page.goto("/search?q=OH");
    await foundCount(page);
    if (size === PHONE) await page.getByRole("button", { name: /Show filters/ }).click();
    const { scrollWidth, clientWidth } = await page.evaluate(() => ({
      scrollWidth: document.documentElement.scrollWidth,
      clientWidth: document.documentElement.clientWidth,
    }));
    expect(scrollWidth).toBeLessThanOrEqual(clientWidth);
    const axe = await axeFindings(page);
    const serious = axe.violations.filter((v) => v.impact === "serious" || v.impact === "critical");
    expect(serious.map((v) => `${v.id}: ${v.nodes[0]?.target.join(" ")}`)).toEqual([]);
    await page.screenshot({ path: info.outputPath(`search-${name}.png`), fullPage: true });
    await page.goto("/search?q=OH&view=reactions");
    await foundCount(page);
    const axeReactions = await axeFindings(page);
    expect(axeReactions.violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => v.id)).toEqual([]);
    await page.screenshot({ path: info.outputPath(`search-reactions-${name}.png`), fullPage: true });
  });
}
