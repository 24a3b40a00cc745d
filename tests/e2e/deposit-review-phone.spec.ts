import { fileURLToPath } from "node:url";
import { expect, test, type Locator, type Page } from "@playwright/test";
import { widthAndAxeProblems } from "./pages/layout-checks";
import { DEMO_CURATORS, DEMO_PASSWORD, DEMO_RESEARCHER, DepositEditorPage, ReviewPage } from "./pages/deposit-pages";

// The whole deposit → submit → review → return → reply → resubmit → accept path on a phone
// (390 × 844), driven as the researcher and a curator: on every page of the path nothing is wider
// than the screen and axe-core finds no serious or critical violation; every button pressed is on
// the screen, inside its width, and the one thing under its centre (not covered or cut off); the
// editor's sticky save bar stays on screen while the data table is scrolled.

const PHONE = { width: 390, height: 844 };
const CSV = fileURLToPath(new URL("../fixtures/e2e/oh-ch4-one-bad-cell.csv", import.meta.url));

test.use({ viewport: PHONE });

/** Why `target` could not be pressed where a person sees it, or null when it can. */
async function tapProblem(page: Page, target: Locator, what: string): Promise<string | null> {
  await expect(target, `${what} is shown`).toBeVisible();
  await target.scrollIntoViewIfNeeded();
  const box = await target.boundingBox();
  if (!box) return `${what}: no box`;
  if (box.x < 0 || box.x + box.width > PHONE.width + 0.5)
    return `${what}: ${Math.round(box.x)}–${Math.round(box.x + box.width)} px, outside the 390 px screen`;
  if (box.y < 0 || box.y + box.height > PHONE.height + 0.5) return `${what}: not wholly on the screen (top ${Math.round(box.y)} px)`;
  // The centre of its first line box: a link that wraps has a bounding box wider than its text.
  const onTop = await target.evaluate((el) => {
    const r = el.getClientRects()[0] ?? el.getBoundingClientRect();
    const hit = document.elementFromPoint(r.left + r.width / 2, r.top + r.height / 2);
    return hit !== null && (hit === el || el.contains(hit));
  });
  return onTop ? null : `${what}: covered by something else at its centre`;
}

test("a deposit goes through a return to publication on a 390 px phone, every page fitting the screen and passing axe", async ({
  page,
}) => {
  // Two people's sessions, two submissions, axe on a dozen pages: minutes on a busy machine.
  test.setTimeout(360_000);
  const stamp = Date.now();
  const title = `OH + CH4 on a phone (end-to-end ${stamp})`;
  const editor = new DepositEditorPage(page);
  const review = new ReviewPage(page);
  const curator = DEMO_CURATORS[1];
  const reason = `Please say in the note of row 5 how that value was checked (${stamp}).`;
  const reply = `Row 5 now says how it was checked (${stamp}).`;
  const problems: string[] = [];
  let versionId = 0;

  const check = async (label: string) => {
    await page.waitForLoadState("networkidle");
    problems.push(...(await widthAndAxeProblems(page, label)));
  };
  /** Presses a button or link after checking that a person could. */
  const tap = async (target: Locator, what: string) => {
    const problem = await tapProblem(page, target, what);
    if (problem) problems.push(problem);
    await target.click();
  };

  /** A full-page screenshot into E2E_SHOTS_DIR, when set (for people to look at). */
  const shot = async (name: string) => {
    const dir = process.env.E2E_SHOTS_DIR;
    if (dir) await page.screenshot({ path: `${dir}/${name}.png`, fullPage: true });
  };
  const signOut = async () => {
    const menu = page.getByRole("button", { name: /Menu/ });
    await tap(menu, "the header's Menu button");
    await tap(page.getByRole("button", { name: "Sign out" }), "Sign out in the menu");
    await expect(page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Sign in" })).toBeVisible();
  };
  const signIn = async (who: { email: string; name: string }, label: string) => {
    await page.goto("/sign-in");
    await check(`sign-in (${label})`);
    await page.getByLabel("E-mail").fill(who.email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await tap(page.getByRole("button", { name: "Sign in" }), "Sign in");
    await expect(page.getByRole("navigation", { name: "Main" })).toContainText(who.name);
  };

  await test.step("the researcher fills in a new deposit and uploads the table", async () => {
    await signIn(DEMO_RESEARCHER, "researcher");
    await editor.openNew();
    await check("/deposits/new (empty)");
    await editor.fillAbout(title, "Rate constants of OH + CH4 measured by pulsed laser photolysis with laser-induced fluorescence of OH.");
    await editor.fillReaction({
      reactants: [
        { name: "hydroxyl radical", smiles: "[OH]" },
        { name: "methane", smiles: "C" },
      ],
      products: [
        { name: "water", smiles: "O" },
        { name: "methyl radical", smiles: "[CH3]" },
      ],
      reactionClass: "H-atom abstraction",
      order: "2",
      phase: "Gas phase",
    });
    await editor.fillMethod("Measured", "pulsed laser photolysis");
    await editor.fillSourceDoi(`10.5555/arrhenia.e2e.phone.${stamp}`);
    await editor.uploadTable(CSV);
    await tap(page.getByRole("button", { name: "Use these rows" }), "Use these rows");
    await expect(editor.rowCount).toHaveText("Rows (8)");
    await editor.cell("k", 5).fill("9.40e-15");
    await check("/deposits/new (8 rows)");
    await shot("deposit-editor-390");
  });

  await test.step("the sticky save bar stays on the screen beside the table, and saves", async () => {
    await editor.cell("Note", 8).scrollIntoViewIfNeeded();
    const save = page.getByRole("button", { name: "Save draft" }).first();
    await page.evaluate(() => Object.assign(window, { arrheniaSameDocument: true }));
    await tap(save, "the sticky bar's Save draft beside row 8");
    await editor.expectState("draft");
    await expect(page).toHaveURL(/\/deposits\/\d+$/);
    versionId = editor.versionId();
    await check(`/deposits/${versionId} (draft)`);
  });

  await test.step("submits it", async () => {
    const submit = page.getByRole("button", { name: "Submit for review" });
    await expect(submit).toBeEnabled({ timeout: 15_000 });
    await tap(submit, "Submit for review");
    await expect(page.getByRole("status").filter({ hasText: "Submitted. A curator has been told." })).toBeVisible({ timeout: 15_000 });
    await editor.expectState("submitted");
    await check(`/deposits/${versionId} (submitted)`);
    await page.goto("/deposits");
    await check("/deposits");
    await signOut();
  });

  await test.step("a curator finds it in the queue, takes it into review and returns it", async () => {
    await signIn(curator, "curator");
    await page.goto("/review?sort=submitted&dir=desc");
    await check("/review");
    await tap(page.getByRole("link", { name: title, exact: true }), "the queue's link to the dataset");
    await expect(page.getByRole("heading", { level: 1, name: title })).toBeVisible();
    await check(`/review/${versionId} (submitted)`);
    await tap(page.getByRole("button", { name: "Take into review" }), "Take into review");
    await expect(page.getByRole("status").filter({ hasText: "the version is now in review" })).toBeVisible({ timeout: 15_000 });
    await page.getByRole("radio", { name: /^Return to the authors/ }).check();
    await page.getByLabel(/^Reason/).fill(reason);
    await tap(page.getByRole("button", { name: "Record the decision" }), "Record the decision (return)");
    await expect(page.getByRole("status").filter({ hasText: /returned to the authors for revision/ })).toBeVisible({ timeout: 15_000 });
    await check(`/review/${versionId} (returned)`);
    // Returned, it waits for its authors: among those, not among those waiting for a curator. The
    // tab keeps the order, newest return first.
    await page.goto("/review?sort=submitted&dir=desc");
    await expect(page.getByRole("link", { name: title, exact: true })).toHaveCount(0);
    await tap(page.getByRole("link", { name: /^With the authors/ }), "the queue's With the authors tab");
    await expect(page.getByRole("row").filter({ hasText: title })).toContainText(`returned by ${curator.name}`);
    await check("/review?state=returned");
    await signOut();
  });

  await test.step("the researcher reads the reason, corrects row 5, and submits again with a reply", async () => {
    await signIn(DEMO_RESEARCHER, "researcher again");
    await editor.open(versionId);
    await editor.expectState("returned for revision");
    await expect(editor.decision("returned to the authors")).toContainText(reason);
    await check(`/deposits/${versionId} (returned)`);
    await editor.cell("Note", 5).fill("re-read from the original trace");
    await tap(page.getByRole("button", { name: "Save draft" }).first(), "the sticky bar's Save draft after a return");
    await expect(page.getByRole("status").filter({ hasText: /^Saved \d\d:\d\d$/ })).toBeVisible({ timeout: 20_000 });
    await page.getByLabel(/^Your reply to the curator/).fill(reply);
    const submit = page.getByRole("button", { name: "Submit for review" });
    await expect(submit).toBeEnabled({ timeout: 15_000 });
    await tap(submit, "Submit for review (again)");
    await expect(page.getByRole("status").filter({ hasText: "Submitted. A curator has been told." })).toBeVisible({ timeout: 15_000 });
    await editor.expectState("submitted");
    await check(`/deposits/${versionId} (submitted again)`);
    await signOut();
  });

  await test.step("the curator sees the reply and the change, and accepts", async () => {
    await signIn(curator, "curator again");
    await review.openFromQueue(title);
    await expect(review.sinceLastSubmission).toContainText(reply);
    await expect(review.sinceLastSubmission).toContainText("Points: 8 before, 8 now; 0 added, 0 removed, 1 changed");
    await check(`/review/${versionId} (resubmitted)`);
    await shot("review-page-390");
    await page.getByRole("radio", { name: /^Accept and publish/ }).check();
    await page.getByLabel(/^Reason/).fill("Complete and consistent; the note on row 5 answers the question.");
    await tap(page.getByRole("button", { name: "Record the decision" }), "Record the decision (accept)");
    await expect(page.getByRole("status").filter({ hasText: /the version is published/ })).toBeVisible({ timeout: 15_000 });
    await check(`/review/${versionId} (published)`);
  });

  await test.step("the published version's page", async () => {
    await tap(page.getByRole("link", { name: /^The full record/ }), "the review page's link to the full record");
    await expect(editor.versionIdentifier).toBeVisible();
    await tap(editor.versionIdentifier.getByRole("link", { name: "open the public page" }), "open the public page");
    await expect(page).toHaveURL(/\/datasets\/\d+\/v1$/);
    await check("the published version's public page");
    await shot("dataset-page-390");
  });

  expect(problems).toEqual([]);
});
