import { expect, test, type Page } from "@playwright/test";
import { labelledAlkaneDeposit } from "../fixtures/labelled-alkane-deposit";
import { freshOrcid } from "../support/orcid";
import { DEMO_ADMIN, Header, MailInbox, SignInPage } from "./pages/auth-pages";
import { DEMO_CURATORS, DEMO_RESEARCHER, signedIn, transition } from "./pages/deposit-pages";

// Sign in with ORCID through the local stand-in's own pages, and the profile that lists the
// datasets naming the iD. The person, the iD and the dataset are this test's own: the database is
// shared by the whole run, and other tests publish datasets for the demo people.

/** From the sign-in page through the stand-in: its login form (unless it remembers the person) and its consent. */
async function throughOrcid(page: Page, orcid: string, name: string) {
  await page.getByRole("button", { name: "Continue with ORCID" }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in") || url.pathname.startsWith("/sign-in/orcid"));
  if (await page.getByRole("heading", { name: "Sign in with your ORCID iD" }).isVisible()) {
    await page.getByLabel("ORCID iD").fill(orcid);
    await page.getByLabel("Name to report (optional)").fill(name);
    await page.getByRole("button", { name: "Sign in" }).click();
  }
  if (await page.getByRole("heading", { name: "Share your iD?" }).isVisible()) await page.getByRole("button", { name: "Allow" }).click();
}

test("sign in with ORCID through the stand-in, confirm the address, and see the profile with the datasets", async ({ page, baseURL }) => {
  test.setTimeout(120_000);
  const orcid = freshOrcid();
  const stamp = Date.now();
  const name = `Ilse Varga ${stamp}`;
  const email = `orcid-e2e-${stamp}@test.arrhenia.invalid`;

  // A demo researcher deposits a dataset naming the iD as a creator; a curator publishes it.
  const title = `ORCID creators ${stamp}`;
  const document = {
    ...labelledAlkaneDeposit({ title, name: `labelled heptadecane ${stamp}`, carbons: 17 }),
    creators: [{ name: DEMO_RESEARCHER.name }, { name: `Varga, Ilse`, orcid }],
  };
  const researcher = await signedIn(baseURL!, DEMO_RESEARCHER);
  const curator = await signedIn(baseURL!, DEMO_CURATORS[0]);
  const created = await researcher.post("/api/v1/datasets", { data: document });
  expect(created.status(), await created.text()).toBe(201);
  const { datasetId, versionId } = (await created.json()).data;
  await transition(researcher, versionId, { transition: "submit" });
  await transition(curator, versionId, { transition: "accept", reason: "Consistent with the others." });
  await researcher.dispose();
  await curator.dispose();

  // The sign-in page says where the button goes.
  const signIn = new SignInPage(page);
  await signIn.open();
  await expect(page.getByText("goes to a local stand-in")).toBeVisible();
  await throughOrcid(page, orcid, name);

  // A first sign-in: a name and an address before any account exists.
  await expect(page.getByRole("heading", { name: "Create an account with ORCID" })).toBeVisible();
  await expect(page.getByRole("main")).toContainText(orcid);
  await expect(page.getByLabel("Full name")).toHaveValue(name);
  await page.getByLabel("E-mail").fill(email);
  await page.getByRole("button", { name: "Create my account" }).click();
  await expect(page.getByRole("main").getByRole("status")).toContainText(`confirmation link to ${email}`);

  // The usual confirmation mail, read in the admin inbox.
  const header = new Header(page);
  await signIn.open();
  await signIn.signIn(DEMO_ADMIN.email, DEMO_ADMIN.password);
  await header.expectSignedInAs("Rosalind Okafor");
  await new MailInbox(page).openLatestTo(email, /Confirm your e-mail address/);
  const href = await page.getByRole("link", { name: /\/verify\?token=/ }).getAttribute("href");
  await header.signOut();
  await page.goto(href!);
  await page.getByRole("button", { name: "Confirm my address" }).click();
  await expect(page.getByRole("main").getByRole("status")).toContainText("Your address is confirmed");

  // The second sign-in with the iD signs the account in.
  await signIn.open();
  await throughOrcid(page, orcid, name);
  await header.expectSignedInAs(name);
  await page.goto("/settings");
  await expect(page.getByRole("region", { name: "ORCID and public profile" })).toContainText(`${orcid} (verified)`);
  await page.getByRole("link", { name: /^\/people\/\d+$/ }).click();

  // The profile: name, verified iD, the dataset with its citation, and never the e-mail address.
  await expect(page.getByRole("heading", { level: 1, name })).toBeVisible();
  await expect(page.getByRole("main")).toContainText(`${orcid} (verified)`);
  const entry = page.getByRole("listitem").filter({ has: page.getByRole("link", { name: title }) });
  await expect(entry).toContainText("creator");
  await expect(entry).toContainText(`Varga`);
  await expect(entry).toContainText("Arrhenia.");
  await expect(page.getByRole("main")).not.toContainText(email);
  await entry.getByRole("link", { name: title }).click();
  await expect(page).toHaveURL(new RegExp(`/datasets/${datasetId}/v1$`));
  // The dataset page links the creator entry to the person, with the verified iD.
  await expect(page.getByRole("link", { name: "Varga, Ilse" })).toHaveAttribute("href", /\/people\/\d+$/);
});

test("a state that does not match the sign-in this browser started is refused with a clear message", async ({ page }) => {
  await page.goto("/api/auth/callback/orcid?code=forged&state=forged");
  await expect(page).toHaveURL(/\/sign-in\?/);
  await expect(page.getByRole("main").getByRole("alert")).toContainText("did not match the sign-in this browser started");
});

test("a cancelled sign-in at ORCID says so", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.open();
  await page.getByRole("button", { name: "Continue with ORCID" }).click();
  await expect(page.getByRole("heading", { name: "Sign in with your ORCID iD" })).toBeVisible();
  await page.getByRole("button", { name: "Cancel" }).click();
  await expect(page.getByRole("main").getByRole("alert")).toContainText("You cancelled at ORCID");
});
