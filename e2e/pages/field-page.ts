import { expect, type Page } from "@playwright/test";
import { SignInPage } from "./sign-in-page";

export const LIBRARY = "Wrenfield Library — air balance";

/** Signs in and opens the library's Field work tab; returns the project id. */
export async function openFieldWork(page: Page, email = "tech@example.test"): Promise<string> {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn(email);
  await page.getByRole("link", { name: new RegExp(LIBRARY) }).click();
  await page.getByRole("navigation", { name: "Project" }).getByRole("link", { name: "Field work" }).click();
  await expect(page.getByRole("heading", { name: "Work safely" })).toBeVisible();
  return page.url().match(/projects\/([0-9a-f-]{36})/)![1]!;
}

/** The conditions panel of one system on the Field work screen. */
export function conditionsPanel(page: Page, tag: string) {
  return page.getByRole("region", { name: `Operating conditions · ${tag}` });
}
