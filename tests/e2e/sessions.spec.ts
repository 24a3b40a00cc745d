import { expect, test } from "@playwright/test";
import { Header, SignInPage } from "./pages/auth-pages";

const PERSON = { email: "lindqvist@demo.arrhenia.invalid", password: "arrhenia-demo", name: "Sara Lindqvist" };

test("a callback path that browsers read as another host lands on the home page after sign-in", async ({ page, baseURL }) => {
  await page.goto("/sign-in?callbackUrl=/%5Cevil.example/phish");
  await new SignInPage(page).signIn(PERSON.email, PERSON.password);
  await new Header(page).expectSignedInAs(PERSON.name);
  expect(page.url()).toBe(`${baseURL}/`);
});

test("signing out ends the session: a copied cookie no longer opens the settings", async ({ page, browser, baseURL }) => {
  await new SignInPage(page).open();
  await new SignInPage(page).signIn(PERSON.email, PERSON.password);
  await new Header(page).expectSignedInAs(PERSON.name);
  const copied = await page.context().cookies();

  const other = await browser.newContext({ baseURL });
  await other.addCookies(copied);
  const otherPage = await other.newPage();
  await otherPage.goto("/settings");
  await expect(otherPage.getByRole("heading", { name: "Settings" })).toBeVisible();

  await new Header(page).signOut();
  await otherPage.goto("/settings");
  await expect(otherPage).toHaveURL(/\/sign-in\?callbackUrl=/);
  await other.close();
});

test("a server action posted from another origin is a 403", async ({ request }) => {
  const res = await request.post("/settings", {
    headers: {
      origin: "https://evil.example",
      "next-action": "00000000000000000000000000000000000000000000",
      "content-type": "text/plain;charset=UTF-8",
    },
    data: "[]",
  });
  expect(res.status()).toBe(403);
  // Claiming the other origin as the forwarded host does not help a client that is not a trusted proxy.
  const claimed = await request.post("/settings", {
    headers: {
      origin: "https://evil.example",
      "x-forwarded-host": "evil.example",
      "next-action": "0000",
      "content-type": "text/plain;charset=UTF-8",
    },
    data: "[]",
  });
  expect(claimed.status()).toBe(403);
});
