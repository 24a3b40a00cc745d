import { expect, type Page } from "@playwright/test";

export const DEMO_ADMIN = { email: "admin@demo.arrhenia.invalid", password: "arrhenia-demo" };

/** Page objects for the sign-in, sign-up and admin mail screens. */
export class SignInPage {
  constructor(private readonly page: Page) {}
  async open() {
    await this.page.goto("/sign-in");
    await expect(this.page.getByRole("heading", { name: "Sign in" })).toBeVisible();
  }
  async signIn(email: string, password: string) {
    await this.page.getByLabel("E-mail").fill(email);
    await this.page.getByLabel("Password").fill(password);
    await this.page.getByRole("button", { name: "Sign in" }).click();
  }
}

export class SignUpPage {
  constructor(private readonly page: Page) {}
  async open() {
    await this.page.goto("/sign-up");
  }
  async signUp(name: string, email: string, password: string) {
    await this.page.getByLabel("Full name").fill(name);
    await this.page.getByLabel("E-mail").fill(email);
    await this.page.getByLabel("Password", { exact: true }).fill(password);
    await this.page.getByLabel("Password again").fill(password);
    await this.page.getByRole("button", { name: "Create account" }).click();
  }
}

export class Header {
  constructor(private readonly page: Page) {}
  async expectSignedInAs(name: string) {
    await expect(this.page.getByRole("navigation", { name: "Main" })).toContainText(name);
  }
  async signOut() {
    await this.page.getByRole("button", { name: "Sign out" }).click();
    await expect(this.page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Sign in" })).toBeVisible();
  }
}

export class MailInbox {
  constructor(private readonly page: Page) {}
  /** Opens the newest message to `to`, reloading until the queue has delivered it. */
  async openLatestTo(to: string, subject: RegExp) {
    const row = this.page.getByRole("row").filter({ hasText: to }).filter({ hasText: subject }).first();
    await expect(async () => {
      await this.page.goto("/admin/mail");
      await expect(row).toBeVisible({ timeout: 1000 });
    }).toPass({ timeout: 30_000 });
    await row.getByRole("link").click();
    await expect(this.page.getByRole("heading", { level: 1 })).toHaveText(subject);
  }
}
