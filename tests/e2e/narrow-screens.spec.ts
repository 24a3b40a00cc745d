import { expect, test, type Page } from "@playwright/test";
import { DEMO_ADMIN } from "./pages/auth-pages";
import { widthAndAxeProblems } from "./pages/layout-checks";
import { DEMO_CURATORS, DEMO_RESEARCHER, signInAs } from "./pages/deposit-pages";

// Every page, as each role, on a 390 px wide phone: nothing wider than the screen, and no serious
// or critical accessibility violation found by axe-core.

const PHONE = { width: 390, height: 844 };
const PUBLIC_PAGES = ["/", "/reactions", "/analyse", "/docs/api", "/docs/deposit-format", "/search?q=methane"];
/**
 * Public pages whose body is the same for everyone (only the header differs, and the header of each
 * role is checked on its other pages): opened as anonymous only; a dataset's series address (the
 * newest version's page again) as anonymous and as researcher.
 */
const SAME_FOR_EVERYONE = new Set(["/analyse", "/docs/api", "/docs/deposit-format"]);
const SIGNED_OUT_PAGES = ["/sign-in", "/sign-up", "/forgot-password", "/verify/resend"];

const roles = {
  anonymous: null,
  researcher: DEMO_RESEARCHER,
  curator: DEMO_CURATORS[0],
  admin: { email: DEMO_ADMIN.email, name: "Rosalind Okafor" },
} as const;

/** The first link in the main content whose address matches `pattern`, or null. */
async function firstLink(page: Page, path: string, pattern: RegExp): Promise<string | null> {
  await page.goto(path);
  const hrefs = await page.locator("main a[href]").evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""));
  return hrefs.find((h) => pattern.test(h)) ?? null;
}

/** The pages a role can open, with real ids taken from the demo data. */
async function pagesFor(page: Page, role: keyof typeof roles): Promise<string[]> {
  const staff = role === "curator" || role === "admin";
  const paths = [
    ...PUBLIC_PAGES.filter((p) => role === "anonymous" || !SAME_FOR_EVERYONE.has(p)),
    ...(role === "anonymous" ? SIGNED_OUT_PAGES : ["/settings"]),
  ];
  const reaction = await firstLink(page, "/reactions", /^\/reactions\/[A-Z0-9.*+~-]+$/);
  expect(reaction, "a reaction page in the demo").not.toBeNull();
  paths.push(reaction!);
  const version = await firstLink(page, reaction!, /^\/datasets\/\d+\/v\d+$/);
  expect(version, "a published version in the demo").not.toBeNull();
  paths.push(version!);
  if (!staff) paths.push(version!.replace(/\/v\d+$/, ""));
  if (role === "researcher" || role === "admin") paths.push("/deposits", "/deposits/new");
  if (role === "researcher") {
    // A deposit page carries its dataset's invitations list and links its audit trail.
    const deposit = await firstLink(page, "/deposits", /^\/deposits\/\d+$/);
    expect(deposit, "a deposit of the demo researcher").not.toBeNull();
    paths.push(deposit!);
    const audit = await firstLink(page, deposit!, /^\/datasets\/\d+\/audit$/);
    expect(audit, "the deposit page links its audit trail").not.toBeNull();
    paths.push(audit!);
  }
  if (role === "curator" || role === "admin") {
    paths.push("/review");
    const review = await firstLink(page, "/review", /^\/review\/\d+$/);
    expect(review, "a submission in the review queue of the demo").not.toBeNull();
    paths.push(review!);
    const audit = await firstLink(page, review!, /^\/datasets\/\d+\/audit$/);
    expect(audit, "the review page links the audit trail").not.toBeNull();
    if (!paths.includes(audit!)) paths.push(audit!);
    // Curators and admins reach a published dataset's audit trail from its public page too.
    const published = await firstLink(page, version!, /^\/datasets\/\d+\/audit$/);
    expect(published, "the public page links the audit trail for curators and admins").not.toBeNull();
    if (!paths.includes(published!)) paths.push(published!);
  }
  if (role === "anonymous") {
    // Nobody else is shown the way to an audit trail.
    expect(await firstLink(page, version!, /^\/datasets\/\d+\/audit$/)).toBeNull();
  }
  if (role === "admin") paths.push("/admin/people", "/admin/mail", "/admin/jobs");
  // The "You do not have access" page (403) of a role that may not open a page.
  if (role === "researcher") paths.push("/review");
  if (role === "curator") paths.push("/admin/people");
  return paths;
}

for (const [role, who] of Object.entries(roles) as [keyof typeof roles, (typeof roles)[keyof typeof roles]][]) {
  test(`every page fits a 390 px screen and passes axe, as ${role}`, async ({ page }) => {
    test.setTimeout(300_000);
    if (who) await signInAs(page, who);
    const paths = await pagesFor(page, role);
    await page.setViewportSize(PHONE);
    const problems: string[] = [];
    for (const path of paths) {
      await page.goto(path);
      await page.waitForLoadState("networkidle");
      if (path === "/analyse") {
        // The parameter tables only exist once something is fitted.
        await page
          .getByLabel(/Data: temperature and rate constant/)
          .fill("250 2.09e-15\n290 4.90e-15\n330 9.1e-15\n370 1.5e-14\n410 2.3e-14");
        await page.getByRole("button", { name: "Fit" }).click();
        await expect(page.getByRole("heading", { name: "Result" })).toBeVisible();
      }
      problems.push(...(await widthAndAxeProblems(page, path)));
    }
    expect(paths.length).toBeGreaterThan(8);
    expect(problems).toEqual([]);
  });
}

test("the signed-in header folds into a menu on a phone that the keyboard opens", async ({ page }) => {
  await signInAs(page, DEMO_CURATORS[0]);
  await page.setViewportSize(PHONE);
  await page.goto("/reactions");
  const menu = page.getByRole("button", { name: /Menu/ });
  await expect(menu).toBeVisible();
  await expect(menu).toHaveAttribute("aria-expanded", "false");
  await menu.focus();
  await page.keyboard.press("Enter");
  await expect(menu).toHaveAttribute("aria-expanded", "true");
  const nav = page.getByRole("navigation", { name: "Main" });
  await expect(nav.getByRole("link", { name: "Review" })).toBeVisible();
  await expect(nav).toContainText(DEMO_CURATORS[0].name);
  await page.keyboard.press("Escape");
  await expect(menu).toHaveAttribute("aria-expanded", "false");
  await expect(menu).toBeFocused();
});

test("a wide code block scrolls by keyboard and says so", async ({ page }) => {
  await page.setViewportSize(PHONE);
  await page.goto("/docs/api");
  // The section is folded (details/summary) until opened.
  await page.locator("summary", { has: page.locator("#analyses") }).click();
  const region = page.getByRole("region", { name: "Example request and response" });
  await region.focus();
  await expect(region).toBeFocused();
  const before = await region.evaluate((el) => el.scrollLeft);
  await page.keyboard.press("ArrowRight");
  await page.keyboard.press("ArrowRight");
  await expect.poll(() => region.evaluate((el) => el.scrollLeft)).toBeGreaterThan(before);
  await expect(
    page
      .getByText(/scroll sideways/)
      .filter({ visible: true })
      .first(),
  ).toBeVisible();
});

/** The tick labels of every plot axis on the page, with their horizontal extent. */
async function plotTicks(page: Page) {
  return page.evaluate(() =>
    [...document.querySelectorAll<SVGGElement>("figure .recharts-cartesian-axis-tick-labels")].map((axis) => ({
      vertical: axis.classList.contains("recharts-yAxis-tick-labels"),
      labels: [...axis.querySelectorAll<SVGTextElement>(".recharts-cartesian-axis-tick-value")].map((t) => {
        const box = t.getBoundingClientRect();
        return { text: t.textContent ?? "", left: box.left, right: box.right };
      }),
    })),
  );
}

/** Null when every label is a round number (at most two decimals). */
function roundTicksProblem(texts: string[]): string | null {
  const values = texts.map((t) => Number(t.replace("\u2212", "-")));
  if (values.some((v) => !Number.isFinite(v) || Math.abs(v * 100 - Math.round(v * 100)) > 1e-6)) return `not round: ${texts.join(" ")}`;
  return null;
}

for (const [name, size] of [
  ["390", PHONE],
  ["1366", { width: 1366, height: 900 }],
] as const) {
  test(`plot axes at ${name} px: round tick labels in ln k and log₁₀ k, top temperatures apart`, async ({ page }) => {
    await page.setViewportSize(size);
    const reaction = await firstLink(page, "/reactions", /^\/reactions\/[A-Z0-9.*+~-]+$/);
    const version = await firstLink(page, reaction!, /^\/datasets\/\d+\/v\d+$/);
    const problems: string[] = [];
    for (const path of [reaction!, version!]) {
      await page.goto(path);
      const figure = page
        .locator("figure")
        .filter({ has: page.getByRole("radio", { name: "log₁₀ k" }) })
        .first();
      await figure.scrollIntoViewIfNeeded();
      for (const scale of ["ln k", "log₁₀ k"]) {
        await figure.getByRole("radio", { name: scale }).check();
        await expect(figure.getByRole("img", { name: new RegExp(`${scale} against 1000/T`) })).toBeVisible();
        for (const axis of await plotTicks(page)) {
          const texts = axis.labels.map((l) => l.text);
          if (texts.length < 2) problems.push(`${path} ${scale}: an axis with ${texts.length} labels`);
          const round = roundTicksProblem(texts);
          if (round) problems.push(`${path} ${scale}: ${round}`);
          if (!axis.vertical) {
            const sorted = [...axis.labels].sort((a, b) => a.left - b.left);
            for (let i = 1; i < sorted.length; i++)
              if (sorted[i].left - sorted[i - 1].right < 6)
                problems.push(
                  `${path} ${scale}: labels ${sorted[i - 1].text} and ${sorted[i].text} crowd (${Math.round(sorted[i].left - sorted[i - 1].right)} px apart)`,
                );
          }
        }
      }
    }
    expect(problems).toEqual([]);
  });
}

test("the API reference is folded on a phone: every endpoint listed, each opens without JavaScript", async ({ browser }) => {
  const context = await browser.newContext({ viewport: PHONE, javaScriptEnabled: false });
  const page = await context.newPage();
  try {
    await page.goto("/docs/api");
    // Folded, the page is a list of endpoints: a few screens, not tens of thousands of pixels.
    const folded = await page.evaluate(() => document.documentElement.scrollHeight);
    expect(folded).toBeLessThan(16_000);
    const openapi = await (await page.request.get("/api/v1/openapi.json")).json();
    const operations = Object.values(openapi.paths as Record<string, Record<string, unknown>>).flatMap((m) => Object.keys(m)).length;
    const endpoints = page.locator("details[id^='op-']");
    await expect(endpoints).toHaveCount(operations);
    // A summary opens its endpoint (no script on the page), and the examples inside open the same way.
    const species = page.locator("#op-getSpeciesByInchikey");
    await species.locator(":scope > summary").click();
    await expect(species).toHaveAttribute("open", "");
    await expect(species.getByText(/matching \^\[A-Z\]\{14\}/)).toBeVisible();
    await species.locator("details > summary").click();
    await expect(species.getByText(/curl -s/)).toBeVisible();
    console.log(`/docs/api on a 390 px phone, folded: ${folded} px`);
  } finally {
    await context.close();
  }
});

test("the API reference with every section and endpoint open: no wider than a phone, no serious axe finding", async ({ page }) => {
  // axe reads every open endpoint of the reference (thousands of elements): minutes on a busy 2-core machine.
  test.setTimeout(240_000);
  await page.setViewportSize(PHONE);
  await page.goto("/docs/api");
  await page.evaluate(() => document.querySelectorAll("details").forEach((d) => d.setAttribute("open", "")));
  expect(await widthAndAxeProblems(page, "/docs/api (every section open)")).toEqual([]);
  console.log(`/docs/api on a 390 px phone, all open: ${await page.evaluate(() => document.documentElement.scrollHeight)} px`);
});
