import { fileURLToPath } from "node:url";
import { expect, test } from "@playwright/test";
import { DEMO_ADMIN } from "./pages/auth-pages";
import { DEMO_CURATORS, DEMO_RESEARCHER, DepositEditorPage, MailLog, ReviewPage, signInAs } from "./pages/deposit-pages";

// Invented OH + CH4 rate constants at 8 temperatures; row 5 holds "9.40e-15x" in the k column.
const CSV = fileURLToPath(new URL("../fixtures/e2e/oh-ch4-one-bad-cell.csv", import.meta.url));
const K_HEADER = "k / cm3 molecule-1 s-1";

test("a deposit goes from an uploaded CSV through a return to the authors to publication, with the mail of each step", async ({ page }) => {
  // Two curators' and a researcher's sessions, two submissions and the inbox: minutes on a busy machine.
  test.setTimeout(240_000);
  const stamp = Date.now();
  const title = `OH + CH4 between 230 and 400 K (end-to-end ${stamp})`;
  const editor = new DepositEditorPage(page);
  const review = new ReviewPage(page);
  const curator = DEMO_CURATORS[0];
  const changesReason = `Please say in the note of row 5 how that value was checked (${stamp}).`;
  const reply = `Row 5 now says how it was checked (${stamp}).`;
  let versionId = 0;

  await test.step("the researcher describes the dataset", async () => {
    await signInAs(page, DEMO_RESEARCHER);
    await editor.openNew();
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
    await editor.fillSourceDoi(`10.5555/arrhenia.e2e.${stamp}`);
  });

  await test.step("uploads the CSV; the columns are recognised from the header", async () => {
    await editor.uploadTable(CSV);
    await expect(editor.mapping.getByRole("heading")).toContainText("8 rows, CSV, with a header row");
    await expect(editor.mappingSelect("Temperature").locator("option:checked")).toHaveText("T / K");
    await expect(editor.mappingSelect("Rate constant").locator("option:checked")).toHaveText(K_HEADER);
    await expect(editor.mappingSelect("Uncertainty").locator("option:checked")).toHaveText("uncertainty %");
    await expect(editor.mapping.getByLabel("The uncertainty column is")).toHaveValue("relative");
    await editor.useRows();
  });

  await test.step("the bad cell is named by row and column, kept in the table, and corrected there", async () => {
    await expect(editor.importProblems).toContainText(`Row 5, column "${K_HEADER}": "9.40e-15x" is not a number.`);
    await expect(editor.rowCount).toHaveText("Rows (8)");
    const badCell = editor.cell("k", 5);
    await expect(badCell).toHaveValue("9.40e-15x");
    await expect(badCell).toHaveAttribute("aria-invalid", "true");
    await expect(badCell).toHaveAccessibleDescription(/"9\.40e-15x" is not a number/);
    await badCell.fill("9.40e-15");
    await expect(badCell).not.toHaveAttribute("aria-invalid", "true");
    await expect(editor.cell("T", 5)).toHaveValue("320");
  });

  await test.step("saves the draft and submits it", async () => {
    versionId = await editor.saveNewDraft();
    await expect(editor.cell("k", 5)).toHaveValue("9.4e-15");
    await editor.submitForReview();
  });

  await test.step("a curator takes it into review and returns it to the authors", async () => {
    await signInAs(page, curator);
    await review.openFromQueue(title);
    await review.takeIntoReview();
    await review.decide("Return to the authors", changesReason, /returned to the authors for revision/);
  });

  await test.step("the researcher reads the decision, edits, saves and submits again", async () => {
    await signInAs(page, DEMO_RESEARCHER);
    await editor.open(versionId);
    await editor.expectState("returned for revision");
    await expect(editor.decision("returned to the authors")).toContainText(curator.name);
    await expect(editor.decision("returned to the authors")).toContainText(changesReason);
    await editor.cell("Note", 5).fill("re-read from the original trace");
    await editor.saveDraft();
    // The conversation so far sits beside the reply field, read-only: here the one return.
    const conversation = page.getByRole("region", { name: "The conversation so far" });
    await expect(conversation.getByRole("listitem")).toHaveCount(1);
    await expect(conversation).toContainText(changesReason);
    await expect(conversation).toContainText(`Returned by ${curator.name}`);
    // Submitting again needs a reply to the curator.
    await expect(page.getByRole("button", { name: "Submit for review" })).toBeDisabled();
    await editor.submitForReview(reply);
  });

  await test.step("the curator sees who holds it, the reason beside the reply, and the changes since the last submission", async () => {
    await signInAs(page, curator);
    await page.goto("/review?sort=submitted&dir=desc");
    await expect(page.getByRole("row").filter({ hasText: title })).toContainText(/under 1 h/);
    // The demo's queued submissions (invented) have waited from hours to days.
    await page.goto("/review?sort=submitted&dir=asc");
    await expect(
      page
        .getByRole("row")
        .filter({ hasText: /\b\d+ d( \d+ h)?\b/ })
        .first(),
    ).toBeVisible();
    await review.openFromQueue(title);
    const changes = review.sinceLastSubmission;
    await expect(changes.getByRole("heading", { name: "Reason for returning it" }).locator("..")).toContainText(changesReason);
    await expect(changes.getByRole("heading", { name: "The authors' reply" }).locator("..")).toContainText(reply);
    await expect(changes).toContainText("Points: 8 before, 8 now; 0 added, 0 removed, 1 changed");
    const row5 = changes.getByRole("row").filter({ hasText: "re-read from the original trace" });
    await expect(row5).toHaveCount(1);
    await expect(row5.getByRole("cell").nth(0)).toHaveText("5");
    await expect(row5).toContainText("changed");
    await expect(page.getByText("This is the first version")).toHaveCount(0);
    // The plot and the table are in the document's unit, never "canonical units".
    await expect(page.getByRole("region", { name: /^Data, re-fit/ })).toContainText("cm³ molecule⁻¹ s⁻¹");
    await expect(page.getByText(/canonical units/)).toHaveCount(0);
    const shots = process.env.E2E_SHOTS_DIR;
    if (shots) {
      for (const width of [1366, 390]) {
        await page.setViewportSize({ width, height: 900 });
        await page.screenshot({ path: `${shots}/review-page-${width}.png`, fullPage: true });
      }
      await page.setViewportSize({ width: 1280, height: 720 });
    }
  });

  await test.step("the full record reads as a curator's, and the audit trail has the reply", async () => {
    await page.getByRole("link", { name: /^The full record/ }).click();
    await expect(page).toHaveURL(/\/deposits\/\d+$/);
    // The site header keeps its own menu; the page itself has no author crumbs.
    await expect(page.getByRole("main").getByRole("link", { name: "My deposits", exact: true })).toHaveCount(0);
    await expect(page.getByText(/withdraw it/)).toHaveCount(0);
    await expect(page.getByRole("link", { name: /^Review of version 1$/ })).toBeVisible();
    await page.getByRole("link", { name: "Audit trail", exact: true }).click();
    await expect(page.getByRole("heading", { level: 1 })).toHaveText(`Audit trail: ${title}`);
    await expect(page.getByRole("row").filter({ hasText: "returned it to the authors" })).toContainText(changesReason);
    await expect(page.getByRole("row").filter({ hasText: reply })).toContainText("submitted it for review");
  });

  await test.step("the curator accepts and publishes", async () => {
    await review.openFromQueue(title);
    await review.decide(
      "Accept and publish",
      "Complete and consistent; the note on row 5 answers the question.",
      /the version is published/,
    );
  });

  await test.step("the published version shows its identifier", async () => {
    await signInAs(page, DEMO_RESEARCHER);
    await editor.open(versionId);
    await editor.expectState("published");
    await expect(editor.versionIdentifier).toHaveText(
      /^Version identifier: 10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{3}[0-9A-Z*~$=]\/1 — open the public page$/,
    );
    // The public page is what the identifier resolves to.
    await editor.versionIdentifier.getByRole("link", { name: "open the public page" }).click();
    await expect(page).toHaveURL(/\/datasets\/\d+\/v1$/);
    await expect(page.getByText(/doi:10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{3}[0-9A-Z*~$=]\/1/).first()).toBeVisible();
    await page.goBack();
    await expect(editor.decision("accepted")).toContainText("the note on row 5 answers the question");
    await expect(editor.cell("Note", 5)).toHaveValue("re-read from the original trace");
  });

  await test.step("the inbox holds the mail of every step", async () => {
    // Each curator heard of both submissions (the one who returned it with the reply); the researcher of both decisions.
    await signInAs(page, { email: DEMO_ADMIN.email, name: "Rosalind Okafor" });
    await new MailLog(page).expectCounts([
      { to: curator.email, subject: `Waiting for review: ${title}`, count: 1 },
      { to: curator.email, subject: `Back for review after your return: ${title}`, count: 1 },
      { to: DEMO_CURATORS[1].email, subject: `Waiting for review: ${title}`, count: 2 },
      { to: DEMO_RESEARCHER.email, subject: `Decision on “${title}”: returned for revision`, count: 1 },
      { to: DEMO_RESEARCHER.email, subject: `Decision on “${title}”: accepted`, count: 1 },
    ]);
  });
});
