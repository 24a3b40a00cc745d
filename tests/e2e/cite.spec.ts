import { readFileSync } from "node:fs";
import { toJSON as parseBibtex } from "@orcid/bibtex-parse-js";
import { expect, test, type APIRequestContext } from "@playwright/test";
import { widthAndAxeProblems } from "./pages/layout-checks";

// The Cite panel of a public version page, from the demo data: copy BibTeX to the clipboard and
// read it back, cite every version instead, download RIS, the page's own URL answering citation
// formats by its Accept header, the JSON-LD, and the panel on a 390 px phone.

/** A public version page from the sitemap (every public version is listed in one of the index's files). */
async function aVersionPage(request: APIRequestContext): Promise<{ dataset: string; number: string; path: string }> {
  const index = await (await request.get("/sitemap.xml")).text();
  let m: RegExpExecArray | null = null;
  for (const [, file] of index.matchAll(/<loc>[^<]*?(\/sitemaps\/sitemap\/\d+\.xml)<\/loc>/g)) {
    m = /\/datasets\/(\d+)\/v(\d+)</.exec(await (await request.get(file)).text());
    if (m) break;
  }
  expect(m, "a public version in the sitemap").not.toBeNull();
  return { dataset: m![1], number: m![2], path: `/datasets/${m![1]}/v${m![2]}` };
}

test("copy a BibTeX citation from a dataset page: the clipboard holds an entry that parses, with the version identifier", async ({
  page,
  context,
}) => {
  await context.grantPermissions(["clipboard-read", "clipboard-write"]);
  const v = await aVersionPage(page.request);
  await page.goto(v.path);
  const panel = page.getByTestId("cite-panel");
  await expect(panel.getByRole("heading", { name: "Cite", exact: true })).toBeVisible();
  await expect(panel.getByRole("radio", { name: /This version/ })).toBeChecked();
  await panel.getByRole("button", { name: "Copy BibTeX" }).click();
  await expect(panel.getByTestId("cite-status")).toHaveText("BibTeX copied to the clipboard.");
  const copied = await page.evaluate(() => navigator.clipboard.readText());
  // An independent BibTeX parser (@orcid/bibtex-parse-js) reads what the page copied.
  const [entry] = parseBibtex(copied);
  expect(entry.entryType.toLowerCase()).toBe("misc");
  const tags = Object.fromEntries(Object.entries(entry.entryTags).map(([k, val]) => [k.toLowerCase(), val]));
  expect(tags.doi).toMatch(new RegExp(`^10\\.5072/ARH-[0-9A-Z]{4}-[0-9A-Z]{4}/${v.number}$`));
  expect(tags.note).toBe(`Version ${v.number}`);
  expect(tags.publisher).toBe("Arrhenia");
  expect(tags.url).toMatch(new RegExp(`${v.path}$`));
  // The same text is on the page.
  expect((await panel.getByTestId("cite-bibtex").textContent())?.trim()).toBe(copied.trim());
});

test("cite every version, pick a style, download RIS, and the source publication is offered", async ({ page }) => {
  const v = await aVersionPage(page.request);
  await page.goto(v.path);
  const panel = page.getByTestId("cite-panel");
  const versionDoi = (await panel.getByTestId("cite-bibtex").textContent())!.match(/doi = \{([^}]+)\}/)![1];
  await panel.getByRole("radio", { name: /Every version/ }).check();
  await expect(panel.getByTestId("cite-bibtex")).not.toContainText(versionDoi);
  const seriesDoi = versionDoi.replace(/\/\d+$/, "");
  await expect(panel.getByTestId("cite-bibtex")).toContainText(`doi = {${seriesDoi}}`);
  await panel.getByLabel("Reference style").selectOption({ label: "American Chemical Society" });
  await expect(panel.getByTestId("cite-reference")).toContainText(`https://doi.org/${seriesDoi}`);
  // ACS writes titles in title case.
  await expect(panel.getByTestId("cite-source")).toContainText(/Arrhenia demo data set/i);
  const [download] = await Promise.all([page.waitForEvent("download"), panel.getByRole("link", { name: /^Download RIS/ }).click()]);
  expect(download.suggestedFilename()).toMatch(/^arrhenia_ARH_[0-9A-Z]{4}_[0-9A-Z]{4}\.ris$/);
  const ris = readFileSync((await download.path())!, "utf8");
  expect(ris).toMatch(/^TY {2}- DATA/m);
  expect(ris).toContain(`DO  - ${seriesDoi}`);
});

test("the version page's URL answers citation formats by Accept, and HTML otherwise", async ({ request }) => {
  const v = await aVersionPage(request);
  const bib = await request.get(v.path, { headers: { Accept: "application/x-bibtex" } });
  expect(bib.status()).toBe(200);
  expect(bib.headers()["content-type"]).toBe("application/x-bibtex; charset=utf-8");
  expect(await bib.text()).toMatch(new RegExp(`doi = \\{10\\.5072/ARH-[0-9A-Z-]+/${v.number}\\}`));
  const ris = await request.get(`/datasets/${v.dataset}`, { headers: { Accept: "application/x-research-info-systems" } });
  expect(ris.headers()["content-type"]).toBe("application/x-research-info-systems; charset=utf-8");
  expect(await ris.text()).toMatch(/^DO {2}- 10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{4}$/m);
  const csl = await request.get(`${v.path}?k=L+mol-1+s-1`, { headers: { Accept: "application/vnd.citationstyles.csl+json" } });
  expect(csl.headers()["content-type"]).toBe("application/vnd.citationstyles.csl+json; charset=utf-8");
  expect((await csl.json())[0].type).toBe("dataset");
  // Quality values decide whatever the order written (lib/http/content-negotiation.ts, negotiator).
  const preferred = await request.get(v.path, { headers: { Accept: "text/html;q=0.5, application/x-bibtex;q=0.9" } });
  expect(preferred.headers()["content-type"]).toBe("application/x-bibtex; charset=utf-8");
  expect(preferred.headers()["vary"]).toMatch(/Accept/i);
  const html = await request.get(v.path, { headers: { Accept: "text/html,application/x-bibtex;q=0.5" } });
  expect(html.headers()["content-type"]).toMatch(/^text\/html/);
  expect(html.headers()["vary"]).toMatch(/Accept/i);
  // A browser's own Accept (no citation type, so no proxy) gets the page with the same Vary (lib/auth/edge-proxy.ts).
  const plain = await request.get(v.path, { headers: { Accept: "text/html,application/xhtml+xml,*/*;q=0.8" } });
  expect(plain.headers()["content-type"]).toMatch(/^text\/html/);
  expect(plain.headers()["vary"]).toMatch(/(^|,\s*)Accept(\s*,|$)/i);
  const draft = await request.get("/datasets/999999999/v1", { headers: { Accept: "application/x-bibtex" } });
  expect(draft.status()).toBe(404);
});

test("the page carries schema.org Dataset JSON-LD; the panel works by keyboard and fits a 390 px phone", async ({ page }) => {
  const v = await aVersionPage(page.request);
  await page.setViewportSize({ width: 390, height: 844 });
  await page.goto(v.path);
  const ld = JSON.parse((await page.locator('script[type="application/ld+json"]').first().textContent())!);
  expect(ld["@type"]).toBe("Dataset");
  expect(ld.version).toBe(v.number);
  expect(ld.variableMeasured.map((x: { name: string }) => x.name)).toContain("T");
  const panel = page.getByTestId("cite-panel");
  const thisVersion = panel.getByRole("radio", { name: /This version/ });
  await thisVersion.focus();
  await page.keyboard.press("ArrowDown");
  await expect(panel.getByRole("radio", { name: /Every version/ })).toBeChecked();
  await panel.scrollIntoViewIfNeeded();
  await page.waitForLoadState("networkidle");
  expect(await widthAndAxeProblems(page, v.path)).toEqual([]);
});
