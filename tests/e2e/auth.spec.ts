import { expect, test } from "@playwright/test";
import { DEMO_ADMIN, Header, MailInbox, SignInPage, SignUpPage } from "./pages/auth-pages";

test("sign up, read the confirmation in the admin inbox, verify, sign in, sign out", async ({ page }) => {
  const email = `e2e-${Date.now()}@test.arrhenia.invalid`;
  const password = "a-long-e2e-password";
  const signUp = new SignUpPage(page);
  const signIn = new SignInPage(page);
  const header = new Header(page);

  await signUp.open();
  await signUp.signUp("Eve Tester", email, password);
  await expect(page.getByRole("main").getByRole("status")).toContainText(`confirmation link to ${email}`);

  // Before confirming, sign-in says what to do.
  await signIn.open();
  await signIn.signIn(email, password);
  await expect(page.getByRole("main").getByRole("alert")).toContainText("Confirm your e-mail address first");
  // …and offers a new link, with the same answer for an address that has no account.
  await page.getByRole("link", { name: "Send me a new confirmation link" }).click();
  await expect(page.getByLabel("E-mail")).toHaveValue(email);
  await page.getByRole("button", { name: "Send me a new confirmation link" }).click();
  await expect(page.getByRole("main").getByRole("status")).toHaveText(
    `If ${email} belongs to an account waiting for confirmation, a new confirmation link is on its way. Earlier links still work until they expire.`,
  );
  const nobody = `nobody-${Date.now()}@test.arrhenia.invalid`;
  await page.goto("/verify/resend");
  await page.getByLabel("E-mail").fill(nobody);
  await page.getByRole("button", { name: "Send me a new confirmation link" }).click();
  await expect(page.getByRole("main").getByRole("status")).toHaveText(
    `If ${nobody} belongs to an account waiting for confirmation, a new confirmation link is on its way. Earlier links still work until they expire.`,
  );
  await signIn.open();

  // The admin reads the captured message and follows its link.
  await signIn.signIn(DEMO_ADMIN.email, DEMO_ADMIN.password);
  await header.expectSignedInAs("Rosalind Okafor");
  await new MailInbox(page).openLatestTo(email, /Confirm your e-mail address/);
  const link = page.getByRole("link", { name: /\/verify\?token=/ });
  const href = await link.getAttribute("href");
  expect(href).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/verify\?token=/);
  await header.signOut();

  await link.page().goto(href!);
  await page.getByRole("button", { name: "Confirm my address" }).click();
  await expect(page.getByRole("main").getByRole("status")).toContainText("Your address is confirmed");
  // A used link says so and offers a new one.
  await page.goto(href!);
  await page.getByRole("button", { name: "Confirm my address" }).click();
  await expect(page.getByRole("main").getByRole("alert")).toContainText("already used");
  await expect(page.getByRole("link", { name: "Send me a new confirmation link" })).toBeVisible();

  await signIn.open();
  await signIn.signIn(email, password);
  await header.expectSignedInAs("Eve Tester");
  await page.goto("/settings");
  await expect(page.getByRole("heading", { name: "Settings" })).toBeVisible();
  await header.signOut();
  await page.goto("/settings");
  await expect(page).toHaveURL(/\/sign-in\?callbackUrl=(%2F|\/)settings/);
});

test("the sign-in form sent before its scripts run (or without them) never puts the password in the address", async ({ browser }) => {
  const context = await browser.newContext({ javaScriptEnabled: false });
  const page = await context.newPage();
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(DEMO_ADMIN.email);
  await page.getByLabel("Password").fill(DEMO_ADMIN.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForLoadState();
  expect(page.url()).not.toContain(encodeURIComponent(DEMO_ADMIN.password));
  expect(page.url()).not.toContain("password");
  await context.close();
});

test("keyboard-only sign-in", async ({ page }) => {
  await page.goto("/sign-in");
  // The e-mail field has focus on arrival; everything else is reached with Tab.
  await expect(page.getByLabel("E-mail")).toBeFocused();
  await page.keyboard.type(DEMO_ADMIN.email);
  await page.keyboard.press("Tab");
  await expect(page.getByLabel("Password")).toBeFocused();
  await page.keyboard.type(DEMO_ADMIN.password);
  await page.keyboard.press("Tab");
  await expect(page.getByRole("button", { name: "Sign in" })).toBeFocused();
  await page.keyboard.press("Enter");
  await new Header(page).expectSignedInAs("Rosalind Okafor");
});

test("a wrong password gets the same message as an unknown e-mail", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.signIn(DEMO_ADMIN.email, "not-the-password");
  await expect(page.getByRole("main").getByRole("alert")).toHaveText("E-mail or password is not right.");
  await signIn.signIn("nobody-here@test.arrhenia.invalid", "not-the-password");
  await expect(page.getByRole("main").getByRole("alert")).toHaveText("E-mail or password is not right.");
});

test("researchers are told they lack access to admin pages, and which role opens them; the home page shows live counts", async ({
  page,
}) => {
  await page.goto("/");
  // Live from the database: the two demo curators, plus any that other tests created.
  const curators = Number(await page.getByTestId("count-curators").textContent());
  expect(curators).toBeGreaterThanOrEqual(2);
  await new SignInPage(page).open();
  await new SignInPage(page).signIn("tanaka@demo.arrhenia.invalid", "arrhenia-demo");
  await new Header(page).expectSignedInAs("Emi Tanaka");
  await expect(page.getByRole("link", { name: "People" })).toHaveCount(0);
  const res = await page.goto("/admin/people");
  expect(res?.status()).toBe(403);
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("You do not have access");
  await expect(page.getByRole("main")).toContainText("You are signed in as a researcher, and this page needs another role.");
  await expect(page.getByRole("main").getByRole("listitem").filter({ hasText: "/admin" })).toContainText("needs the admin role");
  expect((await page.goto("/review"))?.status()).toBe(403);
  await expect(page.getByRole("main")).toContainText("curator or admin role");
  // Signed out, the same address asks for a sign-in instead.
  await page.context().clearCookies();
  await page.goto("/admin/people");
  await expect(page).toHaveURL(/\/sign-in\?callbackUrl=%2Fadmin%2Fpeople/);
});

test("an admin's role control shows the saved role after a change, and the refusal when a change is refused", async ({ page }) => {
  const stamp = Date.now();
  const email = `e2e-role-${stamp}@test.arrhenia.invalid`;
  const name = `Rolf Rollwechsel ${stamp}`;
  await new SignUpPage(page).open();
  await new SignUpPage(page).signUp(name, email, "a-long-e2e-password");
  await expect(page.getByRole("main").getByRole("status")).toContainText("confirmation link");
  const signIn = new SignInPage(page);
  await signIn.open();
  await signIn.signIn(DEMO_ADMIN.email, DEMO_ADMIN.password);
  await new Header(page).expectSignedInAs("Rosalind Okafor");

  await page.goto("/admin/people");
  const role = page.getByLabel(`Role of ${name}`);
  await expect(role).toHaveValue("researcher");
  await role.selectOption("curator");
  await page.getByRole("button", { name: `Save role of ${name}` }).click();
  await expect(page.getByRole("row").filter({ hasText: email }).getByRole("status")).toHaveText("Role changed to curator.");
  await expect(role).toHaveValue("curator");
  await page.reload();
  await expect(role).toHaveValue("curator");

  // The admin's own role cannot be lowered: the control says why and keeps showing the saved role.
  const own = page.getByLabel("Role of Rosalind Okafor");
  await own.selectOption("researcher");
  await page.getByRole("button", { name: "Save role of Rosalind Okafor" }).click();
  await expect(page.getByRole("row").filter({ hasText: DEMO_ADMIN.email }).getByRole("alert")).toContainText(
    "You cannot remove your own admin role",
  );
  await expect(own).toHaveValue("admin");
});
