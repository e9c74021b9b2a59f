import { expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "airtally-demo";

export class SignInPage {
  constructor(private readonly page: Page) {}

  async goto() {
    await this.page.goto("/sign-in");
    await expect(this.page.getByRole("heading", { name: "Sign in" })).toBeVisible();
  }

  async signIn(email: string, password = DEMO_PASSWORD) {
    await this.page.getByLabel("E-mail").fill(email);
    await this.page.getByLabel("Password").fill(password);
    await this.page.getByRole("button", { name: "Sign in" }).click();
  }

  error() {
    // Scoped to the form: Next adds its own (empty) route-announcer alert to every page.
    return this.page.locator("form").getByRole("alert");
  }
}
