import { existsSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { expect, request as newRequest, test, type Page } from "@playwright/test";
import { axeFindings } from "./pages/layout-checks";
import { labelledAlkaneDeposit } from "../fixtures/labelled-alkane-deposit";
import { DEMO_CURATORS, DEMO_RESEARCHER, signedIn, transition } from "./pages/deposit-pages";

// The public reaction, species and class pages, their metadata, the sitemap and robots.txt, and
// that publication and retraction show on them at once (their data are cached by the server).

const PHONE = { width: 390, height: 844 };
const DESK = { width: 1366, height: 900 };
const SHOTS = process.env.PUBLIC_PAGE_SHOTS;

/** The first reaction page linked from /reactions (a path by key). */
async function firstReactionPath(page: Page): Promise<string> {
  await page.goto("/reactions");
  const href = await page.locator("main ul a[href^='/reactions/']").first().getAttribute("href");
  expect(href).toMatch(/^\/reactions\/[A-Z0-9.*+~-]+$/);
  return href!;
}

async function axeProblems(page: Page): Promise<string[]> {
  const axe = await axeFindings(page);
  return axe.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => `${page.url()}: axe ${v.id} on ${v.nodes.length} element(s), e.g. ${v.nodes[0]?.target.join(" ")}`);
}

test("a reaction page by its key, the numeric id redirecting there (308), with metadata and a link to each species", async ({
  page,
  request,
}) => {
  const path = await firstReactionPath(page);
  await page.goto(path);
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
  const canonical = await page.locator('link[rel="canonical"]').getAttribute("href");
  expect(canonical).toMatch(new RegExp(`${path.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}$`));
  await expect(page.locator('meta[property="og:title"]')).toHaveAttribute("content", /· Arrhenia$/);
  await expect(page.locator('meta[name="description"]')).toHaveAttribute("content", /on one Arrhenius plot/);
  // The page names its reaction class, linked to the class page.
  const classLink = page.locator("main header a[href^='/classes/']").first();
  await expect(classLink).toBeVisible();

  // Species page from the reaction page.
  const speciesLink = page.locator("main a[href^='/species/']").first();
  const speciesHref = await speciesLink.getAttribute("href");
  await speciesLink.click();
  await expect(page).toHaveURL(new RegExp(`${speciesHref}$`));
  await expect(page.getByRole("heading", { name: "Identity" })).toBeVisible();
  await expect(page.getByText("InChIKey", { exact: true })).toBeVisible();
  await expect(page.getByRole("img", { name: /^Structure of/ })).toBeVisible();
  await expect(page.locator(`main a[href="${path}"]`).first()).toBeVisible();

  // Unknown or malformed keys are real 404 pages.
  for (const missing of [
    "/species/AAAAAAAAAAAAAA-BBBBBBBBBB-C",
    "/species/not-a-key",
    "/reactions/NOTAKEY",
    "/reactions/999999999",
    "/classes/nope",
  ]) {
    const res = await request.get(missing);
    expect(res.status(), missing).toBe(404);
  }
});

test("the numeric id of a reaction redirects permanently to its key, keeping the query", async ({ page, request }) => {
  const path = await firstReactionPath(page);
  await page.goto(path);
  // A dataset page links its reaction by key (no redirect on the way).
  const datasetsHref = await page.locator("main a[href^='/datasets/']").first().getAttribute("href");
  await page.goto(datasetsHref!);
  await expect(page.getByRole("link", { name: "All datasets of this reaction" })).toHaveAttribute("href", path);
  // The numeric id, as the search API gives it, is an alias.
  const answer = await (await request.get("/api/v1/search?view=reactions&limit=100")).json();
  const hit = (answer.hits as { reactionId: number; reactionKey: string }[]).find(
    (h) => `/reactions/${h.reactionKey.replace(">>", "~")}` === path,
  );
  expect(hit).toBeDefined();
  const alias = `/reactions/${hit!.reactionId}`;
  const res = await request.get(`${alias}?include=measured`, { maxRedirects: 0 });
  expect(res.status()).toBe(308);
  expect(res.headers()["location"]).toMatch(new RegExp(`${path.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}\\?include=measured$`));
});

test("class browse → class page → reaction", async ({ page }) => {
  await page.goto("/classes");
  await expect(page.getByRole("heading", { level: 1, name: "Reaction classes" })).toBeVisible();
  await page.getByRole("link", { name: "H-atom abstraction" }).click();
  await expect(page).toHaveURL(/\/classes\/hydrogen-abstraction$/);
  const list = page.getByRole("list", { name: /Reactions of the class/ });
  const first = list.getByRole("link").first();
  const name = (await first.textContent())!;
  await first.click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(name);
  await expect(page.getByRole("link", { name: "H-atom abstraction" })).toBeVisible();
});

test("sitemap.xml indexes files listing reactions by key, species, classes and versions; robots.txt points to it", async ({
  page,
  request,
}) => {
  const path = await firstReactionPath(page);
  const index = await (await request.get("/sitemap.xml")).text();
  expect(index).toContain("<sitemapindex");
  const files = [...index.matchAll(/<loc>[^<]*?(\/sitemaps\/sitemap\/\d+\.xml)<\/loc>/g)].map((m) => m[1]);
  expect(files.length).toBeGreaterThan(0);
  let xml = "";
  for (const file of files) {
    const res = await request.get(file);
    expect(res.status(), file).toBe(200);
    xml += await res.text();
  }
  expect(xml).toContain("<urlset");
  expect(xml).toContain(`${path}</loc>`);
  expect(xml).toMatch(/\/species\/[A-Z]{14}-[A-Z]{10}-[A-Z]<\/loc>/);
  expect(xml).toContain("/classes/hydrogen-abstraction</loc>");
  expect(xml).toMatch(/\/datasets\/\d+\/v\d+<\/loc>/);
  const robots = await (await request.get("/robots.txt")).text();
  expect(robots).toMatch(/Sitemap: http.*\/sitemap\.xml/);
  expect(robots).toContain("Disallow: /review");
});

test("reaction, species and class pages pass axe at 1366 and 390 px and fit a phone", async ({ page }) => {
  test.setTimeout(300_000);
  const reaction = await firstReactionPath(page);
  await page.goto(reaction);
  const species = await page.locator("main a[href^='/species/']").first().getAttribute("href");
  const problems: string[] = [];
  for (const size of [DESK, PHONE]) {
    await page.setViewportSize(size);
    for (const path of [reaction, species!, "/classes", "/classes/hydrogen-abstraction", "/reactions"]) {
      await page.goto(path);
      await page.waitForLoadState("networkidle");
      const { scrollWidth, clientWidth } = await page.evaluate(() => ({
        scrollWidth: document.documentElement.scrollWidth,
        clientWidth: document.documentElement.clientWidth,
      }));
      if (scrollWidth > clientWidth) problems.push(`${path}: ${scrollWidth} px wide on a ${clientWidth} px screen`);
      problems.push(...(await axeProblems(page)));
      if (SHOTS && (path === reaction || path === species)) {
        await page.screenshot({ path: `${SHOTS}/${path === reaction ? "reaction" : "species"}-${size.width}.png`, fullPage: true });
      }
    }
  }
  expect(problems).toEqual([]);
});

test("a newly published version shows on its reaction and species pages without a restart, and a retraction at once", async ({
  page,
  baseURL,
}) => {
  test.setTimeout(120_000);
  // An invented deposit of a reaction of its own (a 13C-labelled alkane drawn at random for this run).
  const title = `Cache check ${Date.now()}`;
  const name = `labelled octadecane ${Date.now()}`;
  const document = labelledAlkaneDeposit({ title, name, carbons: 18 });
  const researcher = await signedIn(baseURL!, DEMO_RESEARCHER);
  const curator = await signedIn(baseURL!, DEMO_CURATORS[0]);
  const created = await researcher.post("/api/v1/datasets", { data: document });
  expect(created.status(), await created.text()).toBe(201);
  const versionId: number = (await created.json()).data.versionId;
  expect(versionId).toBeGreaterThan(0);

  // The OH page (cached) does not list the draft's reaction; it is read once before publication.
  const oh = "/species/TUJKJAMUKRIRHC-UHFFFAOYSA-N";
  await page.goto(oh);
  await expect(page.getByRole("heading", { name: "Reactions" })).toBeVisible();
  await expect(page.getByRole("link", { name: new RegExp(name) })).toHaveCount(0);

  await transition(researcher, versionId, { transition: "submit" });
  await transition(curator, versionId, { transition: "accept", reason: "Consistent with the others." });

  // At once: the OH page lists it, the new species page exists, and the reaction page shows the dataset.
  await page.goto(oh);
  const reactionLink = page.getByRole("link", { name: new RegExp(name) });
  await expect(reactionLink).toHaveCount(1);
  const row = page.getByRole("row", { name: new RegExp(name) });
  await expect(row).toContainText("1");
  await reactionLink.click();
  await expect(page.getByRole("region", { name: "Datasets of this reaction" }).getByRole("link", { name: title })).toBeVisible();
  await expect(page.getByText("Only one dataset of this reaction is published")).toBeVisible();
  const reactionPath = new URL(page.url()).pathname;
  await page.getByRole("link", { name, exact: true }).click();
  await expect(page).toHaveURL(/\/species\/[A-Z]{14}-[A-Z]{10}-[A-Z]$/);
  await expect(page.getByRole("heading", { level: 1, name, exact: true })).toBeVisible();
  const speciesPath = new URL(page.url()).pathname;

  await transition(curator, versionId, { transition: "retract", reason: "A calibration error was found after publication." });
  await page.goto(speciesPath);
  await expect(page.getByRole("row", { name: new RegExp(name) })).toContainText("0 (and 1 retracted)");
  await page.goto(reactionPath);
  await expect(page.getByRole("row", { name: new RegExp(title) })).toContainText("Version 1 is retracted.");
  await researcher.dispose();
  await curator.dispose();
});

test("public pages are replayed to anonymous readers, never a draft: 404 before and after its owner read it", async ({ baseURL }) => {
  const anonymous = await newRequest.newContext({ baseURL });
  const researcher = await signedIn(baseURL!, DEMO_RESEARCHER);
  // A public page: rendered once, then replayed whole.
  const first = await anonymous.get("/classes");
  const again = await anonymous.get("/classes");
  expect(first.status()).toBe(200);
  expect(again.headers()["x-arrhenia-html-cache"]).toBe("hit");
  expect(await again.text()).toBe(await first.text());
  // A member's request is rendered for them alone (the header names them).
  const mine = await researcher.get("/classes");
  expect(mine.headers()["x-arrhenia-html-cache"]).toBeUndefined();
  expect(await mine.text()).toContain("My deposits");
  expect(await again.text()).not.toContain("My deposits");

  const document = labelledAlkaneDeposit({
    title: `Draft cache check ${Date.now()}`,
    name: `labelled nonadecane ${Date.now()}`,
    carbons: 19,
  });
  const created = await researcher.post("/api/v1/datasets", { data: document });
  expect(created.status(), await created.text()).toBe(201);
  const { datasetId, versionId } = (await created.json()).data;
  // The public address of the draft's version: 404 to everyone (its owner works on it under /deposits).
  const draft = `/datasets/${datasetId}/v1`;
  expect((await anonymous.get(draft)).status()).toBe(404);
  const seen = await researcher.get(`/deposits/${versionId}`);
  expect(seen.status()).toBe(200);
  expect(await seen.text()).toContain("Draft cache check");
  expect((await researcher.get(draft)).status()).toBe(404);
  for (let i = 0; i < 2; i++) {
    const res = await anonymous.get(draft);
    expect(res.status()).toBe(404);
    expect(await res.text()).not.toContain("Draft cache check");
  }
  await anonymous.dispose();
  await researcher.dispose();
});

test("the pages' data cache stays in memory: rendering public pages writes nothing under the build's cache folder", async ({ request }) => {
  // next.config.mjs isrFlushToDisk: its entries are keyed by the public pages' mark, so files written there would pile up for good.
  const folder = path.join(process.env.NEXT_DIST_DIR ?? ".next", "cache", "fetch-cache");
  const since = Date.now() - 1000;
  // A query is never kept, so each of these is rendered now.
  for (const address of ["/datasets/1/v1?fresh=1", "/reactions?fresh=1", "/classes?fresh=1"])
    expect((await request.get(address)).status(), address).toBe(200);
  const written = existsSync(folder) ? readdirSync(folder).filter((name) => statSync(path.join(folder, name)).mtimeMs >= since) : [];
  expect(written).toEqual([]);
});
