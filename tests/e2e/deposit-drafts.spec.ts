import { expect, test, type BrowserContext, type Dialog, type Page } from "@playwright/test";
import { DEMO_RESEARCHER, DepositEditorPage, signInAs } from "./pages/deposit-pages";

// Drafts: saved as they are typed once they have a title, incomplete or not; a warning before
// leaving unsaved changes (a header link, the back button, closing the tab); a co-editor's save
// merged field by field instead of thrown away.

/** Answers every dialog of the page with `accept` and records what it asked. */
function recordDialogs(page: Page, accept: () => boolean) {
  const seen: { type: string; message: string }[] = [];
  page.on("dialog", (d: Dialog) => {
    seen.push({ type: d.type(), message: d.message() });
    void (accept() ? d.accept() : d.dismiss());
  });
  return seen;
}

async function newTitledDraft(page: Page, title: string): Promise<number> {
  const editor = new DepositEditorPage(page);
  await editor.openNew();
  await editor.title.fill(title);
  await editor.expectSaved();
  await expect(page).toHaveURL(/\/deposits\/\d+$/);
  return editor.versionId();
}

test("a new deposit saves itself once it has a title, and lists what it lacks with links to the fields", async ({ page }) => {
  const editor = new DepositEditorPage(page);
  await signInAs(page, DEMO_RESEARCHER);
  await editor.openNew();
  await editor.description.fill("Typed before any title.");
  await expect(editor.saveStatus).toHaveText(/^Not saved: give the deposit a title/, { timeout: 10_000 });

  const title = `Autosaved draft ${Date.now()}`;
  await editor.title.fill(title);
  await editor.expectSaved();
  await expect(page).toHaveURL(/\/deposits\/\d+$/);
  await expect(editor.readiness).toBeVisible();

  // Each item takes the person to its input.
  const readiness = page.locator("#readiness");
  await readiness
    .getByRole("link", { name: /^Reaction, reactant 1\b/ })
    .first()
    .click();
  await expect(page.getByLabel("Reactant 1: SMILES")).toBeFocused();

  // Every field saves itself, the reaction and the points table included.
  await page.getByLabel("Reactant 1: SMILES").fill("[OH]");
  await page.getByRole("button", { name: "Add a row" }).first().click();
  await editor.cell("T", 1).fill("298");
  await editor.cell("k", 1).fill("6.4e-15");
  await editor.expectSaved();

  await page.reload();
  await expect(page.getByRole("heading", { level: 1, name: title })).toBeVisible();
  await expect(page.getByLabel("Reactant 1: SMILES")).toHaveValue("[OH]");
  await expect(editor.cell("k", 1)).toHaveValue("6.4e-15");
  await expect(editor.readiness).toBeVisible();
  await expect(page.getByRole("button", { name: "Submit for review" })).toBeDisabled();
});

test("leaving with unsaved changes asks first: a header link, the back button and closing the tab; nothing is asked once saved", async ({
  page,
}) => {
  const editor = new DepositEditorPage(page);
  await signInAs(page, DEMO_RESEARCHER);
  const id = await newTitledDraft(page, `Leave warning ${Date.now()}`);
  // Every question is answered "stay": the page must still be there, changes and all.
  const dialogs = recordDialogs(page, () => false);
  const main = page.getByRole("navigation", { name: "Main" });

  await test.step("a header link", async () => {
    await editor.description.fill("Not saved yet when the link is clicked.");
    await main.getByRole("link", { name: "Reactions" }).click();
    await expect.poll(() => dialogs.length).toBe(1);
    expect(dialogs[0]).toEqual({ type: "confirm", message: expect.stringMatching(/not saved yet/) });
    await expect(page).toHaveURL(new RegExp(`/deposits/${id}$`));
  });

  await test.step("the back button", async () => {
    await editor.expectSaved();
    await editor.description.fill("Changed again, then back.");
    await page.evaluate(() => window.history.back());
    await expect.poll(() => dialogs.length).toBe(2);
    expect(dialogs[1].type).toBe("confirm");
    await expect(page).toHaveURL(new RegExp(`/deposits/${id}$`));
    await expect(editor.description).toHaveValue("Changed again, then back.");
  });

  await test.step("closing the tab", async () => {
    await editor.expectSaved();
    await editor.description.fill("Changed, then the tab is closed.");
    await page.close({ runBeforeUnload: true });
    await expect.poll(() => dialogs.length).toBe(3);
    expect(dialogs[2].type).toBe("beforeunload");
    // The tab stays open (the dialog was dismissed) and the change is saved.
    await editor.expectSaved();
  });

  await test.step("nothing is asked once everything is saved", async () => {
    await main.getByRole("link", { name: "Reactions" }).click();
    await expect(page).toHaveURL(/\/reactions$/);
    expect(dialogs).toHaveLength(3);
  });
});

test("Back after staying, and Back from the page Save draft opens, go where the person came from", async ({ page }) => {
  const editor = new DepositEditorPage(page);
  await signInAs(page, DEMO_RESEARCHER);
  await page.goto("/deposits");
  await page.getByRole("main").getByRole("link", { name: "New deposit", exact: true }).click();
  await expect(page.getByRole("heading", { level: 1, name: "New deposit" })).toBeVisible();
  await editor.title.fill(`Back and stay ${Date.now()}`);
  await editor.expectSaved();
  const dialogs = recordDialogs(page, () => false);

  await editor.description.fill("Typed, then Back, then stay.");
  await page.goBack();
  await expect.poll(() => dialogs.length).toBe(1);
  await expect(page).toHaveURL(/\/deposits\/\d+$/);
  await expect(editor.description).toHaveValue("Typed, then Back, then stay.");

  // Saved by hand: the draft's own page opens, and one Back returns to My deposits (no blank
  // "New deposit" entry left beneath it, nothing asked).
  await editor.saveNewDraft();
  await page.goBack();
  await expect(page.getByRole("heading", { level: 1, name: "My deposits" })).toBeVisible();
  await expect(page).toHaveURL(/\/deposits$/);
  expect(dialogs).toHaveLength(1);
});

test("after staying, once the edits are saved, one Back leaves the new draft", async ({ page }) => {
  const editor = new DepositEditorPage(page);
  await signInAs(page, DEMO_RESEARCHER);
  await page.goto("/deposits");
  await page.getByRole("main").getByRole("link", { name: "New deposit", exact: true }).click();
  await editor.title.fill(`Stay, then leave ${Date.now()}`);
  await editor.expectSaved();
  const dialogs = recordDialogs(page, () => false);
  await editor.description.fill("Typed, then Back, then stay.");
  await page.goBack();
  await expect.poll(() => dialogs.length).toBe(1);
  await editor.expectSaved();
  await page.goBack();
  await expect(page.getByRole("heading", { level: 1, name: "My deposits" })).toBeVisible();
  expect(dialogs).toHaveLength(1);
});

/** The same researcher signed in twice (two browser contexts), on one new draft; B opens it. */
async function oneDraftTwice(a: BrowserContext, b: BrowserContext, title: string) {
  const pageA = await a.newPage();
  const pageB = await b.newPage();
  await signInAs(pageA, DEMO_RESEARCHER);
  await signInAs(pageB, DEMO_RESEARCHER);
  const id = await newTitledDraft(pageA, `${title} ${Date.now()}`);
  const editorA = new DepositEditorPage(pageA);
  const editorB = new DepositEditorPage(pageB);
  await editorB.open(id);
  return { pageA, pageB, editorA, editorB };
}

test("a co-editor's save is merged field by field, never thrown away", async ({ browser }) => {
  const a = await browser.newContext();
  const b = await browser.newContext();
  try {
    const { pageA, pageB, editorA, editorB } = await oneDraftTwice(a, b, "Two editors");

    await editorA.description.fill("Summary written in the first window.");
    await editorA.expectSaved();

    const titleB = `Retitled in the second window ${Date.now()}`;
    await editorB.title.fill(titleB);
    const conflict = pageB.getByRole("alert").filter({ hasText: "A co-editor saved this draft while you were editing it" });
    await expect(conflict).toBeVisible({ timeout: 20_000 });
    await expect(editorB.saveStatus).toHaveText(/^Not saved: a co-editor saved first/);
    // Each differing field is shown; mine is kept where only I changed it, theirs proposed where only they did.
    const titleField = conflict.getByRole("group", { name: "Title and summary, title" });
    await expect(titleField).toContainText("Yours is kept");
    await expect(titleField).toContainText(titleB);
    const summaryField = conflict.getByRole("group", { name: "Title and summary, description" });
    await expect(summaryField.getByRole("radio", { name: /Take theirs/ })).toBeChecked();
    await expect(summaryField).toContainText("Summary written in the first window.");

    await conflict.getByRole("button", { name: "Save the merged draft" }).click();
    await editorB.expectSaved();
    await expect(conflict).toBeHidden();
    await expect(editorB.description).toHaveValue("Summary written in the first window.");

    await pageA.reload();
    await expect(editorA.title).toHaveValue(titleB);
    await expect(editorA.description).toHaveValue("Summary written in the first window.");
  } finally {
    await a.close();
    await b.close();
  }
});

test("a draft of 100 000 points (about 2 MB of JSON) is saved from the editor and is all there after a reload", async ({ page }) => {
  test.setTimeout(240_000);
  const editor = new DepositEditorPage(page);
  await signInAs(page, DEMO_RESEARCHER);
  const id = await newTitledDraft(page, `Large draft ${Date.now()}`);
  const rows = Array.from({ length: 100_000 }, (_, i) => `${(200 + i * 0.001).toFixed(3)},${(1e-12 * (1 + i / 1e5)).toExponential(6)}`);
  await editor.uploadTable({
    name: "large.csv",
    mimeType: "text/csv",
    buffer: Buffer.from(`T / K,k / cm3 molecule-1 s-1\n${rows.join("\n")}\n`),
  });
  await editor.useRows();
  await expect(editor.rowCount).toHaveText("Rows (100,000)", { timeout: 60_000 });
  // React decodes a text argument of a server action only up to 1 000 000 characters; the
  // document goes as a Blob instead, so this save is stored rather than retried forever.
  // Saved by hand, the new deposit opens its draft's own page once everything is stored.
  await page.getByRole("button", { name: "Save draft" }).first().click();
  await expect(page.getByRole("heading", { name: /^Version \d+: draft$/ })).toBeVisible({ timeout: 120_000 });
  await expect(() => editor.open(id)).toPass({ timeout: 60_000 });
  await expect(editor.rowCount).toHaveText("Rows (100,000)", { timeout: 60_000 });
  await expect(editor.cell("k", 1)).toHaveValue("1e-12");
});

test("edits typed while the merge panel is open are kept by the merge", async ({ browser }) => {
  const a = await browser.newContext();
  const b = await browser.newContext();
  try {
    const { pageA, pageB, editorA, editorB } = await oneDraftTwice(a, b, "Typed during a merge");

    await pageA.getByLabel("Keywords").fill("hydroxyl radical, methane");
    await editorA.expectSaved();

    await editorB.description.fill("Summary typed in the second window.");
    const conflict = pageB.getByRole("alert").filter({ hasText: "A co-editor saved this draft while you were editing it" });
    await expect(conflict).toBeVisible({ timeout: 20_000 });
    // A new title typed while the panel is open is compared too, and kept as mine.
    const titleB = `Retitled during the merge ${Date.now()}`;
    await editorB.title.fill(titleB);
    const titleField = conflict.getByRole("group", { name: "Title and summary, title" });
    await expect(titleField).toContainText("Yours is kept");
    await expect(titleField).toContainText(titleB);

    await conflict.getByRole("button", { name: "Save the merged draft" }).click();
    await editorB.expectSaved();
    await expect(conflict).toBeHidden();
    await expect(editorB.title).toHaveValue(titleB);
    await expect(editorB.description).toHaveValue("Summary typed in the second window.");
    await expect(pageB.getByLabel("Keywords")).toHaveValue("hydroxyl radical, methane");

    await pageA.reload();
    await expect(editorA.title).toHaveValue(titleB);
    await expect(editorA.description).toHaveValue("Summary typed in the second window.");
    await expect(pageA.getByLabel("Keywords")).toHaveValue("hydroxyl radical, methane");
  } finally {
    await a.close();
    await b.close();
  }
});
