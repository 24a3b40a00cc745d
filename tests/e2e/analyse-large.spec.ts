import { openWorkbench } from "./pages/workbench";
import { appendFile, readFile } from "node:fs/promises";
import { expect, test, type Page } from "@playwright/test";

// /analyse at its documented limit: 100 000 pasted points are read and fitted off the page's main
// thread, the plot draws a thinned set and says so, and the page never freezes. The test fails on a
// freeze (2 s without a frame, far above any loaded machine's jitter); the 500 ms responsiveness
// target is measured by `npm run bench:analyse`, which runs this test and prints its figures.

const DATA = page_data();

// Playwright's trace recorder snapshots the whole page on the page's own main thread at every
// action; that is the test's cost, not the page's, so the timing here runs without it.
test.use({ trace: "off" });
const SHOTS = process.env.ANALYSE_SHOTS_DIR;
/** A stall of the page's main thread that no machine load explains (ms); the 500 ms target lives in the benchmark. */
const FREEZE_MS = 2000;

/** 100 000 invented points on an Arrhenius line with a few per cent of scatter, after a header and a blank line. */
function page_data(): string {
  let seed = 12345;
  // Park–Miller minimal standard generator: reproducible scatter without a dependency.
  const random = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
  const lines = ["T/K\tk/(cm3 molecule-1 s-1)", ""];
  for (let i = 0; i < 100_000; i++) {
    const T = 250 + (250 * i) / 100_000;
    const k = 1.8e-12 * Math.exp(-1700 / T) * (1 + 0.05 * (random() - 0.5));
    lines.push(`${T.toFixed(4)}\t${k.toPrecision(5)}`);
  }
  return lines.join("\n");
}

/** Pastes `text` over the whole textarea, as Ctrl+V with everything selected does (a paste event carrying the text). */
async function paste(page: Page, text: string) {
  await page.getByLabel(/Data: temperature and rate constant/).evaluate((el: HTMLTextAreaElement, text) => {
    el.focus();
    el.select();
    const clipboardData = new DataTransfer();
    clipboardData.setData("text/plain", text);
    el.dispatchEvent(new ClipboardEvent("paste", { clipboardData, bubbles: true, cancelable: true }));
  }, text);
}

/** Records every long task (PerformanceObserver 'longtask') and the longest gap between animation frames. */
async function watchMainThread(page: Page) {
  await page.evaluate(() => {
    const w = window as unknown as { __longTasks: number[]; __maxFrameGap: number; __watching: boolean };
    w.__longTasks = [];
    w.__maxFrameGap = 0;
    w.__watching = true;
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) w.__longTasks.push(e.duration);
    }).observe({ type: "longtask" });
    let last = performance.now();
    const tick = (now: number) => {
      w.__maxFrameGap = Math.max(w.__maxFrameGap, now - last);
      last = now;
      if (w.__watching) requestAnimationFrame(tick);
    };
    requestAnimationFrame(tick);
  });
}

async function mainThreadFigures(page: Page) {
  return page.evaluate(() => {
    const w = window as unknown as { __longTasks: number[]; __maxFrameGap: number; __watching: boolean };
    w.__watching = false;
    return { longTasks: w.__longTasks.length, longestTask: Math.max(0, ...w.__longTasks), maxFrameGap: w.__maxFrameGap };
  });
}

test("100 000 pasted points are fitted without freezing the page", async ({ page }, info) => {
  test.setTimeout(180_000);
  await page.setViewportSize({ width: 1366, height: 900 });
  await openWorkbench(page);
  await page.waitForLoadState("networkidle");
  const data = page.getByLabel(/Data: temperature and rate constant/);
  await watchMainThread(page);

  const started = Date.now();
  // A paste: the whole text arrives in one input event.
  await paste(page, DATA);
  await expect(page.getByText("100,000 points read.")).toBeVisible({ timeout: 30_000 });
  const read = Date.now() - started;
  await page.getByRole("button", { name: "Fit" }).click();
  await expect(page.getByRole("heading", { name: "Result" })).toBeVisible({ timeout: 120_000 });
  await expect(page.getByTestId("drawn-count")).toContainText(/of 100,000 points drawn/);
  await expect(page.getByRole("img", { name: /of 100,000 points \([\d,]+ of them drawn\)/ })).toBeVisible();
  const total = Date.now() - started;
  const figures = await mainThreadFigures(page);
  // The pasted lines are summarised beside the text box; clearing them clears the answer too.
  await expect(page.getByRole("group", { name: "Pasted data" })).toContainText("100,002 lines pasted");
  await page.getByRole("button", { name: "Clear" }).click();
  await expect(page.getByText("0 points read.")).toBeVisible({ timeout: 30_000 });
  await expect(page.getByRole("heading", { name: "Result" })).toHaveCount(0);
  await expect(data).toBeVisible();

  info.annotations.push({
    type: "main thread",
    description: `read ${read} ms, read + fit + draw ${total} ms; ${figures.longTasks} long tasks, longest ${Math.round(figures.longestTask)} ms, longest frame gap ${Math.round(figures.maxFrameGap)} ms`,
  });
  console.log(info.annotations.at(-1)?.description);
  if (process.env.ANALYSE_FIGURES_FILE) {
    await appendFile(process.env.ANALYSE_FIGURES_FILE, JSON.stringify({ read, total, ...figures }) + "\n");
  }
  expect(figures.longestTask, "longest main-thread task").toBeLessThan(FREEZE_MS);
  expect(figures.maxFrameGap, "longest gap between frames").toBeLessThan(FREEZE_MS);
});

test("the fit of 100 000 points looks right at 1366 and 390 px", async ({ page }) => {
  test.skip(!SHOTS, "ANALYSE_SHOTS_DIR names the folder for the screenshots");
  test.setTimeout(180_000);
  for (const [name, size] of [
    ["analyse-100k-1366", { width: 1366, height: 900 }],
    ["analyse-100k-390", { width: 390, height: 844 }],
  ] as const) {
    await page.setViewportSize(size);
    await openWorkbench(page);
    await paste(page, DATA);
    await expect(page.getByText("100,000 points read.")).toBeVisible({ timeout: 30_000 });
    await page.getByRole("button", { name: "Fit" }).click();
    await expect(page.getByTestId("drawn-count")).toBeVisible({ timeout: 120_000 });
    const width = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(width, "no sideways scroll").toBeLessThanOrEqual(0);
    await page.getByRole("heading", { name: "Result" }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SHOTS}/${name}.png`, fullPage: true });
  }
});

test("an error box never outlives the text it was about, and names the line as the person counts it", async ({ page }) => {
  await openWorkbench(page);
  const data = page.getByLabel(/Data: temperature and rate constant/);
  // Line 1 a header, line 2 blank, line 3 a comment: the zero k is on line 5.
  await data.fill("T\tk\n\n# invented\n300\t1e-12\n350\t0\n400\t3e-12");
  await page.getByRole("button", { name: "Fit" }).click();
  const alert = page.getByRole("main").getByRole("alert");
  await expect(alert).toContainText("line 5:");
  await data.fill("T\tk\n\n# invented\n300\t1e-12\n350\t2e-12\n400\t3e-12");
  await expect(alert).toHaveCount(0);
  await page.getByRole("button", { name: "Fit" }).click();
  await expect(page.getByRole("heading", { name: "Result" })).toBeVisible();
});

test("decimal commas with semicolons are fitted, and the fit downloads as CSV and JSON with the caution", async ({ page }) => {
  await openWorkbench(page);
  await page
    .getByLabel(/Data: temperature and rate constant/)
    .fill("T;k;s\n250;2,09e-15;0,05\n290;4,90e-15;0,05\n330;9,40e-15;0,05\n400;2,17e-14;0,05");
  await expect(page.getByText("4 points read.")).toBeVisible();
  await page.getByRole("button", { name: "Fit" }).click();
  await expect(page.getByRole("heading", { name: "Result" })).toBeVisible();
  // Stated uncertainties are drawn as bars, and the plot's axis switches to log₁₀ k.
  await expect(page.getByRole("img", { name: /error bars show the stated ±1σ/ })).toBeVisible();
  await page.getByRole("radio", { name: "log₁₀ k" }).check();
  await expect(page.getByRole("img", { name: /log₁₀ k against 1000\/T/ })).toBeVisible();

  const [csv] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Download CSV" }).click()]);
  expect(csv.suggestedFilename()).toBe("arrhenia-fit.csv");
  const text = await readFile((await csv.path())!, "utf8");
  expect(text).toMatch(/^# Extrapolation outside the measured temperature range is unreliable/);
  expect(text).toMatch(/# arrhenius\.Ea = [\d.]+ ± [\d.e-]+ \(standard error\) kJ mol-1/);
  expect(text).toContain("line,T,k,sigma_ln_k,arrhenius_fitted_k,arrhenius_residual_ln_k");
  expect(
    text
      .trim()
      .split("\n")
      .filter((l) => /^\d/.test(l))
      .map((l) => l.split(",")[0]),
  ).toEqual(["2", "3", "4", "5"]);

  const [json] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Download JSON" }).click()]);
  const body = JSON.parse(await readFile((await json.path())!, "utf8"));
  expect(body.caution).toMatch(/Extrapolation outside the measured temperature range is unreliable/);
  expect(body.parameters.find((p: { name: string }) => p.name === "arrhenius.A").unit).toBe("cm3 molecule-1 s-1");
  expect(body.points).toHaveLength(4);
  expect(body.points[0]).toMatchObject({ line: 2, T: 250, k: 2.09e-15, sigma_ln_k: 0.05 });
});
