import { expect, request as newRequest, type APIRequestContext, type Locator, type Page } from "@playwright/test";
import { Header, SignInPage } from "./auth-pages";

/** Demo people of the seed (password for all: arrhenia-demo). */
export const DEMO_PASSWORD = "arrhenia-demo";
export const DEMO_RESEARCHER = { email: "tanaka@demo.arrhenia.invalid", name: "Emi Tanaka" };
export const DEMO_CURATORS = [
  { email: "curator.hale@demo.arrhenia.invalid", name: "Ingrid Hale" },
  { email: "curator.mensah@demo.arrhenia.invalid", name: "Kofi Mensah" },
] as const;

/** Signs out whoever is signed in (if anyone), then signs `who` in and waits for the header to say so. */
export async function signInAs(page: Page, who: { email: string; name: string }) {
  const header = new Header(page);
  if (await page.getByRole("button", { name: "Sign out" }).isVisible()) await header.signOut();
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.signIn(who.email, DEMO_PASSWORD);
  await header.expectSignedInAs(who.name);
}

/** An API request context signed in as a demo person (for the REST API and the transitions). */
export async function signedIn(baseURL: string, who: { email: string }): Promise<APIRequestContext> {
  const ctx = await newRequest.newContext({ baseURL });
  const { csrfToken } = await (await ctx.get("/api/auth/csrf")).json();
  const res = await ctx.post("/api/auth/callback/credentials", {
    form: { csrfToken, email: who.email, password: DEMO_PASSWORD, json: "true" },
  });
  expect(res.ok()).toBe(true);
  return ctx;
}

/** One lifecycle transition of a version through the REST API (submit, accept with a reason, …). */
export async function transition(ctx: APIRequestContext, versionId: number, body: Record<string, string>) {
  const res = await ctx.post(`/api/v1/versions/${versionId}/transitions`, { data: body });
  expect(res.ok(), await res.text()).toBe(true);
}

export interface Species {
  name: string;
  smiles: string;
}

/** The deposit editor, at /deposits/new and /deposits/[id]. */
export class DepositEditorPage {
  constructor(private readonly page: Page) {}

  get lifecycle(): Locator {
    return this.page.getByRole("region", { name: /^Version \d+:/ });
  }

  async openNew() {
    await this.page.goto("/deposits/new");
    await expect(this.page.getByRole("heading", { level: 1, name: "New deposit" })).toBeVisible();
  }

  async open(versionId: number) {
    await this.page.goto(`/deposits/${versionId}`);
    await expect(this.lifecycle).toBeVisible();
  }

  /** The version id in the address of a stored deposit. */
  versionId(): number {
    const m = /\/deposits\/(\d+)/.exec(new URL(this.page.url()).pathname);
    if (!m) throw new Error(`Not on a stored deposit: ${this.page.url()}`);
    return Number(m[1]);
  }

  /** A section of the editor (a fieldset named by its legend). */
  section(name: string): Locator {
    return this.page.getByRole("group", { name, exact: true });
  }

  async fillAbout(title: string, description: string) {
    const about = this.section("Title and summary");
    await about.getByLabel(/^Title/).fill(title);
    await this.description.fill(description);
  }

  get title(): Locator {
    return this.section("Title and summary").getByLabel(/^Title/);
  }

  get description(): Locator {
    return this.section("Title and summary").getByLabel(/^Description/);
  }

  async fillReaction({
    reactants,
    products,
    reactionClass,
    order,
    phase,
  }: {
    reactants: Species[];
    products: Species[];
    reactionClass: string;
    order: "1" | "2" | "3";
    phase: string;
  }) {
    await this.fillSpecies("Reactant", reactants);
    await this.fillSpecies("Product", products);
    await this.page.getByLabel("Reaction class").selectOption({ label: reactionClass });
    await this.page.getByLabel("Reaction order").selectOption(order);
    await this.page.getByLabel("Phase").selectOption({ label: phase });
  }

  /** Names and SMILES of one side; the editor starts with one blank row per side. */
  private async fillSpecies(noun: "Reactant" | "Product", list: Species[]) {
    for (const [i, s] of list.entries()) {
      const name = this.page.getByLabel(`${noun} ${i + 1}: name`);
      if ((await name.count()) === 0) await this.page.getByRole("button", { name: `Add a ${noun.toLowerCase()}` }).click();
      await name.fill(s.name);
      // SMILES fields share their label; each sits in the list item of its species.
      await this.page.getByRole("listitem").filter({ has: name }).getByLabel("SMILES").fill(s.smiles);
    }
  }

  async fillMethod(kind: string, technique: string) {
    await this.page.getByLabel("Obtained by").selectOption({ label: kind });
    await this.page.getByLabel(/^Technique/).fill(technique);
  }

  async fillSourceDoi(doi: string) {
    await this.page.getByLabel("DOI of the publication").fill(doi);
  }

  /** Uploads a table and waits for the column mapping to appear. */
  async uploadTable(path: string | { name: string; mimeType: string; buffer: Buffer }) {
    await this.page.getByLabel("Upload a file").setInputFiles(path);
    await expect(this.mapping).toBeVisible();
  }

  get mapping(): Locator {
    return this.page.getByRole("region", { name: /What each column holds/ });
  }

  /** The column chosen for a role ("Temperature", "Rate constant", "Uncertainty", …). */
  mappingSelect(role: string): Locator {
    return this.mapping.getByLabel(new RegExp(`^${role}( \\(required\\))?$`));
  }

  async useRows() {
    await this.page.getByRole("button", { name: "Use these rows" }).click();
  }

  /** What the import said about the table's problems. */
  get importProblems(): Locator {
    return this.page.getByRole("alert").filter({ hasText: "Problems in the table" });
  }

  cell(column: "T" | "k" | "Uncertainty" | "Note", row: number): Locator {
    return this.page.getByLabel(`${column}, row ${row}`, { exact: true });
  }

  get rowCount(): Locator {
    return this.page.getByRole("heading", { name: /^Rows \(/ });
  }

  /** The save status line ("Saved 14:32", "Saving…", "Not saved: …"), announced politely. */
  get saveStatus(): Locator {
    return this.page.getByTestId("save-status");
  }

  /** Waits until autosave (or a save by hand) has stored every change. */
  async expectSaved() {
    await expect(this.saveStatus).toHaveText(/^Saved \d\d:\d\d$/, { timeout: 20_000 });
  }

  /** "Not ready to submit": the list of what the draft still lacks. */
  get readiness(): Locator {
    return this.page.getByRole("heading", { name: /^Not ready to submit/ });
  }

  /**
   * Saves a new deposit by hand: the draft's own page (lifecycle, checks, Submit) opens in the same
   * tab once everything is stored, without the browser loading a new document.
   */
  async saveNewDraft(): Promise<number> {
    await this.page.evaluate(() => Object.assign(window, { arrheniaSameDocument: true }));
    await this.page.getByRole("button", { name: "Save draft" }).first().click();
    await this.expectState("draft");
    await expect(this.page).toHaveURL(/\/deposits\/\d+$/);
    expect(await this.page.evaluate(() => "arrheniaSameDocument" in window), "the draft's page opened without a reload").toBe(true);
    return this.versionId();
  }

  /** Saves a stored draft with the top button and waits until the status line says it is stored. */
  async saveDraft() {
    await this.page.getByRole("button", { name: "Save draft" }).first().click();
    await expect(this.page.getByRole("status").filter({ hasText: /^Saved \d\d:\d\d$/ })).toBeVisible({ timeout: 20_000 });
  }

  async expectState(words: string) {
    await expect(this.page.getByRole("heading", { name: new RegExp(`^Version \\d+: ${words}$`) })).toBeVisible({ timeout: 15_000 });
  }

  /** Submits the saved draft; after a return, `reply` is the answer to the curator the form requires. */
  async submitForReview(reply?: string) {
    if (reply !== undefined) await this.page.getByLabel(/^Your reply to the curator/).fill(reply);
    const submit = this.page.getByRole("button", { name: "Submit for review" });
    await expect(submit).toBeEnabled({ timeout: 15_000 });
    await submit.click();
    await expect(this.page.getByRole("status").filter({ hasText: "Submitted. A curator has been told." })).toBeVisible({ timeout: 15_000 });
    await this.expectState("submitted");
  }

  /** A curator's decision as listed in the lifecycle panel. */
  decision(words: string): Locator {
    return this.lifecycle.getByRole("listitem").filter({ hasText: words });
  }

  get versionIdentifier(): Locator {
    return this.lifecycle.getByText(/^Version identifier:/);
  }
}

/** The curators' queue at /review and one version's review page. */
export class ReviewPage {
  constructor(private readonly page: Page) {}

  /** Opens the queue newest first (so a fresh submission is on page 1) and follows the dataset's link. */
  async openFromQueue(title: string) {
    await this.page.goto("/review?sort=submitted&dir=desc");
    await expect(this.page.getByRole("heading", { level: 1, name: "Review queue" })).toBeVisible();
    await this.page.getByRole("link", { name: title, exact: true }).click();
    await expect(this.page.getByRole("heading", { level: 1, name: title })).toBeVisible();
  }

  /** The section comparing this submission with the one before it. */
  get sinceLastSubmission(): Locator {
    return this.page.getByRole("region", { name: "Changes since the last submission", exact: true });
  }

  async takeIntoReview() {
    await this.page.getByRole("button", { name: "Take into review" }).click();
    await expect(this.page.getByRole("status").filter({ hasText: "the version is now in review" })).toBeVisible({ timeout: 15_000 });
  }

  async decide(decision: "Return to the authors" | "Accept and publish" | "Decline", reason: string, expectedConfirmation: RegExp) {
    await this.page.getByRole("radio", { name: new RegExp(`^${decision}`) }).check();
    await this.page.getByLabel(/^Reason/).fill(reason);
    await this.page.getByRole("button", { name: "Record the decision" }).click();
    await expect(this.page.getByRole("status").filter({ hasText: expectedConfirmation })).toBeVisible({ timeout: 15_000 });
  }
}

/** The admin's view of outgoing mail, for counting the messages of a flow. */
export class MailLog {
  constructor(private readonly page: Page) {}

  rows(to: string, subject: string): Locator {
    return this.page.getByRole("row").filter({ hasText: to }).filter({ hasText: subject });
  }

  /** Reloads /admin/mail until every expectation holds (the queue delivers within seconds). */
  async expectCounts(expected: { to: string; subject: string; count: number }[]) {
    await expect(async () => {
      await this.page.goto("/admin/mail");
      for (const e of expected)
        await expect(this.rows(e.to, e.subject), `${e.count} × “${e.subject}” to ${e.to}`).toHaveCount(e.count, { timeout: 500 });
    }).toPass({ timeout: 30_000 });
  }
}
